// Certified elliptic logarithms of real points given by an x-enclosure and a branch (the sign of
// y' = y + (a1 x + a3)/2), by Carlson's symmetric integral R_F; exact real-root isolation of
// rational polynomials (Sturm sequences). Needed for region boundaries, which are irrational.
#pragma once

#include <vector>

#include "analytic/real.hpp"
#include "curve/point.hpp"

namespace arcsieve::region {

// Coefficients from the constant term up; exact.
using Polynomial = std::vector<Rational>;

Rational evaluate(const Polynomial& p, const Rational& x);
Polynomial derivative(const Polynomial& p);
// Exact polynomial remainder and gcd over Q (gcd made monic).
Polynomial remainder(const Polynomial& a, const Polynomial& b);
Polynomial polynomial_gcd(Polynomial a, Polynomial b);
Polynomial quotient(const Polynomial& a, const Polynomial& b);
int degree(const Polynomial& p);

// A real root isolated by rationals: lower <= root <= upper, exactly one root of the (squarefree)
// polynomial inside, and lower == upper when the root was found exactly.
struct RootBracket {
    Rational lower, upper;
};

// Every real root of p (squarefree part taken first; multiple roots appear once), increasing,
// each bracket narrower than `width` (> 0). Sturm's theorem counts the roots; bisection isolates.
std::vector<RootBracket> real_roots(const Polynomial& p, const Rational& width);
// Narrows a bracket of a root of p (p changes sign across it, or lower == upper) below `width`.
void refine(const Polynomial& p, RootBracket& bracket, const Rational& width);

// The curve's real structure in the form the certified logarithms need:
// y'^2 = f(x) = x^3 + (b2/4) x^2 + (b4/2) x + b6/4 with y' = y + (a1 x + a3)/2.
struct ArcModel {
    Curve curve;
    Polynomial cubic;                   // f
    int components = 1;                 // 2 when Δ > 0
    std::vector<RootBracket> roots;     // real roots of f, decreasing (e1 > e2 > e3 when Δ > 0)
    unsigned bits = 0;                  // working precision of the intervals below
    std::vector<Interval> root_values;  // the same roots as intervals
    Interval complex_root_re, complex_root_im;  // Δ < 0: the pair e2, e3 = re ± i·im
    // R_F(0, e1−e2, e1−e3) = ∫_{e1}^∞ dx / (2 sqrt f) = ω1 / 2, where ω1 is the least positive
    // real period of dx / (2y + a1 x + a3) (Carlson, Numer. Algorithms 10 (1995), eq. 2.1).
    Interval half_period;
};

// `digits`: correct decimal digits wanted in the logarithms computed from this model.
ArcModel arc_model(const Curve& curve, unsigned digits);

// Elliptic logarithm in arcsieve's convention (analytic/periods.hpp): component 0 or 1 and
// t ∈ [0, 1); t runs from 0 at infinity through 1/2 at (e1, 0) with y' < 0 on (0, 1/2); on the
// egg t = 0 at (e3, 0) and t = 1/2 at (e2, 0). The enclosure may stick out of [0, 1) a little
// near t = 0 (it is never wrapped).
struct LogEnclosure {
    int component = 0;
    Interval t;
};

// Carlson's R_F(x, y, z) for nonnegative real arguments, as an enclosure: duplication
// R_F(x,y,z) = R_F((x+λ)/4, (y+λ)/4, (z+λ)/4), λ = √x√y + √y√z + √z√x, then the bound
// 1/√max <= R_F <= 1/√min (R_F decreases in each argument and R_F(a,a,a) = 1/√a).
Interval carlson_rf(const Interval& x, const Interval& y, const Interval& z);
// R_F(x, w, conj(w)) with w = re + i·im, re > 0 eventually: the same duplication; the final bound
// uses |s + w| between s + re and s + |w| in R_F's integral ½∫ ds / √((s+x)(s+w)(s+w̄)).
Interval carlson_rf_conjugate(const Interval& x, const Interval& re, const Interval& im);

// The point with x in [x_lower, x_upper] on `component` and the branch sign(y') = branch
// (+1, −1, or 0 when y' may vanish there). t is monotone along a branch, so the enclosure is the
// hull of the two ends. Throws std::invalid_argument if the bracket is not on that component.
LogEnclosure log_enclosure(const ArcModel& model, const Rational& x_lower, const Rational& x_upper,
                           int component, int branch);
// A rational point; the component is decided exactly.
LogEnclosure log_enclosure(const ArcModel& model, const Point& p);
// Which real component the rational point lies on (0 or 1), decided exactly.
int component_of(const ArcModel& model, const Point& p);

}  // namespace arcsieve::region
