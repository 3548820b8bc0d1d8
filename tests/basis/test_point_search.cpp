#include <gtest/gtest.h>

#include <cstdlib>
#include <numeric>
#include <set>
#include <string>

#include "basis/point_search.hpp"
#include "basis/square_sieve.hpp"

namespace arcsieve {
namespace {

bool sanitize_scale() {
    const char* scale = std::getenv("ARCSIEVE_TEST_SCALE");
    return scale != nullptr && std::string(scale) == "sanitize";
}

// Independent method (brute force, no sieve): every x = u/w^2 in the box, tested by an exact
// square-root of 4x^3 + b2 x^2 + 2 b4 x + b6 as a rational.
std::set<std::string> brute_force_x(const Curve& e, long bound) {
    std::set<std::string> xs;
    const BInvariants b = b_invariants(e);
    for (long w = 1; w * w <= bound; ++w) {
        for (long u = -bound; u <= bound; ++u) {
            if (std::gcd(u, w) != 1) continue;
            const Rational x(Integer(u), Integer(w * w));
            const Rational d = ((4 * x + b.b2) * x + 2 * b.b4) * x + b.b6;
            if (d < 0) continue;
            if (mpz_perfect_square_p(d.get_num_mpz_t()) &&
                mpz_perfect_square_p(d.get_den_mpz_t())) {
                xs.insert(to_string(Rational(x)));
            }
        }
    }
    return xs;
}

std::set<std::string> searched_x(const Curve& e, long bound) {
    PointSearchOptions options;
    options.height_bound = bound;
    std::set<std::string> xs;
    for (const Point& p : search_points(e, options)) {
        EXPECT_TRUE(on_curve(e, p)) << to_string(p);
        xs.insert(to_string(p.x));
    }
    return xs;
}

TEST(PointSearch, MatchesBruteForceOnSeveralCurves) {
    const long bound = sanitize_scale() ? 60 : 300;
    // Curves from REFERENCE-VALUES.md (LMFDB) and E_4 of the ratio-sum family, plus a
    // non-integral model of our own to exercise the denominators.
    for (const char* text : {"[1,-1,1,4,6]", "[0,1,1,-23,-50]", "[0,0,1,-21,40]", "[1,1,0,-3,-3]",
                             "[0,109,0,224,0]", "[1/2,0,0,-3/4,5]"}) {
        const Curve e = parse_curve(text);
        EXPECT_EQ(searched_x(e, bound), brute_force_x(e, bound)) << "curve " << text;
    }
}

TEST(PointSearch, FindsPublishedPoints) {
    PointSearchOptions options;
    options.height_bound = 200;
    // LMFDB 117a1: (0,2) and torsion (2,3); LMFDB 441.a2: (4,4).
    const auto on_117 = search_points(parse_curve("[1,-1,1,4,6]"), options);
    auto has_x = [](const std::vector<Point>& points, const Rational& x) {
        for (const auto& p : points) {
            if (p.x == x) return true;
        }
        return false;
    };
    EXPECT_TRUE(has_x(on_117, 0));
    EXPECT_TRUE(has_x(on_117, 2));
    EXPECT_TRUE(has_x(search_points(parse_curve("[0,0,1,-21,40]"), options), 4));
    // N = 4 of the ratio-sum family: (−100, 260) (MathOverflow question 227713).
    EXPECT_TRUE(has_x(search_points(parse_curve("[0,109,0,224,0]"), options), -100));
}

TEST(PointSearch, OneOfEachPairSortedByNaiveHeight) {
    PointSearchOptions options;
    options.height_bound = 500;
    options.threads = 2;
    const Curve e = parse_curve("[0,109,0,224,0]");
    const auto points = search_points(e, options);
    ASSERT_FALSE(points.empty());
    auto naive = [](const Point& p) {
        return std::max(Integer(abs(p.x.get_num())), Integer(p.x.get_den()));
    };
    std::set<std::string> xs;
    for (std::size_t i = 0; i < points.size(); ++i) {
        EXPECT_TRUE(xs.insert(to_string(points[i].x)).second)
            << "x repeated: " << to_string(points[i]);
        if (i > 0) {
            EXPECT_LE(naive(points[i - 1]), naive(points[i]));
        }
    }
}

TEST(PointSearch, RejectsBadBounds) {
    PointSearchOptions options;
    options.height_bound = 0;
    EXPECT_THROW(search_points(parse_curve("[0,1]"), options), InputError);
    options.height_bound = Integer("1000000000000000000000");
    EXPECT_THROW(search_points(parse_curve("[0,1]"), options), InputError);
}

TEST(SquareSieve, QuarticValuesAgreeWithDirectEvaluation) {
    // F(u, v) = 2u^4 - 3u^2 v^2 + 5 v^4 (a form of our own): every value the sieve reports is
    // a square, and a direct scan finds no other.
    basis::BinaryForm form{{Integer(5), Integer(0), Integer(-3), Integer(0), Integer(2)}};
    std::vector<basis::OuterValue> outer;
    for (std::int64_t v = 1; v <= 40; ++v) outer.push_back({v, v});
    const auto hits = basis::square_values(form, outer, -200, 200, 0);
    std::set<std::pair<long, long>> reported;
    for (const auto& h : hits) {
        EXPECT_EQ(h.root * h.root, basis::evaluate(form, Integer(h.u), Integer(h.t)));
        reported.insert({h.u, h.t});
    }
    for (long v = 1; v <= 40; ++v) {
        for (long u = -200; u <= 200; ++u) {
            if (std::gcd(u, v) != 1) continue;
            const Integer value = basis::evaluate(form, Integer(u), Integer(v));
            const bool square = value >= 0 && mpz_perfect_square_p(value.get_mpz_t());
            EXPECT_EQ(square, reported.count({u, v}) == 1) << "u=" << u << " v=" << v;
        }
    }
}

}  // namespace
}  // namespace arcsieve
