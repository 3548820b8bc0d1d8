#include "lseries/coefficients.hpp"

#include <tbb/blocked_range.h>
#include <tbb/parallel_for.h>

#include <algorithm>
#include <cmath>
#include <stdexcept>

#include "arith/modular.hpp"
#include "lseries/threads.hpp"

namespace arcsieve::lseries {

namespace {

// Residue of an integer modulo a word-sized modulus, in [0, modulus).
std::uint64_t residue(const Integer& value, std::uint64_t modulus) {
    return mpz_fdiv_ui(value.get_mpz_t(), static_cast<unsigned long>(modulus));
}

// Arithmetic modulo p < 2^32: products fit in 64 bits.
struct SmallField {
    std::uint64_t p;
    std::uint64_t mul(std::uint64_t x, std::uint64_t y) const { return x * y % p; }
    std::uint64_t add(std::uint64_t x, std::uint64_t y) const {
        const std::uint64_t s = x + y;
        return s >= p ? s - p : s;
    }
    std::uint64_t sub(std::uint64_t x, std::uint64_t y) const { return x >= y ? x - y : x + p - y; }
};

// Montgomery arithmetic modulo an odd p < 2^31 with R = 2^32 (Montgomery, Math. Comp. 44
// (1985); common practice): products reduce without division.
struct Montgomery {
    std::uint32_t p, inverse;  // inverse = −p^{-1} mod 2^32
    std::uint32_t r2;          // R² mod p
    explicit Montgomery(std::uint32_t modulus) : p(modulus) {
        std::uint32_t x = modulus;  // Newton iteration for p^{-1} mod 2^32
        for (int i = 0; i < 5; ++i) x *= 2 - modulus * x;
        inverse = static_cast<std::uint32_t>(0) - x;
        const std::uint64_t r = (std::uint64_t{1} << 32) % modulus;
        r2 = static_cast<std::uint32_t>(r * r % modulus);
    }
    std::uint32_t reduce(std::uint64_t t) const {
        const std::uint32_t m = static_cast<std::uint32_t>(t) * inverse;
        const std::uint64_t u = (t + static_cast<std::uint64_t>(m) * p) >> 32;
        return static_cast<std::uint32_t>(u >= p ? u - p : u);
    }
    std::uint32_t mul(std::uint32_t x, std::uint32_t y) const {
        return reduce(static_cast<std::uint64_t>(x) * y);
    }
    std::uint32_t add(std::uint32_t x, std::uint32_t y) const {
        const std::uint32_t s = x + y;  // < 2^32 since p < 2^31
        return s >= p ? s - p : s;
    }
    std::uint32_t sub(std::uint32_t x, std::uint32_t y) const { return x >= y ? x - y : x + p - y; }
    std::uint32_t to(std::uint64_t x) const { return mul(static_cast<std::uint32_t>(x % p), r2); }
    std::uint32_t from(std::uint32_t x) const { return reduce(x); }
    // Extended Euclid on the plain value; x != 0.
    std::uint32_t inverse_of(std::uint32_t x) const {
        std::int64_t r0 = p, r1 = from(x), s0 = 0, s1 = 1;
        while (r1 != 0) {
            const std::int64_t q = r0 / r1;
            std::int64_t t = r0 - q * r1;
            r0 = r1;
            r1 = t;
            t = s0 - q * s1;
            s0 = s1;
            s1 = t;
        }
        return to(static_cast<std::uint64_t>(s0 < 0 ? s0 + p : s0));
    }
};

// Points on y^2 = x^3 + a x + b over F_p in Montgomery form: affine, and Jacobian
// (X/Z², Y/Z³; Z = 0 is O) so that the steps need no inversions (Cohen GTM 138 §7.4 and
// Hankerson–Menezes–Vanstone, Guide to Elliptic Curve Cryptography §3.2; common practice).
struct AffinePoint {
    std::uint32_t x = 0, y = 0;
    bool infinity = true;
};
struct JacobianPoint32 {
    std::uint32_t X = 0, Y = 1, Z = 0;
};

struct ShortCurve {
    const Montgomery& f;
    std::uint32_t a;  // Montgomery form

