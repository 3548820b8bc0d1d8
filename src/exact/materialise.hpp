// Exact solutions: n·P + T by a Jacobian doubling chain with one normalisation at the end, the
// map to coprime (a, b, c), exact verification of the equation, a size estimate from ĥ before
// starting (with a refusal above a limit), streamed digit files and a short on-screen form.
#pragma once

#include <array>
#include <string>
#include <vector>

#include "arith/factor.hpp"
#include "exact/multiple.hpp"
#include "family/ratio_sum.hpp"

namespace arcsieve::exact {

// x = X / W², y = Y / W³ in lowest terms (gcd(X, W) = 1, W > 0).
struct ReducedPoint {
    Integer X, Y, W;
};

// n·P + T without any gcd along the chain. The chain's common factors come only from the
// primes where the doubling formulas degenerate (bad primes and 2); they are removed prime by
// prime from `extraneous_primes` and, when `check_reduced` is set, gcd(X, W) = 1 is confirmed
// (std::runtime_error otherwise).
ReducedPoint materialise_point(const JacobianCurve& curve, const Multiple& q,
                               const std::vector<Integer>& extraneous_primes,
                               bool check_reduced = true);

// Left-to-right binary chain in Jacobian coordinates with additions of the affine base point.
JacobianPoint jacobian_chain(const JacobianCurve& curve, const Point& p, const Integer& n);

// What writing the solution would cost, from ĥ(Q) = n² ĥ(P): |a|, |b|, |c| ≈ W³ with
// 2·log W ≈ ĥ(Q) (DESIGN.md §2, leaving out the bounded λ_∞ and c_p terms).
struct SizeEstimate {
    double digits = 0;        // decimal digits of the largest of a, b, c
    double memory_bytes = 0;  // peak working memory of the chain and the check
    double disk_bytes = 0;    // the three numbers in decimal with newlines
};
SizeEstimate estimate_ratio_sum_size(const Integer& N, const Multiple& q);

// Refusal above the size limit; the message states size, memory, disk and the option to raise.
struct SizeLimitExceeded : InputError {
    using InputError::InputError;
};

// The command-line option (of solve, survey and arcsieve-mpi) that raises the size limit.
inline constexpr const char* max_digits_option = "--size-limit";

// "the solution would have about … digits …, needs … of memory and … of disk (raise the limit
// with --size-limit)": the refusal message, shared by every caller that checks the estimate.
std::string size_limit_message(const SizeEstimate& estimate, double max_digits);

struct MaterialiseOptions {
    double max_digits = 1e8;
    // Confirm gcd(X, W) = 1 and gcd(a, b, c) = 1 by full gcds. Off by default: coprimality
    // holds by construction (the common factors are removed at the only primes that can carry
    // them) and the full gcds cost about 25 multiplications at 10^6 digits (bench_materialise).
    bool check_coprime = false;
};

struct MaterialisedSolution {
    family::Triple triple;  // coprime, a + b + c > 0 (family::normalise convention)
    std::array<std::size_t, 3> digits{};
    std::vector<PrimePower> gcd;  // the common factor the map introduced, removed
    bool positive = false;
    bool verified = false;  // the cleared equation holds exactly, denominators nonzero
    SizeEstimate estimate;
};

// Materialises, maps, normalises and verifies. Throws SizeLimitExceeded above the limit and
// InputError when Q maps to a degenerate triple (a vanishing denominator).
MaterialisedSolution materialise_ratio_sum(const Integer& N, const Multiple& q,
                                           const MaterialiseOptions& options = {});

// Exact check without divisions: with s = a+b+c, p2 = ab+bc+ca, p3 = abc the cleared equation
// is s³ = (N+2)·s·p2 − (N+3)·p3 (expand Σ a(a+b)(a+c) = N (a+b)(b+c)(c+a) in symmetric
// functions). Also requires the denominators b+c, c+a, a+b to be nonzero.
bool satisfies_ratio_sum_fast(const Integer& N, const family::Triple& t);

// Writes a, b, c in decimal, one per line, to `path`, or to path + ".a", ".b", ".c" when
// one_file_per_variable. Digits go straight from GMP to the file. Returns the files written.
std::vector<std::string> write_solution(const family::Triple& t, const std::string& path,
                                        bool one_file_per_variable);

// "1544768021…5277999 (81 digits)": the first and last `edge` digits and the exact count;
// the whole number when it has at most 2·edge + 3 digits.
std::string short_form(const Integer& value, unsigned edge = 12);

}  // namespace arcsieve::exact
