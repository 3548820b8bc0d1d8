// Certified enclosures: at random precisions, on thousands of points, the interval must contain
// the value computed at a much higher precision, and be narrow.
#include <gtest/gtest.h>

#include <random>

#include "analytic/height.hpp"
#include "family/ratio_sum.hpp"
#include "test_support.hpp"

namespace arcsieve {
namespace {

using namespace testing_support;

struct CurveWithPoints {
    Curve curve;
    std::vector<Point> points;  // multiples and torsion translates, both components
};

std::vector<CurveWithPoints> sample_curves() {
    struct Source {
        Curve curve;
        Point generator;
        Point torsion;
    };
    const Source sources[] = {
        {family::ratio_sum_curve(Integer(4)), rational_point("-100", "260"),
         rational_point("0", "0")},
        {parse_curve("[1,-1,1,4,6]"), rational_point("0", "2"), rational_point("2", "3")},
        {parse_curve("[1,1,0,-3,-3]"), rational_point("2", "1"), rational_point("-2", "1")},
        {parse_curve("[0,0,1,-21,40]"), rational_point("4", "4"), Point::infinity()},
        {parse_curve("[0,0,0,13524,-400624]"), rational_point("109", "1539"),
         rational_point("28", "0")},
        {parse_curve("[0,1,1,-2,0]"), rational_point("0", "0"), rational_point("1", "0")},
    };
    std::vector<CurveWithPoints> out;
    for (const Source& source : sources) {
        CurveWithPoints entry{source.curve, {}};
        Point multiple = Point::infinity();
        for (int n = 1; n <= 10; ++n) {
            multiple = add(source.curve, multiple, source.generator);
            if (multiple.at_infinity) continue;
            entry.points.push_back(multiple);
            entry.points.push_back(negate(source.curve, multiple));
            const Point shifted = add(source.curve, multiple, source.torsion);
            if (!shifted.at_infinity) entry.points.push_back(shifted);
        }
        out.push_back(entry);
    }
    return out;
}

bool contains_modulo_one(const Interval& enclosure, const Real& value) {
    for (int shift = -1; shift <= 1; ++shift) {
        const Real candidate = value + shift;
        if (lower(enclosure) <= candidate && candidate <= upper(enclosure)) return true;
    }
    return false;
}

TEST(EllipticLogEnclosure, ContainsTheHighPrecisionValueAtRandomPrecisions) {
    std::mt19937_64 random(424242);
    const std::vector<CurveWithPoints> curves = sample_curves();
    const int trials = scaled(2400);
    int checked = 0;
    for (int trial = 0; trial < trials; ++trial) {
        const CurveWithPoints& entry = curves[random() % curves.size()];
        const Point& p = entry.points[random() % entry.points.size()];
        const unsigned digits = 10 + static_cast<unsigned>(random() % 140);
        const EllipticLogEnclosure enclosure = elliptic_log_enclosure(entry.curve, p, digits);
        const EllipticLog reference = elliptic_log(entry.curve, p, digits + 60);
        ASSERT_EQ(enclosure.component, reference.component) << to_string(p);
        EXPECT_TRUE(contains_modulo_one(enclosure.t, reference.t))
            << "curve " << to_string(entry.curve) << " point " << to_string(p) << " digits "
            << digits << " enclosure [" << show(Real(lower(enclosure.t))) << ", "
            << show(Real(upper(enclosure.t))) << "] reference " << show(reference.t);
        const Real width = upper(enclosure.t) - lower(enclosure.t);
        EXPECT_LT(width, power_of_ten(-static_cast<int>(digits), digits + 20))
            << "too wide: " << to_string(p) << " digits " << digits;
        ++checked;
    }
    EXPECT_EQ(checked, trials);
}

TEST(CanonicalHeightEnclosure, ContainsTheHighPrecisionValueAtRandomPrecisions) {
    std::mt19937_64 random(777);
    const std::vector<CurveWithPoints> curves = sample_curves();
    for (int trial = 0; trial < scaled(300); ++trial) {
        const CurveWithPoints& entry = curves[random() % curves.size()];
        const Point& p = entry.points[random() % entry.points.size()];
        const unsigned digits = 10 + static_cast<unsigned>(random() % 100);
        const Interval enclosure = canonical_height_enclosure(entry.curve, p, digits);
        const Real reference = canonical_height(entry.curve, p, digits + 50);
        EXPECT_TRUE(lower(enclosure) <= reference && reference <= upper(enclosure))
            << "curve " << to_string(entry.curve) << " point " << to_string(p) << " digits "
            << digits << " enclosure [" << show(Real(lower(enclosure))) << ", "
            << show(Real(upper(enclosure))) << "] reference " << show(reference);
        EXPECT_LT(Real(upper(enclosure) - lower(enclosure)),
                  power_of_ten(-static_cast<int>(digits), digits + 20))
            << to_string(p) << " digits " << digits;
    }
}

TEST(EllipticLogEnclosure, IsExactAtTwoTorsionPoints) {
    const Curve curve = family::ratio_sum_curve(Integer(4));
    const EllipticLogEnclosure at_origin =
        elliptic_log_enclosure(curve, rational_point("0", "0"), 30);
    EXPECT_EQ(at_origin.component, 0);  // x = 0 = e1 on E_4
    EXPECT_TRUE(lower(at_origin.t) == 0.5 && upper(at_origin.t) == 0.5);
}

}  // namespace
}  // namespace arcsieve
