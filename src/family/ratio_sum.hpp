// The ratio-sum family a/(b+c) + b/(c+a) + c/(a+b) = N: its curve
// E_N : y^2 = x^3 + (4N^2+12N-3) x^2 + 32(N+3) x (Bremner and Macleod, Annales Math. Inform. 43
// (2014)), and the birational maps between E_N and the projective cubic in (a : b : c).
#pragma once

#include <optional>
#include <string>
#include <variant>

#include "curve/point.hpp"

namespace arcsieve::family {

// Largest N accepted: the discriminant's factorisation (needed by Tate's algorithm) stays
// cheap; beyond it the user gets an InputError.
inline constexpr long long ratio_sum_max_N = 1'000'000'000'000LL;

// Validates N (an integer with 1 <= N <= ratio_sum_max_N) and throws InputError otherwise.
Integer ratio_sum_parameter(std::string_view text);
void check_ratio_sum_parameter(const Integer& N);

Curve ratio_sum_curve(const Integer& N);

struct Triple {
    Integer a, b, c;
    bool operator==(const Triple&) const = default;
};

// A point whose image is not a solution: a denominator b+c, c+a or a+b vanishes.
struct Degenerate {
    std::string reason;
};

// (x, y) ↦ (a : b : c) = (8(N+3) - x + y : 8(N+3) - x - y : -8(N+3) - 2(N+2)x), normalised
// to coprime integers with a + b + c > 0. The point at infinity and the torsion points map to
// triples with a vanishing denominator and are reported as Degenerate.
std::variant<Triple, Degenerate> point_to_triple(const Integer& N, const Point& p);

// (a : b : c) ↦ x = 4(N+3)(a+b+2c)/(c-(N+2)(a+b)), y = 4(N+3)(2N+5)(a-b)/((N+2)(a+b)-c).
// Throws InputError if (a, b, c) is not on the cubic or is (0,0,0); the pole c = (N+2)(a+b)
// of the map is the point at infinity.
std::variant<Point, Degenerate> triple_to_point(const Integer& N, const Triple& t);

// a(a+b)(a+c) + b(b+a)(b+c) + c(c+a)(c+b) - N (a+b)(b+c)(c+a): zero exactly on the cubic.
Integer ratio_sum_cubic(const Integer& N, const Triple& t);

// Exact check of the original equation: all denominators nonzero and the sum equals N.
bool satisfies_ratio_sum(const Integer& N, const Triple& t);

// Divides by the gcd and fixes the sign so that a + b + c > 0 (or the first nonzero entry
// is positive when the sum is 0).
Triple normalise(Triple t);

}  // namespace arcsieve::family
