// The general family interface the region and first-hit layers work from: a curve, the problem's
// variables as linear forms in the projective coordinates (X : Y : Z) of the curve, and the sign
// and ordering conditions that define "a solution"; plus the ratio-sum family in this form.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "curve/point.hpp"

namespace arcsieve::family {

// coefficient_x·X + coefficient_y·Y + coefficient_z·Z; on an affine point (x, y) it is
// coefficient_x·x + coefficient_y·y + coefficient_z, at the point at infinity (0 : 1 : 0) it is
// coefficient_y. Its zeros on the curve are the intersections with a line.
struct LinearForm {
    Rational coefficient_x, coefficient_y, coefficient_z;
    bool operator==(const LinearForm&) const = default;
};

LinearForm operator+(const LinearForm& f, const LinearForm& g);
LinearForm operator-(const LinearForm& f, const LinearForm& g);
LinearForm operator*(const Rational& scale, const LinearForm& f);
bool is_zero(const LinearForm& f);
// Exact value at an affine point, or at infinity (coefficient_y).
Rational evaluate(const LinearForm& f, const Point& p);

// One condition of the target: `form` > 0 (strict) or `form` >= 0.
struct SignCondition {
    LinearForm form;
    bool strict = true;
    std::string label;  // e.g. "a > 0", "a >= b": used in explanations
};

// A problem family instance in the shape the region layer needs. A point P is a solution when
// every condition holds for (v_1, …, v_k)(P), or — for projective families, where (v_i) and
// (−v_i) are the same solution — when every condition holds for (−v_i)(P). Families whose map
// from the curve is not linear in (X : Y : Z) do not fit this interface.
struct Target {
    std::string family;                       // e.g. "ratio-sum"
    Integer parameter;                        // e.g. N
    Curve curve;                              // the model the forms are written on
    std::vector<std::string> variable_names;  // e.g. {"a", "b", "c"}
    std::vector<LinearForm> variables;        // one form per variable
    std::vector<SignCondition> conditions;    // positivity and optional orderings
    bool projective = true;                   // the variables are defined up to a common factor
};

// Does P satisfy the target's conditions, decided exactly? The point at infinity is evaluated
// through (0 : 1 : 0).
bool satisfies_exactly(const Target& target, const Point& p);

// Parses an ordering such as "a>=b>=c" or "c >= a" over the target's variable names and adds the
// conditions v_i - v_j >= 0. Throws InputError on an unknown name or a malformed chain.
void add_ordering(Target& target, std::string_view ordering);

// The ratio-sum family a/(b+c) + b/(c+a) + c/(a+b) = N on E_N (family/ratio_sum.hpp):
// a = 8(N+3)Z − X + Y, b = 8(N+3)Z − X − Y, c = −8(N+3)Z − 2(N+2)X, conditions a, b, c > 0
// (up to a common sign; a+b, b+c, c+a are then positive too). `ordering` may be empty.
Target ratio_sum_target(const Integer& N, std::string_view ordering = {});

}  // namespace arcsieve::family
