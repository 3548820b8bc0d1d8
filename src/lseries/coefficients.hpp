// The Dirichlet coefficients a_n of L(E, s) for an elliptic curve over Q: a_p at good primes by
// point counting (Legendre sums for small p, baby-step giant-step with Mestre's twist argument
// for large p), a_p at bad primes from the reduction type (Tate's algorithm), a_n by
// multiplicativity and the Hecke recursion. The curve's local data (conductor, bad primes).
#pragma once

#include <cstdint>
#include <vector>

#include "curve/minimal_model.hpp"
#include "curve/tate.hpp"

namespace arcsieve::lseries {

// What every L-series computation needs about E, computed once: the global minimal model,
// the change from the input curve to it, the conductor and the local reduction at bad primes.
struct LSeriesCurve {
    Curve input;
    ModelWithChange minimal;
    Integer conductor;
    std::vector<LocalReduction> bad_primes;  // increasing
    Integer c4, c6;                          // of the minimal model
};

LSeriesCurve lseries_curve(const Curve& curve);

// The reduction at p when p is bad, else nullptr.
const LocalReduction* bad_reduction_at(const LSeriesCurve& curve, std::uint64_t prime);

// a_p = p + 1 − #E(F_p) for y^2 = x^3 + a x + b over F_p, p >= 5 prime, 4a^3 + 27b^2 != 0.
// The sum −Σ_x ((x^3 + ax + b)/p) with a table of squares: O(p), the baseline.
std::int64_t trace_by_legendre_sum(std::uint64_t a, std::uint64_t b, std::uint64_t prime);
// Baby-step giant-step on random points of E and of its quadratic twist (Mestre's argument:
// for p > 229 one of them has a point whose order has a single multiple in the Hasse interval;
// Cohen GTM 138 Algorithm 7.4.12, with the twist-by-f trick so that no square roots are taken).
// O(p^{1/4}) group operations in Montgomery arithmetic and Jacobian coordinates; p < 2^31.
std::int64_t trace_by_baby_giant(std::uint64_t a, std::uint64_t b, std::uint64_t prime);

// a_p for any prime p (good or bad) of the curve.
std::int64_t trace_of_frobenius(const LSeriesCurve& curve, std::uint64_t prime);

// Jacobi symbol (x/n) for odd n > 0 (binary algorithm; common practice).
int jacobi_symbol(std::uint64_t x, std::uint64_t n);

// Primes <= limit (Eratosthenes).
std::vector<std::uint32_t> primes_up_to(std::uint32_t limit);

// a_p for every prime p <= limit, in the order of primes_up_to(limit); TBB parallel over
// primes (threads = 0: TBB decides).
std::vector<std::int32_t> prime_traces(const LSeriesCurve& curve, std::uint32_t limit,
                                       unsigned threads = 0);

// a_1 .. a_count (index 0 unused, holds 0): a_{p^k} = a_p a_{p^{k−1}} − p a_{p^{k−2}} at good p,
// a_p^k at bad p, and a_{mn} = a_m a_n for coprime m, n (Silverman AEC V.2, Cremona §2.10;
// common practice). |a_n| <= d(n)√n keeps every value in 32 bits for count < 2^31.
std::vector<std::int32_t> dirichlet_coefficients(const LSeriesCurve& curve, std::uint32_t count,
                                                 unsigned threads = 0);

}  // namespace arcsieve::lseries
