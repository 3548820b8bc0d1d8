// p-adic numbers with tracked precision and affine point arithmetic over Q_p on curves
// y^2 = x^3 + a2 x^2 + a4 x + a6: the local view of a huge multiple n·P + T at one bad prime,
// computed in O(log n) steps without ever writing n·P + T down.
#pragma once

#include <map>
#include <stdexcept>

#include "curve/point.hpp"

namespace arcsieve::exact {

// Raised when a p-adic computation runs out of precision (a cancellation ate every known digit);
// callers retry with more precision or report the quantity as undecided.
struct PadicPrecisionExhausted : std::runtime_error {
    using std::runtime_error::runtime_error;
};

// Powers of one prime, cached for a computation (a value passed around, not global state).
class PadicContext {
  public:
    PadicContext(const Integer& prime, long precision);
    const Integer& prime() const { return prime_; }
    long precision() const { return precision_; }
    // prime^k for 0 <= k; computed on demand.
    const Integer& power(long k) const;

  private:
    Integer prime_;
    long precision_;
    mutable std::map<long, Integer> powers_;
};

// prime^valuation · unit with the unit known modulo prime^relative_precision, or (zero) a value
// only known to be ≡ 0 modulo prime^valuation.
struct PadicNumber {
    Integer unit;
    long valuation = 0;
    long relative_precision = 0;
    bool zero = true;

    long absolute_precision() const { return zero ? valuation : valuation + relative_precision; }
};

// Exact rationals enter with `ctx.precision()` relative digits (0 becomes zero to that many).
PadicNumber padic_from_rational(const PadicContext& ctx, const Rational& value);
PadicNumber padic_add(const PadicContext& ctx, const PadicNumber& a, const PadicNumber& b);
PadicNumber padic_negate(const PadicNumber& a);
PadicNumber padic_subtract(const PadicContext& ctx, const PadicNumber& a, const PadicNumber& b);
PadicNumber padic_multiply(const PadicContext& ctx, const PadicNumber& a, const PadicNumber& b);
// Throws PadicPrecisionExhausted when the divisor is zero to its precision.
PadicNumber padic_divide(const PadicContext& ctx, const PadicNumber& a, const PadicNumber& b);
// Multiplies by prime^shift (exact, any sign of shift).
PadicNumber padic_shift(const PadicNumber& a, long shift);

struct PadicPoint {
    PadicNumber x, y;
    bool at_infinity = false;
};

struct PadicCurve {
    PadicNumber a2, a4, a6;
};

PadicCurve padic_curve(const PadicContext& ctx, const JacobianCurve& curve);
PadicPoint padic_point(const PadicContext& ctx, const Point& p);
// The chord-and-tangent law (Silverman AEC III.2.3) over Q_p. Throws PadicPrecisionExhausted
// when x1 = x2 (or y = 0 when doubling) cannot be excluded at the precision held: the callers
// only add points known to be distinct and not opposite.
PadicPoint padic_add(const PadicContext& ctx, const PadicCurve& curve, const PadicPoint& p,
                     const PadicPoint& q);
PadicPoint padic_double(const PadicContext& ctx, const PadicCurve& curve, const PadicPoint& p);
// n·P + T (n >= 1, P of infinite order, T torsion or the point at infinity) by a left-to-right
// binary chain.
PadicPoint padic_multiple(const PadicContext& ctx, const PadicCurve& curve, const PadicPoint& p,
                          const Integer& n, const PadicPoint& translate);

}  // namespace arcsieve::exact
