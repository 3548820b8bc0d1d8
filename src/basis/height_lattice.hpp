// Linear algebra of the height pairing: LLL reduction of a Gram matrix (Lenstra, Lenstra and
// Lovász 1982; Cohen GTM 138 Alg. 2.6.3 in its Gram-matrix form) with the integer transform,
// determinants, and recognising a numerical relation as a small rational vector.
#pragma once

#include <optional>
#include <vector>

#include "analytic/real.hpp"

namespace arcsieve::basis {

using GramMatrix = std::vector<std::vector<Real>>;
using IntegerMatrix = std::vector<std::vector<Integer>>;

// LLL with δ = 0.99 on a positive definite Gram matrix: returns U (rows = new vectors as
// integer combinations of the old ones, det ±1) so that U G Uᵀ is LLL-reduced.
IntegerMatrix lll_transform(const GramMatrix& gram);

GramMatrix transform_gram(const GramMatrix& gram, const IntegerMatrix& transform);

// Determinant by Gaussian elimination with partial pivoting (at the matrix's precision).
Real determinant(const GramMatrix& matrix);

// For independent b_1..b_k (Gram `gram`) and a point P with pairings `pairings` = <b_i, P> and
// ĥ(P) = `height`: if P is numerically in the Q-span of the b_i (residual ĥ below
// `tolerance`), the smallest d <= max_denominator and integers m with d·P ≈ Σ m_i b_i
// (coordinates within `tolerance` of integers); nullopt when P is independent or no such d.
struct RationalRelation {
    Integer denominator;
    std::vector<Integer> numerators;
};
// The residual ĥ(P − proj P) of P against the span of the b_i: ≈ 0 exactly when dependent.
Real residual_height(const GramMatrix& gram, const std::vector<Real>& pairings, const Real& height);
std::optional<RationalRelation> find_relation(const GramMatrix& gram,
                                              const std::vector<Real>& pairings,
                                              const Real& tolerance, long max_denominator);

// Hermite constant γ_r^r for r = 1..8 (Cassels, "An Introduction to the Geometry of Numbers";
// common practice): λ_1(L)^r <= γ_r^r det(L) for a lattice L of rank r.
double hermite_constant_power(int rank);

}  // namespace arcsieve::basis
