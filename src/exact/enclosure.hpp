// Certified real enclosures for the exact layer: a thin value type over MPFI's mpfi_t whose
// every result carries an explicit precision (Boost 1.74's mpfi_float drops expression results
// to the process default precision, so this layer calls MPFI directly).
#pragma once

#include <mpfi.h>

#include <string>

#include "arith/rational.hpp"

namespace arcsieve::exact {

class Enclosure {
  public:
    explicit Enclosure(long bits);
    Enclosure(const Enclosure& other);
    Enclosure(Enclosure&& other) noexcept;
    Enclosure& operator=(const Enclosure& other);
    Enclosure& operator=(Enclosure&& other) noexcept;
    ~Enclosure();

    long bits() const { return static_cast<long>(mpfi_get_prec(value_)); }
    mpfi_ptr get() { return value_; }
    mpfi_srcptr get() const { return value_; }

    bool contains_zero() const { return mpfi_has_zero(value_) != 0; }
    bool is_finite() const { return mpfi_bounded_p(value_) != 0 && mpfi_nan_p(value_) == 0; }
    // Endpoints rounded outward to doubles (for diagnostics and rough decisions only).
    double lower_double() const;
    double upper_double() const;
    // Width divided by the magnitude (infinite when the enclosure contains 0).
    double relative_width() const;
    std::string to_string(int digits = 20) const;

  private:
    mpfi_t value_;
    bool moved_ = false;
};

Enclosure enclose(const Rational& value, long bits);
Enclosure enclose(const Integer& value, long bits);
Enclosure enclose(long value, long bits);

// Results take the larger precision of the operands.
Enclosure operator+(const Enclosure& a, const Enclosure& b);
Enclosure operator-(const Enclosure& a, const Enclosure& b);
Enclosure operator*(const Enclosure& a, const Enclosure& b);
Enclosure operator/(const Enclosure& a, const Enclosure& b);
Enclosure operator-(const Enclosure& a);
Enclosure operator*(long k, const Enclosure& a);
Enclosure square(const Enclosure& a);
Enclosure absolute(const Enclosure& a);
Enclosure natural_log(const Enclosure& a);
Enclosure log_of_two(long bits);
Enclosure log_of_ten(long bits);
// The interval hull of {max(s, t) : s ∈ a, t ∈ b}.
Enclosure maximum(const Enclosure& a, const Enclosure& b);
// The hull of a and b.
Enclosure hull(const Enclosure& a, const Enclosure& b);
// 4^-k · a for k >= 0, exactly.
Enclosure scale_by_power_of_two(const Enclosure& a, long exponent);

}  // namespace arcsieve::exact
