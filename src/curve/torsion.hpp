// The torsion subgroup of E(Q): Mazur's list bounds it; reduction modulo several good primes
// bounds the order; the points are then found exactly (division points / Nagell–Lutz).
#pragma once

#include <optional>
#include <vector>

#include "curve/point.hpp"

namespace arcsieve {

struct TorsionGroup {
    std::vector<Point> points;      // every torsion point, the point at infinity first
    std::vector<int> structure;     // [] trivial, [n] for Z/n, [2, 2m] for Z/2 × Z/2m
    std::vector<Point> generators;  // one per factor of `structure`
};
// The points are listed as k·G (k = 0, 1, ...) for Z/n, then H + k·G for Z/2 × Z/2m, with
// generators {G} or {H, G}; all on the input curve. Factorises the minimal discriminant.

TorsionGroup torsion_subgroup(const Curve& curve);
// Order of P if it is a torsion point (≤ 12 by Mazur), nullopt if P has infinite order.
std::optional<int> torsion_order(const Curve& curve, const Point& p);

}  // namespace arcsieve
