// The general family interface (family/target.hpp): the ratio-sum linear forms against the
// lead's triple map (family/ratio_sum.hpp), orderings, and exact membership.
#include <gtest/gtest.h>

#include "family/ratio_sum.hpp"
#include "family/target.hpp"

namespace arcsieve::family {
namespace {

TEST(TargetTest, RatioSumFormsAreProportionalToTheTripleMap) {
    for (int n : {2, 4, 9}) {
        const Integer N(n);
        const Target target = ratio_sum_target(N);
        const Curve& e = target.curve;
        const Point p = n == 4 ? Point{Rational(-100), Rational(260), false}
                               : Point{Rational(0), Rational(0), false};
        for (int k = 1; k <= 5; ++k) {
            const Point q = n == 4 ? multiply(e, p, std::int64_t{k}) : p;
            const auto image = point_to_triple(N, q);
            if (!std::holds_alternative<Triple>(image)) continue;
            const Triple t = std::get<Triple>(image);
            const Rational a = evaluate(target.variables[0], q),
                           b = evaluate(target.variables[1], q),
                           c = evaluate(target.variables[2], q);
            // (a : b : c) as projective points: cross products vanish.
            EXPECT_EQ(a * t.b, b * t.a) << "N=" << n << " k=" << k;
            EXPECT_EQ(b * t.c, c * t.b) << "N=" << n << " k=" << k;
            const bool positive = t.a > 0 && t.b > 0 && t.c > 0;
            EXPECT_EQ(satisfies_exactly(target, q), positive) << "N=" << n << " k=" << k;
        }
    }
}

TEST(TargetTest, OrderingAddsDifferences) {
    Target target = ratio_sum_target(Integer(4), "a >= b >= c");
    ASSERT_EQ(target.conditions.size(), 5u);
    EXPECT_EQ(target.conditions[3].form, target.variables[0] - target.variables[1]);
    EXPECT_FALSE(target.conditions[3].strict);
    EXPECT_EQ(target.conditions[4].label, "b >= c");
    EXPECT_THROW(add_ordering(target, "a>=x"), InputError);
    EXPECT_THROW(add_ordering(target, "a"), InputError);
    EXPECT_THROW(add_ordering(target, ">=b"), InputError);
}

TEST(TargetTest, PointAtInfinityUsesItsProjectiveCoordinates) {
    const Target target = ratio_sum_target(Integer(4));
    // (0 : 1 : 0) ↦ (a : b : c) = (1 : −1 : 0): not a solution.
    EXPECT_EQ(evaluate(target.variables[0], Point::infinity()), 1);
    EXPECT_EQ(evaluate(target.variables[1], Point::infinity()), -1);
    EXPECT_EQ(evaluate(target.variables[2], Point::infinity()), 0);
    EXPECT_FALSE(satisfies_exactly(target, Point::infinity()));
}

}  // namespace
}  // namespace arcsieve::family
