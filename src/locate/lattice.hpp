// Lattice points of a positive definite quadratic form (the canonical-height pairing on the
// free part of E(Q)) in increasing order of the form: LLL reduction of the Gram matrix
// (Lenstra, Lenstra and Lovász 1982) and Fincke–Pohst enumeration (Math. Comp. 44 (1985)).
#pragma once

#include <cstdint>
#include <vector>

namespace arcsieve::locate {

using GramMatrix = std::vector<std::vector<double>>;

struct LatticeVector {
    std::vector<std::int64_t> coefficients;  // with respect to the original basis
    double norm = 0;                         // coefficientsᵀ · Gram · coefficients
};

// LLL (δ = 0.99) on a Gram matrix: returns the unimodular U with rows giving the reduced basis
// in terms of the original one (reduced Gram = U·G·Uᵀ). Throws InputError unless G is
// symmetric positive definite.
std::vector<std::vector<std::int64_t>> lll_reduce_gram(const GramMatrix& gram);

// Every nonzero v with vᵀ G v <= bound (up to a relative 1e-9 slack for rounding), sorted by
// norm then lexicographically. Fincke–Pohst on the LLL-reduced form, mapped back.
std::vector<LatticeVector> vectors_up_to(const GramMatrix& gram, double bound);

}  // namespace arcsieve::locate
