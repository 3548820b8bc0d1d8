// The target region as arcs of t: membership decided from certified t-enclosures must agree with
// the exact sign test of the conditions (family/target.hpp) and with the lead's exact triple map
// (family/ratio_sum.hpp), on many rational points built by the exact group law.
#include <gtest/gtest.h>

#include "brute_force.hpp"
#include "family/ratio_sum.hpp"
#include "region/interval_ops.hpp"
#include "region/region.hpp"

namespace arcsieve::region {
namespace {

// Independent of family/target.hpp: the triple map of family/ratio_sum.hpp, all three of one sign.
bool positive_by_triple_map(const Integer& N, const Point& p) {
    const auto image = family::point_to_triple(N, p);
    const auto* t = std::get_if<family::Triple>(&image);
    return t != nullptr && t->a > 0 && t->b > 0 && t->c > 0;  // normalised: a + b + c > 0
}

bool ordered_by_triple_map(const Integer& N, const Point& p) {
    const auto image = family::point_to_triple(N, p);
    const auto* t = std::get_if<family::Triple>(&image);
    return t != nullptr && t->a > 0 && t->b > 0 && t->c > 0 && t->a >= t->b && t->b >= t->c;
}

// A point of infinite order on E_N of small height, by brute force over integral x.
std::optional<Point> small_point(const Curve& e, long bound) {
    for (long x = -bound; x <= bound; ++x) {
        const Integer X(x);
        const Integer f = X * X * X + Integer(e.a2) * X * X + Integer(e.a4) * X;
        if (f <= 0 || !mpz_perfect_square_p(f.get_mpz_t())) continue;
        Integer y;
        mpz_sqrt(y.get_mpz_t(), f.get_mpz_t());
        const Point p{Rational(X), Rational(y), false};
        Point q = p;
        bool torsion = false;
        for (int k = 1; k <= 12 && !torsion; ++k) {
            torsion = q.at_infinity;
            q = add(e, q, p);
        }
        if (!torsion) return p;
    }
    return std::nullopt;
}

struct Tally {
    int points = 0, inside = 0, undecided = 0;  // undecided: off every boundary
};

Tally compare_with_exact(const Region& region, const Point& generator,
                         const std::vector<Point>& torsion, int range,
                         bool (*independent)(const Integer&, const Point&)) {
    Tally tally;
    const Curve& e = region.target.curve;
    for (const Point& t : torsion) {
        Point q = add(e, multiply(e, generator, std::int64_t{-range}), t);
        for (int k = -range; k <= range; ++k, q = add(e, q, generator)) {
            const LogEnclosure log = log_enclosure(region.model, q);
            const Membership m = classify(region, log.component, log.t);
            const bool exact = family::satisfies_exactly(region.target, q);
            ++tally.points;
            tally.inside += exact;
            if (m == Membership::undecided) {
                // Only a point exactly on a boundary may stay undecided at these precisions.
                bool on_boundary = false;
                for (const auto& c : region.target.conditions) {
                    on_boundary |= family::evaluate(c.form, q) == 0;
                }
                tally.undecided += !on_boundary;
                EXPECT_FALSE(exact) << "k=" << k << " T=" << to_string(t);
                continue;
            }
            EXPECT_EQ(m == Membership::inside, exact)
                << "k=" << k << " T=" << to_string(t) << " component " << log.component
                << " t=" << midpoint_double(log.t);
            if (independent) {
                EXPECT_EQ(exact, independent(region.target.parameter, q))
                    << "k=" << k << " T=" << to_string(t);
            }
        }
    }
    return tally;
}

TEST(RegionTest, RatioSumN4MembershipAgreesWithExactSigns) {
    const Integer N(4);
    const Region region = target_region(family::ratio_sum_target(N), 30);
    ASSERT_FALSE(region.arcs.empty());
    const Curve& e = region.target.curve;
    // (−100, 260): MathOverflow question 227713 (REFERENCE-VALUES.md).
    const Point p{Rational(-100), Rational(260), false};
    const auto torsion = testing::torsion_by_search(e, 200);
    ASSERT_EQ(torsion.size(), 6u);
    const Tally tally = compare_with_exact(region, p, torsion, 12, positive_by_triple_map);
    EXPECT_EQ(tally.undecided, 0);
    // The published smallest solution is 9P + T for some torsion T (same source): some point
    // with |k| <= 12 is inside.
    EXPECT_GT(tally.inside, 0);
}

TEST(RegionTest, BoundaryPointsAreZerosOfTheirForms) {
    for (int n : {2, 4, 5, 12}) {
        const Region region = target_region(family::ratio_sum_target(Integer(n)), 25);
        for (const BoundaryPoint& b : region.boundaries) {
            ASSERT_FALSE(b.conditions.empty());
            if (b.exact_point) {
                for (std::size_t c : b.conditions) {
                    EXPECT_EQ(family::evaluate(region.target.conditions[c].form, *b.exact_point),
                              0);
                }
                continue;
            }
            // An irrational zero: the line meets the curve inside the bracket, so the cubic
            // f(x) − y(x)² changes sign across it (y' from the line).
            for (std::size_t c : b.conditions) {
                const auto& f = region.target.conditions[c].form;
                if (f.coefficient_y == 0) {
                    // A vertical line x = x0: x0 is exact and f(x0) > 0 (two real points).
                    EXPECT_EQ(b.x.lower, b.x.upper);
                    EXPECT_EQ(f.coefficient_x * b.x.lower + f.coefficient_z, 0);
                    EXPECT_GT(evaluate(region.model.cubic, b.x.lower), 0);
                    continue;
                }
                auto residual = [&](const Rational& x) -> Rational {
                    const Rational y = -(f.coefficient_x * x + f.coefficient_z) / f.coefficient_y;
                    return evaluate(region.model.cubic, x) - y * y;  // a1 = a3 = 0 here
                };
                EXPECT_LE(sgn(residual(b.x.lower)) * sgn(residual(b.x.upper)), 0) << "N=" << n;
            }
        }
        // Boundaries on a component are strictly ordered (certified separation).
        for (std::size_t i = 0; i + 1 < region.boundaries.size(); ++i) {
            if (region.boundaries[i].component != region.boundaries[i + 1].component) continue;
            EXPECT_TRUE(certainly_less(region.boundaries[i].t, region.boundaries[i + 1].t));
        }
    }
}

TEST(RegionTest, EvenAndOddNMembershipAgreesWithExactSigns) {
    const int last = testing::sanitize_scale() ? 8 : 20;
    for (int n = 2; n <= last; ++n) {
        const Integer N(n);
        const Region region = target_region(family::ratio_sum_target(N), 25);
        const Curve& e = region.target.curve;
        const auto p = small_point(e, 2000);
        if (!p) continue;
        const auto torsion = testing::torsion_by_search(e, 8 * (n + 3) + 10);
        const Tally tally = compare_with_exact(region, *p, torsion, 5, positive_by_triple_map);
        EXPECT_EQ(tally.undecided, 0) << "N=" << n;
    }
}

TEST(RegionTest, OrderingShrinksTheRegion) {
    const Integer N(4);
    const Region ordered = target_region(family::ratio_sum_target(N, "a>=b>=c"), 30);
    const Point p{Rational(-100), Rational(260), false};
    const auto torsion = testing::torsion_by_search(ordered.target.curve, 200);
    const Tally tally = compare_with_exact(ordered, p, torsion, 12, ordered_by_triple_map);
    EXPECT_EQ(tally.undecided, 0);
    // a, b, c distinct for a solution with k != 0, so exactly one of the 6 orderings holds: one
    // sixth of the positive points (the six permutations are all hits).
    const Region plain = target_region(family::ratio_sum_target(N), 30);
    const Tally all = compare_with_exact(plain, p, torsion, 12, nullptr);
    EXPECT_EQ(6 * tally.inside, all.inside);
}

TEST(RegionTest, SecondFamilySumOfTwoCubes) {
    // x³ + y³ = 7 in positive rationals: Y² = X³ − 432·7² with (x : y : 1) = (36·7 + Y : 36·7 − Y
    // : 6X) (common practice). OEIS A254326: 4³ + 5³ = 7·3³, i.e. the point (28, −28). Δ < 0: one
    // real component (exercises the complex-pair integral).
    family::Target target;
    target.family = "two-cubes";
    target.parameter = 7;
    target.curve = parse_curve("[0,0,0,0,-21168]");
    target.variable_names = {"x", "y", "z"};
    target.variables = {family::LinearForm{0, 1, 252}, family::LinearForm{0, -1, 252},
                        family::LinearForm{6, 0, 0}};
    for (int i = 0; i < 3; ++i) target.conditions.push_back({target.variables[i], true, ""});
    const Region region = target_region(target, 30);
    EXPECT_EQ(region.model.components, 1);
    const Point p{Rational(28), Rational(-28), false};
    ASSERT_TRUE(on_curve(target.curve, p));
    EXPECT_TRUE(family::satisfies_exactly(target, p));
    const Tally tally = compare_with_exact(region, p, {Point::infinity()}, 10, nullptr);
    EXPECT_EQ(tally.undecided, 0);
    EXPECT_GE(tally.inside, 2);  // (4, 5, 3) and (5, 4, 3)
}

TEST(RegionTest, BadTargetsAreRejected) {
    EXPECT_THROW(family::ratio_sum_target(Integer(0)), InputError);
    EXPECT_THROW(family::ratio_sum_target(Integer(4), "a>=d"), InputError);
    EXPECT_THROW(family::ratio_sum_target(Integer(4), "a>="), InputError);
    EXPECT_THROW(family::ratio_sum_target(Integer(4), "a>=a"), InputError);
    family::Target empty = family::ratio_sum_target(Integer(4));
    empty.conditions.clear();
    EXPECT_THROW(target_region(empty, 20), InputError);
}

}  // namespace
}  // namespace arcsieve::region
