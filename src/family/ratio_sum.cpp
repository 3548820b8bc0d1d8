#include "family/ratio_sum.hpp"

namespace arcsieve::family {

Integer ratio_sum_parameter(std::string_view text) {
    auto n = parse_integer(text);
    if (!n) {
        throw InputError("N must be an integer, got '" + std::string(text) + "'");
    }
    check_ratio_sum_parameter(*n);
    return *n;
}

void check_ratio_sum_parameter(const Integer& N) {
    if (N < 1) {
        throw InputError("N = " + to_string(N) +
                         " is out of range: ratio-sum needs N >= 1 (for positive a, b, c the sum "
                         "is at least 3/2 by Nesbitt's inequality)");
    }
    if (N > Integer(std::to_string(ratio_sum_max_N))) {
        throw InputError("N = " + to_string(N) + " is larger than the supported maximum " +
                         std::to_string(ratio_sum_max_N));
    }
}

Curve ratio_sum_curve(const Integer& N) {
    // Δ = 2^16 (N+3)^2 (2N+5)^3 (2N-3) up to sign conventions, nonzero for every integer N >= 1.
    return Curve{Rational(0), Rational(4 * N * N + 12 * N - 3), Rational(0),
                 Rational(32 * (N + 3)), Rational(0)};
}

Triple normalise(Triple t) {
    Integer g = gcd(gcd(t.a, t.b), t.c);
    if (g != 0 && g != 1) {
        t.a /= g;
        t.b /= g;
        t.c /= g;
    }
    const Integer sum = t.a + t.b + t.c;
    const bool flip = sum < 0 || (sum == 0 && (t.a < 0 || (t.a == 0 && (t.b < 0 ||
                                                                        (t.b == 0 && t.c < 0)))));
    if (flip) {
        t.a = -t.a;
        t.b = -t.b;
        t.c = -t.c;
    }
    return t;
}

Integer ratio_sum_cubic(const Integer& N, const Triple& t) {
    const Integer ab = t.a + t.b, bc = t.b + t.c, ca = t.c + t.a;
    return t.a * ab * ca + t.b * ab * bc + t.c * ca * bc - N * ab * bc * ca;
}

bool satisfies_ratio_sum(const Integer& N, const Triple& t) {
    const Integer ab = t.a + t.b, bc = t.b + t.c, ca = t.c + t.a;
    if (ab == 0 || bc == 0 || ca == 0) return false;
    return ratio_sum_cubic(N, t) == 0;
}

namespace {

std::optional<std::string> vanishing_denominator(const Triple& t) {
    if (t.b + t.c == 0) return std::string("b + c = 0");
    if (t.c + t.a == 0) return std::string("c + a = 0");
    if (t.a + t.b == 0) return std::string("a + b = 0");
    return std::nullopt;
}

}  // namespace

std::variant<Triple, Degenerate> point_to_triple(const Integer& N, const Point& p) {
    if (p.at_infinity) return Degenerate{"the point at infinity maps to (1 : -1 : 0), a + b = 0"};
    const Rational k = 8 * (N + 3);
    Rational a = k - p.x + p.y;
    Rational b = k - p.x - p.y;
    Rational c = -k - 2 * (N + 2) * p.x;
    // Clear denominators: a common positive factor does not change the projective point.
    const Integer den = lcm(lcm(Integer(a.get_den()), Integer(b.get_den())), Integer(c.get_den()));
    Triple t{Integer(a * den), Integer(b * den), Integer(c * den)};
    t = normalise(t);
    if (auto why = vanishing_denominator(t)) {
        return Degenerate{"point " + to_string(p) + " maps to (" + to_string(t.a) + " : " +
                          to_string(t.b) + " : " + to_string(t.c) + "), where " + *why};
    }
    return t;
}

std::variant<Point, Degenerate> triple_to_point(const Integer& N, const Triple& t) {
    if (t.a == 0 && t.b == 0 && t.c == 0) throw InputError("(0, 0, 0) is not a projective point");
    if (ratio_sum_cubic(N, t) != 0) {
        throw InputError("(" + to_string(t.a) + ", " + to_string(t.b) + ", " + to_string(t.c) +
                         ") does not satisfy the cleared ratio-sum equation for N = " +
                         to_string(N));
    }
    const Integer s = t.a + t.b;
    const Integer pole = t.c - (N + 2) * s;
    if (pole == 0) return Point::infinity();
    Rational x(4 * (N + 3) * (s + 2 * t.c), pole);
    Rational y(4 * (N + 3) * (2 * N + 5) * (t.a - t.b), -pole);
    x.canonicalize();
    y.canonicalize();
    return Point{x, y, false};
}

}  // namespace arcsieve::family
