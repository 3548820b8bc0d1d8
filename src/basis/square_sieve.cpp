#include "basis/square_sieve.hpp"

#include <tbb/blocked_range.h>
#include <tbb/parallel_for.h>
#include <tbb/task_arena.h>

#include <array>
#include <numeric>
#include <stdexcept>

namespace arcsieve::basis {

namespace {

// Moduli for the sieve: 16 and 9 catch the squares' 2- and 3-adic conditions that a single
// prime misses; the odd primes each cut roughly half the candidates (common practice).
constexpr std::array<std::uint32_t, 20> sieve_moduli{16, 9,  5,  7,  11, 13, 17, 19, 23, 29,
                                                     31, 37, 41, 43, 47, 53, 59, 61, 67, 71};

std::int64_t floor_mod(std::int64_t a, std::int64_t m) {
    const std::int64_t r = a % m;
    return r < 0 ? r + m : r;
}

// Allowed residues u mod m for one t, replicated to m + 64 bits so that any 64-bit window
// starting at an offset in [0, m) can be read with two word loads.
struct Pattern {
    std::uint32_t modulus = 1;
    std::vector<std::uint64_t> bits;
    std::uint64_t window(std::uint32_t offset) const {
        const std::uint32_t word = offset >> 6, shift = offset & 63u;
        if (shift == 0) return bits[word];
        return (bits[word] >> shift) | (bits[word + 1] << (64 - shift));
    }
};

std::vector<std::vector<bool>> square_tables() {
    std::vector<std::vector<bool>> tables;
    for (const std::uint32_t m : sieve_moduli) {
        std::vector<bool> is_square(m, false);
        for (std::uint64_t r = 0; r < m; ++r) is_square[(r * r) % m] = true;
        tables.push_back(std::move(is_square));
    }
    return tables;
}

Pattern make_pattern(const BinaryForm& form, std::int64_t t, std::uint32_t m,
                     const std::vector<bool>& is_square) {
    const std::size_t degree = form.coefficients.size() - 1;
    // c_i · t^(d−i) mod m, then Horner in u.
    std::vector<std::uint64_t> reduced(degree + 1);
    const std::uint64_t t_mod = static_cast<std::uint64_t>(floor_mod(t, m));
    for (std::size_t i = 0; i <= degree; ++i) {
        std::uint64_t power = 1;
        for (std::size_t k = 0; k < degree - i; ++k) power = (power * t_mod) % m;
        const std::uint64_t c = mpz_fdiv_ui(form.coefficients[i].get_mpz_t(), m);
        reduced[i] = (c * power) % m;
    }
    Pattern pattern;
    pattern.modulus = m;
    pattern.bits.assign((m + 64) / 64 + 1, 0);
    std::vector<bool> allowed(m);
    for (std::uint64_t u = 0; u < m; ++u) {
        std::uint64_t value = 0;
        for (std::size_t i = degree + 1; i-- > 0;) value = (value * u + reduced[i]) % m;
        allowed[u] = is_square[value];
    }
    for (std::uint32_t j = 0; j < m + 64; ++j) {
        if (allowed[j % m]) pattern.bits[j >> 6] |= std::uint64_t{1} << (j & 63u);
    }
    return pattern;
}

void sieve_one_outer(const BinaryForm& form, const OuterValue& outer, std::int64_t u_min,
                     std::int64_t u_max, const std::vector<std::vector<bool>>& tables,
                     std::vector<SquareValue>& found) {
    std::vector<Pattern> patterns;
    patterns.reserve(sieve_moduli.size());
    for (std::size_t k = 0; k < sieve_moduli.size(); ++k) {
        patterns.push_back(make_pattern(form, outer.t, sieve_moduli[k], tables[k]));
    }
    std::vector<std::uint32_t> offsets(patterns.size());
    for (std::size_t k = 0; k < patterns.size(); ++k) {
        offsets[k] = static_cast<std::uint32_t>(floor_mod(u_min, patterns[k].modulus));
    }
    // Powers t^(d−i) once, exactly.
    const std::size_t degree = form.coefficients.size() - 1;
    std::vector<Integer> scaled(degree + 1);
    {
        Integer t_value;
        mpz_set_si(t_value.get_mpz_t(), static_cast<long>(outer.t));
        for (std::size_t i = 0; i <= degree; ++i) {
            Integer power = 1;
            for (std::size_t k = 0; k < degree - i; ++k) power *= t_value;
            scaled[i] = form.coefficients[i] * power;
        }
    }
    Integer value, u_value;
    for (std::int64_t block = u_min; block <= u_max; block += 64) {
        std::uint64_t word = ~std::uint64_t{0};
        const std::int64_t remaining = u_max - block + 1;
        if (remaining < 64) word = (std::uint64_t{1} << remaining) - 1;
        for (std::size_t k = 0; k < patterns.size() && word != 0; ++k) {
            word &= patterns[k].window(offsets[k]);
        }
        for (std::size_t k = 0; k < patterns.size(); ++k) {
            offsets[k] = (offsets[k] + 64) % patterns[k].modulus;
        }
        while (word != 0) {
            const int bit = __builtin_ctzll(word);
            word &= word - 1;
            const std::int64_t u = block + bit;
            if (std::gcd(u, outer.coprime_to) != 1) continue;
            mpz_set_si(u_value.get_mpz_t(), static_cast<long>(u));
            value = scaled[degree];
            for (std::size_t i = degree; i-- > 0;) value = value * u_value + scaled[i];
            if (sgn(value) < 0 || !mpz_perfect_square_p(value.get_mpz_t())) continue;
            SquareValue hit;
            hit.u = u;
            hit.t = outer.t;
            mpz_sqrt(hit.root.get_mpz_t(), value.get_mpz_t());
            found.push_back(std::move(hit));
        }
    }
}

}  // namespace

Integer evaluate(const BinaryForm& form, const Integer& u, const Integer& t) {
    Integer value = 0, t_power = 1;
    std::vector<Integer> t_powers(form.coefficients.size());
    for (std::size_t i = 0; i < form.coefficients.size(); ++i) {
        t_powers[i] = t_power;
        t_power *= t;
    }
    const std::size_t degree = form.coefficients.size() - 1;
    for (std::size_t i = degree + 1; i-- > 0;) {
        value = value * u + form.coefficients[i] * t_powers[degree - i];
    }
    return value;
}

std::vector<SquareValue> square_values(const BinaryForm& form, const std::vector<OuterValue>& outer,
                                       std::int64_t u_min, std::int64_t u_max, unsigned threads) {
    if (form.coefficients.empty()) throw std::invalid_argument("square_values: empty form");
    if (u_min > u_max || outer.empty()) return {};
    const auto tables = square_tables();
    std::vector<std::vector<SquareValue>> per_outer(outer.size());
    auto run = [&] {
        tbb::parallel_for(tbb::blocked_range<std::size_t>(0, outer.size()),
                          [&](const tbb::blocked_range<std::size_t>& range) {
                              for (std::size_t i = range.begin(); i != range.end(); ++i) {
                                  sieve_one_outer(form, outer[i], u_min, u_max, tables,
                                                  per_outer[i]);
                              }
                          });
    };
    if (threads == 0) {
        run();
    } else {
        tbb::task_arena arena(static_cast<int>(threads));
        arena.execute(run);
    }
    std::vector<SquareValue> all;
    for (auto& list : per_outer) {
        for (auto& hit : list) all.push_back(std::move(hit));
    }
    return all;
}

}  // namespace arcsieve::basis
