// Internal to the analytic layer: the AGM sequence and the descending Landen transformation of
// Cohen GTM 138 §7.4 (Algorithm 7.4.8), written once for Real and for Interval numbers, in a form
// that never subtracts nearly equal numbers (the gap e = c − a is carried alongside c).
#pragma once

#include <cstddef>
#include <vector>

#include "analytic/periods.hpp"
#include "analytic/real.hpp"

namespace arcsieve::detail {

// a_0 = a, b_0 = b, a_{n+1} = (a_n + b_n)/2, b_{n+1} = sqrt(a_n b_n); stops once a_n and b_n
// agree to `bits` bits (for intervals: once both are narrower than that). 0 < b <= a.
template <class Number>
struct AgmSequence {
    std::vector<Number> a, b;
};

// True once a and b agree to `bits` bits (for intervals: the hull of both is that narrow).
inline bool agrees_to_bits(const Real& a, const Real& b, long bits) {
    Real gap = abs(a - b) / a;
    return gap == 0 || mpfr_get_exp(gap.backend().data()) < -bits;
}
inline bool agrees_to_bits(const Interval& a, const Interval& b, long bits) {
    // Also stop once the midpoints differ by less than the widths: the enclosures have reached
    // the noise of the working precision and further steps would only widen the descent.
    Interval spread = hull(a, b);
    Real width(upper(spread) - lower(spread), a.precision());
    Real scale(abs(lower(spread)), a.precision());
    if (width == 0) return true;
    if (scale == 0) return false;
    Real gap = width / scale;
    if (mpfr_get_exp(gap.backend().data()) < -bits) return true;
    Real own_widths(upper(a) - lower(a) + upper(b) - lower(b), a.precision());
    Real midpoint_gap(abs(median(a) - median(b)), a.precision());
    return midpoint_gap <= own_widths;
}

template <class Number>
AgmSequence<Number> agm_sequence(const Number& a0, const Number& b0, long bits) {
    AgmSequence<Number> sequence;
    Number a = a0, b = b0;
    for (int step = 0; step < 200; ++step) {
        sequence.a.push_back(a);
        sequence.b.push_back(b);
        if (agrees_to_bits(a, b, bits)) break;
        Number next_a = (a + b) / 2;
        b = sqrt(a * b);
        a = next_a;
    }
    return sequence;
}

// The Landen descent of Cohen Algorithm 7.4.8 on (a, b, c) with c = a + gap, c ≥ a:
// c_{n+1} = (c_n + r_n)/2 with r_n = sqrt(c_n^2 − a_n^2 + b_n^2), and, since
// c_n − a_n = (c_n^2 − a_n^2)/(c_n + a_n), gap_{n+1} = 2 gap_n c_{n+1} / (gap_n + r_n + b_n).
// The integral I(a,b,c) = ∫_c^∞ dw / sqrt((w^2 − a^2)(w^2 − a^2 + b^2)) is invariant and
// I(a, a, c) = arcsin(a/c)/a. Returns the final (a_N, b_N, gap_N).
template <class Number>
struct LandenEnd {
    Number a, b, gap;
};

template <class Number>
LandenEnd<Number> landen_descent(const AgmSequence<Number>& agm, const Number& c0,
                                 const Number& gap0) {
    Number c = c0, gap = gap0;
    const std::size_t steps = agm.a.size();
    for (std::size_t n = 0; n + 1 < steps; ++n) {
        const Number& a = agm.a[n];
        const Number& b = agm.b[n];
        Number r = sqrt(gap * (c + a) + b * b);
        Number next_c = (c + r) / 2;
        gap = 2 * gap * next_c / (gap + r + b);
        c = next_c;
    }
    return LandenEnd<Number>{agm.a.back(), agm.b.back(), gap};
}

// arcsin(a/(a + gap)) written without cancellation: pi/2 − atan(sqrt(gap (2a + gap)) / a).
template <class Number>
Number arcsine_of_ratio(const Number& a, const Number& gap, const Number& half_pi) {
    return half_pi - atan(sqrt(gap * (2 * a + gap)) / a);
}

}  // namespace arcsieve::detail

namespace arcsieve::detail {

// Certified counterpart of RealStructure (periods.hpp): every field is an interval guaranteed to
// contain the exact value; built from a RealStructure by certifying its roots (sign changes of
// the cubic) and rerunning the AGM in interval arithmetic, where AGM(a, b) lies in [b_N, a_N].
struct IntervalStructure {
    int components = 1;
    std::vector<Interval> roots;   // decreasing; one when Δ < 0
    Interval alpha, beta;          // Δ < 0 only: the complex pair (periods.cpp)
    Interval a0, b0;               // start of the descent (Cohen Algorithm 7.4.8)
    AgmSequence<Interval> agm;     // from (a0, b0)
    Interval real_period;          // ω1
    Interval imaginary_period_im;  // Im ω2
    unsigned digits = 0;           // working precision of the intervals
};

// Throws std::runtime_error when the roots cannot be certified at the precision of `real`.
IntervalStructure interval_structure(const Curve& curve, const RealStructure& real);

// Certified t(P) on the given structures (both built at the same precision).
EllipticLogEnclosure elliptic_log_enclosure_on(const Curve& curve, const RealStructure& real,
                                               const IntervalStructure& box, const Point& p);

// [max(lower, 0), upper]: for quantities known to be non-negative.
inline Interval clamp_non_negative(const Interval& x) {
    if (lower(x) >= 0) return x;
    Real zero(0, x.precision());
    Real top = upper(x) > 0 ? Real(upper(x)) : zero;
    Interval r;
    r.precision(x.precision());
    mpfi_interv_fr(r.backend().data(), zero.backend().data(), top.backend().data());
    return r;
}

}  // namespace arcsieve::detail
