// Certified special values of L(E, s) at s = 1: the rapidly converging series
// L^(r)(E,1) = 2·r!·Σ a_n/n · G_r(2πn/√N) (Cremona, "Algorithms for Modular Elliptic Curves",
// 2nd ed. §2.13; Cohen GTM 239 §8.5), summed in MPFI with a rigorous bound on the tail and
// rigorous enclosures of G_r, and the sign of the functional equation certified the same way.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "analytic/real.hpp"
#include "lseries/coefficients.hpp"

namespace arcsieve::lseries {

// G_r(x) = (1/(r−1)!) ∫_1^∞ e^{−xt} (log t)^{r−1} dt/t for r >= 1, G_0(x) = e^{−x}, x > 0,
// as an enclosure of absolute width about 2^-bits (relative for r = 0). The power series
// G_r(x) = P_r(−log x) + Σ_{n>=1} (−1)^{n−r} x^n / (n^r n!) with P_r(t) = [s^r] e^{ts}Γ(1+s)
// (Cremona §2.13), carried at bits + 1.45x so that the cancellation is paid for, and for r = 1
// and large x the enveloping asymptotic series e^{−x}/x Σ (−1)^k k!/x^k (Abramowitz and Stegun
// 5.1.51: the remainder is below the first omitted term). r in [0, 3].
Interval incomplete_gamma_family(int r, const Interval& x, unsigned bits);

// Terms of the series for L^(r)(E,1) needed for absolute accuracy 10^-digits at conductor N.
std::uint64_t special_value_terms(const Integer& conductor, unsigned digits);
// Terms of the Fricke functional-equation check (the slowest side, λ = 1.7).
std::uint64_t functional_equation_terms(const Integer& conductor, unsigned digits);

// An enclosure of L^(r)(E,1) (not divided by r!) from the a_n (index n, a.size() > terms),
// valid when the root number w equals (−1)^r and L^(k)(E,1) = 0 for every k < r (automatic for
// r <= 1). The tail Σ_{n>M} is bounded by |a_n|/n <= d(n)/√n <= 2 and G_r(y) <= e^{−y}/y.
// TBB parallel over n.
Interval special_value(const Integer& conductor, const std::vector<std::int32_t>& a, int order,
                       unsigned digits, unsigned threads = 0);

// The sign w of Λ(s) = w Λ(2−s), certified from f(i/(N y)) = w N y² f(i y) (Cremona §2.13;
// the functional equation holds by modularity, Wiles / Breuil–Conrad–Diamond–Taylor): both
// sides are enclosed in MPFI with rigorous tails; w = −1 is proved when the two sides differ,
// +1 when their sum is nonzero. nullopt when the enclosures decide neither at any of the
// points tried (then nothing is claimed). Needs a.size() > functional_equation_terms.
std::optional<int> functional_equation_sign(const Integer& conductor,
                                            const std::vector<std::int32_t>& a, unsigned digits,
                                            unsigned threads = 0);

// Central value of the quadratic twist E_D (conductor N·D², gcd(D, N) = 1, D a fundamental
// discriminant) whose root number is +1: L(E_D,1) = 2 Σ χ_D(n) a_n/n e^{−2πn/(|D|√N)}. Needs
// a.size() > special_value_terms(N·D², digits).
Interval twisted_central_value(const Integer& conductor, long discriminant,
                               const std::vector<std::int32_t>& a, unsigned digits,
                               unsigned threads = 0);

// Kronecker symbol (D/n) for a discriminant D and n >= 1 (common practice).
int kronecker(long discriminant, std::uint64_t n);

// Width-aware helpers for reports.
bool contains_zero(const Interval& x);
std::string format_enclosure(const Interval& x, int significant = 16);

}  // namespace arcsieve::lseries
