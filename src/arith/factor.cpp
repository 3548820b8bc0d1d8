#include "arith/factor.hpp"

#include <algorithm>
#include <map>
#include <optional>
#include <stdexcept>

namespace arcsieve {
namespace {

// Primes below this bound are removed by trial division before any probabilistic step.
constexpr unsigned long trial_division_bound = 1U << 14;

// Primes below `bound` by the sieve of Eratosthenes; built once (immutable after construction).
const std::vector<unsigned long>& small_primes() {
    static const std::vector<unsigned long> primes = [] {
        std::vector<bool> composite(trial_division_bound, false);
        std::vector<unsigned long> out;
        for (unsigned long k = 2; k < trial_division_bound; ++k) {
            if (composite[k]) continue;
            out.push_back(k);
            for (unsigned long multiple = k * k; multiple < trial_division_bound; multiple += k) {
                composite[multiple] = true;
            }
        }
        return out;
    }();
    return primes;
}

// One run of Brent's variant of Pollard's rho (R. P. Brent, "An improved Monte Carlo
// factorization algorithm", BIT 20 (1980) 176–184) with f(x) = x^2 + c and products of
// `batch` differences per gcd, backtracking one step at a time when a batch overshoots.
// Returns a divisor of n, possibly n itself (failure for this c), or nullopt when the step
// budget is spent.
std::optional<Integer> brent_rho(const Integer& n, unsigned long c, unsigned long start) {
    constexpr unsigned long batch = 128;
    Integer y = start, x, ys, q = 1, g = 1, diff, product;
    auto step = [&](Integer& value) {
        value *= value;
        value += c;
        mpz_mod(value.get_mpz_t(), value.get_mpz_t(), n.get_mpz_t());
    };
    unsigned long r = 1;
    // Rho needs ~sqrt(p) steps to find the prime p: 2^23 steps reach p ~ 10^13 with a failure
    // chance below 10^-7 (enough for the ratio-sum discriminants up to N = 10^12, whose
    // primes are below 3·10^12). A step costs ~(bits)^2, so the budget shrinks for huge n to
    // keep the time to give up near a second.
    const auto bits = static_cast<unsigned long>(mpz_sizeinbase(n.get_mpz_t(), 2));
    const unsigned long max_steps =
        bits <= 256 ? (1UL << 23)
                    : std::max(1UL << 16, (1UL << 23) / ((bits / 256) * (bits / 256)));
    unsigned long steps = 0;
    while (g == 1) {
        x = y;
        for (unsigned long i = 0; i < r; ++i) step(y);
        unsigned long k = 0;
        while (k < r && g == 1) {
            ys = y;
            const unsigned long count = std::min(batch, r - k);
            for (unsigned long i = 0; i < count; ++i) {
                step(y);
                diff = x - y;
                q *= diff;
                mpz_mod(q.get_mpz_t(), q.get_mpz_t(), n.get_mpz_t());
            }
            mpz_gcd(g.get_mpz_t(), q.get_mpz_t(), n.get_mpz_t());
            k += count;
        }
        r *= 2;
        steps += r;
        if (steps > max_steps) return std::nullopt;
    }
    if (g == n) {
        // The batch product hit 0 mod n; redo the last batch one difference at a time.
        do {
            step(ys);
            diff = x - ys;
            mpz_gcd(g.get_mpz_t(), diff.get_mpz_t(), n.get_mpz_t());
        } while (g == 1);
    }
    return g;
}

// If n = m^k with k >= 2, returns the smallest such m (and k); else nullopt.
std::optional<std::pair<Integer, int>> perfect_power_root(const Integer& n) {
    if (!mpz_perfect_power_p(n.get_mpz_t())) return std::nullopt;
    const auto bits = static_cast<int>(mpz_sizeinbase(n.get_mpz_t(), 2));
    for (int k = bits; k >= 2; --k) {
        Integer root;
        if (mpz_root(root.get_mpz_t(), n.get_mpz_t(), static_cast<unsigned long>(k)) != 0 &&
            root > 1) {
            return std::make_pair(root, k);
        }
    }
    return std::nullopt;
}

// Splits n (> 1, with no prime factor below the trial-division bound) into primes,
// adding `multiplicity` to each prime's exponent.
void split_into_primes(const Integer& n, int multiplicity, std::map<Integer, int>& exponents) {
    if (n == 1) return;
    if (is_probable_prime(n)) {
        exponents[n] += multiplicity;
        return;
    }
    if (auto power = perfect_power_root(n)) {
        split_into_primes(power->first, multiplicity * power->second, exponents);
        return;
    }
    for (unsigned long c = 1; c <= 16; ++c) {
        const auto found = brent_rho(n, c, 2 + c);
        if (!found) break;
        const Integer& d = *found;
        if (d != 1 && d != n) {
            Integer rest = n / d;
            // Pull the common part out so both halves are split independently.
            split_into_primes(d, multiplicity, exponents);
            split_into_primes(rest, multiplicity, exponents);
            return;
        }
    }
    throw InputError("cannot factor " + to_string(n) +
                     ": Pollard-Brent found no factor within its step budget");
}

}  // namespace

bool is_probable_prime(const Integer& n) {
    if (n < 2) return false;
    // GMP's test: trial division, a Baillie–PSW test and then `reps - 24` Miller–Rabin rounds
    // with random bases; no composite is known to pass Baillie–PSW.
    return mpz_probab_prime_p(n.get_mpz_t(), 30) > 0;
}

std::vector<PrimePower> factor(const Integer& n) {
    if (n == 0) throw std::domain_error("factor: cannot factor 0");
    Integer m = abs(n);
    std::map<Integer, int> exponents;
    for (unsigned long p : small_primes()) {
        if (m == 1) break;
        if (Integer(p) * p > m) {
            // m has no prime factor up to sqrt(m): it is prime.
            exponents[m] += 1;
            m = 1;
            break;
        }
        if (mpz_divisible_ui_p(m.get_mpz_t(), p)) {
            int e = 0;
            while (mpz_divisible_ui_p(m.get_mpz_t(), p)) {
                mpz_divexact_ui(m.get_mpz_t(), m.get_mpz_t(), p);
                ++e;
            }
            exponents[Integer(p)] += e;
        }
    }
    split_into_primes(m, 1, exponents);
    std::vector<PrimePower> out;
    out.reserve(exponents.size());
    for (const auto& [prime, exponent] : exponents) out.push_back(PrimePower{prime, exponent});
    return out;
}

std::vector<Integer> prime_divisors(const Integer& n) {
    std::vector<Integer> out;
    for (const auto& pp : factor(n)) out.push_back(pp.prime);
    return out;
}

}  // namespace arcsieve
