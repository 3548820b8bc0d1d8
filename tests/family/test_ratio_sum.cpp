// The ratio-sum maps: round trips point ↔ triple, and the published image of (-100, 260) on E_4.
#include <gtest/gtest.h>

#include "family/ratio_sum.hpp"

namespace arcsieve::family {
namespace {

TEST(RatioSumTest, CurveCoefficients) {
    // E_4 : y^2 = x^3 + 109 x^2 + 224 x (MathOverflow question 227713; Bremner–Macleod 2014).
    EXPECT_EQ(to_string(ratio_sum_curve(Integer(4))), "[0,109,0,224,0]");
}

TEST(RatioSumTest, GeneratorOfE4MapsToKnownTriple) {
    // Fact of the trade (widely published): (-100, 260) on E_4 corresponds to (4, -1, 11) up to
    // order and sign.
    const auto image = point_to_triple(Integer(4), Point{Rational(-100), Rational(260), false});
    ASSERT_TRUE(std::holds_alternative<Triple>(image));
    const Triple t = std::get<Triple>(image);
    std::vector<Integer> v{abs(t.a), abs(t.b), abs(t.c)};
    std::sort(v.begin(), v.end());
    EXPECT_EQ(v, (std::vector<Integer>{1, 4, 11}));
    EXPECT_TRUE(satisfies_ratio_sum(Integer(4), t));
}

TEST(RatioSumTest, RoundTripOverMultiples) {
    for (int n : {2, 4, 6, 10, 14}) {
        const Integer N(n);
        const Curve e = ratio_sum_curve(N);
        // A point on each E_N: pull back a small solution of the cubic found by brute force.
        std::optional<Point> base;
        for (int a = -30; a <= 30 && !base; ++a)
            for (int b = -30; b <= 30 && !base; ++b)
                for (int c = 1; c <= 30 && !base; ++c) {
                    Triple t{a, b, c};
                    if (!satisfies_ratio_sum(N, t)) continue;
                    auto p = triple_to_point(N, t);
                    if (auto* q = std::get_if<Point>(&p); q && !q->at_infinity && q->y != 0 &&
                                                          q->x != 4) {
                        base = *q;
                    }
                }
        if (!base) continue;
        for (int k = 1; k <= 6; ++k) {
            const Point q = multiply(e, *base, std::int64_t{k});
            ASSERT_TRUE(on_curve(e, q));
            const auto image = point_to_triple(N, q);
            if (!std::holds_alternative<Triple>(image)) continue;
            const Triple t = std::get<Triple>(image);
            EXPECT_TRUE(satisfies_ratio_sum(N, t)) << "N=" << n << " k=" << k;
            const auto back = triple_to_point(N, t);
            ASSERT_TRUE(std::holds_alternative<Point>(back));
            EXPECT_EQ(std::get<Point>(back), q) << "N=" << n << " k=" << k;
        }
    }
}

TEST(RatioSumTest, TorsionPointsAreDegenerate) {
    const Integer N(4);
    for (const Point& p : {Point{Rational(0), Rational(0), false},
                           Point{Rational(4), Rational(8 * 4 + 20), false},
                           Point{Rational(8 * 7), Rational(-8 * 7 * 13), false},
                           Point::infinity()}) {
        EXPECT_TRUE(on_curve(ratio_sum_curve(N), p));
        EXPECT_TRUE(std::holds_alternative<Degenerate>(point_to_triple(N, p))) << to_string(p);
    }
}

TEST(RatioSumTest, BadParameters) {
    EXPECT_THROW(ratio_sum_parameter("0"), InputError);
    EXPECT_THROW(ratio_sum_parameter("-4"), InputError);
    EXPECT_THROW(ratio_sum_parameter("4.5"), InputError);
    EXPECT_THROW(ratio_sum_parameter("7/2"), InputError);
    EXPECT_THROW(ratio_sum_parameter("1000000000000000000000"), InputError);
    EXPECT_EQ(ratio_sum_parameter("14"), Integer(14));
}

}  // namespace
}  // namespace arcsieve::family
