// Certified elliptic logs of real points: root isolation, Carlson's R_F against independent
// formulas (AGM, elementary R_C), periods against the LMFDB, and additivity under the exact
// group law of curve/point.hpp.
#include <gtest/gtest.h>
#include <mpfr.h>

#include "brute_force.hpp"
#include "region/arc_log.hpp"
#include "region/interval_ops.hpp"

namespace arcsieve::region {
namespace {

// π / (2·AGM(√y, √z)) = R_F(0, y, z): Gauss's AGM (common practice), in plain MPFR.
double agm_complete_integral(double y, double z, mpfr_prec_t bits) {
    mpfr_t a, b, t, pi;
    mpfr_inits2(bits, a, b, t, pi, (mpfr_ptr)0);
    mpfr_set_d(a, y, MPFR_RNDN);
    mpfr_sqrt(a, a, MPFR_RNDN);
    mpfr_set_d(b, z, MPFR_RNDN);
    mpfr_sqrt(b, b, MPFR_RNDN);
    for (int i = 0; i < 200; ++i) {
        mpfr_add(t, a, b, MPFR_RNDN);
        mpfr_div_ui(t, t, 2, MPFR_RNDN);
        mpfr_mul(b, a, b, MPFR_RNDN);
        mpfr_sqrt(b, b, MPFR_RNDN);
        mpfr_set(a, t, MPFR_RNDN);
    }
    mpfr_const_pi(pi, MPFR_RNDN);
    mpfr_div(t, pi, a, MPFR_RNDN);
    mpfr_div_ui(t, t, 2, MPFR_RNDN);
    const double result = mpfr_get_d(t, MPFR_RNDN);
    mpfr_clears(a, b, t, pi, (mpfr_ptr)0);
    return result;
}

bool contains_double(const Interval& x, double value, double slack) {
    return lower_double(x) - slack <= value && value <= upper_double(x) + slack;
}

TEST(RealRootsTest, IsolatesRationalAndIrrationalRoots) {
    // (x − 1)(x + 3)(x² − 2) = x⁴ + 2x³ − 5x² − 4x + 6.
    const Polynomial p{Rational(6), Rational(-4), Rational(-5), Rational(2), Rational(1)};
    const auto roots = real_roots(p, Rational(1, 1000000));
    ASSERT_EQ(roots.size(), 4u);
    const double expected[] = {-3, -1.4142135623730951, 1, 1.4142135623730951};
    for (int i = 0; i < 4; ++i) {
        EXPECT_LE(roots[i].lower.get_d(), expected[i] + 1e-6);
        EXPECT_GE(roots[i].upper.get_d(), expected[i] - 1e-6);
        // Each bracket holds a root: p changes sign across it or hits it exactly.
        const Rational a = evaluate(p, roots[i].lower), b = evaluate(p, roots[i].upper);
        EXPECT_TRUE(roots[i].lower == roots[i].upper ? a == 0 : sgn(a) * sgn(b) <= 0) << i;
    }
}

TEST(RealRootsTest, RepeatedRootsAppearOnce) {
    // (x − 2)²(x + 1) = x³ − 3x² + 4.
    const auto roots = real_roots(Polynomial{Rational(4), Rational(0), Rational(-3), Rational(1)},
                                  Rational(1, 1000));
    ASSERT_EQ(roots.size(), 2u);
}

TEST(CarlsonTest, CompleteIntegralAgreesWithAgm) {
    for (auto [y, z] : {std::pair{1.0, 2.0}, std::pair{0.25, 9.0}, std::pair{3.0, 3.5}}) {
        const Interval rf = carlson_rf(interval_with_bits(200), interval_of(Rational(y), 200),
                                       interval_of(Rational(z), 200));
        EXPECT_TRUE(contains_double(rf, agm_complete_integral(y, z, 200), 1e-15))
            << "y=" << y << " z=" << z << " rf=" << midpoint_double(rf);
        EXPECT_LT(width_double(rf), 1e-50);
    }
}

TEST(CarlsonTest, DegenerateCaseIsElementary) {
    // R_F(x, y, y) = R_C(x, y) = arccos(√(x/y)) / √(y − x) for 0 <= x < y (common practice).
    const double x = 0.5, y = 2.0;
    const Interval rf = carlson_rf(interval_of(Rational(1, 2), 200), interval_of(Rational(2), 200),
                                   interval_of(Rational(2), 200));
    EXPECT_TRUE(contains_double(rf, std::acos(std::sqrt(x / y)) / std::sqrt(y - x), 1e-15));
    // R_F(a, a, a) = 1/√a.
    const Interval same = carlson_rf(interval_of(Rational(4), 200), interval_of(Rational(4), 200),
                                     interval_of(Rational(4), 200));
    EXPECT_TRUE(contains_double(same, 0.5, 0));
}

TEST(CarlsonTest, ConjugatePairMatchesRealFormulaAtZeroImaginaryPart) {
    const Interval a = carlson_rf_conjugate(interval_of(Rational(1), 200),
                                            interval_of(Rational(3), 200), interval_with_bits(200));
    const Interval b = carlson_rf(interval_of(Rational(1), 200), interval_of(Rational(3), 200),
                                  interval_of(Rational(3), 200));
    EXPECT_NEAR(midpoint_double(a), midpoint_double(b), 1e-15);
    EXPECT_LT(width_double(a), 1e-40);
}

// LMFDB (REFERENCE-VALUES.md): Ω = least positive real period × number of real components.
TEST(ArcModelTest, RealPeriodMatchesLmfdb) {
    struct Case {
        Curve curve;
        double omega;
    };
    const Case cases[] = {
        {parse_curve("[1,-1,1,4,6]"), 2.6403251263283034696},    // 117a1, LMFDB
        {parse_curve("[0,1,1,-23,-50]"), 2.1770431858084583470}  // 37.b2, LMFDB
    };
    for (const Case& c : cases) {
        const ArcModel m = arc_model(c.curve, 40);
        const Interval omega = scaled(scaled(m.half_period, 2), m.components);
        EXPECT_NEAR(midpoint_double(omega), c.omega, 1e-15) << to_string(c.curve);
        EXPECT_LT(width_double(omega), 1e-35);
    }
}

bool same_mod_one(const Interval& a, const Interval& b) {
    const Interval d = minus(a, b);
    const double k = std::round(midpoint_double(d));
    const Interval r = minus(d, interval_of(Rational(static_cast<long>(k)), precision_bits(d)));
    return lower_double(r) <= 0 && 0 <= upper_double(r) && width_double(r) < 1e-30;
}

// Additivity t(P + Q) = t(P) + t(Q) mod 1 with components adding mod 2, against the exact group
// law (an independent method).
void expect_additive(const Curve& curve, const std::vector<Point>& points) {
    const ArcModel m = arc_model(curve, 40);
    for (const Point& p : points) {
        for (const Point& q : points) {
            const Point sum = add(curve, p, q);
            const LogEnclosure lp = log_enclosure(m, p), lq = log_enclosure(m, q),
                               ls = log_enclosure(m, sum);
            EXPECT_EQ(ls.component, (lp.component + lq.component) % 2)
                << to_string(p) << " + " << to_string(q);
            EXPECT_TRUE(same_mod_one(ls.t, plus(lp.t, lq.t)))
                << to_string(curve) << ": " << to_string(p) << " + " << to_string(q)
                << " t(P)=" << midpoint_double(lp.t) << " t(Q)=" << midpoint_double(lq.t)
                << " t(P+Q)=" << midpoint_double(ls.t);
        }
    }
}

TEST(EllipticLogTest, AdditiveOnTheRatioSumCurveForN4) {
    const Curve e = parse_curve("[0,109,0,224,0]");
    const Point p{Rational(-100), Rational(260), false};
    std::vector<Point> points = testing::torsion_by_search(e, 300);
    EXPECT_EQ(points.size(), 6u);
    for (int k : {1, 2, 3, -1}) points.push_back(multiply(e, p, std::int64_t{k}));
    expect_additive(e, points);
}

TEST(EllipticLogTest, AdditiveWithA1A3NonzeroAndOneComponent) {
    // 117a1 = [1,−1,1,4,6] (LMFDB): (0,2) of infinite order, (2,3) of order 4.
    const Curve e = parse_curve("[1,-1,1,4,6]");
    const Point p{Rational(0), Rational(2), false}, t{Rational(2), Rational(3), false};
    expect_additive(e, {p, t, add(e, p, p), add(e, p, t), negate(e, p)});
    // A point of order 4 has 4·t ≡ 0 (mod 1).
    const LogEnclosure lt = log_enclosure(arc_model(e, 40), t);
    const Interval four_t = scaled(lt.t, 4);
    EXPECT_TRUE(same_mod_one(four_t, interval_with_bits(200)));
}

TEST(EllipticLogTest, ConventionSmallTHasNegativeY) {
    // Near infinity y' ≈ −1/z³ for z = t·ω1 > 0 small (℘' ≈ −2/z³; common practice).
    const Curve e = parse_curve("[0,109,0,224,0]");
    const ArcModel m = arc_model(e, 30);
    const LogEnclosure big_negative = log_enclosure(m, Rational(1000000), Rational(1000000), 0, -1);
    EXPECT_LT(upper_double(big_negative.t), 0.01);
    const LogEnclosure two_torsion = log_enclosure(m, Point{Rational(0), Rational(0), false});
    EXPECT_TRUE(contains_double(two_torsion.t, 0.5, 1e-20));
}

TEST(EllipticLogTest, BadInputIsRejected) {
    const ArcModel m = arc_model(parse_curve("[0,109,0,224,0]"), 20);
    EXPECT_THROW(log_enclosure(m, Rational(-1), Rational(-1), 0, 1), std::invalid_argument);
    EXPECT_THROW(arc_model(Curve{0, 0, 0, 0, 0}, 20), InputError);
}

}  // namespace
}  // namespace arcsieve::region
