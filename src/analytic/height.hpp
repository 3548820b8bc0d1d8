// Canonical height and local heights. Normalisation (kept throughout arcsieve, the LMFDB's):
// ĥ(P) = lim h(x(2^k P)) / 4^k with h(p/q) = log max(|p|, |q|), twice Silverman's (AEC VIII.9).
// Local heights are λ_v = 2·λ_v^Silverman − (1/6)·log|Δ|_v for the model given, so that
// ĥ = λ_∞ + Σ_p λ_p and λ_p(P) = max(0, log|x(P)|_p) at primes of good reduction.
#pragma once

#include <vector>

#include "analytic/periods.hpp"

namespace arcsieve {

// All take `digits` = correct decimal digits wanted; the layer picks its working precision.
Real canonical_height(const Curve& curve, const Point& p, unsigned digits);
Interval canonical_height_enclosure(const Curve& curve, const Point& p, unsigned digits);

// λ_∞ of P on the given model (see normalisation above).
Real archimedean_local_height(const Curve& curve, const Point& p, unsigned digits);
// λ_∞ at the real point with component/coordinate t: needed for points too large to write.
Real archimedean_local_height_at_log(const Curve& curve, const RealStructure& real, int component,
                                     const Real& t);
// λ_p of P on the given model, for any prime p (exact up to the log p factor).
Real nonarchimedean_local_height(const Curve& curve, const Point& p, const Integer& prime,
                                 unsigned digits);

// <P, Q> = (ĥ(P+Q) − ĥ(P) − ĥ(Q)) / 2, so <P, P> = ĥ(P).
Real height_pairing(const Curve& curve, const Point& p, const Point& q, unsigned digits);
std::vector<std::vector<Real>> height_matrix(const Curve& curve, const std::vector<Point>& points,
                                             unsigned digits);
// det of the height matrix (the regulator when the points are a basis modulo torsion).
Real regulator(const Curve& curve, const std::vector<Point>& points, unsigned digits);

}  // namespace arcsieve
