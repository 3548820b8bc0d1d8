#include "lseries/coefficients.hpp"

#include <tbb/blocked_range.h>
#include <tbb/parallel_for.h>
#include <tbb/task_arena.h>

#include <algorithm>
#include <cmath>
#include <stdexcept>

#include "arith/modular.hpp"

namespace arcsieve::lseries {

namespace {

// Residue of an integer modulo a word-sized modulus, in [0, modulus).
std::uint64_t residue(const Integer& value, std::uint64_t modulus) {
    return mpz_fdiv_ui(value.get_mpz_t(), static_cast<unsigned long>(modulus));
}

// Arithmetic modulo p < 2^32: products fit in 64 bits.
struct SmallField {
    std::uint64_t p;
    std::uint64_t mul(std::uint64_t x, std::uint64_t y) const { return x * y % p; }
    std::uint64_t add(std::uint64_t x, std::uint64_t y) const {
        const std::uint64_t s = x + y;
        return s >= p ? s - p : s;
    }
    std::uint64_t sub(std::uint64_t x, std::uint64_t y) const { return x >= y ? x - y : x + p - y; }
    // Extended Euclid; x != 0 mod p.
    std::uint64_t inverse(std::uint64_t x) const {
        std::int64_t r0 = static_cast<std::int64_t>(p), r1 = static_cast<std::int64_t>(x);
        std::int64_t s0 = 0, s1 = 1;
        while (r1 != 0) {
            const std::int64_t q = r0 / r1;
            std::int64_t t = r0 - q * r1;
            r0 = r1;
            r1 = t;
            t = s0 - q * s1;
            s0 = s1;
            s1 = t;
        }
        return static_cast<std::uint64_t>(s0 < 0 ? s0 + static_cast<std::int64_t>(p) : s0);
    }
};

// Jacobi symbol (x/n) for odd n > 0 (binary algorithm; common practice).
int jacobi(std::uint64_t x, std::uint64_t n) {
    x %= n;
    int sign = 1;
    while (x != 0) {
        while ((x & 1) == 0) {
            x >>= 1;
            const std::uint64_t r = n & 7;
            if (r == 3 || r == 5) sign = -sign;
        }
        std::swap(x, n);
        if ((x & 3) == 3 && (n & 3) == 3) sign = -sign;
        x %= n;
    }
    return n == 1 ? sign : 0;
}

// Affine points on y^2 = x^3 + a x + b over F_p.
struct AffinePoint {
    std::uint64_t x = 0, y = 0;
    bool infinity = true;
};

struct ShortCurve {
    SmallField f;
    std::uint64_t a, b;

