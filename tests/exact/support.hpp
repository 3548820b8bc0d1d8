// Test helpers for the exact layer, independent of the code under test: torsion points and
// small points of E_N by brute-force search, first positive multiple by exact iteration.
#pragma once

#include <cstdlib>
#include <optional>
#include <string>
#include <vector>

#include "family/ratio_sum.hpp"

namespace arcsieve::exact::testing {

inline bool sanitize_scale() {
    const char* s = std::getenv("ARCSIEVE_TEST_SCALE");
    return s != nullptr && std::string(s) == "sanitize";
}

inline std::optional<Integer> exact_sqrt(const Integer& v) {
    if (v < 0) return std::nullopt;
    if (!mpz_perfect_square_p(v.get_mpz_t())) return std::nullopt;
    Integer r;
    mpz_sqrt(r.get_mpz_t(), v.get_mpz_t());
    return r;
}

inline bool is_torsion(const Curve& e, const Point& p) {
    // Mazur: torsion orders are at most 12.
    Point q = p;
    for (int k = 1; k <= 12; ++k) {
        if (q.at_infinity) return true;
        q = add(e, q, p);
    }
    return q.at_infinity;
}

// All torsion points of E_N (integral by Nagell–Lutz on this integral model), found by
// searching integer x and testing the order by exact addition.
inline std::vector<Point> torsion_points(const Integer& N) {
    const Curve e = family::ratio_sum_curve(N);
    std::vector<Point> out{Point::infinity()};
    const long bound = 4 * Integer(e.a2.get_num()).get_si() + 64 * (N.get_si() + 3);
    for (long x = -bound; x <= bound; ++x) {
        const Integer X(x);
        const Integer f = X * X * X + Integer(e.a2.get_num()) * X * X + Integer(e.a4.get_num()) * X;
        auto y = exact_sqrt(f);
        if (!y) continue;
        for (int s : {1, -1}) {
            const Point p{Rational(X), Rational(s * *y), false};
            if (is_torsion(e, p)) out.push_back(p);
            if (*y == 0) break;
        }
    }
    return out;
}

// A point of infinite order with x = u/w², |u| <= bound, w <= w_bound, smallest |u|·w² first.
inline std::optional<Point> small_point(const Integer& N, long bound, long w_bound) {
    const Curve e = family::ratio_sum_curve(N);
    const Integer a2(e.a2.get_num()), a4(e.a4.get_num());
    std::optional<Point> best;
    Rational best_size;
    for (long w = 1; w <= w_bound; ++w) {
        const Integer w2 = w * w;
        for (long u = -bound; u <= bound; ++u) {
            if (u == 0 || gcd(Integer(u), Integer(w)) != 1) continue;
            // y² = (u³ + a2 u² w² + a4 u w⁴) / w⁶
            const Integer U(u);
            const Integer f = U * U * U + a2 * U * U * w2 + a4 * U * w2 * w2;
            auto y = exact_sqrt(f);
            if (!y || *y == 0) continue;
            const Point p{Rational(U, w2), Rational(*y, w2 * w), false};
            if (is_torsion(e, p)) continue;
            const Rational size(abs(U) * w2);
            if (!best || size < best_size) {
                best = p;
                best_size = size;
            }
        }
        if (best) break;
    }
    return best;
}

struct FirstHit {
    long index = 0;
    Point translate;
};

// First n >= 1 (and torsion T) with n·P + T mapping to a strictly positive triple, by exact
// iteration Q_n = Q_{n−1} + P (no chain, no analytics).
inline std::optional<FirstHit> first_positive(const Integer& N, const Point& p, long max_index) {
    const Curve e = family::ratio_sum_curve(N);
    const std::vector<Point> torsion = torsion_points(N);
    Point q = Point::infinity();
    for (long n = 1; n <= max_index; ++n) {
        q = add(e, q, p);
        for (const Point& t : torsion) {
            const auto image = family::point_to_triple(N, add(e, q, t));
            if (const auto* triple = std::get_if<family::Triple>(&image)) {
                if (triple->a > 0 && triple->b > 0 && triple->c > 0) return FirstHit{n, t};
            }
        }
    }
    return std::nullopt;
}

}  // namespace arcsieve::exact::testing
