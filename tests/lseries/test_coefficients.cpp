#include <gtest/gtest.h>

#include <array>
#include <cstdlib>

#include "curve/curve.hpp"
#include "family/ratio_sum.hpp"
#include "lseries/coefficients.hpp"

namespace arcsieve::lseries {
namespace {

// 11a1's newform is η(τ)²η(11τ)² = q ∏ (1 − q^n)² (1 − q^{11n})² (a classical identity; e.g.
// Cremona, Algorithms, §2.10 / Diamond–Shurman Ex. 1.x; common practice): an independent
// computation of a_n by power-series multiplication.
TEST(Coefficients, ElevenA1MatchesEtaProduct) {
    const int count = 400;
    std::vector<long> series(count + 1, 0);
    series[1] = 1;                      // q
    auto multiply_by = [&](int step) {  // (1 − q^step)
        for (int n = count; n >= step; --n) series[n] -= series[n - step];
    };
    for (int n = 1; n <= count; ++n) {
        multiply_by(n);
        multiply_by(n);
        if (11 * n <= count) {
            multiply_by(11 * n);
            multiply_by(11 * n);
        }
    }
    const auto curve = lseries_curve(parse_curve("[0,-1,1,-10,-20]"));
    EXPECT_EQ(curve.conductor, 11);
    const auto a = dirichlet_coefficients(curve, count);
    for (int n = 1; n <= count; ++n) EXPECT_EQ(a[n], series[n]) << "n = " << n;
}

}  // namespace
}  // namespace arcsieve::lseries

namespace arcsieve::lseries {
namespace {

// #E(F_p) by listing all (x, y) (an independent method; common practice).
long brute_force_count(const Curve& e, long p) {
    auto r = [&](const Rational& a) {
        return static_cast<long>(mpz_fdiv_ui(a.get_num_mpz_t(), static_cast<unsigned long>(p)));
    };
    const long a1 = r(e.a1), a2 = r(e.a2), a3 = r(e.a3), a4 = r(e.a4), a6 = r(e.a6);
    long count = 1;
    for (long x = 0; x < p; ++x) {
        for (long y = 0; y < p; ++y) {
            if ((y * y + a1 * x * y + a3 * y - (x * x * x + a2 * x * x + a4 * x + a6)) % p == 0)
                ++count;
        }
    }
    return count;
}

TEST(Coefficients, GoodPrimeTracesMatchBruteForceCounts) {
    std::uint64_t state = 7;
    auto next = [&](long range) {
        state = state * 6364136223846793005ULL + 1442695040888963407ULL;
        return static_cast<long>((state >> 33) % static_cast<std::uint64_t>(2 * range + 1)) - range;
    };
    const auto primes = primes_up_to(150);
    for (int trial = 0; trial < 12; ++trial) {
        std::array<Rational, 5> coefficients{Rational(next(1)), Rational(next(2)),
                                             Rational(next(1)), Rational(next(30)),
                                             Rational(next(30))};
        Curve e;
        try {
            e = make_curve(coefficients);
        } catch (const InputError&) {
            continue;  // singular
        }
        const auto curve = lseries_curve(e);
        for (std::uint32_t p : primes) {
            if (bad_reduction_at(curve, p)) continue;
            EXPECT_EQ(trace_of_frobenius(curve, p),
                      static_cast<long>(p) + 1 - brute_force_count(curve.minimal.curve, p))
                << to_string(e) << " p = " << p;
        }
    }
}

TEST(Coefficients, BabyGiantAgreesWithLegendreSums) {
    // Two independent counts of #E(F_p) on random short curves and primes up to 3·10^5.
    const auto primes = primes_up_to(300000);
    std::uint64_t state = 99;
    const int trials = std::getenv("ARCSIEVE_TEST_SCALE") ? 60 : 400;
    for (int trial = 0; trial < trials; ++trial) {
        state = state * 6364136223846793005ULL + 1442695040888963407ULL;
        const std::uint64_t p = primes[1000 + (state >> 33) % (primes.size() - 1000)];
        const std::uint64_t a = (state >> 7) % p, b = (state >> 19) % p;
        if ((4 * (a * a % p) % p * a + 27 * (b * b % p)) % p == 0) continue;
        const auto fast = trace_by_baby_giant(a, b, p);
        EXPECT_EQ(fast, trace_by_legendre_sum(a, b, p))
            << "p = " << p << " a = " << a << " b = " << b;
        EXPECT_LE(fast * fast, static_cast<std::int64_t>(4 * p));  // Hasse
    }
}

}  // namespace
}  // namespace arcsieve::lseries

namespace arcsieve::lseries {
namespace {

TEST(Coefficients, TorsionRichCurvesMatchLegendreSums) {
    // E_N has rational torsion Z/2 × Z/6 or Z/6, so random points of E(F_p) often have small
    // order (the case where ord(P) <= the baby-step bound): every a_p for 1000 < p < 30000
    // must equal the Legendre sum (regression: E_184 at p = 8147).
    for (int N : {184, 178}) {
        const auto curve = lseries_curve(family::ratio_sum_curve(Integer(N)));
        const auto primes = primes_up_to(30000);
        const auto traces = prime_traces(curve, 30000);
        for (std::size_t i = 0; i < primes.size(); ++i) {
            const std::uint64_t p = primes[i];
            if (p < 1000 || bad_reduction_at(curve, p)) continue;
            const std::uint64_t a = (p - mpz_fdiv_ui(curve.c4.get_mpz_t(), p) * 27 % p) % p;
            const std::uint64_t b = (p - mpz_fdiv_ui(curve.c6.get_mpz_t(), p) * 54 % p) % p;
            ASSERT_EQ(traces[i], trace_by_legendre_sum(a, b, p)) << "N = " << N << " p = " << p;
        }
    }
}

}  // namespace
}  // namespace arcsieve::lseries
