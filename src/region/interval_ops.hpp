// Interval arithmetic at an explicit precision for the region and first-hit layers: thin wrappers
// over MPFI that give every result the larger operand precision (Boost 1.74's expression
// templates would give temporaries the process default precision, losing digits silently).
#pragma once

#include <mpfi.h>

#include "analytic/real.hpp"

namespace arcsieve::region {

inline unsigned precision_bits(const Interval& x) {
    return static_cast<unsigned>(mpfi_get_prec(x.backend().data()));
}

// A zero interval carrying `bits` of precision.
inline Interval interval_with_bits(unsigned bits) {
    Interval r;  // Boost 1.74's mpfi_float has no (value, digits) constructor
    mpfi_set_prec(r.backend().data(), bits);
    mpfi_set_si(r.backend().data(), 0);
    return r;
}

inline Interval interval_of(const Rational& q, unsigned bits) {
    Interval r = interval_with_bits(bits);
    mpfi_set_q(r.backend().data(), q.get_mpq_t());
    return r;
}

inline Interval interval_of(const Integer& n, unsigned bits) {
    Interval r = interval_with_bits(bits);
    mpfi_set_z(r.backend().data(), n.get_mpz_t());
    return r;
}

inline unsigned common_bits(const Interval& a, const Interval& b) {
    return std::max(precision_bits(a), precision_bits(b));
}

inline Interval plus(const Interval& a, const Interval& b) {
    Interval r = interval_with_bits(common_bits(a, b));
    mpfi_add(r.backend().data(), a.backend().data(), b.backend().data());
    return r;
}
inline Interval minus(const Interval& a, const Interval& b) {
    Interval r = interval_with_bits(common_bits(a, b));
    mpfi_sub(r.backend().data(), a.backend().data(), b.backend().data());
    return r;
}
inline Interval times(const Interval& a, const Interval& b) {
    Interval r = interval_with_bits(common_bits(a, b));
    mpfi_mul(r.backend().data(), a.backend().data(), b.backend().data());
    return r;
}
inline Interval divided(const Interval& a, const Interval& b) {
    Interval r = interval_with_bits(common_bits(a, b));
    mpfi_div(r.backend().data(), a.backend().data(), b.backend().data());
    return r;
}
inline Interval scaled(const Interval& a, long factor) {
    Interval r = interval_with_bits(precision_bits(a));
    mpfi_mul_si(r.backend().data(), a.backend().data(), factor);
    return r;
}
inline Interval times_integer(const Interval& a, const Integer& factor) {
    Interval r = interval_with_bits(precision_bits(a));
    mpfi_mul_z(r.backend().data(), a.backend().data(), factor.get_mpz_t());
    return r;
}
inline Interval negated(const Interval& a) {
    Interval r = interval_with_bits(precision_bits(a));
    mpfi_neg(r.backend().data(), a.backend().data());
    return r;
}
// sqrt of an interval known to enclose a nonnegative quantity: the negative part (an artefact of
// rounding) is cut off first.
inline Interval sqrt_of_nonnegative(const Interval& a) {
    Interval r = interval_with_bits(precision_bits(a));
    mpfi_t cut;
    mpfi_init2(cut, precision_bits(a));
    mpfi_set(cut, a.backend().data());
    if (mpfr_sgn(&cut->left) < 0) mpfr_set_zero(&cut->left, 1);
    if (mpfr_sgn(&cut->right) < 0) mpfr_set_zero(&cut->right, 1);
    mpfi_sqrt(r.backend().data(), cut);
    mpfi_clear(cut);
    return r;
}
inline Interval hull_of(const Interval& a, const Interval& b) {
    Interval r = interval_with_bits(common_bits(a, b));
    mpfi_union(r.backend().data(), a.backend().data(), b.backend().data());
    return r;
}
// [lower(a), upper(b)].
inline Interval span(const Interval& a, const Interval& b) {
    Interval r = interval_with_bits(common_bits(a, b));
    mpfi_interv_fr(r.backend().data(), &a.backend().data()->left, &b.backend().data()->right);
    return r;
}
// Endpoints as intervals of width zero.
inline Interval lower_end(const Interval& a) {
    Interval r = interval_with_bits(precision_bits(a));
    mpfi_set_fr(r.backend().data(), &a.backend().data()->left);
    return r;
}
inline Interval upper_end(const Interval& a) {
    Interval r = interval_with_bits(precision_bits(a));
    mpfi_set_fr(r.backend().data(), &a.backend().data()->right);
    return r;
}
inline bool certainly_positive(const Interval& a) {
    return mpfi_is_strictly_pos(a.backend().data()) > 0;
}
inline bool certainly_negative(const Interval& a) {
    return mpfi_is_strictly_neg(a.backend().data()) > 0;
}
// a < b for every choice of the enclosed values.
inline bool certainly_less(const Interval& a, const Interval& b) {
    return mpfr_cmp(&a.backend().data()->right, &b.backend().data()->left) < 0;
}
inline bool is_finite(const Interval& a) {
    return mpfi_bounded_p(a.backend().data()) != 0;
}
inline double lower_double(const Interval& a) {
    return mpfr_get_d(&a.backend().data()->left, MPFR_RNDD);
}
inline double upper_double(const Interval& a) {
    return mpfr_get_d(&a.backend().data()->right, MPFR_RNDU);
}
inline double midpoint_double(const Interval& a) {
    return 0.5 * (lower_double(a) + upper_double(a));
}
// Width as a double rounded up.
inline double width_double(const Interval& a) {
    mpfr_t w;
    mpfr_init2(w, 64);
    mpfi_diam_abs(w, a.backend().data());
    const double result = mpfr_get_d(w, MPFR_RNDU);
    mpfr_clear(w);
    return result;
}
// Midpoint as a Real of the interval's precision.
inline Real midpoint_real(const Interval& a) {
    Real r(0, 10);
    mpfr_set_prec(r.backend().data(), precision_bits(a));
    mpfi_mid(r.backend().data(), a.backend().data());
    return r;
}

}  // namespace arcsieve::region
