// Real and interval numbers at a precision chosen by the caller (Boost.Multiprecision over MPFR
// and MPFI). Precision is always a parameter: every value is constructed through these helpers
// with an explicit number of decimal digits, and arithmetic keeps the larger operand precision.
// The process-wide Boost default precision is never changed (it is shared by all threads).
#pragma once

#include <boost/multiprecision/mpfi.hpp>
#include <boost/multiprecision/mpfr.hpp>

#include "arith/rational.hpp"

namespace arcsieve {

using Real = boost::multiprecision::mpfr_float;
using Interval = boost::multiprecision::mpfi_float;

// Decimal digits <-> bits, with a few guard digits left to the caller.
inline unsigned bits_for_digits(unsigned digits) { return digits * 3322u / 1000u + 1u; }

inline Real make_real(long value, unsigned digits) { return Real(value, digits); }
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
inline Real with_digits(const Real& value, unsigned digits) { return Real(value, digits); }

inline Interval make_interval(const Rational& value, unsigned digits) {
    Interval r(0, digits);
    mpfi_set_q(r.backend().data(), value.get_mpq_t());
    return r;
}
inline Interval make_interval(const Integer& value, unsigned digits) {
    Interval r(0, digits);
    mpfi_set_z(r.backend().data(), value.get_mpz_t());
    return r;
}
inline Interval make_interval(long value, unsigned digits) { return Interval(value, digits); }

inline Real pi_real(unsigned digits) {
    Real r(0, digits);
    mpfr_const_pi(r.backend().data(), MPFR_RNDN);
    return r;
}

// Precision in decimal digits carried by a value.
inline unsigned digits_of(const Real& value) { return value.precision(); }

}  // namespace arcsieve
