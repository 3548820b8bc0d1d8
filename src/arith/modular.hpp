// Arithmetic modulo a word-sized prime (products through 128 bits): the small helpers shared by
// reduction modulo primes and by the division-polynomial root search.
#pragma once

#include <cstdint>

namespace arcsieve {

inline std::uint64_t mul_mod(std::uint64_t a, std::uint64_t b, std::uint64_t modulus) {
    return static_cast<std::uint64_t>((static_cast<unsigned __int128>(a) * b) % modulus);
}

inline std::uint64_t pow_mod(std::uint64_t base, std::uint64_t exponent, std::uint64_t modulus) {
    std::uint64_t result = 1;
    for (; exponent; exponent >>= 1, base = mul_mod(base, base, modulus)) {
        if (exponent & 1) result = mul_mod(result, base, modulus);
    }
    return result;
}

// a^(q−2) = a^(−1) modulo a prime q (Fermat); a must not be divisible by q.
inline std::uint64_t inverse_mod_prime(std::uint64_t a, std::uint64_t prime) {
    return pow_mod(a, prime - 2, prime);
}

}  // namespace arcsieve
