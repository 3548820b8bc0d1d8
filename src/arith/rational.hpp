// Exact integers and rationals (GMP's C++ classes) and the small helpers every layer uses:
// parsing from text, printing, p-adic valuations and the project's input-error type.
#pragma once

#include <gmpxx.h>

#include <optional>
#include <stdexcept>
#include <string>
#include <string_view>

namespace arcsieve {

using Integer = mpz_class;
using Rational = mpq_class;

// Raised for malformed or out-of-range user input; the CLI prints its message on one line and
// exits with code 2.
struct InputError : std::runtime_error {
    using std::runtime_error::runtime_error;
};

// Parses "123", "-7", "22/7" (optionally with surrounding spaces). Returns nullopt on anything
// else, including a zero denominator.
std::optional<Integer> parse_integer(std::string_view text);
std::optional<Rational> parse_rational(std::string_view text);

std::string to_string(const Integer& n);
std::string to_string(const Rational& q);

// v_p(n) for n != 0 and p >= 2; throws std::domain_error for n == 0.
int valuation(const Integer& n, const Integer& p);
// v_p(q) = v_p(numerator) - v_p(denominator) for q != 0.
int valuation(const Rational& q, const Integer& p);

// Number of decimal digits of |n| (1 for n == 0), exact.
std::size_t decimal_digits(const Integer& n);

}  // namespace arcsieve