    JacobianPoint32 lift(const AffinePoint& P) const {
        if (P.infinity) return JacobianPoint32{};
        return JacobianPoint32{P.x, P.y, f.to(1)};
    }
    JacobianPoint32 twice(const JacobianPoint32& P) const {
        if (P.Z == 0 || P.Y == 0) return JacobianPoint32{};
        const std::uint32_t XX = f.mul(P.X, P.X), YY = f.mul(P.Y, P.Y), YYYY = f.mul(YY, YY),
                            ZZ = f.mul(P.Z, P.Z);
        const std::uint32_t S = f.mul(f.add(f.add(P.X, P.X), f.add(P.X, P.X)), YY);
        const std::uint32_t M = f.add(f.add(f.add(XX, XX), XX), f.mul(a, f.mul(ZZ, ZZ)));
        JacobianPoint32 R;
        R.X = f.sub(f.mul(M, M), f.add(S, S));
        std::uint32_t eight = f.add(YYYY, YYYY);
        eight = f.add(eight, eight);
        eight = f.add(eight, eight);
        R.Y = f.sub(f.mul(M, f.sub(S, R.X)), eight);
        R.Z = f.mul(f.add(P.Y, P.Y), P.Z);
        return R;
    }
    // P + Q with Q affine (mixed addition).
    JacobianPoint32 add_affine(const JacobianPoint32& P, const AffinePoint& Q) const {
        if (Q.infinity) return P;
        if (P.Z == 0) return lift(Q);
        const std::uint32_t Z1Z1 = f.mul(P.Z, P.Z);
        const std::uint32_t U2 = f.mul(Q.x, Z1Z1), S2 = f.mul(Q.y, f.mul(P.Z, Z1Z1));
        const std::uint32_t H = f.sub(U2, P.X), r = f.sub(S2, P.Y);
        if (H == 0) return r == 0 ? twice(lift(Q)) : JacobianPoint32{};
        const std::uint32_t HH = f.mul(H, H), HHH = f.mul(H, HH), V = f.mul(P.X, HH);
        JacobianPoint32 R;
        R.X = f.sub(f.sub(f.mul(r, r), HHH), f.add(V, V));
        R.Y = f.sub(f.mul(r, f.sub(V, R.X)), f.mul(P.Y, HHH));
        R.Z = f.mul(P.Z, H);
        return R;
    }
    JacobianPoint32 multiply(const AffinePoint& P, std::uint64_t n) const {
        JacobianPoint32 R;
        if (n == 0 || P.infinity) return R;
        int top = 63;
        while (((n >> top) & 1) == 0) --top;
        R = lift(P);
        for (int bit = top - 1; bit >= 0; --bit) {
            R = twice(R);
            if ((n >> bit) & 1) R = add_affine(R, P);
        }
        return R;
    }
    // Affine forms of many points with one inversion (Montgomery's simultaneous inversion).
    std::vector<AffinePoint> normalise(const std::vector<JacobianPoint32>& points) const {
        std::vector<AffinePoint> out(points.size());
        std::vector<std::uint32_t> prefix(points.size());
        std::uint32_t running = f.to(1);
        for (std::size_t i = 0; i < points.size(); ++i) {
            prefix[i] = running;
            if (points[i].Z != 0) running = f.mul(running, points[i].Z);
        }
        std::uint32_t inverse = f.inverse_of(running);
        for (std::size_t i = points.size(); i-- > 0;) {
            if (points[i].Z == 0) continue;
            const std::uint32_t z_inverse = f.mul(inverse, prefix[i]);
            inverse = f.mul(inverse, points[i].Z);
            const std::uint32_t z2 = f.mul(z_inverse, z_inverse);
            out[i] = AffinePoint{f.mul(points[i].X, z2), f.mul(points[i].Y, f.mul(z2, z_inverse)),
                                 false};
        }
        return out;
    }
};

std::uint64_t isqrt(std::uint64_t n) {
    auto r = static_cast<std::uint64_t>(std::sqrt(static_cast<double>(n)));
    while (r * r > n) --r;
    while ((r + 1) * (r + 1) <= n) ++r;
    return r;
}

// Every group order m in [p+1−B, p+1+B] with m·P = O (B = ⌊2√p⌋), by baby steps jP (|j| <= s)
// and giant steps (p+1)P + k(2s+1)P, both normalised in one batch each.
std::vector<std::int64_t> orders_killing(const ShortCurve& E, const AffinePoint& P) {
    const std::uint64_t p = E.f.p;
    const auto bound = static_cast<std::int64_t>(isqrt(4 * p));
    const auto center = static_cast<std::int64_t>(p + 1);
    const auto s = static_cast<std::int64_t>(isqrt(static_cast<std::uint64_t>(bound)) + 1);
    std::vector<JacobianPoint32> baby_jacobian;
    baby_jacobian.reserve(static_cast<std::size_t>(s));
    JacobianPoint32 jP = E.lift(P);
    for (std::int64_t j = 1; j <= s; ++j) {
        if (jP.Z == 0) {
            // jP = O with (j−1)P != O: ord(P) = j <= s; the killing orders are its multiples.
            const std::int64_t order = j;
            std::vector<std::int64_t> found;
            for (std::int64_t m = (center - bound + order - 1) / order * order; m <= center + bound;
                 m += order)
                found.push_back(m);
            return found;
        }
        baby_jacobian.push_back(jP);
        jP = E.add_affine(jP, P);
    }
    struct Baby {
        std::uint32_t x, y;
        std::int64_t j;
        bool operator<(const Baby& o) const { return x < o.x; }
    };
    const auto baby_affine = E.normalise(baby_jacobian);
    std::vector<Baby> baby;
    baby.reserve(baby_affine.size());
    for (std::size_t i = 0; i < baby_affine.size(); ++i) {
        baby.push_back({baby_affine[i].x, baby_affine[i].y, static_cast<std::int64_t>(i) + 1});
    }
    std::sort(baby.begin(), baby.end());
    const std::int64_t step = 2 * s + 1;
    const std::int64_t k_max = (bound + s) / step + 1;
    std::vector<JacobianPoint32> pair{
        E.multiply(P, static_cast<std::uint64_t>(step)),
        E.multiply(P, static_cast<std::uint64_t>(center - k_max * step))};
    const auto pair_affine = E.normalise(pair);
    const AffinePoint giant = pair_affine[0];
    std::vector<JacobianPoint32> giants;
    giants.reserve(static_cast<std::size_t>(2 * k_max + 1));
    JacobianPoint32 R = E.lift(pair_affine[1]);
    for (std::int64_t k = -k_max; k <= k_max; ++k) {
        giants.push_back(R);
        R = E.add_affine(R, giant);
    }
    const auto giants_affine = E.normalise(giants);
    std::vector<std::int64_t> found;
    auto keep = [&](std::int64_t m) {
        if (m >= center - bound && m <= center + bound) found.push_back(m);
    };
    for (std::int64_t k = -k_max; k <= k_max; ++k) {
        const AffinePoint& G = giants_affine[static_cast<std::size_t>(k + k_max)];
        if (G.infinity) {
            keep(center + k * step);
            continue;
        }
        auto it = std::lower_bound(baby.begin(), baby.end(), Baby{G.x, 0, 0});
        for (; it != baby.end() && it->x == G.x; ++it) {
            // G = jP => (p+1 + k step − j)P = O;  G = −jP => (p+1 + k step + j)P = O
            keep(center + k * step + (it->y == G.y ? -it->j : it->j));
        }
    }
    std::sort(found.begin(), found.end());
    found.erase(std::unique(found.begin(), found.end()), found.end());
    return found;
}

// splitmix64: deterministic pseudo-random x-coordinates (no global state).
std::uint64_t mix(std::uint64_t z) {
    z += 0x9e3779b97f4a7c15ULL;
    z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
    z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
    return z ^ (z >> 31);
}

// #E(F_p) by listing every (x, y) of the long Weierstrass form (small p only).
std::int64_t count_points_directly(const Curve& e, std::uint64_t p) {
    auto r = [&](const Rational& v) { return static_cast<std::int64_t>(residue(v.get_num(), p)); };
    const std::int64_t a1 = r(e.a1), a2 = r(e.a2), a3 = r(e.a3), a4 = r(e.a4), a6 = r(e.a6);
    const auto q = static_cast<std::int64_t>(p);
    std::int64_t count = 1;
    for (std::int64_t x = 0; x < q; ++x) {
        for (std::int64_t y = 0; y < q; ++y) {
            const std::int64_t lhs = (y * y + a1 * x * y + a3 * y) % q;
            const std::int64_t rhs = ((x * x % q) * x + a2 * x % q * x + a4 * x + a6) % q;
            if (lhs == rhs) ++count;
        }
    }
    return count;
}

}  // namespace

int jacobi_symbol(std::uint64_t x, std::uint64_t n) {
    x %= n;
    int sign = 1;
    while (x != 0) {
        while ((x & 1) == 0) {
            x >>= 1;
            const std::uint64_t r = n & 7;
            if (r == 3 || r == 5) sign = -sign;
        }
        std::swap(x, n);
        if ((x & 3) == 3 && (n & 3) == 3) sign = -sign;
        x %= n;
    }
    return n == 1 ? sign : 0;
}

LSeriesCurve lseries_curve(const Curve& curve) {
    LSeriesCurve result;
    result.input = curve;
    result.minimal = minimal_model(curve);
    result.bad_primes = bad_reduction(result.minimal.curve);
    result.conductor = 1;
    for (const auto& local : result.bad_primes) {
        Integer power;
        mpz_pow_ui(power.get_mpz_t(), local.prime.get_mpz_t(),
                   static_cast<unsigned long>(local.conductor_exponent));
        result.conductor *= power;
    }
    const Rational c4_value = arcsieve::c4(result.minimal.curve);
    const Rational c6_value = arcsieve::c6(result.minimal.curve);
    result.c4 = c4_value.get_num();
    result.c6 = c6_value.get_num();
    return result;
}

const LocalReduction* bad_reduction_at(const LSeriesCurve& curve, std::uint64_t prime) {
    for (const auto& local : curve.bad_primes) {
        if (local.prime == static_cast<unsigned long>(prime)) return &local;
    }
    return nullptr;
}

std::int64_t trace_by_legendre_sum(std::uint64_t a, std::uint64_t b, std::uint64_t prime) {
    const SmallField f{prime};
    std::vector<std::int8_t> chi(prime, -1);
    chi[0] = 0;
    for (std::uint64_t y = 1; y <= prime / 2; ++y) chi[f.mul(y, y)] = 1;
    std::int64_t sum = 0;
    for (std::uint64_t x = 0; x < prime; ++x) {
        const std::uint64_t value = f.add(f.mul(f.add(f.mul(x, x), a), x), b);
        sum += chi[value];
    }
    return -sum;
}

std::int64_t trace_by_baby_giant(std::uint64_t a, std::uint64_t b, std::uint64_t prime) {
    if (prime >= (1ULL << 31)) throw std::invalid_argument("trace_by_baby_giant: p >= 2^31");
    if (prime < 1000) return trace_by_legendre_sum(a, b, prime);
    const SmallField plain{prime};
    const Montgomery f(static_cast<std::uint32_t>(prime));
    const auto bound = static_cast<std::int64_t>(isqrt(4 * prime));
    const auto center = static_cast<std::int64_t>(prime + 1);
    std::vector<std::int64_t> candidates;  // possible a_p
    bool have_candidates = false;
    std::uint64_t seed = prime * 0x2545F4914F6CDD1DULL;
    for (int round = 0; round < 64; ++round) {
        // A random x with v = x^3 + ax + b != 0; (xv, v^2) lies on y^2 = x^3 + a v^2 x + b v^3,
        // which is E when v is a square and the quadratic twist of E when it is not.
        seed = mix(seed);
        const std::uint64_t x = seed % prime;
        const std::uint64_t value = plain.add(plain.mul(plain.add(plain.mul(x, x), a), x), b);
        if (value == 0) continue;
        const int chi = jacobi_symbol(value, prime);
        const ShortCurve curve{f, f.to(plain.mul(a, plain.mul(value, value)))};
        const AffinePoint P{f.to(plain.mul(x, value)), f.to(plain.mul(value, value)), false};
        // #curve = p + 1 − chi·a_p
        if (!have_candidates || candidates.size() > 8) {
            std::vector<std::int64_t> from_point;
            for (std::int64_t m : orders_killing(curve, P))
                from_point.push_back(chi * (center - m));
            std::sort(from_point.begin(), from_point.end());
            if (!have_candidates) {
                candidates = from_point;
                have_candidates = true;
            } else {
                std::vector<std::int64_t> both;
                std::set_intersection(candidates.begin(), candidates.end(), from_point.begin(),
                                      from_point.end(), std::back_inserter(both));
                candidates = both;
            }
        } else {
            std::vector<std::int64_t> kept;
            for (std::int64_t t : candidates) {
                const std::int64_t order = center - chi * t;
                if (curve.multiply(P, static_cast<std::uint64_t>(order)).Z == 0) kept.push_back(t);
            }
            candidates = kept;
        }
        if (candidates.size() == 1 && std::llabs(candidates.front()) <= bound) {
            return candidates.front();
        }
        if (have_candidates && candidates.empty()) break;  // cannot happen for a nonsingular curve
    }
    return trace_by_legendre_sum(a, b, prime);  // always correct, O(p)
}

std::int64_t trace_of_frobenius(const LSeriesCurve& curve, std::uint64_t prime) {
    if (const LocalReduction* local = bad_reduction_at(curve, prime)) {
        switch (local->kind) {
            case ReductionKind::split_multiplicative:
                return 1;
            case ReductionKind::nonsplit_multiplicative:
                return -1;
            case ReductionKind::additive:
                return 0;
            case ReductionKind::good:
                break;
        }
        throw std::logic_error("bad prime with good reduction kind");
    }
    if (prime < 5) {
        return static_cast<std::int64_t>(prime + 1) -
               count_points_directly(curve.minimal.curve, prime);
    }
    // y^2 = x^3 − 27 c4 x − 54 c6 is isomorphic to E over Z[1/6] (Silverman AEC III.1).
    const std::uint64_t a = (prime - residue(curve.c4, prime) * 27 % prime) % prime;
    const std::uint64_t b = (prime - residue(curve.c6, prime) * 54 % prime) % prime;
    return trace_by_baby_giant(a, b, prime);
}

std::vector<std::uint32_t> primes_up_to(std::uint32_t limit) {
    std::vector<std::uint32_t> primes;
    if (limit < 2) return primes;
    std::vector<bool> composite(static_cast<std::size_t>(limit) + 1, false);
    for (std::uint64_t i = 2; i <= limit; ++i) {
        if (composite[i]) continue;
        primes.push_back(static_cast<std::uint32_t>(i));
        for (std::uint64_t j = i * i; j <= limit; j += i) composite[j] = true;
    }
    return primes;
}

std::vector<std::int32_t> prime_traces(const LSeriesCurve& curve, std::uint32_t limit,
                                       unsigned threads) {
    const auto primes = primes_up_to(limit);
    std::vector<std::int32_t> traces(primes.size());
    run_with_threads(threads, [&] {
        tbb::parallel_for(
            tbb::blocked_range<std::size_t>(0, primes.size(), 512),
            [&](const tbb::blocked_range<std::size_t>& range) {
                for (std::size_t i = range.begin(); i != range.end(); ++i) {
                    traces[i] = static_cast<std::int32_t>(trace_of_frobenius(curve, primes[i]));
                }
            });
    });
    return traces;
}

std::vector<std::int32_t> dirichlet_coefficients(const LSeriesCurve& curve, std::uint32_t count,
                                                 unsigned threads) {
    if (count >= (1U << 31)) throw std::invalid_argument("dirichlet_coefficients: count >= 2^31");
    const auto primes = primes_up_to(count);
    const auto traces = prime_traces(curve, count, threads);
    std::vector<std::int32_t> a(static_cast<std::size_t>(count) + 1, 1);
    a[0] = 0;
    // Multiply in a_{p^k} at every n whose p-part is exactly p^k.
    for (std::size_t i = 0; i < primes.size(); ++i) {
        const std::int64_t p = primes[i];
        const bool bad = bad_reduction_at(curve, static_cast<std::uint64_t>(p)) != nullptr;
        std::int64_t previous = 1, current = traces[i];  // a_{p^{k−1}}, a_{p^k}
        for (std::int64_t q = p; q <= count; q *= p) {
            for (std::int64_t n = q, j = 1; n <= count; n += q, ++j) {
                if (j % p == 0) continue;
                a[static_cast<std::size_t>(n)] =
                    static_cast<std::int32_t>(a[static_cast<std::size_t>(n)] * current);
            }
            const std::int64_t next =
                bad ? current * traces[i] : traces[i] * current - p * previous;
            previous = current;
            current = next;
            if (q > count / p) break;
        }
    }
    return a;
}

}  // namespace arcsieve::lseries
