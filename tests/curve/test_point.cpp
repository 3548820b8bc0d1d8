// Group law on rational points: identities (associativity, inverses, multiples) and published
// values: OEIS A350622/A350623 (multiples of (0,0) on y^2 + y = x^3 + x^2, Husemoller p. 28)
// and OEIS A028940 (x(10P) = 161/16 for P = (0,0) on y^2 + y = x^3 - x).
#include <gtest/gtest.h>

#include <random>

#include "curve/point.hpp"

namespace arcsieve {
namespace {

Point pt(const char* x, const char* y) { return Point{Rational(x), Rational(y), false}; }

TEST(PointTest, MultiplesMatchOeisA350622) {
    // Source: OEIS A350622/A350623 (y^2 + y = x^3 + x^2, P = (0,0); Husemoller p. 28).
    const Curve e = parse_curve("[0,1,1,0,0]");
    const Point p = pt("0", "0");
    const std::vector<Point> published = {
        pt("0", "0"),         pt("-1", "-1"),        pt("1", "-2"),
        pt("2", "3"),         pt("-3/4", "1/8"),     pt("-2/9", "-28/27"),
        pt("21", "-99"),      pt("11/49", "20/343"), pt("-140/121", "-931/1331"),
        pt("209/400", "-10527/8000")};
    for (std::size_t n = 1; n <= published.size(); ++n) {
        EXPECT_EQ(multiply(e, p, static_cast<std::int64_t>(n)), published[n - 1]) << "n = " << n;
    }
}

TEST(PointTest, TenthMultipleMatchesOeisA028940) {
    // Source: OEIS A028940: x(10P) = 161/16 on y^2 + y = x^3 - x, P = (0,0).
    const Curve e = parse_curve("[0,0,1,-1,0]");
    const Point q = multiply(e, pt("0", "0"), std::int64_t{10});
    EXPECT_EQ(q.x, Rational(161, 16));
}

TEST(PointTest, GroupLawIdentitiesOnRandomMultiples) {
    const Curve e = parse_curve("[1,-1,1,4,6]");  // LMFDB 117.a? (Cremona 117a1), P = (0,2)
    const Point p = pt("0", "2");
    std::mt19937_64 rng(7);
    for (int iteration = 0; iteration < 50; ++iteration) {
        const std::int64_t i = static_cast<std::int64_t>(rng() % 25) - 12;
        const std::int64_t j = static_cast<std::int64_t>(rng() % 25) - 12;
        const std::int64_t k = static_cast<std::int64_t>(rng() % 25) - 12;
        const Point a = multiply(e, p, i), b = multiply(e, p, j), c = multiply(e, p, k);
        ASSERT_TRUE(on_curve(e, a));
        EXPECT_EQ(add(e, add(e, a, b), c), add(e, a, add(e, b, c))) << i << " " << j << " " << k;
        EXPECT_EQ(add(e, a, b), multiply(e, p, i + j));
        EXPECT_TRUE(add(e, a, negate(e, a)).at_infinity);
    }
}

TEST(PointTest, JacobianMultipleEqualsAffineMultiple) {
    const Curve e = parse_curve("[0,109,0,224,0]");  // E_4 of the ratio-sum family
    const Point p = pt("-100", "260");
    const JacobianCurve je = jacobian_curve(e);
    for (int n = -20; n <= 40; ++n) {
        const Point affine = multiply(e, p, std::int64_t{n});
        const Point fast = to_affine(jacobian_multiply(je, to_jacobian(p), Integer(n)));
        EXPECT_EQ(fast, affine) << "n = " << n;
    }
}

TEST(PointTest, ModelChangeRoundTrip) {
    const Curve e = parse_curve("[1,-1,1,4,6]");
    const ModelChange c{Rational(1, 2), Rational(3), Rational(-1), Rational(5, 7)};
    const Curve e2 = apply(e, c);
    const Point p = pt("0", "2");
    const Point p2 = to_new_model(c, p);
    EXPECT_TRUE(on_curve(e2, p2));
    EXPECT_EQ(to_old_model(c, p2), p);
    EXPECT_EQ(apply(e2, inverse(c)), e);
    const ModelChange d{Rational(3), Rational(-2), Rational(4), Rational(1)};
    EXPECT_EQ(apply(e, compose(c, d)), apply(e2, d));
    EXPECT_EQ(discriminant(e2), discriminant(e) * 64 * 64 * 64 * 64 / (64 * 64));
}

TEST(PointTest, A1A3FreeModelIsIntegralAndCarriesPoints) {
    const Curve e = parse_curve("[1,-1,1,4,6]");
    const ModelChange c = a1_a3_free_change(e);
    const Curve e2 = apply(e, c);
    EXPECT_TRUE(is_integral(e2));
    EXPECT_EQ(e2.a1, 0);
    EXPECT_EQ(e2.a3, 0);
    EXPECT_TRUE(on_curve(e2, to_new_model(c, pt("0", "2"))));
}

TEST(PointTest, ParseRejectsBadInput) {
    const Curve e = parse_curve("[0,109,0,224,0]");
    EXPECT_THROW(parse_point(e, "1,2"), InputError);
    EXPECT_THROW(parse_point(e, "1/0,2"), InputError);
    EXPECT_THROW(parse_point(e, "abc"), InputError);
    EXPECT_EQ(parse_point(e, "(-100:260:1)"), pt("-100", "260"));
    EXPECT_THROW(parse_curve("[0,0,0,0,0]"), InputError);
    EXPECT_THROW(parse_curve("[1,2,3"), InputError);
    EXPECT_THROW(parse_curve("[1,2,3,4]"), InputError);
}

}  // namespace
}  // namespace arcsieve
