// The fixed-point first-hit search against brute force (an independent method) on random small
// problems, and the Euclid-like descent against the parallel linear scan on large ones.
#include <gtest/gtest.h>

#include <random>

#include "../region/brute_force.hpp"
#include "locate/rotation.hpp"
#include "region/interval_ops.hpp"

namespace arcsieve::locate {
namespace {

std::optional<Integer> brute_force(long a, long b, long m, long low, long high) {
    for (long x = 0; x <= 2 * m; ++x) {
        const long v = (a * x + b) % m;
        if (low <= high ? (v >= low && v <= high) : (v >= low || v <= high)) return Integer(x);
    }
    return std::nullopt;
}

TEST(RotationTest, AgreesWithBruteForceOnRandomSmallProblems) {
    std::mt19937_64 random(20261202);
    const int cases = testing::sanitize_scale() ? 2000 : 20000;
    for (int i = 0; i < cases; ++i) {
        const long m = 1 + static_cast<long>(random() % 500);
        const long a = static_cast<long>(random() % m), b = static_cast<long>(random() % m);
        const long low = static_cast<long>(random() % m), high = static_cast<long>(random() % m);
        const auto expected = brute_force(a, b, m, low, high);
        const auto got = first_in_window(Integer(a), Integer(b), Integer(m),
                                         ResidueWindow{Integer(low), Integer(high)});
        ASSERT_EQ(got.has_value(), expected.has_value())
            << "a=" << a << " b=" << b << " m=" << m << " window [" << low << ", " << high << "]";
        if (expected) {
            ASSERT_EQ(*got, *expected) << "a=" << a << " b=" << b << " m=" << m << " window ["
                                       << low << ", " << high << "]";
        }
    }
}

TEST(RotationTest, LinearScanAgreesWithBruteForce) {
    std::mt19937_64 random(7);
    for (int i = 0; i < 200; ++i) {
        const std::uint64_t step = random(), offset = random();
        const std::uint64_t low = random(), width = random() >> (20 + random() % 20);
        const std::uint64_t high = low + width;  // may wrap: then the window wraps too
        std::optional<std::uint64_t> expected;
        std::uint64_t v = offset;
        for (std::uint64_t x = 0; x < 300000 && !expected; ++x, v += step) {
            if (low <= high ? (v >= low && v <= high) : (v >= low || v <= high)) expected = x;
        }
        const auto got = linear_first_in_window(step, offset, low, high, 300000);
        ASSERT_EQ(got, expected) << "step=" << step << " offset=" << offset << " low=" << low
                                 << " high=" << high;
    }
}

TEST(RotationTest, DescentAgreesWithLinearScanOnWordSizedProblems) {
    // Windows of relative width 1e-7 … 1e-5 put the first hits around 10^5 … 10^7.
    std::mt19937_64 random(11);
    Integer modulus(1);
    mpz_mul_2exp(modulus.get_mpz_t(), modulus.get_mpz_t(), 64);
    const int cases = testing::sanitize_scale() ? 3 : 30;
    for (int i = 0; i < cases; ++i) {
        const std::uint64_t step = random(), offset = random(), low = random();
        const std::uint64_t width = static_cast<std::uint64_t>(
            std::ldexp(1.0, 64) * std::pow(10.0, -5.0 - 2.0 * (random() % 1000) / 1000.0));
        const std::uint64_t high = low + width;
        const auto scan = linear_first_in_window(step, offset, low, high, 100'000'000);
        const auto descent = first_in_window(
            Integer(std::to_string(step)), Integer(std::to_string(offset)), modulus,
            ResidueWindow{Integer(std::to_string(low)), Integer(std::to_string(high))});
        ASSERT_TRUE(scan.has_value()) << "step=" << step;
        ASSERT_TRUE(descent.has_value());
        EXPECT_EQ(to_string(*descent), std::to_string(*scan))
            << "step=" << step << " offset=" << offset << " low=" << low << " high=" << high;
    }
}

// Synthetic rotation problems with a planted hit at index `planted`: α, β random rationals, the
// arc of width `width` centred on {planted·α + β}. The first hit is the planted one unless an
// earlier index falls into the arc too (probability about planted·width).
struct Planted {
    Rational alpha, beta, start, end;
};

Planted plant(std::mt19937_64& random, const Integer& planted, const Rational& width) {
    Integer den(1);
    mpz_mul_2exp(den.get_mpz_t(), den.get_mpz_t(), 200);
    auto uniform = [&]() {
        Integer num;
        for (int i = 0; i < 4; ++i) {
            num = num * Integer("1125899906842624") + Integer(std::to_string(random() >> 14));
        }
        Rational q(Integer(num % den), den);
        q.canonicalize();
        return q;
    };
    Planted p{uniform(), uniform(), 0, 0};
    const Rational centre = planted * p.alpha + p.beta;
    Integer whole;
    mpz_fdiv_q(whole.get_mpz_t(), centre.get_num_mpz_t(), centre.get_den_mpz_t());
    const Rational c = centre - whole;
    p.start = c - width / 2;
    p.end = c + width / 2;
    return p;
}

// Exact membership of {m·α + β} in (start, end) modulo 1, in rationals (independent of MPFI).
bool exactly_inside(const Planted& p, const Integer& m) {
    for (long k : {-1L, 0L, 1L}) {
        const Rational v = m * p.alpha + p.beta;
        Integer whole;
        mpz_fdiv_q(whole.get_mpz_t(), v.get_num_mpz_t(), v.get_den_mpz_t());
        const Rational frac = v - whole + k;
        if (p.start < frac && frac < p.end) return true;
    }
    return false;
}

RotationOutcome run(const Planted& p, const Integer& max_index, bool linear) {
    RotationSearch search;
    search.step = region::interval_of(p.alpha, 256);
    search.offset = region::interval_of(p.beta, 256);
    search.arc_start = region::interval_of(p.start, 256);
    search.arc_end = region::interval_of(p.end, 256);
    search.max_index = max_index;
    search.linear = linear;
    return first_rotation_hit(search, [&](const Integer& m) {
        const Interval t = region::plus(region::times_integer(search.step, m), search.offset);
        return in_open_arc(t, search.arc_start, search.arc_end);
    });
}

TEST(RotationTest, FindsPlantedHitsBeyondAMillionLikeTheLinearScan) {
    std::mt19937_64 random(5);
    const int cases = testing::sanitize_scale() ? 1 : 4;
    for (int i = 0; i < cases; ++i) {
        const Integer planted(1'000'000 + 777'777 * i);
        const Planted p = plant(random, planted, Rational(Integer(1), Integer("100000000000")));
        const RotationOutcome descent = run(p, Integer(100'000'000), false);
        const RotationOutcome scan = run(p, Integer(100'000'000), true);
        ASSERT_TRUE(descent.hit.has_value()) << "case " << i;
        ASSERT_TRUE(scan.hit.has_value()) << "case " << i;
        EXPECT_EQ(*descent.hit, *scan.hit) << "case " << i;
        EXPECT_GE(*descent.hit, 1'000'000) << "case " << i;
        EXPECT_LE(*descent.hit, planted);
        EXPECT_TRUE(exactly_inside(p, *descent.hit));
        // Nothing before it: every index whose fixed-point value is near the arc was verified.
        EXPECT_FALSE(descent.undecided.has_value());
    }
}

TEST(RotationTest, FindsPlantedHitsNearTenToTheTwelve) {
    std::mt19937_64 random(9);
    for (int i = 0; i < 3; ++i) {
        const Integer planted("987654321012");
        const Planted p = plant(random, planted + i, Rational(1, Integer("100000000000000000000")));
        const RotationOutcome descent = run(p, Integer("1000000000000"), false);
        ASSERT_TRUE(descent.hit.has_value()) << "case " << i;
        // An earlier hit has probability about 10^-8; the planted one is found exactly.
        EXPECT_EQ(*descent.hit, planted + i);
        EXPECT_TRUE(exactly_inside(p, *descent.hit));
        EXPECT_FALSE(exactly_inside(p, *descent.hit - 1));
        EXPECT_LT(descent.candidates, 10u);
    }
}

TEST(RotationTest, RejectsArgumentsOutOfRange) {
    EXPECT_THROW(first_in_window(Integer(5), Integer(0), Integer(5), {Integer(0), Integer(1)}),
                 std::invalid_argument);
    EXPECT_THROW(first_in_window(Integer(1), Integer(0), Integer(0), {Integer(0), Integer(0)}),
                 std::invalid_argument);
}

}  // namespace
}  // namespace arcsieve::locate
