// Root numbers of E/Q as products of local root numbers, w(E) = −∏_p w_p (w_∞ = −1): good
// p: +1; multiplicative: −a_p; additive at p >= 5: Rohrlich's formulas (Rohrlich, "Variation
// of the root number in families of elliptic curves", Compositio Math. 87 (1993), Prop. 2,
// from memory; checked against the functional equation in tests). At p = 2, 3 with additive
// reduction the tables of Halberstadt (1998) and Rizzo (2003) are NOT implemented: those local
// factors are left open and the global sign then comes from the certified functional equation.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "lseries/coefficients.hpp"

namespace arcsieve::lseries {

struct LocalRootNumber {
    std::uint64_t prime = 0;
    std::optional<int> value;  // nullopt: additive at 2 or 3 (tables not implemented)
    std::string rule;          // how it was obtained, in words
};

// One entry per bad prime (good primes contribute +1).
std::vector<LocalRootNumber> local_root_numbers(const LSeriesCurve& curve);

// −∏ w_p when every local factor is known.
std::optional<int> root_number_from_local(const std::vector<LocalRootNumber>& local);

}  // namespace arcsieve::lseries
