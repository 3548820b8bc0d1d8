// Local and canonical heights through the Green function of the duplication map on x:
// λ_v(x) = lim 4^-k log‖F^k(x, 1)‖_v with F the homogeneous duplication of Silverman AEC
// III.2.3(d). For any integral a1 = a3 = 0 model these sum to ĥ (arcsieve normalisation).
#pragma once

#include <algorithm>
#include <utility>
#include <vector>

#include "curve/point.hpp"
#include "exact/enclosure.hpp"
#include "exact/padic.hpp"

namespace arcsieve::exact {

// F1 = X^4 − b4 X²Z² − 2 b6 X Z³ − b8 Z^4, F2 = 4 X³Z + b2 X²Z² + 2 b4 X Z³ + b6 Z^4, so that
// x(2P) = F1(x, 1) / F2(x, 1).
struct DuplicationForms {
    Integer b2, b4, b6, b8;
};

DuplicationForms duplication_forms(const JacobianCurve& curve);
// Homogeneous resultant of F1 and F2 (Sylvester determinant); nonzero exactly when the curve
// is nonsingular. Away from its primes λ_p(x) = log max(1, |x|_p).
Integer duplication_resultant(const DuplicationForms& forms);

// Primes at which the local height can differ from log max(1, |x|_p): the primes of the
// resultant, found from the factorisation of the discriminant (and 2, 3). Throws
// std::runtime_error if the resultant has a prime outside that set (which would be a bug).
std::vector<Integer> height_correction_primes(const JacobianCurve& curve,
                                              const std::vector<Integer>& discriminant_primes);

// Rigorous bounds m <= ‖F(v)‖_∞ <= M over ‖v‖_∞ = 1 (m by interval subdivision): they bound
// every term of the archimedean series and hence its tail.
struct DuplicationNormBounds {
    double log_lower = 0;
    double log_upper = 0;
};
DuplicationNormBounds duplication_norm_bounds(const DuplicationForms& forms);

// λ_∞ at a real x given as an enclosure, summing `terms` terms of the series
// λ_∞ = log max(|x|,1) + Σ_k 4^-(k+1) log‖F(v_k)‖ (v_k the normalised iterates) and enclosing
// the tail by the norm bounds. Stops early (with the tail enclosed) when the iterates lose
// all precision.
Enclosure archimedean_local_height(const DuplicationForms& forms,
                                   const DuplicationNormBounds& bounds, const Enclosure& x,
                                   long terms);

// c_p = λ_p(x) − log max(1, |x|_p) = −log p · Σ_k 4^-(k+1) e_k, where e_k is the valuation of
// F at the k-th normalised p-adic iterate; e_k <= v_p(resultant) encloses the tail.
struct PadicHeightCorrection {
    Rational partial_sum;  // Σ_{k < terms_used} 4^-(k+1) e_k
    long terms_used = 0;
    long max_drop = 0;  // v_p(resultant), bound for every e_k
    Enclosure value(const Integer& prime, long bits) const;
};
PadicHeightCorrection padic_height_correction(const PadicContext& ctx,
                                              const DuplicationForms& forms, const PadicNumber& x,
                                              long terms, long max_drop);

// c_p at x = x(Q) where Q is produced at a given p-adic precision by `point_at` (an exact
// point, or a p-adic chain): starts with a modest precision and raises it until all `terms`
// terms are determined (the e_k are usually tiny, so the worst-case bound terms·v_p(Res) is
// rarely needed). Returns the correction and the point used.
template <typename PointAt>
std::pair<PadicHeightCorrection, PadicPoint> padic_correction_with_retries(
    const Integer& prime, const DuplicationForms& forms, long terms, long max_drop,
    long base_precision, PointAt point_at) {
    long precision = base_precision + 2 * terms + 4 * max_drop + 64;
    const long ceiling = base_precision + terms * (max_drop + 1) + 64;
    while (true) {
        const PadicContext ctx(prime, precision);
        try {
            PadicPoint point = point_at(ctx);
            PadicHeightCorrection c = padic_height_correction(ctx, forms, point.x, terms, max_drop);
            if (c.terms_used >= terms || precision >= ceiling) return {c, point};
        } catch (const PadicPrecisionExhausted&) {
            if (precision >= ceiling) throw;
        }
        precision = std::min(ceiling, 4 * precision);
    }
}

// ĥ(P) = λ_∞(P) + 2 log W(P) + Σ_{p in correction primes} c_p(P), enclosed with about `bits`
// bits of absolute accuracy.
Enclosure canonical_height_enclosure(const JacobianCurve& curve, const Point& p,
                                     const std::vector<Integer>& correction_primes, long bits);

}  // namespace arcsieve::exact
