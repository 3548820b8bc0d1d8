// Rational points: affine points with exact rational coordinates and the group law
// (Silverman AEC III.2.3), and Jacobian integer coordinates (x = X/Z^2, y = Y/Z^3) for fast
// scalar multiples on integral models with a1 = a3 = 0.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>

#include "curve/curve.hpp"

namespace arcsieve {

struct Point {
    Rational x, y;
    bool at_infinity = false;

    static Point infinity() { return Point{Rational(0), Rational(0), true}; }
    bool operator==(const Point& other) const {
        if (at_infinity || other.at_infinity) return at_infinity == other.at_infinity;
        return x == other.x && y == other.y;
    }
};

bool on_curve(const Curve& curve, const Point& p);
Point negate(const Curve& curve, const Point& p);
Point add(const Curve& curve, const Point& p, const Point& q);
Point doubled(const Curve& curve, const Point& p);
Point subtract(const Curve& curve, const Point& p, const Point& q);
// n·P for any signed n, by binary double-and-add on affine coordinates.
Point multiply(const Curve& curve, const Point& p, std::int64_t n);
Point multiply(const Curve& curve, const Point& p, const Integer& n);

// Moves a point along a change of variables (curve.hpp): `to_new_model` takes P on E to E',
// `to_old_model` takes P' on E' back to E.
Point to_new_model(const ModelChange& change, const Point& p);
Point to_old_model(const ModelChange& change, const Point& p);

// Parses "x,y" (rationals) or "(X:Y:Z)" (projective, x = X/Z, y = Y/Z); "0" or "(0:1:0)" is the
// point at infinity. Throws InputError on malformed text or a point off the curve.
Point parse_point(const Curve& curve, std::string_view text);
std::string to_string(const Point& p);

// Jacobian coordinates over Z: (X : Y : Z) stands for (X/Z^2, Y/Z^3); Z == 0 is infinity.
// Valid on curves y^2 = x^3 + a2 x^2 + a4 x + a6 with integer a2, a4, a6 (a1 = a3 = 0).
struct JacobianPoint {
    Integer X, Y, Z;
    bool is_infinity() const { return Z == 0; }
};

struct JacobianCurve {
    Integer a2, a4, a6;
};

// Throws std::invalid_argument unless the curve is integral with a1 = a3 = 0.
JacobianCurve jacobian_curve(const Curve& curve);
// The change of variables (u = 1/2, s = -a1/2, t = -a3/2) taking any curve to
// [0, b2, 0, 8 b4, 16 b6], which has a1 = a3 = 0 and is integral when the input is.
ModelChange a1_a3_free_change(const Curve& curve);

JacobianPoint to_jacobian(const Point& p);  // p must have x = m/e^2, y = n/e^3 (integral model)
Point to_affine(const JacobianPoint& p);
JacobianPoint jacobian_double(const JacobianCurve& curve, const JacobianPoint& p);
JacobianPoint jacobian_add(const JacobianCurve& curve, const JacobianPoint& p,
                           const JacobianPoint& q);
JacobianPoint jacobian_negate(const JacobianPoint& p);
// n·P by a left-to-right binary chain; no gcd is taken until to_affine.
JacobianPoint jacobian_multiply(const JacobianCurve& curve, const JacobianPoint& p,
                                const Integer& n);

}  // namespace arcsieve
