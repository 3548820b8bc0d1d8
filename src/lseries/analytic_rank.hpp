// Proven ranks from certified L-values: the root number (local product, certified functional
// equation), enclosures of L^(r)(E,1), and the theorems that turn them into ranks:
// w = +1, 0 ∉ L(E,1) ⇒ rank 0 (Kolyvagin 1988 with Gross–Zagier 1986 and modularity: Wiles,
// Breuil–Conrad–Diamond–Taylor 2001); w = −1, 0 ∉ L'(E,1) ⇒ rank 1 (Gross–Zagier + Kolyvagin).
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "analytic/real.hpp"
#include "lseries/coefficients.hpp"
#include "lseries/root_number.hpp"

namespace arcsieve::lseries {

struct AnalyticOptions {
    unsigned digits = 20;  // absolute accuracy of the L-value enclosures
    // Refuse (InputError with the estimate) when the series needs more terms than this; the
    // default covers conductors up to about 5·10^11 at 20 digits.
    std::uint64_t max_terms = 20'000'000;
    // L''(E,1), L'''(E,1) use the power series of G_r at every term: only below this many terms.
    std::uint64_t max_higher_order_terms = 400'000;
    bool check_root_number = true;  // also certify w by the functional equation
    unsigned threads = 0;           // 0: TBB decides
};

// What computing the L-series of a curve will cost before it is done.
struct SeriesCost {
    Integer conductor;
    std::uint64_t terms = 0;  // a_n needed
    double seconds = 0;       // rough, for 2 cores
};
SeriesCost series_cost(const Integer& conductor, unsigned digits);

struct SpecialValue {
    int order = 0;          // r
    Interval value;         // encloses L^(r)(E,1) / r!
    std::string condition;  // empty, or the assumption the value rests on
};

enum class RankProof { none, rank_zero_kolyvagin, rank_one_gross_zagier_kolyvagin };

struct AnalyticRank {
    Integer conductor;
    std::optional<int> root_number;
    std::string root_number_reason;
    std::vector<LocalRootNumber> local_root_numbers;
    std::optional<int> functional_equation_sign;  // when certified
    std::vector<SpecialValue> values;
    int analytic_rank_lower = 0;  // proven lower bound for the order of vanishing at s = 1
    std::optional<int> proven_rank;
    RankProof proof = RankProof::none;
    std::string proof_reason;  // the theorem, in words
    std::uint64_t terms = 0;
    double seconds = 0;
    std::vector<std::string> notes;
};

// The whole analytic computation. InputError (with the cost estimate and the option to raise)
// when the conductor needs more than options.max_terms terms.
AnalyticRank analytic_rank(const Curve& curve, const AnalyticOptions& options);
AnalyticRank analytic_rank(const LSeriesCurve& curve, const std::vector<std::int32_t>& a,
                           const AnalyticOptions& options);

// The enclosure of L'(E,1) when proven rank 1 (else nullopt).
std::optional<Interval> first_derivative(const AnalyticRank& rank);

}  // namespace arcsieve::lseries
