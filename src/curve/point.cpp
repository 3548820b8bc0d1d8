#include "curve/point.hpp"

#include <stdexcept>

namespace arcsieve {

bool on_curve(const Curve& e, const Point& p) {
    if (p.at_infinity) return true;
    const Rational lhs = p.y * p.y + e.a1 * p.x * p.y + e.a3 * p.y;
    const Rational rhs = ((p.x + e.a2) * p.x + e.a4) * p.x + e.a6;
    return lhs == rhs;
}

Point negate(const Curve& e, const Point& p) {
    if (p.at_infinity) return p;
    return Point{p.x, -p.y - e.a1 * p.x - e.a3, false};
}

Point add(const Curve& e, const Point& p, const Point& q) {
    // Silverman AEC, Algorithm III.2.3.
    if (p.at_infinity) return q;
    if (q.at_infinity) return p;
    Rational lambda, nu;
    if (p.x == q.x) {
        const Rational denom = 2 * p.y + e.a1 * p.x + e.a3;
        if (p.y + q.y + e.a1 * q.x + e.a3 == 0 || denom == 0) return Point::infinity();
        lambda = (3 * p.x * p.x + 2 * e.a2 * p.x + e.a4 - e.a1 * p.y) / denom;
        nu = (-p.x * p.x * p.x + e.a4 * p.x + 2 * e.a6 - e.a3 * p.y) / denom;
    } else {
        lambda = (q.y - p.y) / (q.x - p.x);
        nu = (p.y * q.x - q.y * p.x) / (q.x - p.x);
    }
    const Rational x3 = lambda * lambda + e.a1 * lambda - e.a2 - p.x - q.x;
    const Rational y3 = -(lambda + e.a1) * x3 - nu - e.a3;
    return Point{x3, y3, false};
}

Point doubled(const Curve& e, const Point& p) { return add(e, p, p); }

Point subtract(const Curve& e, const Point& p, const Point& q) { return add(e, p, negate(e, q)); }

Point multiply(const Curve& e, const Point& p, const Integer& n) {
    if (n == 0 || p.at_infinity) return Point::infinity();
    const Point base = n < 0 ? negate(e, p) : p;
    const Integer m = abs(n);
    Point result = Point::infinity();
    for (long bit = static_cast<long>(mpz_sizeinbase(m.get_mpz_t(), 2)) - 1; bit >= 0; --bit) {
        result = doubled(e, result);
        if (mpz_tstbit(m.get_mpz_t(), static_cast<mp_bitcnt_t>(bit))) result = add(e, result, base);
    }
    return result;
}

Point multiply(const Curve& e, const Point& p, std::int64_t n) {
    Integer m;
    mpz_set_si(m.get_mpz_t(), 0);
    // mpz_set_si takes long, which is 64-bit on the platforms we build for.
    static_assert(sizeof(long) == sizeof(std::int64_t));
    mpz_set_si(m.get_mpz_t(), static_cast<long>(n));
    return multiply(e, p, m);
}

Point to_new_model(const ModelChange& c, const Point& p) {
    if (p.at_infinity) return p;
    const Rational x = (p.x - c.r) / (c.u * c.u);
    const Rational y = (p.y - c.s * (p.x - c.r) - c.t) / (c.u * c.u * c.u);
    return Point{x, y, false};
}

Point to_old_model(const ModelChange& c, const Point& p) {
    if (p.at_infinity) return p;
    const Rational u2 = c.u * c.u;
    return Point{u2 * p.x + c.r, u2 * c.u * p.y + c.s * u2 * p.x + c.t, false};
}

Point parse_point(const Curve& e, std::string_view text) {
    const std::string original(text);
    auto fail = [&](const std::string& why) {
        return InputError("cannot read point '" + original + "': " + why +
                          " (expected x,y with rational entries or (X:Y:Z))");
    };
    while (!text.empty() && text.front() == ' ') text.remove_prefix(1);
    while (!text.empty() && text.back() == ' ') text.remove_suffix(1);
    Point p;
    if (text == "0" || text == "infinity") {
        p = Point::infinity();
    } else if (!text.empty() && text.front() == '(') {
        if (text.back() != ')') throw fail("missing ')'");
        const auto inner = text.substr(1, text.size() - 2);
        const auto c1 = inner.find(':');
        const auto c2 = c1 == std::string_view::npos ? c1 : inner.find(':', c1 + 1);
        if (c2 == std::string_view::npos) throw fail("a projective point needs X:Y:Z");
        auto X = parse_integer(inner.substr(0, c1));
        auto Y = parse_integer(inner.substr(c1 + 1, c2 - c1 - 1));
        auto Z = parse_integer(inner.substr(c2 + 1));
        if (!X || !Y || !Z) throw fail("X, Y, Z must be integers");
        if (*Z == 0) {
            if (*X != 0 || *Y == 0) throw fail("(X:Y:0) is on the curve only as (0:1:0)");
            p = Point::infinity();
        } else {
            p = Point{Rational(*X, *Z), Rational(*Y, *Z), false};
            p.x.canonicalize();
            p.y.canonicalize();
        }
    } else {
        const auto comma = text.find(',');
        if (comma == std::string_view::npos) throw fail("missing ','");
        auto x = parse_rational(text.substr(0, comma));
        auto y = parse_rational(text.substr(comma + 1));
        if (!x || !y) throw fail("coordinates must be integers or p/q");
        p = Point{*x, *y, false};
    }
    if (!on_curve(e, p)) {
        throw InputError("point " + to_string(p) + " is not on the curve " + to_string(e));
    }
    return p;
}

std::string to_string(const Point& p) {
    if (p.at_infinity) return "(0:1:0)";
    return to_string(p.x) + "," + to_string(p.y);
}

JacobianCurve jacobian_curve(const Curve& e) {
    if (!is_integral(e) || e.a1 != 0 || e.a3 != 0) {
        throw std::invalid_argument("Jacobian arithmetic needs an integral model with a1 = a3 = 0");
    }
    return JacobianCurve{Integer(e.a2.get_num()), Integer(e.a4.get_num()),
                         Integer(e.a6.get_num())};
}

ModelChange a1_a3_free_change(const Curve& e) {
    return ModelChange{Rational(1, 2), Rational(0), -e.a1 / 2, -e.a3 / 2};
}

JacobianPoint to_jacobian(const Point& p) {
    if (p.at_infinity) return JacobianPoint{Integer(1), Integer(1), Integer(0)};
    // On an integral model x = m/e^2 and y = n/e^3 in lowest terms (Silverman AEC VII.2).
    Integer e;
    if (!mpz_perfect_square_p(p.x.get_den().get_mpz_t())) {
        throw std::invalid_argument("x-denominator is not a square: model not integral?");
    }
    mpz_sqrt(e.get_mpz_t(), p.x.get_den().get_mpz_t());
    const Integer e3 = e * e * e;
    if (p.y.get_den() != e3) throw std::invalid_argument("y-denominator is not e^3");
    return JacobianPoint{Integer(p.x.get_num()), Integer(p.y.get_num()), e};
}

Point to_affine(const JacobianPoint& p) {
    if (p.is_infinity()) return Point::infinity();
    const Integer z2 = p.Z * p.Z;
    Rational x(p.X, z2);
    Rational y(p.Y, z2 * p.Z);
    x.canonicalize();
    y.canonicalize();
    return Point{x, y, false};
}

JacobianPoint jacobian_negate(const JacobianPoint& p) { return JacobianPoint{p.X, -p.Y, p.Z}; }

JacobianPoint jacobian_double(const JacobianCurve& e, const JacobianPoint& p) {
    // λ = (3x^2 + 2 a2 x + a4) / 2y. With M = 3X^2 + 2 a2 X Z^2 + a4 Z^4 and Z3 = 2YZ:
    // X3 = M^2 - 4Y^2 (a2 Z^2 + 2X), Y3 = M (4XY^2 - X3) - 8Y^4 (derived from AEC III.2.3).
    if (p.is_infinity() || p.Y == 0) return JacobianPoint{Integer(1), Integer(1), Integer(0)};
    const Integer z2 = p.Z * p.Z;
    const Integer z4 = z2 * z2;
    const Integer m = 3 * p.X * p.X + 2 * e.a2 * p.X * z2 + e.a4 * z4;
    const Integer y2 = p.Y * p.Y;
    const Integer four_y2 = 4 * y2;
    JacobianPoint r;
    r.Z = 2 * p.Y * p.Z;
    r.X = m * m - four_y2 * (e.a2 * z2 + 2 * p.X);
    r.Y = m * (four_y2 * p.X - r.X) - 8 * y2 * y2;
    return r;
}

JacobianPoint jacobian_add(const JacobianCurve& e, const JacobianPoint& p,
                           const JacobianPoint& q) {
    // U_i = X_i Z_j^2, S_i = Y_i Z_j^3, H = U2 - U1, R = S2 - S1, Z3 = H Z1 Z2,
    // X3 = R^2 - a2 Z3^2 - H^2 (U1 + U2), Y3 = R (U1 H^2 - X3) - S1 H^3.
    if (p.is_infinity()) return q;
    if (q.is_infinity()) return p;
    const Integer z1s = p.Z * p.Z, z2s = q.Z * q.Z;
    const Integer u1 = p.X * z2s, u2 = q.X * z1s;
    const Integer s1 = p.Y * z2s * q.Z, s2 = q.Y * z1s * p.Z;
    const Integer h = u2 - u1, rr = s2 - s1;
    if (h == 0) {
        if (rr == 0) return jacobian_double(e, p);
        return JacobianPoint{Integer(1), Integer(1), Integer(0)};
    }
    const Integer h2 = h * h;
    JacobianPoint out;
    out.Z = h * p.Z * q.Z;
    out.X = rr * rr - e.a2 * out.Z * out.Z - h2 * (u1 + u2);
    out.Y = rr * (u1 * h2 - out.X) - s1 * h2 * h;
    return out;
}

JacobianPoint jacobian_multiply(const JacobianCurve& e, const JacobianPoint& p, const Integer& n) {
    JacobianPoint result{Integer(1), Integer(1), Integer(0)};
    if (n == 0 || p.is_infinity()) return result;
    const JacobianPoint base = n < 0 ? jacobian_negate(p) : p;
    const Integer m = abs(n);
    for (long bit = static_cast<long>(mpz_sizeinbase(m.get_mpz_t(), 2)) - 1; bit >= 0; --bit) {
        result = jacobian_double(e, result);
        if (mpz_tstbit(m.get_mpz_t(), static_cast<mp_bitcnt_t>(bit))) {
            result = jacobian_add(e, result, base);
        }
    }
    return result;
}

}  // namespace arcsieve
