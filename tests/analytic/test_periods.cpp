// Periods, real structure, elliptic logarithm and its inverse.
#include <gtest/gtest.h>

#include <random>

#include "analytic/periods.hpp"
#include "family/ratio_sum.hpp"
#include "test_support.hpp"

namespace arcsieve {
namespace {

using namespace testing_support;

Curve curve_of(const char* text) {
    return parse_curve(text);
}

// ---- external values -----------------------------------------------------------------------

// Abramowitz and Stegun, Handbook of Mathematical Functions (1965) §18 worked examples:
// ℘'^2 = 4℘^3 − g2 ℘ − g3; y^2 = x^3 − (g2/4) x − g3/4 has Y = 2y = ℘', x = ℘.
TEST(RealStructure, MatchesAbramowitzStegunHalfPeriodsForG2Eight) {
    const RealStructure real = real_structure(curve_of("[0,0,0,-2,-1]"), 30);  // g2 = 8, g3 = 4
    EXPECT_EQ(real.components, 2);
    EXPECT_NEAR(static_cast<double>(real.real_period / 2), 1.009453, 2e-6);
    EXPECT_NEAR(static_cast<double>(real.imaginary_period_im / 2), 1.484412, 2e-6);
    EXPECT_EQ(real.imaginary_period_re, 0);
}

TEST(RealStructure, MatchesAbramowitzStegunHalfPeriodsForG2Ten) {
    const RealStructure real = real_structure(curve_of("[0,0,0,-5/2,-1/2]"), 30);  // g2=10, g3=2
    EXPECT_EQ(real.components, 2);
    EXPECT_NEAR(static_cast<double>(real.real_period / 2), 1.003847, 2e-6);
    EXPECT_NEAR(static_cast<double>(real.imaginary_period_im / 2), 1.09797, 2e-5);
}

// LMFDB (lmfdb.org, via ../shared/REFERENCE-VALUES.md): Ω = least real period × components.
TEST(RealStructure, MatchesLmfdbRealPeriodWithNegativeDiscriminant117a1) {
    const RealStructure real = real_structure(curve_of("[1,-1,1,4,6]"), 40);
    EXPECT_EQ(real.components, 1);  // Δ = −28431
    const Real expected("2.6403251263283034696079214014", 40);
    EXPECT_LT(abs(real.real_period * real.components - expected), power_of_ten(-27, 40))
        << show(real.real_period);
}

TEST(RealStructure, MatchesLmfdbRealPeriodWithPositiveDiscriminant37b2) {
    const RealStructure real = real_structure(curve_of("[0,1,1,-23,-50]"), 40);
    EXPECT_EQ(real.components, 2);  // Δ = 37^3
    const Real expected("2.1770431858084583470086166231", 40);
    EXPECT_LT(abs(real.real_period * real.components - expected), power_of_ten(-27, 40))
        << show(real.real_period);
}

// ---- an independent general method: the defining integrals by double-exponential quadrature ----

// ∫_lower^upper g(x) dx over a finite interval with endpoint singularities of type 1/sqrt, by the
// tanh-sinh rule (Takahasi and Mori 1974; common practice). `g` receives the distances to both
// ends so that nothing cancels near them.
template <class Integrand>
Real tanh_sinh(const Real& width, Integrand g, unsigned digits) {
    const Real h = make_real(1, digits) / 64;
    const Real half_pi = pi_real(digits) / 2;
    Real sum = make_real(0, digits);
    for (int k = -64 * 8; k <= 64 * 8; ++k) {
        const Real u = h * k;
        const Real v = half_pi * sinh(u);
        // distance to the lower end: width/(1 + e^{−2v}), to the upper end: width/(1 + e^{2v})
        const Real to_lower = width / (1 + exp(-2 * v));
        const Real to_upper = width / (1 + exp(2 * v));
        const Real weight = width * half_pi * cosh(u) / (2 * cosh(v) * cosh(v));
        if (to_lower == 0 || to_upper == 0) continue;
        sum += weight * g(to_lower, to_upper);
    }
    return sum * h;
}

// ω1 = 2 ∫_{e1}^∞ dx / sqrt(f(x)), f = 4x^3 + b2 x^2 + 2 b4 x + b6, with x = e1 + h and
// f(e1 + h) = h (f'(e1) + h (12 e1 + b2 + 4h)). The range is cut at h = β 2^k (β^2 = f'(e1)/4, the
// scale of the other roots) so that complex roots near the real axis do not slow the rule down,
// and the tail [h_last, ∞) is mapped to (0, 1) by h = h_last (1 + s/(1 − s)).
Real real_period_by_quadrature(const Curve& curve, const Real& e1, unsigned digits) {
    const BInvariants b = b_invariants(curve);
    const Real b2 = make_real(b.b2, digits), b4 = make_real(b.b4, digits);
    const Real slope = (12 * e1 + 2 * b2) * e1 + 2 * b4;
    auto integrand_at = [&](const Real& h) {
        return Real(1 / sqrt(h * (slope + h * (12 * e1 + b2 + 4 * h))));
    };
    const Real scale = sqrt(slope / 4);
    Real total = make_real(0, digits);
    Real lower = make_real(0, digits);
    for (int k = -6; k <= 6; ++k) {
        const Real upper = scale * pow(make_real(2, digits), k);
        total += tanh_sinh(
            Real(upper - lower),
            [&](const Real& from_lower, const Real&) { return integrand_at(lower + from_lower); },
            digits);
        lower = upper;
    }
    total += tanh_sinh(
        make_real(1, digits),
        [&](const Real& s, const Real& one_minus_s) {
            const Real h = lower * (1 + s / one_minus_s);
            return Real(integrand_at(h) * lower / (one_minus_s * one_minus_s));
        },
        digits);
    return 2 * total;
}

TEST(RealStructure, RealPeriodAgreesWithNumericalIntegrationOnSeveralCurves) {
    for (const char* text : {"[0,1,1,-23,-50]", "[1,-1,1,4,6]", "[0,109,0,224,0]", "[0,0,1,-21,40]",
                             "[1,1,0,-3,-3]", "[0,0,0,877,0]", "[0,0,0,-5/2,-1/2]",
                             "[0,4000011999997,0,32000096,0]"}) {  // the last: E_N, N = 10^6
        const Curve curve = curve_of(text);
        const RealStructure real = real_structure(curve, 40);
        const Real integral = real_period_by_quadrature(curve, real.roots[0], 40);
        EXPECT_LT(abs(integral - real.real_period) / real.real_period, power_of_ten(-30, 40))
            << text << " AGM " << show(real.real_period) << " quadrature " << show(integral);
    }
}

// For Δ > 0 the half periods are ∫_{e3}^{e2} dx / sqrt(−f(x)) = ω1/2 (the egg) and
// ∫_{e2}^{e1} dx / sqrt(−f(x)) = |ω2|/2 (common practice: ℘ maps the sides of the period
// rectangle to the real intervals between the roots).
TEST(RealStructure, EggAndImaginaryPeriodsAgreeWithNumericalIntegrationWhenDiscriminantPositive) {
    for (const char* text : {"[0,1,1,-23,-50]", "[0,109,0,224,0]", "[1,1,0,-3,-3]"}) {
        const Curve curve = curve_of(text);
        const RealStructure real = real_structure(curve, 40);
        const Real& e1 = real.roots[0];
        const Real& e2 = real.roots[1];
        const Real& e3 = real.roots[2];
        auto egg = [&](const Real& from_e3, const Real& to_e2) {
            return Real(1 / sqrt(4 * (e1 - e3 - from_e3) * to_e2 * from_e3));
        };
        auto imaginary = [&](const Real& from_e2, const Real& to_e1) {
            return Real(1 / sqrt(4 * to_e1 * from_e2 * (e2 - e3 + from_e2)));
        };
        const Real egg_half = tanh_sinh(Real(e2 - e3), egg, 40);
        const Real imaginary_half = tanh_sinh(Real(e1 - e2), imaginary, 40);
        EXPECT_LT(abs(2 * egg_half - real.real_period) / real.real_period, power_of_ten(-30, 40))
            << text;
        EXPECT_LT(abs(2 * imaginary_half - real.imaginary_period_im) / real.imaginary_period_im,
                  power_of_ten(-30, 40))
            << text;
    }
}

// ---- identities ----------------------------------------------------------------------------

struct NamedPoint {
    const char* curve;
    const char* x;
    const char* y;
};

// Points of infinite order and torsion points on curves of both discriminant signs; E_4's
// (−100, 260) lies on the egg (−106.9 < x < −2.09), its double on the identity component.
const NamedPoint sample_points[] = {
    {"[0,109,0,224,0]", "-100", "260"},
    {"[0,109,0,224,0]", "8836/25", "-950716/125"},
    {"[0,109,0,224,0]", "0", "0"},
    {"[1,-1,1,4,6]", "0", "2"},
    {"[1,-1,1,4,6]", "2", "3"},
    {"[0,1,1,-23,-50]", "8", "18"},
    {"[0,0,1,-21,40]", "4", "4"},
    {"[1,1,0,-3,-3]", "2", "1"},
    {"[1,1,0,-3,-3]", "-2", "1"},
    {"[0,-1,0,-10,17]", "4", "5"},
    {"[1,-1,0,-5252,-145223]", "4776/49", "158761/343"},
    {"[0,0,0,13524,-400624]", "109", "1539"},
};

TEST(EllipticLog, PointOnEggOfE4IsOnComponentOne) {
    const Curve curve = family::ratio_sum_curve(Integer(4));
    const EllipticLog log = elliptic_log(curve, rational_point("-100", "260"), 30);
    EXPECT_EQ(log.component, 1);
    const EllipticLog doubled_log =
        elliptic_log(curve, doubled(curve, rational_point("-100", "260")), 30);
    EXPECT_EQ(doubled_log.component, 0);
}

TEST(EllipticLog, PointFromLogRecoversThePointTo100Digits) {
    for (const NamedPoint& named : sample_points) {
        const Curve curve = curve_of(named.curve);
        const Point p = rational_point(named.x, named.y);
        ASSERT_TRUE(on_curve(curve, p)) << named.curve;
        const RealStructure real = real_structure(curve, 100);
        const EllipticLog log = elliptic_log(curve, real, p);
        const RealPoint back = point_from_log(curve, real, log.component, log.t);
        ASSERT_FALSE(back.at_infinity);
        const Real scale = 1 + abs(make_real(p.x, 120)) + abs(make_real(p.y, 120));
        EXPECT_LT(abs(back.x - make_real(p.x, 120)) / scale, power_of_ten(-100, 120))
            << named.curve << " " << named.x << " t=" << show(log.t);
        EXPECT_LT(abs(back.y - make_real(p.y, 120)) / scale, power_of_ten(-100, 120))
            << named.curve << " " << named.x;
    }
}

TEST(EllipticLog, IsAdditiveOnBothComponentsTo100Digits) {
    for (const NamedPoint& first : sample_points) {
        for (const NamedPoint& second : sample_points) {
            if (std::string(first.curve) != second.curve) continue;
            const Curve curve = curve_of(first.curve);
            const Point p = rational_point(first.x, first.y);
            const Point q = rational_point(second.x, second.y);
            const Point sum = add(curve, p, q);
            const RealStructure real = real_structure(curve, 100);
            const EllipticLog lp = elliptic_log(curve, real, p);
            const EllipticLog lq = elliptic_log(curve, real, q);
            const EllipticLog ls = elliptic_log(curve, real, sum);
            EXPECT_EQ(ls.component, (lp.component + lq.component) % 2)
                << first.curve << " " << first.x << " + " << second.x;
            EXPECT_LT(circle_distance(ls.t, lp.t + lq.t), power_of_ten(-100, 110))
                << first.curve << " " << first.x << " + " << second.x;
        }
    }
}

TEST(EllipticLog, TorsionPointsHaveRationalLogs) {
    // (2,3) has order 4 on 117a1 (LMFDB), (8,18) order 3 on 37.b2 (LMFDB): 4t, 3t ≡ 0.
    const Curve e117 = curve_of("[1,-1,1,4,6]");
    const EllipticLog t4 = elliptic_log(e117, rational_point("2", "3"), 60);
    EXPECT_LT(circle_distance(4 * t4.t, make_real(0, 60)), power_of_ten(-58, 60));
    const Curve e37 = curve_of("[0,1,1,-23,-50]");
    const EllipticLog t3 = elliptic_log(e37, rational_point("8", "18"), 60);
    EXPECT_LT(circle_distance(3 * t3.t, make_real(0, 60)), power_of_ten(-58, 60));
    EXPECT_EQ(t3.component, 0);  // an odd-order point lies on the identity component
}

TEST(EllipticLog, MultiplesMatchExactMultiplesForSmallN) {
    for (const NamedPoint& named : sample_points) {
        const Curve curve = curve_of(named.curve);
        const Point p = rational_point(named.x, named.y);
        const RealStructure real = real_structure(curve, 100);
        const EllipticLog log = elliptic_log(curve, real, p);
        Point multiple = p;
        for (int n = 2; n <= 12; ++n) {
            multiple = add(curve, multiple, p);
            const EllipticLog ln = elliptic_log(curve, real, multiple);
            EXPECT_LT(circle_distance(ln.t, n * log.t), power_of_ten(-100, 110))
                << named.curve << " " << named.x << " n=" << n;
            EXPECT_EQ(ln.component, (n * log.component) % 2);
        }
    }
}

// For n up to 10^6 the exact n·P is far too large; the real group law at 130 digits (which loses
// about log10(n) digits) gives n·P numerically, independently of the logarithm, and ℘(n t(P))
// must agree with it.
TEST(EllipticLog, MultiplesUpToAMillionAgreeWithTheRealGroupLaw) {
    const long multipliers[] = {97, 1000, 65537, 999999, 1000000};
    for (const char* text : {"[0,109,0,224,0]", "[1,-1,1,4,6]"}) {
        const Curve curve = curve_of(text);
        const Point p = std::string(text) == "[1,-1,1,4,6]" ? rational_point("0", "2")
                                                            : rational_point("-100", "260");
        const RealStructure real = real_structure(curve, 120);
        const EllipticLog log = elliptic_log(curve, real, p);
        for (long n : multipliers) {
            const RealPoint by_group_law = real_multiple(curve, to_real_point(p, 140), n, 140);
            const RealPoint by_log =
                point_from_log(curve, real, static_cast<int>((n * log.component) % 2), n * log.t);
            const Real scale = 1 + abs(by_group_law.x);
            EXPECT_LT(abs(by_log.x - by_group_law.x) / scale, power_of_ten(-100, 140))
                << text << " n=" << n;
            EXPECT_LT(abs(by_log.y - by_group_law.y) / (scale + abs(by_group_law.y)),
                      power_of_ten(-100, 140))
                << text << " n=" << n;
        }
    }
}

TEST(EllipticLog, PointsNearTwoTorsionAndInfinityKeepFullAccuracy) {
    // Points of large height of E_4 come arbitrarily close to the 2-torsion points and to O;
    // there the round trip through the inverse map must still be exact to 100 digits.
    const Curve curve = family::ratio_sum_curve(Integer(4));
    const RealStructure real = real_structure(curve, 100);
    const Point p = rational_point("-100", "260");
    Point multiple = p;
    int near_count = 0;
    for (int n = 2; n <= 40; ++n) {
        multiple = add(curve, multiple, p);
        const EllipticLog log = elliptic_log(curve, real, multiple);
        const RealPoint back = point_from_log(curve, real, log.component, log.t);
        const Real x = make_real(multiple.x, 130);
        EXPECT_LT(abs(back.x - x) / (1 + abs(x)), power_of_ten(-100, 130)) << "n=" << n;
        if (circle_distance(2 * log.t, make_real(0, 100)) < 0.02) ++near_count;
    }
    EXPECT_GT(near_count, 0);  // the test did visit neighbourhoods of 2-torsion points or O
}

TEST(PointFromLog, InverseThenLogIsIdentityOnRandomCoordinates) {
    std::mt19937_64 random(20261202);
    for (const char* text : {"[0,109,0,224,0]", "[1,-1,1,4,6]", "[0,1,1,-23,-50]"}) {
        const Curve curve = curve_of(text);
        const RealStructure real = real_structure(curve, 60);
        for (int trial = 0; trial < scaled(200); ++trial) {
            const int component = real.components == 2 ? static_cast<int>(random() % 2) : 0;
            const Real t = make_real(static_cast<long>(random() % 1000000000), 60) / 1000000000;
            const RealPoint point = point_from_log(curve, real, component, t);
            if (point.at_infinity) continue;
            // The point satisfies the curve equation, and the Y sign matches the half of R/Z.
            const Real x = point.x, y = point.y;
            const Real lhs = y * y + make_real(curve.a1, 60) * x * y + make_real(curve.a3, 60) * y;
            const Real rhs = x * x * x + make_real(curve.a2, 60) * x * x +
                             make_real(curve.a4, 60) * x + make_real(curve.a6, 60);
            EXPECT_LT(abs(lhs - rhs) / (1 + abs(rhs)), power_of_ten(-55, 60))
                << text << " t=" << show(t) << " component " << component;
        }
    }
}

TEST(EllipticLog, IsAdditiveAndInvertibleAtSixHundredDigits) {
    const Curve curve = family::ratio_sum_curve(Integer(4));
    const RealStructure real = real_structure(curve, 600);
    const Point p = rational_point("-100", "260");
    const Point q = multiply(curve, p, 5);
    const EllipticLog lp = elliptic_log(curve, real, p);
    const EllipticLog lq = elliptic_log(curve, real, q);
    const EllipticLog ls = elliptic_log(curve, real, add(curve, p, q));
    EXPECT_LT(circle_distance(ls.t, lp.t + lq.t), power_of_ten(-598, 620));
    const RealPoint back = point_from_log(curve, real, lq.component, lq.t);
    const Real x = make_real(q.x, 620);
    EXPECT_LT(abs(back.x - x) / (1 + abs(x)), power_of_ten(-595, 620));
}

TEST(EllipticLog, RejectsPointsOffTheCurve) {
    EXPECT_THROW(elliptic_log(curve_of("[0,109,0,224,0]"), rational_point("1", "1"), 20),
                 InputError);
    const Curve curve = curve_of("[1,-1,1,4,6]");
    EXPECT_THROW(point_from_log(curve, real_structure(curve, 20), 1, make_real(0, 20)), InputError);
}

}  // namespace
}  // namespace arcsieve
