// Shared helpers for the analytic-layer tests: curves with published data, the sanitizer scale
// factor, a high-precision real group law (an independent way to move points along E(R)),
// and distances on R/Z.
#pragma once

#include <cstdlib>
#include <cstring>
#include <string>

#include "analytic/periods.hpp"

namespace arcsieve::testing_support {

// ARCSIEVE_TEST_SCALE=sanitize cuts iteration counts by 10x.
inline int scaled(int count) {
    const char* scale = std::getenv("ARCSIEVE_TEST_SCALE");
    if (scale != nullptr && std::strcmp(scale, "sanitize") == 0)
        return count / 10 > 0 ? count / 10 : 1;
    return count;
}

inline Real power_of_ten(int exponent, unsigned digits) {
    return pow(make_real(10, digits), exponent);
}

// |a − b| reduced to the distance on R/Z.
inline Real circle_distance(const Real& a, const Real& b) {
    Real d = a - b;
    d = d - floor(d);
    if (d > 0.5) d = 1 - d;
    return d;
}

inline Point rational_point(const char* x, const char* y) {
    return Point{Rational(x), Rational(y), false};
}

// Chord-and-tangent on the real points of the long Weierstrass form (Silverman AEC III.2.3),
// at the precision of the inputs: used as an independent way to form n·P numerically.
inline RealPoint real_add(const Curve& e, const RealPoint& p, const RealPoint& q, unsigned digits) {
    if (p.at_infinity) return q;
    if (q.at_infinity) return p;
    const Real a1 = make_real(e.a1, digits), a2 = make_real(e.a2, digits),
               a3 = make_real(e.a3, digits), a4 = make_real(e.a4, digits);
    Real lambda(0, digits), nu(0, digits);
    if (p.x == q.x) {
        const Real denominator = 2 * p.y + a1 * p.x + a3;
        if (denominator == 0 || p.y + q.y + a1 * q.x + a3 == 0) {
            return RealPoint{make_real(0, digits), make_real(0, digits), true};
        }
        lambda = (3 * p.x * p.x + 2 * a2 * p.x + a4 - a1 * p.y) / denominator;
    } else {
        lambda = (q.y - p.y) / (q.x - p.x);
    }
    nu = p.y - lambda * p.x;
    RealPoint r{make_real(0, digits), make_real(0, digits), false};
    r.x = lambda * lambda + a1 * lambda - a2 - p.x - q.x;
    r.y = -(lambda + a1) * r.x - nu - a3;
    return r;
}

inline RealPoint real_multiple(const Curve& e, const RealPoint& p, long n, unsigned digits) {
    RealPoint result{make_real(0, digits), make_real(0, digits), true};
    RealPoint base = p;
    while (n > 0) {
        if (n & 1) result = real_add(e, result, base, digits);
        base = real_add(e, base, base, digits);
        n >>= 1;
    }
    return result;
}

inline RealPoint to_real_point(const Point& p, unsigned digits) {
    return RealPoint{make_real(p.x, digits), make_real(p.y, digits), p.at_infinity};
}

inline std::string show(const Real& x) {
    return x.str(40);
}

}  // namespace arcsieve::testing_support
