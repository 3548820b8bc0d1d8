// Real and interval numbers at a precision chosen by the caller (Boost.Multiprecision over MPFR
// and MPFI). Precision is always a parameter: every value is constructed through these helpers
// with an explicit number of decimal digits, and arithmetic keeps the larger operand precision.
// Boost's default precision (thread-local since 1.79) is never changed by this project.
#pragma once

#include <boost/multiprecision/mpfi.hpp>
#include <boost/multiprecision/mpfr.hpp>

#include "arith/rational.hpp"

// Thread safety: Boost.Multiprecision sets the default precision temporarily inside every
// arithmetic operation (scoped_default_precision) to give temporaries the operands' precision.
// Boost 1.74 kept that default in one process-wide static, so threads at different precisions
// corrupted each other (measured: 24 of 100 heights at 300 digits wrong beside a 20-digit
// thread). We build against Boost >= 1.81, where the default is thread_local; the test
// tests/analytic/test_thread_safety.cpp checks concurrent heights at different precisions.

namespace arcsieve {

using Real = boost::multiprecision::mpfr_float;
using Interval = boost::multiprecision::mpfi_float;

// Decimal digits <-> bits, with a few guard digits left to the caller.
inline unsigned bits_for_digits(unsigned digits) {
    return digits * 3322u / 1000u + 1u;
}

inline Real make_real(long value, unsigned digits) {
    return Real(value, digits);
}
inline Real make_real(const Integer& value, unsigned digits) {
    Real r(0, digits);
    mpfr_set_z(r.backend().data(), value.get_mpz_t(), MPFR_RNDN);
    return r;
}
inline Real make_real(const Rational& value, unsigned digits) {
    Real r(0, digits);
    mpfr_set_q(r.backend().data(), value.get_mpq_t(), MPFR_RNDN);
    return r;
}
// A real at `digits` holding `value` rounded to that precision.
inline Real with_digits(const Real& value, unsigned digits) {
    return Real(value, digits);
}

// An interval with room for `digits` decimal digits, holding 0 (Boost 1.74's mpfi_float has no
// (value, digits) constructor, so the precision is set before the value).
inline Interval interval_zero(unsigned digits) {
    Interval r;
    r.precision(digits);
    mpfi_set_si(r.backend().data(), 0);
    return r;
}
inline Interval make_interval(const Rational& value, unsigned digits) {
    Interval r = interval_zero(digits);
    mpfi_set_q(r.backend().data(), value.get_mpq_t());
    return r;
}
inline Interval make_interval(const Integer& value, unsigned digits) {
    Interval r = interval_zero(digits);
    mpfi_set_z(r.backend().data(), value.get_mpz_t());
    return r;
}
inline Interval make_interval(long value, unsigned digits) {
    Interval r = interval_zero(digits);
    mpfi_set_si(r.backend().data(), value);
    return r;
}
// The smallest interval at `digits` containing [lower, upper] (outward rounding).
inline Interval make_interval(const Real& lower, const Real& upper, unsigned digits) {
    Interval r = interval_zero(digits);
    mpfi_interv_fr(r.backend().data(), lower.backend().data(), upper.backend().data());
    return r;
}
// A real's value as a point interval (widened outward if it does not fit in `digits`).
inline Interval make_interval(const Real& value, unsigned digits) {
    Interval r = interval_zero(digits);
    mpfi_set_fr(r.backend().data(), value.backend().data());
    return r;
}
inline Interval pi_interval(unsigned digits) {
    Interval r = interval_zero(digits);
    mpfi_const_pi(r.backend().data());
    return r;
}

inline Real pi_real(unsigned digits) {
    Real r(0, digits);
    mpfr_const_pi(r.backend().data(), MPFR_RNDN);
    return r;
}

// Precision in decimal digits carried by a value.
inline unsigned digits_of(const Real& value) {
    return value.precision();
}

}  // namespace arcsieve
