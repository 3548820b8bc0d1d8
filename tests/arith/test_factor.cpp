// Factorisation: against brute-force trial division (an independent general method), by
// multiplying back with every factor prime, and on the discriminants of the ratio-sum curves.
#include <gtest/gtest.h>

#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <map>
#include <random>
#include <string>

#include "arith/factor.hpp"

namespace arcsieve {
namespace {

bool sanitize_scale() {
    const char* scale = std::getenv("ARCSIEVE_TEST_SCALE");
    return scale != nullptr && std::string(scale) == "sanitize";
}

// Plain trial division up to sqrt(n): slow, obviously right.
std::vector<PrimePower> factor_by_trial_division(long n) {
    std::vector<PrimePower> out;
    n = std::labs(n);
    for (long p = 2; p * p <= n; ++p) {
        int e = 0;
        while (n % p == 0) {
            n /= p;
            ++e;
        }
        if (e > 0) out.push_back(PrimePower{Integer(p), e});
    }
    if (n > 1) out.push_back(PrimePower{Integer(n), 1});
    return out;
}

std::string describe(const std::vector<PrimePower>& f) {
    std::string out;
    for (const auto& pp : f) out += to_string(pp.prime) + "^" + std::to_string(pp.exponent) + " ";
    return out;
}

// Checks that f is a factorisation of |n| into increasing probable primes.
void expect_factorisation_of(const Integer& n, const std::vector<PrimePower>& f) {
    Integer product = 1;
    for (std::size_t i = 0; i < f.size(); ++i) {
        EXPECT_TRUE(is_probable_prime(f[i].prime))
            << to_string(f[i].prime) << " in " << to_string(n);
        EXPECT_GE(f[i].exponent, 1);
        if (i > 0) {
            EXPECT_LT(f[i - 1].prime, f[i].prime) << "not increasing for " << to_string(n);
        }
        Integer power;
        mpz_pow_ui(power.get_mpz_t(), f[i].prime.get_mpz_t(),
                   static_cast<unsigned long>(f[i].exponent));
        product *= power;
    }
    EXPECT_EQ(product, abs(n)) << "n = " << to_string(n) << ", got " << describe(f);
}

TEST(FactorTest, AgreesWithTrialDivisionUpTo30000AndNegatives) {
    // Independent general method: trial division.
    const long limit = sanitize_scale() ? 3000 : 30000;
    for (long n = 1; n <= limit; ++n) {
        ASSERT_EQ(factor(Integer(n)), factor_by_trial_division(n)) << "n = " << n;
        ASSERT_EQ(factor(Integer(-n)), factor_by_trial_division(n)) << "n = " << -n;
    }
}

TEST(FactorTest, ZeroIsRejectedAndOneHasNoPrimes) {
    EXPECT_THROW(factor(Integer(0)), std::domain_error);
    EXPECT_TRUE(factor(Integer(1)).empty());
    EXPECT_TRUE(factor(Integer(-1)).empty());
}

TEST(FactorTest, ProbablePrimeTestRejectsCarmichaelNumbersAndAcceptsKnownPrimes) {
    // Carmichael numbers 561, 1105, 1729, 41041, 825265 (common practice: they fool Fermat's
    // test but not Miller–Rabin); 2^61 - 1 and 2^89 - 1 are Mersenne primes (common practice).
    for (long n : {561L, 1105L, 1729L, 41041L, 825265L, 1L, 0L, -7L}) {
        EXPECT_FALSE(is_probable_prime(Integer(n))) << n;
    }
    Integer m61, m89;
    mpz_ui_pow_ui(m61.get_mpz_t(), 2, 61);
    mpz_ui_pow_ui(m89.get_mpz_t(), 2, 89);
    EXPECT_TRUE(is_probable_prime(m61 - 1));
    EXPECT_TRUE(is_probable_prime(m89 - 1));
    EXPECT_FALSE(is_probable_prime((m61 - 1) * (m89 - 1)));
}

TEST(FactorTest, RandomProductsOfPrimesAreRecoveredExactly) {
    // The primes are chosen first (GMP's next prime after a random start), then multiplied: the
    // factorisation must return exactly them.
    std::mt19937_64 rng(2024);
    const int rounds = sanitize_scale() ? 20 : 200;
    for (int round = 0; round < rounds; ++round) {
        std::map<Integer, int> chosen;
        Integer n = 1;
        const int count = 1 + static_cast<int>(rng() % 5);
        for (int k = 0; k < count; ++k) {
            // Prime sizes from 2 to 9 digits; one may be up to 30 digits (the cofactor).
            const int digits =
                k == 0 ? 2 + static_cast<int>(rng() % 29) : 2 + static_cast<int>(rng() % 8);
            Integer start;
            mpz_ui_pow_ui(start.get_mpz_t(), 10, static_cast<unsigned long>(digits - 1));
            start += Integer(std::to_string(rng() % 1000000000ULL)) * (digits > 10 ? 7 : 1) % start;
            Integer p;
            mpz_nextprime(p.get_mpz_t(), start.get_mpz_t());
            const int e = 1 + static_cast<int>(rng() % 3);
            chosen[p] += e;
            for (int i = 0; i < e; ++i) n *= p;
        }
        std::vector<PrimePower> expected;
        for (const auto& [p, e] : chosen) expected.push_back(PrimePower{p, e});
        const auto got = factor(n);
        EXPECT_EQ(got, expected) << "n = " << to_string(n) << " got " << describe(got)
                                 << " expected " << describe(expected);
    }
}

TEST(FactorTest, PerfectPowersOfLargePrimes) {
    Integer p;
    mpz_nextprime(p.get_mpz_t(), Integer("100000000000000000000").get_mpz_t());
    Integer q;
    mpz_nextprime(q.get_mpz_t(), Integer("30000000000").get_mpz_t());
    const Integer n = p * p * p * q * q;
    const std::vector<PrimePower> expected = {PrimePower{q, 2}, PrimePower{p, 3}};
    EXPECT_EQ(factor(n), expected) << to_string(n);
    EXPECT_EQ(factor(-p * p), (std::vector<PrimePower>{PrimePower{p, 2}}));
}

TEST(FactorTest, FortyDigitNumberWithTenDigitFactorsInMilliseconds) {
    // 40 digits: three ~10-digit primes and a ~10-digit cofactor. Rho needs ~sqrt(p) ~ 10^5 steps.
    std::vector<Integer> primes;
    Integer n = 1;
    for (const char* start : {"1000000007", "2718281828", "3141592653", "9999999967"}) {
        Integer p;
        mpz_nextprime(p.get_mpz_t(), Integer(start).get_mpz_t());
        primes.push_back(p);
        n *= p;
    }
    EXPECT_GE(decimal_digits(n), 37u);
    const auto begin = std::chrono::steady_clock::now();
    const auto f = factor(n);
    const double ms =
        std::chrono::duration<double, std::milli>(std::chrono::steady_clock::now() - begin).count();
    expect_factorisation_of(n, f);
    EXPECT_EQ(f.size(), 4u);
    std::printf("40-digit product of four 10-digit primes factored in %.1f ms\n", ms);
    if (!sanitize_scale()) {
        EXPECT_LT(ms, 2000.0);
    }
}

TEST(FactorTest, RatioSumDiscriminantsUpToNEqualsTenToTheTwelve) {
    // Δ(E_N) for E_N : y^2 = x^3 + (4N^2+12N-3)x^2 + 32(N+3)x is 16 b^2 (a^2 - 4b) with
    // a = 4N^2+12N-3, b = 32(N+3) (common practice for y^2 = x^3 + a x^2 + b x). Factor it for
    // sample N up to 10^6 and up to 10^12, and multiply back.
    std::mt19937_64 rng(5);
    for (const unsigned long long bound : {1000000ULL, 1000000000000ULL}) {
        const int samples = sanitize_scale() ? 10 : (bound == 1000000ULL ? 200 : 20);
        const auto begin = std::chrono::steady_clock::now();
        for (int k = 0; k < samples; ++k) {
            const Integer N(std::to_string(1 + rng() % bound));
            const Integer a = 4 * N * N + 12 * N - 3, b = 32 * (N + 3);
            const Integer delta = 16 * b * b * (a * a - 4 * b);
            expect_factorisation_of(delta, factor(delta));
        }
        const double ms =
            std::chrono::duration<double, std::milli>(std::chrono::steady_clock::now() - begin)
                .count();
        std::printf("%d ratio-sum discriminants with N <= %llu: %.2f ms each\n", samples, bound,
                    ms / samples);
    }
}

TEST(FactorTest, PrimeDivisorsListsEachPrimeOnce) {
    EXPECT_EQ(prime_divisors(Integer(-360)),
              (std::vector<Integer>{Integer(2), Integer(3), Integer(5)}));
}

}  // namespace
}  // namespace arcsieve
