#include "basis/reduction_mod_prime.hpp"

#include <vector>

#include "arith/modular.hpp"

namespace arcsieve::basis {

namespace {

std::uint64_t residue(const Rational& value, std::uint64_t q) {
    const std::uint64_t n = mpz_fdiv_ui(value.get_num_mpz_t(), q);
    const std::uint64_t d = mpz_fdiv_ui(value.get_den_mpz_t(), q);
    return mul_mod(n, inverse_mod_prime(d, q), q);
}

}  // namespace

std::optional<CurveModPrime> reduce_curve(const Curve& e, std::uint64_t q) {
    if (q < 3 || q > 0xffffffffULL || q % 2 == 0) return std::nullopt;
    if (e.a1 != 0 || e.a3 != 0 || !is_integral(e)) return std::nullopt;
    const Integer disc = discriminant(e).get_num();
    if (mpz_fdiv_ui(disc.get_mpz_t(), q) == 0) return std::nullopt;
    CurveModPrime c;
    c.q = q;
    c.a2 = residue(e.a2, q);
    c.a4 = residue(e.a4, q);
    c.a6 = residue(e.a6, q);
    return c;
}

PointModPrime reduce_point(const CurveModPrime& c, const Point& p) {
    if (p.at_infinity) return {};
    if (mpz_fdiv_ui(p.x.get_den_mpz_t(), c.q) == 0) return {};
    return PointModPrime{residue(p.x, c.q), residue(p.y, c.q), false};
}

PointModPrime add(const CurveModPrime& c, const PointModPrime& p, const PointModPrime& r) {
    if (p.at_infinity) return r;
    if (r.at_infinity) return p;
    const std::uint64_t q = c.q;
    std::uint64_t lambda;
    if (p.x == r.x) {
        if ((p.y + r.y) % q == 0) return {};
        // λ = (3x^2 + 2 a2 x + a4) / (2y)
        const std::uint64_t numerator =
            (mul_mod(3, mul_mod(p.x, p.x, q), q) + mul_mod(2 * c.a2 % q, p.x, q) + c.a4) % q;
        lambda = mul_mod(numerator, inverse_mod_prime(2 * p.y % q, q), q);
    } else {
        lambda = mul_mod((r.y + q - p.y) % q, inverse_mod_prime((r.x + q - p.x) % q, q), q);
    }
    const std::uint64_t x3 = (mul_mod(lambda, lambda, q) + 3 * q - c.a2 - p.x - r.x) % q;
    const std::uint64_t y3 = (mul_mod(lambda, (p.x + q - x3) % q, q) + q - p.y) % q;
    return PointModPrime{x3, y3, false};
}

PointModPrime multiply(const CurveModPrime& c, const PointModPrime& p, std::uint64_t n) {
    PointModPrime result, base = p;
    for (; n; n >>= 1, base = add(c, base, base)) {
        if (n & 1) result = add(c, result, base);
    }
    return result;
}

std::uint64_t group_order(const CurveModPrime& c) {
    const std::uint64_t q = c.q;
    std::vector<signed char> chi(q, -1);
    chi[0] = 0;
    for (std::uint64_t t = 1; t <= q / 2; ++t) chi[t * t % q] = 1;
    long long sum = 0;
    for (std::uint64_t x = 0; x < q; ++x) {
        const std::uint64_t f = (mul_mod((mul_mod(x + c.a2, x, q) + c.a4) % q, x, q) + c.a6) % q;
        sum += chi[f];
    }
    return static_cast<std::uint64_t>(static_cast<long long>(q) + 1 + sum);
}

PointModPrime point_from_x_at_least(const CurveModPrime& c, std::uint64_t start) {
    const std::uint64_t q = c.q;
    for (std::uint64_t step = 0; step < q; ++step) {
        const std::uint64_t x = (start + step) % q;
        const std::uint64_t f = (mul_mod((mul_mod(x + c.a2, x, q) + c.a4) % q, x, q) + c.a6) % q;
        if (f == 0) return PointModPrime{x, 0, false};
        if (pow_mod(f, (q - 1) / 2, q) != 1) continue;
        // Tonelli–Shanks: q − 1 = 2^s · odd.
        std::uint64_t odd = q - 1, s = 0;
        while (odd % 2 == 0) {
            odd /= 2;
            ++s;
        }
        std::uint64_t z = 2;
        while (pow_mod(z, (q - 1) / 2, q) != q - 1) ++z;
        std::uint64_t m = s, cz = pow_mod(z, odd, q), t = pow_mod(f, odd, q),
                      r = pow_mod(f, (odd + 1) / 2, q);
        while (t != 1) {
            std::uint64_t i = 0, t2 = t;
            while (t2 != 1) {
                t2 = mul_mod(t2, t2, q);
                ++i;
            }
            std::uint64_t b = cz;
            for (std::uint64_t k = 0; k + 1 < m - i; ++k) b = mul_mod(b, b, q);
            m = i;
            cz = mul_mod(b, b, q);
            t = mul_mod(t, cz, q);
            r = mul_mod(r, b, q);
        }
        return PointModPrime{x, std::min(r, q - r), false};
    }
    return {};
}

}  // namespace arcsieve::basis
