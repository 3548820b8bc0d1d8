// Heegner points for curves of analytic rank 1 (Gross and Zagier, "Heegner points and
// derivatives of L-series", Invent. Math. 84 (1986)): the choice of discriminant D, the Heegner
// forms [N·a, b, c] of discriminant D with b ≡ β (mod 2N), the modular parametrisation
// z = Σ_τ Σ_n a_n/n e^{2πinτ} as mergeable interval partial sums over ranges of n (the unit
// of work that threads and MPI ranks share), and the recovery of a rational point from z:
// division by the index in C/Λ, ℘ by the analytic layer, continued fractions, exact check.
// Method as in Cohen, GTM 138 §7.5 and Cremona, "Algorithms for Modular Elliptic Curves" §2.
#pragma once

#include <cstdint>
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "analytic/real.hpp"
#include "curve/point.hpp"
#include "lseries/analytic_rank.hpp"
#include "lseries/coefficients.hpp"

namespace arcsieve::lseries {

// BSD for rank 1 (conditional on the Birch–Swinnerton-Dyer conjecture):
// ĥ(P)·|Sha| = L'(E,1)·|T|² / (Ω·∏c_p), ĥ in arcsieve's normalisation (no factor ½) and Ω the
// least positive real period of the minimal model times the number of real components (the
// LMFDB's Ω) — the combination that reproduces the 117a1 identity of REFERENCE-VALUES.md.
struct HeightPrediction {
    Real height_times_sha;  // ĥ(generator)·|Sha|
    Real omega;             // Ω as above
    int tamagawa_product = 1;
    int torsion_order = 1;
};
HeightPrediction predicted_generator_height(const LSeriesCurve& curve,
                                            const Interval& first_derivative, unsigned digits);

// A Heegner form [A, B, C], A = N·a, B² − 4AC = D; its point is τ = (−B + √D)/(2A).
struct HeegnerForm {
    Integer a, b, c;
};

struct HeegnerOptions {
    unsigned threads = 0;                   // 0: TBB decides
    double time_limit_seconds = 900;        // refuse a sum whose estimate exceeds this; stop at it
    std::uint64_t max_terms = 400'000'000;  // refuse above (a_n table and sum length)
    long max_discriminant = 3000;           // |D| searched up to this
    int discriminants_compared = 10;        // candidates whose cost is compared
    long discriminant = 0;  // 0: choose; else use this D (must satisfy the hypothesis)
    // Extra decimal digits beyond the prediction (the precision then grows on failure).
    unsigned extra_digits = 10;
    std::function<void(const std::string&)> progress;  // one line per stage (may be empty)
};

// Everything fixed before the sum: D, β, the forms, the predicted heights, the precision and
// the number of terms for each form.
struct HeegnerPlan {
    Integer conductor;
    long discriminant = 0;
    Integer beta;  // β² ≡ D (mod 4N), 0 <= β < 2N
    int class_number = 0;
    std::vector<HeegnerForm> forms;
    std::vector<std::uint64_t> form_terms;  // M_i for each form
    Interval twisted_value;                 // L(E_D, 1), nonzero
    double predicted_generator_height = 0;  // BSD with |Sha| = 1
    double predicted_heegner_height = 0;    // Gross–Zagier, of y_K = Σ φ(τ_i)
    double predicted_index = 0;             // √(ratio)
    unsigned digits = 0;                    // absolute accuracy of z
    std::uint64_t max_terms = 0;            // max_i M_i (a_n needed up to here)
    std::uint64_t total_terms = 0;          // Σ_i M_i
    double seconds_estimate = 0;            // for the sum on the threads given
    double core_hours = 0;
};

// Heegner hypothesis: every p | N splits in Q(√D) (D ≡ β² mod 4N), D < −4 fundamental.
bool satisfies_heegner_hypothesis(const LSeriesCurve& curve, long discriminant);
bool is_fundamental_discriminant(long discriminant);
// β with β² ≡ D (mod 4N), 0 <= β < 2N (CRT over the prime powers of 4N), nullopt if none.
std::optional<Integer> square_root_mod_4n(const Integer& conductor,
                                          const std::vector<LocalReduction>& bad, long D);
// One form [N·a, b, c] (b ≡ β mod 2N) per class of discriminant D, with a as small as
// possible (the largest Im τ in the class), found by increasing a.
std::vector<HeegnerForm> heegner_forms(const Integer& conductor, long discriminant,
                                       const Integer& beta);
int class_number(long discriminant);

// Chooses D and sizes the sum. `first_derivative` is the enclosure of L'(E,1); `a` must cover
// the twisted L-values (it is extended by the caller when needed: see heegner_point).
// InputError with the cost when the cheapest choice exceeds options.max_terms.
HeegnerPlan plan_heegner(const LSeriesCurve& curve, const Interval& first_derivative,
                         const HeegnerOptions& options);

// Σ over the forms of Σ_{begin <= n < end, n <= M_i} a_n/n q_i^n, as enclosures of the real
// and imaginary parts. Rounding errors of the MPFR recurrences are bounded a priori (each
// complex product costs at most 4u relative, u = 2^{1−precision}; Higham, Accuracy and
// Stability of Numerical Algorithms, §3.6) and added to the intervals; the tails n > M_i are
// added by heegner_trace. Independent ranges merge by interval addition.
struct HeegnerPartialSum {
    std::uint64_t begin = 0, end = 0;  // n in [begin, end)
    Interval real, imaginary;
};
HeegnerPartialSum heegner_partial_sum(const HeegnerPlan& plan, const std::vector<std::int32_t>& a,
                                      std::uint64_t begin, std::uint64_t end, unsigned threads = 0,
                                      double deadline_seconds = 0);
// Exact merge of adjacent or disjoint ranges (throws std::invalid_argument on overlap).
HeegnerPartialSum merge(const HeegnerPartialSum& x, const HeegnerPartialSum& y);
// Text form (one line, endpoints in exact hexadecimal) and back.
std::string serialise(const HeegnerPartialSum& sum);
HeegnerPartialSum deserialise_partial_sum(const std::string& text);

// z = Σ_i φ(τ_i) from the partial sums covering [1, max_terms], tails added.
struct HeegnerTrace {
    Interval real, imaginary;
};
HeegnerTrace heegner_trace(const HeegnerPlan& plan, const HeegnerPartialSum& total);

struct HeegnerResult {
    Point point;  // on the input curve, verified exactly
    long discriminant = 0;
    int index = 0;       // y_K = index·P + T in E(Q) (after the scaling below)
    int multiplier = 1;  // y_K taken as multiplier·z in the lattice of the given model
    Real height;         // ĥ(point), our normalisation
    unsigned digits = 0;
    std::uint64_t terms = 0;
    double seconds = 0;
    std::vector<std::string> notes;
};

// From the trace to a rational point: for the index ℓ around the predicted one (and small
// multipliers for a model whose lattice differs from the modular one), every division of z by
// ℓ in C/Λ on the real locus, minus every torsion point, is mapped by ℘ to x, x is recognised
// by continued fractions and the point is checked exactly on the curve. nullopt if none
// verifies at this precision.
std::optional<HeegnerResult> recover_heegner_point(const LSeriesCurve& curve,
                                                   const HeegnerPlan& plan,
                                                   const HeegnerTrace& trace);

// The whole construction for a curve of proven analytic rank 1; the precision grows (up to
// twice) until the recovered point verifies. nullopt with the reason in `notes` otherwise.
// InputError when the estimated cost exceeds the limits of `options` (the message names them).
std::optional<HeegnerResult> heegner_point(const Curve& curve, const AnalyticRank& rank,
                                           const HeegnerOptions& options,
                                           std::vector<std::string>* notes = nullptr);

}  // namespace arcsieve::lseries
