// Saturation of a set of independent points at primes ℓ ≤ B (Siksek, Rocky Mountain J. Math. 25
// (1995); Cremona, Prickett and Siksek, J. Number Theory 116 (2006) §3): ℓ-divisibility of a
// combination is ruled out by maps E(Q) → E(F_q)/ℓE(F_q); combinations that survive are divided.
#pragma once

#include <string>
#include <vector>

#include "curve/point.hpp"

namespace arcsieve::basis {

// A combination Σ coefficients[i]·points[i] (exact).
Point combination(const Curve& curve, const std::vector<Point>& points,
                  const std::vector<Integer>& coefficients);

// Given ℓ·quotient = Σ coefficients[i]·generators[i] + (torsion), with some coefficient prime
// to ℓ, replaces one generator so that the new set generates a group ℓ times larger modulo
// torsion: the index-ℓ step of saturation (Cremona, Algorithms §3.7, in spirit).
void enlarge_by_quotient(const Curve& curve, std::vector<Point>& generators,
                         const std::vector<Integer>& coefficients, const Point& quotient, int ell);

struct SaturationOptions {
    int prime_bound = 50;         // saturate at every prime ℓ <= prime_bound
    int max_division_prime = 23;  // division polynomials of degree ℓ² above this are too costly
    std::uint64_t max_auxiliary_prime = 60000;  // primes q used for the reduction maps
};

struct SaturationOutcome {
    std::vector<Point> generators;  // generate a group saturated at every ℓ <= saturated_up_to
    int saturated_up_to = 1;        // every prime ℓ <= this is proved; 1: none
    std::vector<int> divided_by;    // one entry per index-ℓ enlargement performed
    std::vector<std::string> notes;
};

// `curve` must be integral with a1 = a3 = 0; `generators` independent points of infinite order;
// `torsion_generators` generate E(Q)_tors (their orders in `torsion_orders`).
SaturationOutcome saturate(const Curve& curve, std::vector<Point> generators,
                           const std::vector<Point>& torsion_generators,
                           const std::vector<int>& torsion_orders,
                           const SaturationOptions& options);

}  // namespace arcsieve::basis