    AffinePoint add(const AffinePoint& P, const AffinePoint& Q) const {
        if (P.infinity) return Q;
        if (Q.infinity) return P;
        std::uint64_t lambda;
        if (P.x == Q.x) {
            if (f.add(P.y, Q.y) == 0) return AffinePoint{};
            // doubling: λ = (3x^2 + a) / 2y
            lambda = f.mul(f.add(f.mul(3, f.mul(P.x, P.x)), a), f.inverse(f.add(P.y, P.y)));
        } else {
            lambda = f.mul(f.sub(Q.y, P.y), f.inverse(f.sub(Q.x, P.x)));
        }
        AffinePoint R;
        R.infinity = false;
        R.x = f.sub(f.sub(f.mul(lambda, lambda), P.x), Q.x);
        R.y = f.sub(f.mul(lambda, f.sub(P.x, R.x)), P.y);
        return R;
    }
    AffinePoint negate(const AffinePoint& P) const {
        if (P.infinity) return P;
        return AffinePoint{P.x, P.y == 0 ? 0 : f.p - P.y, false};
    }
    AffinePoint multiply(const AffinePoint& P, std::uint64_t n) const {
        AffinePoint result, base = P;
        for (; n; n >>= 1) {
            if (n & 1) result = add(result, base);
            base = add(base, base);
        }
        return result;
    }
};

std::uint64_t isqrt(std::uint64_t n) {
    auto r = static_cast<std::uint64_t>(std::sqrt(static_cast<double>(n)));
    while (r * r > n) --r;
    while ((r + 1) * (r + 1) <= n) ++r;
    return r;
}

// Every group order m in [p+1−B, p+1+B] with m·P = O (B = ⌊2√p⌋), by baby steps jP (|j| <= s)
// and giant steps (p+1)P + k(2s+1)P.
std::vector<std::int64_t> orders_killing(const ShortCurve& E, const AffinePoint& P) {
    const std::uint64_t p = E.f.p;
    const auto bound = static_cast<std::int64_t>(isqrt(4 * p));
    const auto s = static_cast<std::int64_t>(isqrt(static_cast<std::uint64_t>(bound)) + 1);
    struct Baby {
        std::uint64_t x, y;
        std::int64_t j;
        bool operator<(const Baby& o) const { return x < o.x; }
    };
    std::vector<Baby> baby;
    baby.reserve(static_cast<std::size_t>(s));
    AffinePoint jP = P;
    for (std::int64_t j = 1; j <= s; ++j) {
        if (jP.infinity) break;  // order <= s: the giant steps below still find every multiple
        baby.push_back({jP.x, jP.y, j});
        jP = E.add(jP, P);
    }
    std::sort(baby.begin(), baby.end());
    const std::int64_t step = 2 * s + 1;
    const std::int64_t k_max = (bound + s) / step + 1;
    const AffinePoint giant = E.multiply(P, static_cast<std::uint64_t>(step));
    AffinePoint R = E.add(E.multiply(P, p + 1), E.multiply(E.negate(giant), static_cast<std::uint64_t>(k_max)));
    std::vector<std::int64_t> found;
    const auto center = static_cast<std::int64_t>(p + 1);
    auto keep = [&](std::int64_t m) {
        if (m >= center - bound && m <= center + bound) found.push_back(m);
    };
    for (std::int64_t k = -k_max; k <= k_max; ++k) {
        // R = (p+1)P + k·step·P
        if (R.infinity) {
            keep(center + k * step);
        } else {
            auto it = std::lower_bound(baby.begin(), baby.end(), Baby{R.x, 0, 0});
            for (; it != baby.end() && it->x == R.x; ++it) {
                // R = jP  => (p+1 + k step − j)P = O;  R = −jP => (p+1 + k step + j)P = O
                keep(center + k * step + (it->y == R.y ? -it->j : it->j));
            }
        }
        R = E.add(R, giant);
    }
    std::sort(found.begin(), found.end());
    found.erase(std::unique(found.begin(), found.end()), found.end());
    return found;
}

// splitmix64: deterministic pseudo-random x-coordinates (no global state).
std::uint64_t mix(std::uint64_t z) {
    z += 0x9e3779b97f4a7c15ULL;
    z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
    z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
    return z ^ (z >> 31);
}

// #E(F_p) by listing every (x, y) of the long Weierstrass form (small p only).
std::int64_t count_points_directly(const Curve& e, std::uint64_t p) {
    auto r = [&](const Rational& v) { return static_cast<std::int64_t>(residue(v.get_num(), p)); };
    const std::int64_t a1 = r(e.a1), a2 = r(e.a2), a3 = r(e.a3), a4 = r(e.a4), a6 = r(e.a6);
    const auto q = static_cast<std::int64_t>(p);
    std::int64_t count = 1;
    for (std::int64_t x = 0; x < q; ++x) {
        for (std::int64_t y = 0; y < q; ++y) {
            const std::int64_t lhs = (y * y + a1 * x * y + a3 * y) % q;
            const std::int64_t rhs = ((x * x % q) * x + a2 * x % q * x + a4 * x + a6) % q;
            if (lhs == rhs) ++count;
        }
    }
    return count;
}

template <class F>
void run_with_threads(unsigned threads, F&& body) {
    if (threads == 0) {
        body();
        return;
    }
    tbb::task_arena arena(static_cast<int>(threads));
    arena.execute(body);
}

}  // namespace

LSeriesCurve lseries_curve(const Curve& curve) {
    LSeriesCurve result;
    result.input = curve;
    result.minimal = minimal_model(curve);
    result.bad_primes = bad_reduction(result.minimal.curve);
    result.conductor = 1;
    for (const auto& local : result.bad_primes) {
        Integer power;
        mpz_pow_ui(power.get_mpz_t(), local.prime.get_mpz_t(),
                   static_cast<unsigned long>(local.conductor_exponent));
        result.conductor *= power;
    }
    const Rational c4_value = arcsieve::c4(result.minimal.curve);
    const Rational c6_value = arcsieve::c6(result.minimal.curve);
    result.c4 = c4_value.get_num();
    result.c6 = c6_value.get_num();
    return result;
}

const LocalReduction* bad_reduction_at(const LSeriesCurve& curve, std::uint64_t prime) {
    for (const auto& local : curve.bad_primes) {
        if (local.prime == static_cast<unsigned long>(prime)) return &local;
    }
    return nullptr;
}

std::int64_t trace_by_legendre_sum(std::uint64_t a, std::uint64_t b, std::uint64_t prime) {
    const SmallField f{prime};
    std::vector<std::int8_t> chi(prime, -1);
    chi[0] = 0;
    for (std::uint64_t y = 1; y <= prime / 2; ++y) chi[f.mul(y, y)] = 1;
    std::int64_t sum = 0;
    for (std::uint64_t x = 0; x < prime; ++x) {
        const std::uint64_t value = f.add(f.mul(f.add(f.mul(x, x), a), x), b);
        sum += chi[value];
    }
    return -sum;
}

std::int64_t trace_by_baby_giant(std::uint64_t a, std::uint64_t b, std::uint64_t prime) {
    if (prime >= (1ULL << 32)) throw std::invalid_argument("trace_by_baby_giant: p >= 2^32");
    if (prime < 1000) return trace_by_legendre_sum(a, b, prime);
    const SmallField f{prime};
    const auto bound = static_cast<std::int64_t>(isqrt(4 * prime));
    const auto center = static_cast<std::int64_t>(prime + 1);
    std::vector<std::int64_t> candidates;  // possible a_p
    bool have_candidates = false;
    std::uint64_t seed = prime * 0x2545F4914F6CDD1DULL;
    for (int round = 0; round < 64; ++round) {
        // A random x with f = x^3 + ax + b != 0; (xf, f^2) lies on y^2 = x^3 + a f^2 x + b f^3,
        // which is E when f is a square and the quadratic twist of E when it is not.
        seed = mix(seed);
        const std::uint64_t x = seed % prime;
        const std::uint64_t value = f.add(f.mul(f.add(f.mul(x, x), a), x), b);
        if (value == 0) continue;
        const int chi = jacobi(value, prime);
        const ShortCurve curve{f, f.mul(a, f.mul(value, value)),
                               f.mul(b, f.mul(value, f.mul(value, value)))};
        const AffinePoint P{f.mul(x, value), f.mul(value, value), false};
        // #curve = p + 1 − chi·a_p
        if (!have_candidates || candidates.size() > 8) {
            std::vector<std::int64_t> from_point;
            for (std::int64_t m : orders_killing(curve, P)) from_point.push_back(chi * (center - m));
            std::sort(from_point.begin(), from_point.end());
            if (!have_candidates) {
                candidates = from_point;
                have_candidates = true;
            } else {
                std::vector<std::int64_t> both;
                std::set_intersection(candidates.begin(), candidates.end(), from_point.begin(),
                                      from_point.end(), std::back_inserter(both));
                candidates = both;
            }
        } else {
            std::vector<std::int64_t> kept;
            for (std::int64_t t : candidates) {
                const std::int64_t order = center - chi * t;
                if (curve.multiply(P, static_cast<std::uint64_t>(order)).infinity) kept.push_back(t);
            }
            candidates = kept;
        }
        if (candidates.size() == 1 && std::llabs(candidates.front()) <= bound) {
            return candidates.front();
        }
        if (have_candidates && candidates.empty()) break;  // cannot happen for a nonsingular curve
    }
    return trace_by_legendre_sum(a, b, prime);  // always correct, O(p)
}

std::int64_t trace_of_frobenius(const LSeriesCurve& curve, std::uint64_t prime) {
    if (const LocalReduction* local = bad_reduction_at(curve, prime)) {
        switch (local->kind) {
            case ReductionKind::split_multiplicative: return 1;
            case ReductionKind::nonsplit_multiplicative: return -1;
            case ReductionKind::additive: return 0;
            case ReductionKind::good: break;
        }
        throw std::logic_error("bad prime with good reduction kind");
    }
    if (prime < 5) {
        return static_cast<std::int64_t>(prime + 1) -
               count_points_directly(curve.minimal.curve, prime);
    }
    // y^2 = x^3 − 27 c4 x − 54 c6 is isomorphic to E over Z[1/6] (Silverman AEC III.1).
    const std::uint64_t a = (prime - residue(curve.c4, prime) * 27 % prime) % prime;
    const std::uint64_t b = (prime - residue(curve.c6, prime) * 54 % prime) % prime;
    return trace_by_baby_giant(a, b, prime);
}

std::vector<std::uint32_t> primes_up_to(std::uint32_t limit) {
    std::vector<std::uint32_t> primes;
    if (limit < 2) return primes;
    std::vector<bool> composite(static_cast<std::size_t>(limit) + 1, false);
    for (std::uint64_t i = 2; i <= limit; ++i) {
        if (composite[i]) continue;
        primes.push_back(static_cast<std::uint32_t>(i));
        for (std::uint64_t j = i * i; j <= limit; j += i) composite[j] = true;
    }
    return primes;
}

std::vector<std::int32_t> prime_traces(const LSeriesCurve& curve, std::uint32_t limit,
                                       unsigned threads) {
    const auto primes = primes_up_to(limit);
    std::vector<std::int32_t> traces(primes.size());
    run_with_threads(threads, [&] {
        tbb::parallel_for(tbb::blocked_range<std::size_t>(0, primes.size(), 512),
                          [&](const tbb::blocked_range<std::size_t>& range) {
                              for (std::size_t i = range.begin(); i != range.end(); ++i) {
                                  traces[i] = static_cast<std::int32_t>(
                                      trace_of_frobenius(curve, primes[i]));
                              }
                          });
    });
    return traces;
}

std::vector<std::int32_t> dirichlet_coefficients(const LSeriesCurve& curve, std::uint32_t count,
                                                 unsigned threads) {
    if (count >= (1U << 31)) throw std::invalid_argument("dirichlet_coefficients: count >= 2^31");
    const auto primes = primes_up_to(count);
    const auto traces = prime_traces(curve, count, threads);
    std::vector<std::int32_t> a(static_cast<std::size_t>(count) + 1, 1);
    a[0] = 0;
    // Multiply in a_{p^k} at every n whose p-part is exactly p^k.
    for (std::size_t i = 0; i < primes.size(); ++i) {
        const std::int64_t p = primes[i];
        const bool bad = bad_reduction_at(curve, static_cast<std::uint64_t>(p)) != nullptr;
        std::int64_t previous = 1, current = traces[i];  // a_{p^{k−1}}, a_{p^k}
        for (std::int64_t q = p; q <= count; q *= p) {
            for (std::int64_t n = q, j = 1; n <= count; n += q, ++j) {
                if (j % p == 0) continue;
                a[static_cast<std::size_t>(n)] =
                    static_cast<std::int32_t>(a[static_cast<std::size_t>(n)] * current);
            }
            const std::int64_t next = bad ? current * traces[i]
                                          : traces[i] * current - p * previous;
            previous = current;
            current = next;
            if (q > count / p) break;
        }
    }
    return a;
}

}  // namespace arcsieve::lseries
