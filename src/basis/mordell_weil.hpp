// The Mordell–Weil basis of one curve: rank bounds, generators modulo torsion (LLL-reduced in
// the height pairing), their canonical heights, the regulator, how far saturation is proved,
// and notes on everything that could not be decided. The entry point for locate/solve/survey.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "analytic/real.hpp"
#include "curve/point.hpp"
#include "curve/torsion.hpp"
#include "lseries/report.hpp"

namespace arcsieve {

struct BasisOptions {
    // Direct search on the global minimal model: x = u/w^2 with |u|, w^2 <= search_height_bound.
    Integer search_height_bound{250000};
    // 2-isogeny descent: |u|, v <= quartic_bound on every soluble quartic not yet explained.
    std::int64_t quartic_bound = 400;
    // Saturation is proved at every prime ℓ <= saturation_prime_bound (or fails with a note).
    int saturation_prime_bound = 50;
    // Proven ranks from certified L-values (lseries/analytic_rank.hpp) for curves of conductor
    // up to this bound when descent and search leave the rank open; 0 switches it off.
    Integer analytic_conductor_bound{100'000'000'000};
    // Heegner point (lseries/heegner.hpp) when rank 1 is proven and no generator was found;
    // the sum is refused (with its cost in the notes) above this time or this many terms.
    // 0 switches it off (the default; with_effort(e >= 1) sets 300·e seconds).
    double heegner_time_limit_seconds = 0;
    std::uint64_t heegner_max_terms = 400'000'000;
    unsigned digits = 30;  // correct decimal digits of heights and regulator
    unsigned threads = 0;  // 0: TBB decides

    // effort 0: quick (survey pre-pass), 1: the defaults (well under a second for E_N, N <= 100),
    // 2, 3, ...: each step multiplies the quartic bound and the search bound by 3.
    static BasisOptions with_effort(int effort);
};

struct RankBounds {
    int lower = 0;
    std::optional<int> upper;  // nullopt: not bounded by this program (see notes)
    bool known() const { return upper && *upper == lower; }
};

// What the 2-isogeny descent showed (F_2-dimensions; see basis/two_isogeny_descent.hpp).
struct DescentSummary {
    int selmer_dimension = 0;            // Sel^φ(E): quartics b1 u^4 + A u^2 v^2 + (B/b1) v^4
    int isogenous_selmer_dimension = 0;  // Sel^φ'(E') on the isogenous curve
    int found_dimension = 0;             // images of points found on E (incl. 1 and B)
    int isogenous_found_dimension = 0;
};

struct MordellWeilBasis {
    RankBounds rank;
    std::vector<Point> generators;        // on the input curve, independent, of infinite order
    std::vector<Real> generator_heights;  // ĥ (LMFDB normalisation, analytic/height.hpp)
    Real regulator;                       // det of the height matrix; 1 when there are none
    TorsionGroup torsion;                 // on the input curve
    // Every prime ℓ <= saturated_up_to is proved not to divide [E(Q) : <generators, torsion>]
    // (within the span of the generators; if rank.lower < true rank nothing is claimed beyond).
    int saturated_up_to = 1;
    // Upper bound for the index of <generators, torsion> in its saturation (the rational points
    // of its Q-span) from a lower bound on ĥ over non-torsion points (Silverman's
    // height-difference bound with the search region, see notes); nullopt if not obtained.
    std::optional<double> index_bound;
    // index_bound < next prime after saturated_up_to: the subgroup is saturated in E(Q). This
    // holds whatever the rank; it says nothing about points outside the span of the generators.
    bool saturation_complete = false;
    std::optional<DescentSummary> descent;
    std::optional<int> root_number;  // from the functional equation, when computed
    // Analytic data (root number, L-value enclosures, proven rank and its theorem, BSD height
    // prediction, the Heegner construction) when the lseries layer was used.
    std::optional<lseries::AnalyticReport> analytic;
    // How the points behind the generators were found: "given", "descent", "search",
    // "Heegner (D = ..., index ...)"; one entry per route that contributed.
    std::vector<std::string> generator_sources;
    std::vector<std::string> notes;

    // As many independent generators as the rank, and the rank proven: only then do the
    // generators span E(Q) ⊗ Q, so that saturation means they generate E(Q) with the torsion.
    bool full_rank() const {
        return rank.known() && generators.size() == static_cast<std::size_t>(rank.lower);
    }
    // Proven: the generators and the torsion generate E(Q).
    bool generates() const { return full_rank() && saturation_complete; }
    // The points generate E(Q)/2E(Q) (full rank and saturated at 2): the component argument
    // for "no positive solution" rests on this (docs/design-notes.md).
    bool generates_modulo_2() const { return full_rank() && saturated_up_to >= 2; }
    bool settled() const { return generates(); }
};

// Generators of E(Q) modulo torsion for `curve` (any Weierstrass model over Q). Points in
// `given` are checked first — on the curve, of infinite order, independent — and throw
// InputError otherwise; they are then used together with what the search finds, and saturated
// like any other. Never throws for a mathematical "don't know": that goes into the notes.
MordellWeilBasis mordell_weil_basis(const Curve& curve, const BasisOptions& options,
                                    const std::vector<Point>& given = {});

}  // namespace arcsieve
