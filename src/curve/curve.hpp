// Weierstrass curves over Q in long form y^2 + a1 xy + a3 y = x^3 + a2 x^2 + a4 x + a6:
// invariants (Silverman AEC III.1), parsing "[a1,a2,a3,a4,a6]", and changes of variables
// x = u^2 x' + r, y = u^3 y' + s u^2 x' + t kept as values so points move between models.
#pragma once

#include <array>
#include <string>
#include <string_view>

#include "arith/rational.hpp"

namespace arcsieve {

struct Curve {
    Rational a1, a2, a3, a4, a6;
    bool operator==(const Curve&) const = default;
};

struct BInvariants {
    Rational b2, b4, b6, b8;
};

BInvariants b_invariants(const Curve& curve);
Rational c4(const Curve& curve);
Rational c6(const Curve& curve);
Rational discriminant(const Curve& curve);
bool is_singular(const Curve& curve);
// j = c4^3 / Δ; throws std::domain_error on a singular curve.
Rational j_invariant(const Curve& curve);
bool is_integral(const Curve& curve);

// Builds a curve and rejects singular ones with InputError.
Curve make_curve(const std::array<Rational, 5>& a);
// Parses "[a1,a2,a3,a4,a6]" or the short form "[a4,a6]"; entries integers or fractions.
// Throws InputError with a one-line message on malformed or singular input.
Curve parse_curve(std::string_view text);
std::string to_string(const Curve& curve);

// x = u^2 x' + r, y = u^3 y' + s u^2 x' + t (u != 0): the standard change of variables.
struct ModelChange {
    Rational u{1}, r{0}, s{0}, t{0};
    bool operator==(const ModelChange&) const = default;
};

// The curve E' obtained from E by the change of variables (Silverman AEC Table 3.1).
Curve apply(const Curve& curve, const ModelChange& change);
// `first` maps E -> E', `then` maps E' -> E''; the result maps E -> E''.
ModelChange compose(const ModelChange& first, const ModelChange& then);
ModelChange inverse(const ModelChange& change);

}  // namespace arcsieve
