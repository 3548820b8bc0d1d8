// The sieve engine behind every point search in basis/: integers u in a range and values t from
// a list such that a binary form F(u, t) is a perfect square, with quadratic-residue sieving
// modulo small moduli (bit-packed patterns, 64 candidates per word) and TBB over the t values.
#pragma once

#include <cstdint>
#include <vector>

#include "arith/rational.hpp"

namespace arcsieve::basis {

// F(u, t) = sum_i coefficients[i] · u^i · t^(d − i), d = coefficients.size() − 1.
struct BinaryForm {
    std::vector<Integer> coefficients;
};

Integer evaluate(const BinaryForm& form, const Integer& u, const Integer& t);

// One outer value: the second argument t of the form, and the number u must be coprime to
// (w for x = u/w^2 with t = w^2; v itself for quartics in (u, v)).
struct OuterValue {
    std::int64_t t = 1;
    std::int64_t coprime_to = 1;
};

struct SquareValue {
    std::int64_t u = 0;
    std::int64_t t = 0;
    Integer root;  // sqrt(F(u, t)) >= 0
};

// Every (u, t) with u in [u_min, u_max], gcd(u, coprime_to) = 1 and F(u, t) a square (zero
// included), in no particular order. threads = 0 lets TBB decide.
std::vector<SquareValue> square_values(const BinaryForm& form, const std::vector<OuterValue>& outer,
                                       std::int64_t u_min, std::int64_t u_max, unsigned threads);

}  // namespace arcsieve::basis
