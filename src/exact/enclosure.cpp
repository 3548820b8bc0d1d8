#include "exact/enclosure.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

namespace arcsieve::exact {

Enclosure::Enclosure(long bits) {
    mpfi_init2(value_, static_cast<mpfr_prec_t>(std::max(bits, 2L)));
}

Enclosure::Enclosure(const Enclosure& other) {
    mpfi_init2(value_, mpfi_get_prec(other.value_));
    mpfi_set(value_, other.value_);
}

Enclosure::Enclosure(Enclosure&& other) noexcept {
    // MPFI values cannot be moved cheaply through the C API; swap storage instead.
    mpfi_init2(value_, 2);
    mpfi_swap(value_, other.value_);
}

Enclosure& Enclosure::operator=(const Enclosure& other) {
    if (this != &other) {
        mpfi_set_prec(value_, mpfi_get_prec(other.value_));
        mpfi_set(value_, other.value_);
    }
    return *this;
}

Enclosure& Enclosure::operator=(Enclosure&& other) noexcept {
    if (this != &other) mpfi_swap(value_, other.value_);
    return *this;
}

Enclosure::~Enclosure() {
    mpfi_clear(value_);
}

double Enclosure::lower_double() const {
    mpfr_t t;
    mpfr_init2(t, mpfi_get_prec(value_));
    mpfi_get_left(t, value_);
    const double d = mpfr_get_d(t, MPFR_RNDD);
    mpfr_clear(t);
    return d;
}

double Enclosure::upper_double() const {
    mpfr_t t;
    mpfr_init2(t, mpfi_get_prec(value_));
    mpfi_get_right(t, value_);
    const double d = mpfr_get_d(t, MPFR_RNDU);
    mpfr_clear(t);
    return d;
}

double Enclosure::relative_width() const {
    if (!is_finite() || contains_zero()) return std::numeric_limits<double>::infinity();
    mpfr_t w, m;
    mpfr_init2(w, 64);
    mpfr_init2(m, 64);
    mpfi_diam_abs(w, value_);
    mpfi_mig(m, value_);
    mpfr_div(w, w, m, MPFR_RNDU);
    const double d = mpfr_get_d(w, MPFR_RNDU);
    mpfr_clear(w);
    mpfr_clear(m);
    return d;
}

std::string Enclosure::to_string(int digits) const {
    mpfr_t l, r;
    mpfr_init2(l, mpfi_get_prec(value_));
    mpfr_init2(r, mpfi_get_prec(value_));
    mpfi_get_left(l, value_);
    mpfi_get_right(r, value_);
    auto text = [&](mpfr_t v) {
        char* s = nullptr;
        mpfr_asprintf(&s, "%.*Rg", digits, v);
        std::string out(s);
        mpfr_free_str(s);
        return out;
    };
    std::string out = "[" + text(l) + ", " + text(r) + "]";
    mpfr_clear(l);
    mpfr_clear(r);
    return out;
}

Enclosure enclose(const Rational& value, long bits) {
    Enclosure e(bits);
    mpfi_set_q(e.get(), value.get_mpq_t());
    return e;
}

Enclosure enclose(const Integer& value, long bits) {
    Enclosure e(bits);
    mpfi_set_z(e.get(), value.get_mpz_t());
    return e;
}

Enclosure enclose(long value, long bits) {
    Enclosure e(bits);
    mpfi_set_si(e.get(), value);
    return e;
}

namespace {
long wider(const Enclosure& a, const Enclosure& b) {
    return std::max(a.bits(), b.bits());
}
}  // namespace

Enclosure operator+(const Enclosure& a, const Enclosure& b) {
    Enclosure r(wider(a, b));
    mpfi_add(r.get(), a.get(), b.get());
    return r;
}

Enclosure operator-(const Enclosure& a, const Enclosure& b) {
    Enclosure r(wider(a, b));
    mpfi_sub(r.get(), a.get(), b.get());
    return r;
}

Enclosure operator*(const Enclosure& a, const Enclosure& b) {
    Enclosure r(wider(a, b));
    mpfi_mul(r.get(), a.get(), b.get());
    return r;
}

Enclosure operator/(const Enclosure& a, const Enclosure& b) {
    Enclosure r(wider(a, b));
    mpfi_div(r.get(), a.get(), b.get());
    return r;
}

Enclosure operator-(const Enclosure& a) {
    Enclosure r(a.bits());
    mpfi_neg(r.get(), a.get());
    return r;
}

Enclosure operator*(long k, const Enclosure& a) {
    Enclosure r(a.bits());
    mpfi_mul_si(r.get(), a.get(), k);
    return r;
}

Enclosure square(const Enclosure& a) {
    Enclosure r(a.bits());
    mpfi_sqr(r.get(), a.get());
    return r;
}

Enclosure absolute(const Enclosure& a) {
    Enclosure r(a.bits());
    mpfi_abs(r.get(), a.get());
    return r;
}

Enclosure natural_log(const Enclosure& a) {
    Enclosure r(a.bits());
    mpfi_log(r.get(), a.get());
    return r;
}

Enclosure log_of_two(long bits) {
    Enclosure r(bits);
    mpfi_const_log2(r.get());
    return r;
}

Enclosure log_of_ten(long bits) {
    return natural_log(enclose(10L, bits));
}

Enclosure maximum(const Enclosure& a, const Enclosure& b) {
    const long bits = wider(a, b);
    mpfr_t al, ar, bl, br;
    for (mpfr_ptr t : {al, ar, bl, br}) mpfr_init2(t, bits);
    mpfi_get_left(al, a.get());
    mpfi_get_right(ar, a.get());
    mpfi_get_left(bl, b.get());
    mpfi_get_right(br, b.get());
    mpfr_max(al, al, bl, MPFR_RNDD);
    mpfr_max(ar, ar, br, MPFR_RNDU);
    Enclosure r(bits);
    mpfi_interv_fr(r.get(), al, ar);
    for (mpfr_ptr t : {al, ar, bl, br}) mpfr_clear(t);
    return r;
}

Enclosure hull(const Enclosure& a, const Enclosure& b) {
    Enclosure r(wider(a, b));
    mpfi_union(r.get(), a.get(), b.get());
    return r;
}

Enclosure scale_by_power_of_two(const Enclosure& a, long exponent) {
    Enclosure r(a.bits());
    if (exponent >= 0) {
        mpfi_mul_2ui(r.get(), a.get(), static_cast<unsigned long>(exponent));
    } else {
        mpfi_div_2ui(r.get(), a.get(), static_cast<unsigned long>(-exponent));
    }
    return r;
}

}  // namespace arcsieve::exact
