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

// A square root of d modulo an odd prime p by Tonelli–Shanks (Cohen GTM 138 Algorithm 1.5.1;
// common practice); d must be a nonzero square modulo p.
inline std::uint64_t sqrt_mod_prime(std::uint64_t d, std::uint64_t p) {
    d %= p;
    if (p % 4 == 3) return pow_mod(d, (p + 1) / 4, p);
    std::uint64_t q = p - 1;
    std::uint64_t s = 0;
    while (q % 2 == 0) {
        q /= 2;
        ++s;
    }
    std::uint64_t z = 2;
    while (pow_mod(z, (p - 1) / 2, p) != p - 1) ++z;
    std::uint64_t m = s, c = pow_mod(z, q, p), t = pow_mod(d, q, p), r = pow_mod(d, (q + 1) / 2, p);
    while (t != 1) {
        std::uint64_t i = 0, t2 = t;
        while (t2 != 1) {
            t2 = mul_mod(t2, t2, p);
            ++i;
        }
        std::uint64_t b = c;
        for (std::uint64_t j = 0; j + 1 < m - i; ++j) b = mul_mod(b, b, p);
        m = i;
        c = mul_mod(b, b, p);
        t = mul_mod(t, c, p);
        r = mul_mod(r, b, p);
    }
    return r;
}

}  // namespace arcsieve
