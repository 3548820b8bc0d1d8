#include "lseries/analytic_rank.hpp"

#include <fmt/format.h>

#include <chrono>
#include <cmath>
#include <stdexcept>

#include "lseries/special_values.hpp"

namespace arcsieve::lseries {

namespace {

double elapsed(std::chrono::steady_clock::time_point start) {
    return std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
}

}  // namespace

SeriesCost series_cost(const Integer& conductor, unsigned digits) {
    SeriesCost cost;
    cost.conductor = conductor;
    cost.terms = std::max(special_value_terms(conductor, digits),
                          functional_equation_terms(conductor, digits));
    // Measured on this project's 2-core machine: about 4 µs per term (a_p by baby-step
    // giant-step dominates below 10^7 terms, the G_1 enclosures above).
    cost.seconds = 4e-6 * static_cast<double>(cost.terms);
    return cost;
}

AnalyticRank analytic_rank(const Curve& curve, const AnalyticOptions& options) {
    if (options.digits < 5 || options.digits > 200)
        throw InputError("L-value digits must lie in [5, 200]");
    const LSeriesCurve lcurve = lseries_curve(curve);
    const SeriesCost cost = series_cost(lcurve.conductor, options.digits);
    if (cost.terms > options.max_terms) {
        throw InputError(fmt::format(
            "conductor {} needs {} L-series terms (about {:.0f} s on 2 cores) for {} digits, above "
            "the limit of {} terms: raise the L-series term limit to allow it",
            to_string(lcurve.conductor), cost.terms, cost.seconds, options.digits,
            options.max_terms));
    }
    const auto a =
        dirichlet_coefficients(lcurve, static_cast<std::uint32_t>(cost.terms + 1), options.threads);
    return analytic_rank(lcurve, a, options);
}

AnalyticRank analytic_rank(const LSeriesCurve& lcurve, const std::vector<std::int32_t>& a,
                           const AnalyticOptions& options) {
    const auto start = std::chrono::steady_clock::now();
    AnalyticRank result;
    result.conductor = lcurve.conductor;
    result.terms = special_value_terms(lcurve.conductor, options.digits);
    result.local_root_numbers = local_root_numbers(lcurve);
    const std::optional<int> from_local = root_number_from_local(result.local_root_numbers);
    if (!from_local || options.check_root_number) {
        result.functional_equation_sign =
            functional_equation_sign(lcurve.conductor, a, options.digits, options.threads);
    }
    if (from_local && result.functional_equation_sign &&
        *from_local != *result.functional_equation_sign) {
        throw std::logic_error(fmt::format(
            "root number {} from local factors but {} from the functional equation (conductor {})",
            *from_local, *result.functional_equation_sign, to_string(lcurve.conductor)));
    }
    if (from_local) {
        result.root_number = from_local;
        result.root_number_reason = result.functional_equation_sign
                                        ? "product of local root numbers, confirmed by the "
                                          "certified functional equation"
                                        : "product of local root numbers";
    } else if (result.functional_equation_sign) {
        result.root_number = result.functional_equation_sign;
        result.root_number_reason =
            "certified functional equation f(i/(Ny)) = w·N·y²·f(iy) (interval enclosures); a "
            "local factor at 2 or 3 is not tabulated here";
    } else {
        result.root_number_reason =
            "undecided: a local factor at 2 or 3 is not tabulated and "
            "the functional-equation enclosures decided neither sign";
        result.notes.push_back("root number unknown: no L-value claims");
        result.seconds = elapsed(start);
        return result;
    }
    const int w = *result.root_number;
    const int first = w == 1 ? 0 : 1;
    result.analytic_rank_lower = first;  // w = −1 forces L(E,1) = 0
    SpecialValue value;
    value.order = first;
    value.value = special_value(lcurve.conductor, a, first, options.digits, options.threads);
    result.values.push_back(value);
    if (!contains_zero(value.value)) {
        result.proven_rank = first;
        if (first == 0) {
            result.proof = RankProof::rank_zero_kolyvagin;
            result.proof_reason =
                "L(E,1) != 0 (certified enclosure) => rank 0 (Kolyvagin 1988, Gross–Zagier 1986; "
                "modularity by Wiles and Breuil–Conrad–Diamond–Taylor)";
        } else {
            result.proof = RankProof::rank_one_gross_zagier_kolyvagin;
            result.proof_reason =
                "w = −1 and L'(E,1) != 0 (certified enclosure) => rank 1 (Gross–Zagier 1986 with "
                "Kolyvagin 1988; modularity by Wiles and Breuil–Conrad–Diamond–Taylor)";
        }
        result.seconds = elapsed(start);
        return result;
    }
    result.notes.push_back(fmt::format(
        "the enclosure of L{}(E,1) contains 0 at {} digits: the order of vanishing is >= {} "
        "(parity) and nothing more is proved",
        first == 0 ? "" : "'", options.digits, first));
    if (result.terms <= options.max_higher_order_terms) {
        SpecialValue higher;
        higher.order = first + 2;
        higher.value =
            special_value(lcurve.conductor, a, first + 2, options.digits, options.threads) /
            (first == 0 ? 2 : 6);
        higher.condition =
            first == 0 ? "valid if L(E,1) = 0 (not proved)" : "valid if L'(E,1) = 0 (not proved)";
        result.values.push_back(higher);
    } else {
        result.notes.push_back(
            fmt::format("L^({})(E,1) not computed: {} terms exceed the higher-order limit {}",
                        first + 2, result.terms, options.max_higher_order_terms));
    }
    result.seconds = elapsed(start);
    return result;
}

std::optional<Interval> first_derivative(const AnalyticRank& rank) {
    if (rank.proof != RankProof::rank_one_gross_zagier_kolyvagin) return std::nullopt;
    for (const auto& v : rank.values) {
        if (v.order == 1) return v.value;
    }
    return std::nullopt;
}

}  // namespace arcsieve::lseries
