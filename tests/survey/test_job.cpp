// The whole job on rank-2 and "unreachable" problems, against independent exact methods:
// enumeration of all small combinations n1·P1 + n2·P2 + T with exact rational arithmetic, and
// exact halving (the x(2Q) = x0 quartic has no rational root) for the component argument.
#include <gtest/gtest.h>

#include <algorithm>

#include "curve/torsion.hpp"
#include "family/ratio_sum.hpp"
#include "survey/job.hpp"

namespace arcsieve {
namespace {

Point point_of(const nlohmann::json& pair) {
    return Point{Rational(pair[0].get<std::string>()), Rational(pair[1].get<std::string>()), false};
}

// Decimal digit count of the largest of |a|, |b|, |c|.
std::size_t largest_digits(const family::Triple& t) {
    return std::max({decimal_digits(t.a), decimal_digits(t.b), decimal_digits(t.c)});
}

TEST(JobTest, RankTwoFirstHitAgreesWithExactEnumerationOfCombinations) {
    // N = 34: rank 2 (descent bounds agree). Independent method: every n1·P1 + n2·P2 + T with
    // |n1|, |n2| <= 14 mapped to (a, b, c) exactly; the smallest positive solution must be the
    // job's (same digit counts up to the order of a, b, c).
    const Integer N(34);
    ProblemSpec problem{"ratio-sum", N, std::nullopt, {}};
    JobOptions options;
    options.materialise = false;
    const nlohmann::json record = run_problem(problem, options);
    ASSERT_EQ(record["rank"]["lower"], 2) << record.dump();
    ASSERT_EQ(record["rank"]["upper"], 2);
    ASSERT_TRUE(record["hit"].is_object()) << record.dump();
    const Curve e = family::ratio_sum_curve(N);
    const Point p1 = point_of(record["generators"][0]);
    const Point p2 = point_of(record["generators"][1]);
    const auto torsion = torsion_subgroup(e).points;
    const int bound = 14;
    std::vector<Point> multiples1, multiples2;
    for (int i = -bound; i <= bound; ++i) multiples1.push_back(multiply(e, p1, std::int64_t{i}));
    for (int j = -bound; j <= bound; ++j) multiples2.push_back(multiply(e, p2, std::int64_t{j}));
    std::size_t best = 0;
    std::vector<std::size_t> best_digits;
    for (const Point& a : multiples1) {
        for (const Point& b : multiples2) {
            const Point q = add(e, a, b);
            for (const Point& t : torsion) {
                const auto image = family::point_to_triple(N, add(e, q, t));
                const auto* triple = std::get_if<family::Triple>(&image);
                if (!triple || triple->a <= 0 || triple->b <= 0 || triple->c <= 0) continue;
                const std::size_t digits = largest_digits(*triple);
                if (best == 0 || digits < best) {
                    best = digits;
                    best_digits = {decimal_digits(triple->a), decimal_digits(triple->b),
                                   decimal_digits(triple->c)};
                }
            }
        }
    }
    ASSERT_GT(best, 0u) << "no positive solution among the enumerated combinations";
    std::vector<std::size_t> job_digits = record["digits"].get<std::vector<std::size_t>>();
    std::sort(job_digits.begin(), job_digits.end());
    std::sort(best_digits.begin(), best_digits.end());
    EXPECT_EQ(job_digits, best_digits) << record["hit"].dump();
}

// True when some Q in E(Q) has 2Q = R: a rational root x of x(2Q) = x(R), i.e. of
// x^4 − 4 x0 x^3 − (4 a2 x0 + 2 a4) x^2 − 4 a4 x0 x + a4^2 on y^2 = x^3 + a2 x^2 + a4 x (AEC
// III.2.3(d)), whose point also has rational y. Rational roots by the rational-root theorem.
bool is_twice_a_rational_point(const Curve& e, const Point& r) {
    if (r.at_infinity) return true;
    const Rational x0 = r.x;
    std::vector<Rational> c{Rational(1), -4 * x0, -(4 * e.a2 * x0 + 2 * e.a4), -4 * e.a4 * x0,
                            e.a4 * e.a4};
    Integer den = 1;
    for (const auto& v : c) den = lcm(den, Integer(v.get_den()));
    std::vector<Integer> ic;
    for (const auto& v : c) ic.push_back(Integer(v * den));
    auto divisors = [](Integer n) {
        n = abs(n);
        std::vector<Integer> out;
        for (Integer d = 1; d * d <= n; ++d) {
            if (n % d == 0) {
                out.push_back(d);
                out.push_back(n / d);
            }
        }
        return out;
    };
    if (ic.back() == 0) return true;  // x = 0 is a root: Q = (0, 0) doubled is O, handled above
    for (const Integer& p : divisors(ic.back())) {
        for (const Integer& q : divisors(ic.front())) {
            for (int sign : {1, -1}) {
                const Rational x(sign * p, q);
                Rational value = 0;
                for (const auto& v : c) value = value * x + v;
                if (value != 0) continue;
                const Rational rhs = ((x + e.a2) * x + e.a4) * x;
                if (rhs >= 0 && mpz_perfect_square_p(rhs.get_num().get_mpz_t()) &&
                    mpz_perfect_square_p(rhs.get_den().get_mpz_t())) {
                    return true;
                }
            }
        }
    }
    return false;
}

TEST(JobTest, UnreachableProofAgreesWithExactHalving) {
    // N = 40: the job proves "no positive solution" by the component argument. Independently:
    // no P + T is twice a rational point (so with rank 1 the generator is P up to odd multiples
    // and torsion), and P and every torsion point have x >= 0, i.e. lie on the identity
    // component (the egg of y^2 = x(x^2 + a2 x + a4), a2, a4 > 0, lies at negative x).
    const Integer N(40);
    ProblemSpec problem{"ratio-sum", N, std::nullopt, {}};
    JobOptions options;
    const nlohmann::json record = run_problem(problem, options);
    ASSERT_TRUE(record.value("no_solution_proven", false)) << record.dump();
    ASSERT_EQ(record["generators"].size(), 1u);
    const Curve e = family::ratio_sum_curve(N);
    const Point p = point_of(record["generators"][0]);
    EXPECT_GE(p.x, 0);
    for (const Point& t : torsion_subgroup(e).points) {
        if (!t.at_infinity) {
            EXPECT_GE(t.x, 0);
        }
        EXPECT_FALSE(is_twice_a_rational_point(e, add(e, p, t))) << to_string(add(e, p, t));
    }
}

}  // namespace
}  // namespace arcsieve
