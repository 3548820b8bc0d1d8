// Test-only brute-force helpers shared by the region and locate tests: torsion points found by
// exhaustive search over integral x (Nagell–Lutz: torsion points of an integral model
// y^2 = x^3 + a2 x^2 + a4 x + a6 have integer coordinates; common practice) and exact multiples.
#pragma once

#include <cstdlib>
#include <string>
#include <vector>

#include "curve/point.hpp"

namespace arcsieve::testing {

// Every torsion point of an integral model with a1 = a3 = 0 whose |x| <= bound, O first.
inline std::vector<Point> torsion_by_search(const Curve& curve, long bound) {
    std::vector<Point> points{Point::infinity()};
    for (long x = -bound; x <= bound; ++x) {
        const Integer X(x);
        const Integer f =
            X * X * X + Integer(curve.a2) * X * X + Integer(curve.a4) * X + Integer(curve.a6);
        if (f < 0 || !mpz_perfect_square_p(f.get_mpz_t())) continue;
        Integer y;
        mpz_sqrt(y.get_mpz_t(), f.get_mpz_t());
        for (const Integer& Y : {y, Integer(-y)}) {
            const Point p{Rational(X), Rational(Y), false};
            Point q = p;
            for (int order = 1; order <= 12; ++order) {
                if (q.at_infinity) {
                    points.push_back(p);
                    break;
                }
                q = add(curve, q, p);
            }
            if (Y == 0) break;
        }
    }
    return points;
}

// ARCSIEVE_TEST_SCALE=sanitize: cut iteration counts (tests run under ASan+UBSan).
inline bool sanitize_scale() {
    const char* scale = std::getenv("ARCSIEVE_TEST_SCALE");
    return scale != nullptr && std::string(scale) == "sanitize";
}

}  // namespace arcsieve::testing
