// Search for rational points of small naive height: x = u/w^2 with |u|, w^2 bounded, sieved by
// quadratic residues modulo small primes (bit-packed, parallel with TBB).
#pragma once

#include <vector>

#include "curve/point.hpp"

namespace arcsieve {

struct PointSearchOptions {
    // Search x = u / w^2 with gcd(u, w) = 1, |u| <= height_bound and w^2 <= height_bound.
    Integer height_bound{1000};
    unsigned threads = 0;  // 0: use what TBB offers
};

// Every affine point found with its naive height within the bound, one of each ±P pair,
// sorted by naive height. Torsion points are included; callers filter.
std::vector<Point> search_points(const Curve& curve, const PointSearchOptions& options);

}  // namespace arcsieve
