// Real structure of E(R) and the period lattice by the AGM (Cohen GTM 138 §7.4; Cremona and
// Thongjunthug, J. Number Theory 133 (2013)); the elliptic logarithm and its inverse (℘, ℘').
// Convention: E(R) ≅ R/Z × Z/2 (two components, Δ > 0) or R/Z (Δ < 0) as groups; a real point
// has a component (0 = identity component, 1 = the bounded "egg") and t ∈ [0,1).
#pragma once

#include <vector>

#include "analytic/real.hpp"
#include "curve/point.hpp"

namespace arcsieve {

struct RealStructure {
    int components = 1;        // 2 when Δ > 0, else 1
    std::vector<Real> roots;   // real roots in x of the model, decreasing (e1 ≥ e2 ≥ e3)
    Real real_period;          // least positive real period ω1 of the Néron differential
    Real imaginary_period_re;  // ω2 = re + i·im, second basis vector of the lattice
    Real imaginary_period_im;  //   (re = 0 when Δ > 0, re = ω1/2 when Δ < 0)
    unsigned digits = 0;       // correct decimal digits of every field
};

// Periods and roots of `curve` (any model over Q, either sign of Δ) to `digits` correct digits.
RealStructure real_structure(const Curve& curve, unsigned digits);

struct EllipticLog {
    int component = 0;  // 0 identity component, 1 egg
    Real t;             // in [0, 1); the point at infinity has component 0 and t = 0
};

struct EllipticLogEnclosure {
    int component = 0;
    Interval t;  // guaranteed to contain the true t (wrap-around at 0/1 returned unwrapped)
};

// t(P) to `digits` correct digits after the point (absolute accuracy; the layer chooses its
// working precision). Cohen Algorithm 7.4.8 rewritten without cancellation: next to a 2-torsion
// point x − e_i is recomputed from Y^2 = 4(x − e1)(x − e2)(x − e3), Y = 2y + a1 x + a3 exact.
EllipticLog elliptic_log(const Curve& curve, const Point& p, unsigned digits);
EllipticLog elliptic_log(const Curve& curve, const RealStructure& real, const Point& p);
// Certified enclosure of t(P): certified roots (sign changes of the cubic), interval AGM, and
// the bounds arcsin(a/c)/a ≤ I ≤ arcsin(a/c)/b on the remaining Landen integral.
EllipticLogEnclosure elliptic_log_enclosure(const Curve& curve, const Point& p, unsigned digits);

struct RealPoint {
    Real x, y;
    bool at_infinity = false;
};

// The inverse map: the real point with the given component and coordinate t (℘ and ℘' of
// z = t·ω1, shifted by the half period for the egg), to the precision of `real`: the Landen
// descent of elliptic_log run backwards (no q-series, so any lattice shape is equally fast).
// InputError for component 1 on a curve with one real component.
RealPoint point_from_log(const Curve& curve, const RealStructure& real, int component,
                         const Real& t);

}  // namespace arcsieve
