// Exact division of a rational point by a prime ℓ: the x-coordinates of the R with ℓR = Q are
// the roots of x(Q)·ψ_ℓ² − φ_ℓ (division polynomials, Silverman AEC Ex. 3.7), found as rational
// roots by Hensel lifting modulo a prime and rational reconstruction (common practice).
#pragma once

#include <optional>
#include <vector>

#include "curve/point.hpp"

namespace arcsieve::basis {

// Integer polynomial, coefficient of x^i at index i.
using IntegerPolynomial = std::vector<Integer>;

// ψ_n² and φ_n as polynomials in x on an integral curve (x(nP) = φ_n/ψ_n²); n >= 1.
struct MultiplicationByN {
    IntegerPolynomial psi_squared, phi;
};
MultiplicationByN multiplication_polynomials(const Curve& integral_curve, int n);

// Every rational root of a nonzero integer polynomial (exact; roots listed once).
std::vector<Rational> rational_roots(const IntegerPolynomial& polynomial);

// A point R with ℓ·R = Q, if one exists (Q affine, curve integral). ℓ >= 2 prime or not.
std::optional<Point> divide_point(const Curve& integral_curve, const Point& q, int ell);

}  // namespace arcsieve::basis
