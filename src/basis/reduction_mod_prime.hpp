// A curve y^2 = x^3 + a2 x^2 + a4 x + a6 reduced modulo an odd prime q of good reduction: point
// arithmetic in F_q, the group order #E(F_q) by summing Legendre symbols, reduction of points.
#pragma once

#include <cstdint>
#include <optional>

#include "curve/point.hpp"

namespace arcsieve::basis {

struct PointModPrime {
    std::uint64_t x = 0, y = 0;
    bool at_infinity = true;
    bool operator==(const PointModPrime&) const = default;
};

struct CurveModPrime {
    std::uint64_t q = 0;
    std::uint64_t a2 = 0, a4 = 0, a6 = 0;
};

// nullopt unless the curve is integral with a1 = a3 = 0 and has good reduction at the odd
// prime q (q < 2^32).
std::optional<CurveModPrime> reduce_curve(const Curve& curve, std::uint64_t q);
// The reduction of P (O when q divides the denominator of x).
PointModPrime reduce_point(const CurveModPrime& curve, const Point& p);

PointModPrime add(const CurveModPrime& curve, const PointModPrime& p, const PointModPrime& r);
PointModPrime multiply(const CurveModPrime& curve, const PointModPrime& p, std::uint64_t n);
// #E(F_q) = q + 1 + Σ_x (f(x)/q) (common practice; O(q) time, for q up to a few 10^5).
std::uint64_t group_order(const CurveModPrime& curve);
// The affine point with the smallest x >= start (mod q) and the smaller square root y
// (Tonelli–Shanks, common practice); start is taken mod q and the scan wraps around.
PointModPrime point_from_x_at_least(const CurveModPrime& curve, std::uint64_t start);

}  // namespace arcsieve::basis
