// Integer factorisation: trial division by small primes, Miller–Rabin, and Pollard–Brent rho
// (Brent, BIT 20 (1980)) for what is left. Fast for the discriminants of the families.
#pragma once

#include <vector>

#include "arith/rational.hpp"

namespace arcsieve {

struct PrimePower {
    Integer prime;
    int exponent = 0;
    bool operator==(const PrimePower&) const = default;
};

// Factorisation of |n| (n != 0), primes increasing; empty for |n| = 1. Throws InputError when
// a composite cofactor resists Pollard–Brent's step budget (its prime factors beyond ~10^13;
// the budget shrinks for numbers over 256 bits), std::domain_error for n = 0.
std::vector<PrimePower> factor(const Integer& n);
std::vector<Integer> prime_divisors(const Integer& n);
// Baillie–PSW plus Miller–Rabin rounds (GMP's mpz_probab_prime_p); false for n < 2.
bool is_probable_prime(const Integer& n);

}  // namespace arcsieve
