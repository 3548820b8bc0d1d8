#include "exact/padic.hpp"

#include <algorithm>

namespace arcsieve::exact {

PadicContext::PadicContext(const Integer& prime, long precision)
    : prime_(prime), precision_(precision) {
    if (prime < 2) throw std::invalid_argument("p-adic context needs a prime >= 2");
    if (precision < 1) throw std::invalid_argument("p-adic precision must be positive");
}

const Integer& PadicContext::power(long k) const {
    if (k < 0) throw std::invalid_argument("negative power in PadicContext::power");
    // Only a few distinct exponents occur in one computation (the precisions in play).
    auto found = powers_.find(k);
    if (found != powers_.end()) return found->second;
    Integer value;
    mpz_pow_ui(value.get_mpz_t(), prime_.get_mpz_t(), static_cast<unsigned long>(k));
    return powers_.emplace(k, std::move(value)).first->second;
}

namespace {

PadicNumber make_zero(long absolute_precision) {
    PadicNumber z;
    z.zero = true;
    z.valuation = absolute_precision;
    z.relative_precision = 0;
    z.unit = 0;
    return z;
}

// Splits s (nonzero modulo prime^digits) into prime^v · unit and returns the normalised number
// whose absolute precision is base_valuation + digits.
PadicNumber normalise(const PadicContext& ctx, Integer s, long base_valuation, long digits) {
    const Integer& modulus = ctx.power(digits);
    mpz_mod(s.get_mpz_t(), s.get_mpz_t(), modulus.get_mpz_t());
    if (s == 0) return make_zero(base_valuation + digits);
    Integer unit;
    const long v =
        static_cast<long>(mpz_remove(unit.get_mpz_t(), s.get_mpz_t(), ctx.prime().get_mpz_t()));
    PadicNumber r;
    r.zero = false;
    r.valuation = base_valuation + v;
    r.relative_precision = digits - v;
    r.unit = std::move(unit);
    return r;
}

}  // namespace

PadicNumber padic_from_rational(const PadicContext& ctx, const Rational& value) {
    if (value == 0) return make_zero(ctx.precision());
    Integer num(value.get_num()), den(value.get_den());
    Integer num_unit, den_unit;
    const long vn = static_cast<long>(
        mpz_remove(num_unit.get_mpz_t(), num.get_mpz_t(), ctx.prime().get_mpz_t()));
    const long vd = static_cast<long>(
        mpz_remove(den_unit.get_mpz_t(), den.get_mpz_t(), ctx.prime().get_mpz_t()));
    const Integer& modulus = ctx.power(ctx.precision());
    Integer inverse;
    mpz_invert(inverse.get_mpz_t(), den_unit.get_mpz_t(), modulus.get_mpz_t());
    Integer unit = num_unit * inverse;
    mpz_mod(unit.get_mpz_t(), unit.get_mpz_t(), modulus.get_mpz_t());
    PadicNumber r;
    r.zero = false;
    r.valuation = vn - vd;
    r.relative_precision = ctx.precision();
    r.unit = std::move(unit);
    return r;
}

PadicNumber padic_add(const PadicContext& ctx, const PadicNumber& a, const PadicNumber& b) {
    const long absolute = std::min(a.absolute_precision(), b.absolute_precision());
    if (a.zero && b.zero) return make_zero(absolute);
    if (a.zero || b.zero) {
        const PadicNumber& value = a.zero ? b : a;
        if (value.valuation >= absolute) return make_zero(absolute);
        return normalise(ctx, value.unit, value.valuation, absolute - value.valuation);
    }
    const long low = std::min(a.valuation, b.valuation);
    if (low >= absolute) return make_zero(absolute);
    Integer s = a.unit * ctx.power(a.valuation - low) + b.unit * ctx.power(b.valuation - low);
    return normalise(ctx, std::move(s), low, absolute - low);
}

PadicNumber padic_negate(const PadicNumber& a) {
    PadicNumber r = a;
    if (!r.zero) r.unit = -r.unit;  // left unreduced; the next normalise reduces it
    return r;
}

PadicNumber padic_subtract(const PadicContext& ctx, const PadicNumber& a, const PadicNumber& b) {
    return padic_add(ctx, a, padic_negate(b));
}

PadicNumber padic_multiply(const PadicContext& ctx, const PadicNumber& a, const PadicNumber& b) {
    if (a.zero || b.zero) {
        // A zero known to p^k times a number of valuation v is a zero known to p^(k+v).
        const long bound =
            (a.zero ? a.valuation : a.valuation) + (b.zero ? b.valuation : b.valuation);
        return make_zero(bound);
    }
    const long digits = std::min(a.relative_precision, b.relative_precision);
    return normalise(ctx, a.unit * b.unit, a.valuation + b.valuation, digits);
}

PadicNumber padic_divide(const PadicContext& ctx, const PadicNumber& a, const PadicNumber& b) {
    if (b.zero)
        throw PadicPrecisionExhausted("p-adic division by a number that is zero to precision");
    if (a.zero) return make_zero(a.valuation - b.valuation);
    const long digits = std::min(a.relative_precision, b.relative_precision);
    const Integer& modulus = ctx.power(digits);
    Integer inverse;
    Integer reduced = b.unit;
    mpz_mod(reduced.get_mpz_t(), reduced.get_mpz_t(), modulus.get_mpz_t());
    if (mpz_invert(inverse.get_mpz_t(), reduced.get_mpz_t(), modulus.get_mpz_t()) == 0) {
        throw std::logic_error("p-adic unit is not invertible");
    }
    return normalise(ctx, a.unit * inverse, a.valuation - b.valuation, digits);
}

PadicNumber padic_shift(const PadicNumber& a, long shift) {
    PadicNumber r = a;
    r.valuation += shift;
    return r;
}

PadicCurve padic_curve(const PadicContext& ctx, const JacobianCurve& curve) {
    // Curve coefficients are exact: give them far more digits than any computation keeps.
    const PadicContext wide(ctx.prime(), 4 * ctx.precision() + 64);
    auto lift = [&](const Integer& value) { return padic_from_rational(wide, Rational(value)); };
    return PadicCurve{lift(curve.a2), lift(curve.a4), lift(curve.a6)};
}

PadicPoint padic_point(const PadicContext& ctx, const Point& p) {
    if (p.at_infinity) return PadicPoint{{}, {}, true};
    return PadicPoint{padic_from_rational(ctx, p.x), padic_from_rational(ctx, p.y), false};
}

namespace {

PadicNumber small(const PadicContext& ctx, long value) {
    const PadicContext wide(ctx.prime(), 4 * ctx.precision() + 64);
    return padic_from_rational(wide, Rational(value));
}

// x3 = λ² − a2 − x1 − x2, y3 = λ(x1 − x3) − y1 (Silverman AEC III.2.3 with a1 = a3 = 0).
PadicPoint chord_result(const PadicContext& ctx, const PadicCurve& e, const PadicNumber& lambda,
                        const PadicPoint& p, const PadicNumber& x2) {
    PadicNumber x3 = padic_multiply(ctx, lambda, lambda);
    x3 = padic_subtract(ctx, x3, e.a2);
    x3 = padic_subtract(ctx, x3, p.x);
    x3 = padic_subtract(ctx, x3, x2);
    PadicNumber y3 = padic_multiply(ctx, lambda, padic_subtract(ctx, p.x, x3));
    y3 = padic_subtract(ctx, y3, p.y);
    return PadicPoint{x3, y3, false};
}

}  // namespace

PadicPoint padic_add(const PadicContext& ctx, const PadicCurve& e, const PadicPoint& p,
                     const PadicPoint& q) {
    if (p.at_infinity) return q;
    if (q.at_infinity) return p;
    const PadicNumber dx = padic_subtract(ctx, q.x, p.x);
    if (dx.zero) {
        throw PadicPrecisionExhausted("p-adic chord: x-coordinates agree to the precision held");
    }
    const PadicNumber lambda = padic_divide(ctx, padic_subtract(ctx, q.y, p.y), dx);
    return chord_result(ctx, e, lambda, p, q.x);
}

PadicPoint padic_double(const PadicContext& ctx, const PadicCurve& e, const PadicPoint& p) {
    if (p.at_infinity) return p;
    const PadicNumber two_y = padic_multiply(ctx, small(ctx, 2), p.y);
    if (two_y.zero) {
        throw PadicPrecisionExhausted("p-adic tangent: 2y is zero to the precision held");
    }
    // λ = (3x² + 2 a2 x + a4) / 2y
    PadicNumber slope = padic_multiply(ctx, small(ctx, 3), padic_multiply(ctx, p.x, p.x));
    slope =
        padic_add(ctx, slope, padic_multiply(ctx, padic_multiply(ctx, small(ctx, 2), e.a2), p.x));
    slope = padic_add(ctx, slope, e.a4);
    const PadicNumber lambda = padic_divide(ctx, slope, two_y);
    return chord_result(ctx, e, lambda, p, p.x);
}

PadicPoint padic_multiple(const PadicContext& ctx, const PadicCurve& e, const PadicPoint& p,
                          const Integer& n, const PadicPoint& translate) {
    if (n < 1) throw std::invalid_argument("padic_multiple needs n >= 1");
    PadicPoint result = p;
    const long top = static_cast<long>(mpz_sizeinbase(n.get_mpz_t(), 2)) - 1;
    for (long bit = top - 1; bit >= 0; --bit) {
        result = padic_double(ctx, e, result);
        if (mpz_tstbit(n.get_mpz_t(), static_cast<mp_bitcnt_t>(bit))) {
            result = padic_add(ctx, e, result, p);
        }
    }
    return padic_add(ctx, e, result, translate);
}

}  // namespace arcsieve::exact
