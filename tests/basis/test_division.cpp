#include <gtest/gtest.h>

#include "basis/division.hpp"

namespace arcsieve::basis {
namespace {

TEST(RationalRoots, FindsExactlyTheRationalRootsOfAProduct) {
    // (2x − 3)(x + 5)(x^2 + 1) x = 2x^5 + 7x^4 − 13x^3 + 7x^2 − 15x (expanded by hand).
    const IntegerPolynomial h{0, -15, 7, -13, 7, 2};
    auto roots = rational_roots(h);
    std::sort(roots.begin(), roots.end());
    ASSERT_EQ(roots.size(), 3u);
    EXPECT_EQ(roots[0], Rational(-5));
    EXPECT_EQ(roots[1], Rational(0));
    EXPECT_EQ(roots[2], Rational(3, 2));
}

TEST(MultiplicationPolynomials, AgreeWithGroupLaw) {
    // Identity check: x(nP) = φ_n(x)/ψ_n(x)^2 against repeated addition, on E_4 and LMFDB 117a1.
    for (const auto& [curve_text, point_text] :
         {std::pair{"[0,109,0,224,0]", "-100,260"}, std::pair{"[1,-1,1,4,6]", "0,2"}}) {
        const Curve e = parse_curve(curve_text);
        const Point p = parse_point(e, point_text);
        for (int n = 1; n <= 7; ++n) {
            const auto m = multiplication_polynomials(e, n);
            auto at = [&](const IntegerPolynomial& poly) {
                Rational v = 0;
                for (std::size_t i = poly.size(); i-- > 0;) v = v * p.x + Rational(poly[i]);
                return v;
            };
            const Point np = multiply(e, p, static_cast<std::int64_t>(n));
            ASSERT_FALSE(np.at_infinity);
            EXPECT_EQ(at(m.phi) / at(m.psi_squared), np.x) << curve_text << " n=" << n;
        }
    }
}

TEST(DividePoint, RecoversAPointFromItsMultiples) {
    // E_4: (−100, 260) (MathOverflow question 227713).
    const Curve e = parse_curve("[0,109,0,224,0]");
    const Point p = parse_point(e, "-100,260");
    for (int ell : {2, 3, 5}) {
        const Point q = multiply(e, p, static_cast<std::int64_t>(ell));
        const auto r = divide_point(e, q, ell);
        ASSERT_TRUE(r.has_value()) << "ell=" << ell;
        EXPECT_EQ(multiply(e, *r, static_cast<std::int64_t>(ell)), q);
    }
}

TEST(DividePoint, GeneratorIsNotDivisible) {
    // LMFDB 117a1: (0, 2) generates E(Q) modulo torsion, so it is not ℓ·R for ℓ = 2, 3, 5, 7
    // modulo torsion; in particular not ℓ·R itself.
    const Curve e = parse_curve("[1,-1,1,4,6]");
    const Point p = parse_point(e, "0,2");
    for (int ell : {2, 3, 5, 7}) EXPECT_FALSE(divide_point(e, p, ell).has_value()) << ell;
}

}  // namespace
}  // namespace arcsieve::basis
