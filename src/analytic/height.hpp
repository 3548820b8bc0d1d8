// Canonical height and local heights. Normalisation (kept throughout arcsieve, the LMFDB's):
// ĥ(P) = lim h(x(2^k P)) / 4^k with h(p/q) = log max(|p|, |q|), twice Silverman's (AEC VIII.9).
// Local heights are λ_v = 2·λ_v^S + (1/6)·log|Δ|_v for the model given, λ^S being Silverman's
// model-independent local height (λ^S = ½ log|x| − (1/12) log|Δ| + o(1) near O, Advanced Topics
// VI.1.1), so that ĥ = λ_∞ + Σ_p λ_p, λ_∞ = log|x| + o(1) near O and λ_p(P) = max(0, log|x(P)|_p)
// at primes of good reduction of an integral model.
#pragma once

#include <vector>

#include "analytic/periods.hpp"

namespace arcsieve {

// All take `digits` = correct decimal digits wanted; the layer picks its working precision.
// `digits` is absolute accuracy (ĥ of a torsion point comes out below 10^-digits).
Real canonical_height(const Curve& curve, const Point& p, unsigned digits);
// Guaranteed to contain ĥ(P): interval AGM, certified roots, the q-series with a rigorous tail
// bound, exact non-archimedean coefficients. Width about 10^-(digits + 20). Throws
// std::runtime_error if the roots of the cubic cannot be separated at the working precision.
Interval canonical_height_enclosure(const Curve& curve, const Point& p, unsigned digits);

// λ_∞ of P on the given model (see normalisation above).
Real archimedean_local_height(const Curve& curve, const Point& p, unsigned digits);
// λ_∞ at the real point with component/coordinate t: needed for points too large to write.
// Computed at the precision of `real` from the q-series of σ (Silverman, Advanced Topics VI.3.4)
// in whichever lattice basis has the smaller |q|; its error is that of t times dλ/dt ≈ 2/t
// near O, so t must carry absolute accuracy 10^-(digits + log10(1/t)).
Real archimedean_local_height_at_log(const Curve& curve, const RealStructure& real, int component,
                                     const Real& t);
// λ_p of P on the given model, for any prime p (exact up to the log p factor).
Real nonarchimedean_local_height(const Curve& curve, const Point& p, const Integer& prime,
                                 unsigned digits);

// λ_p(P) = coefficient · log p exactly; the coefficient is rational (denominators divide 12·N).
// Depends only on P modulo the reduction at p once x(P) is p-integral (the c_p of DESIGN.md §2).
Rational nonarchimedean_local_height_coefficient(const Curve& curve, const Point& p,
                                                 const Integer& prime);

// <P, Q> = (ĥ(P+Q) − ĥ(P) − ĥ(Q)) / 2, so <P, P> = ĥ(P).
Real height_pairing(const Curve& curve, const Point& p, const Point& q, unsigned digits);
std::vector<std::vector<Real>> height_matrix(const Curve& curve, const std::vector<Point>& points,
                                             unsigned digits);
// det of the height matrix (the regulator when the points are a basis modulo torsion).
Real regulator(const Curve& curve, const std::vector<Point>& points, unsigned digits);

}  // namespace arcsieve
