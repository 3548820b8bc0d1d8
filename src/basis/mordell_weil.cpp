#include "basis/mordell_weil.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <stdexcept>

#include "analytic/height.hpp"
#include "arith/factor.hpp"
#include "basis/height_lattice.hpp"
#include "basis/point_search.hpp"
#include "basis/saturation.hpp"
#include "basis/two_isogeny_descent.hpp"
#include "curve/minimal_model.hpp"
#include "lseries/analytic_rank.hpp"
#include "lseries/heegner.hpp"

namespace arcsieve {

namespace {

using basis::GramMatrix;

struct WorkingModel {
    Curve curve;         // integral, a1 = a3 = 0 (and a 2-torsion point at (0,0) if any)
    ModelChange change;  // input -> curve
    std::optional<basis::TwoTorsionModel> two_torsion;
};

WorkingModel working_model(const Curve& curve) {
    WorkingModel w;
    w.two_torsion = basis::two_torsion_model(curve);
    if (w.two_torsion) {
        w.curve = w.two_torsion->curve;
        w.change = w.two_torsion->change;
        return w;
    }
    Integer d = 1;
    for (const Rational* a : {&curve.a1, &curve.a2, &curve.a3, &curve.a4, &curve.a6}) {
        mpz_lcm(d.get_mpz_t(), d.get_mpz_t(), a->get_den_mpz_t());
    }
    ModelChange to_integral;
    to_integral.u = Rational(1, d);
    to_integral.u.canonicalize();
    const Curve integral = apply(curve, to_integral);
    w.change = compose(to_integral, a1_a3_free_change(integral));
    w.curve = apply(curve, w.change);
    return w;
}

bool is_torsion(const TorsionGroup& torsion, const Point& p) {
    return std::find(torsion.points.begin(), torsion.points.end(), p) != torsion.points.end();
}

double log_abs(const Integer& n) {
    if (n == 0) return 0;
    long exponent = 0;
    const double mantissa = mpz_get_d_2exp(&exponent, n.get_mpz_t());
    return std::log(std::fabs(mantissa)) + static_cast<double>(exponent) * std::log(2.0);
}

double naive_log_height(const Rational& q) {
    return std::max(log_abs(q.get_num()), log_abs(q.get_den()));
}

// A lower bound for ĥ(P) over every non-torsion P, from Silverman's bound on the global
// minimal model (Math. Comp. 55 (1990), Theorem 1, from memory, in the ½ normalisation:
// ĥ − ½h(x) >= −(1/8)h(j) − (1/12)log|Δ| − ½h_∞(b2/12) − ½log 2* − 0.973): a point with
// ĥ < λ has h(x_minimal) < λ + 2·(that constant), hence lies in the search region
// (naive height <= search_bound on the minimal model) when that sum is below log(bound).
// Returns nullopt if no positive λ follows.
std::optional<double> height_lower_bound(const ModelWithChange& minimal,
                                         const Integer& search_bound, double smallest_found,
                                         std::vector<std::string>& notes) {
    // The b2 and 2* terms of the theorem's μ(E) are added in full (conservative: they
    // only lower λ), since the memory of how the constant 0.973 absorbs them is unsure.
    const Rational b2_over_12 = b_invariants(minimal.curve).b2 / 12;
    const double b2_term = std::max(0.0, std::log(std::fabs(b2_over_12.get_d()) + 1e-300));
    const double constant = 2.0 * (naive_log_height(j_invariant(minimal.curve)) / 8.0 +
                                   log_abs(discriminant(minimal.curve).get_num()) / 12.0 +
                                   0.5 * b2_term + 0.5 * std::log(2.0) + 0.973);
    const double reach = log_abs(search_bound);  // the direct search runs on the minimal model
    const double lambda = std::min(reach - constant, smallest_found);
    notes.push_back(fmt::format(
        "lattice minimum: every non-torsion point has ĥ >= {:.4g} (the search covers naive "
        "height e^{:.3g} on the minimal model; Silverman's 1990 bound, from memory, costs {:.3g}; "
        "the sharper Cremona–Prickett–Siksek 2006 bound is not implemented)",
        std::max(lambda, 0.0), reach, constant));
    if (lambda <= 0) return std::nullopt;
    return lambda;
}

std::vector<Real> pairings_with(const Curve& e, const std::vector<Point>& basis, const Point& p,
                                unsigned digits) {
    std::vector<Real> result;
    for (const Point& b : basis) result.push_back(height_pairing(e, b, p, digits));
    return result;
}

bool next_prime_exceeds(int saturated_up_to, double index_bound) {
    int next = saturated_up_to + 1;
    auto is_prime = [](int n) {
        if (n < 2) return false;
        for (int d = 2; d * d <= n; ++d) {
            if (n % d == 0) return false;
        }
        return true;
    };
    while (!is_prime(next)) ++next;
    return index_bound < next;
}

}  // namespace

BasisOptions BasisOptions::with_effort(int effort) {
    BasisOptions options;
    if (effort < 0) throw InputError("basis effort must be >= 0");
    if (effort >= 1) options.heegner_time_limit_seconds = 300.0 * effort;
    if (effort == 0) {
        options.search_height_bound = 5000;
        options.quartic_bound = 100;
        options.saturation_prime_bound = 20;
        return options;
    }
    for (int step = 1; step < effort && step < 8; ++step) {
        options.quartic_bound *= 3;
        options.search_height_bound *= 3;
    }
    if (effort > 8) throw InputError("basis effort above 8 would not finish: use 0..8");
    return options;
}

MordellWeilBasis mordell_weil_basis(const Curve& curve, const BasisOptions& options,
                                    const std::vector<Point>& given) {
    if (options.digits < 10 || options.digits > 2000) {
        throw InputError("basis digits must lie in [10, 2000]");
    }
    if (options.quartic_bound < 1 || options.quartic_bound > 1'000'000) {
        throw InputError("quartic bound must lie in [1, 10^6]");
    }
    if (options.saturation_prime_bound < 1 || options.saturation_prime_bound > 2000) {
        throw InputError("saturation prime bound must lie in [1, 2000]");
    }
    const unsigned digits = options.digits + 10;  // guard digits for relations and LLL
    MordellWeilBasis result;
    const WorkingModel w = working_model(curve);
    const TorsionGroup torsion = torsion_subgroup(w.curve);
    for (const Point& p : given) {
        if (!on_curve(curve, p))
            throw InputError("given generator " + to_string(p) + " is not on the curve");
        if (is_torsion(torsion, to_new_model(w.change, p))) {
            throw InputError("given generator " + to_string(p) + " has finite order");
        }
    }

    // Candidates: given points first, then descent points, then the direct search.
    std::vector<Point> candidates;
    std::vector<const char*> candidate_source;  // route that found each candidate
    for (const Point& p : given) candidates.push_back(to_new_model(w.change, p));
    candidate_source.assign(candidates.size(), "given");
    std::optional<basis::DescentResult> descent;
    if (w.two_torsion) {
        basis::DescentOptions descent_options;
        descent_options.quartic_bound = options.quartic_bound;
        descent_options.threads = options.threads;
        descent = basis::two_isogeny_descent(curve, *w.two_torsion, descent_options);
        for (const Point& p : descent->points_on_input) {
            candidates.push_back(to_new_model(w.change, p));
        }
    }
    candidate_source.resize(candidates.size(), "descent");
    // The direct search runs on the global minimal model, where Silverman's bound applies.
    const ModelWithChange minimal = minimal_model(curve);
    PointSearchOptions search_options;
    search_options.height_bound = options.search_height_bound;
    search_options.threads = options.threads;
    for (const Point& p : search_points(minimal.curve, search_options)) {
        candidates.push_back(to_new_model(w.change, to_old_model(minimal.change, p)));
    }
    candidate_source.resize(candidates.size(), "search");
    auto record_source = [&](std::size_t index) {
        const std::string source = candidate_source[index];
        if (std::find(result.generator_sources.begin(), result.generator_sources.end(), source) ==
            result.generator_sources.end())
            result.generator_sources.push_back(source);
    };

    // Independent points generating the same group as the candidates (modulo torsion).
    std::vector<Point> basis_points;
    GramMatrix gram;
    double smallest_height = 1e300;
    const Real tolerance =
        Real(1, digits) / boost::multiprecision::pow(Real(10, digits), digits / 2);
    for (std::size_t index = 0; index < candidates.size(); ++index) {
        const Point& p = candidates[index];
        if (p.at_infinity || is_torsion(torsion, p)) continue;
        const Real height = canonical_height(w.curve, p, digits);
        if (index >= given.size())
            smallest_height = std::min(smallest_height, height.convert_to<double>());
        for (int round = 0; round < 64; ++round) {
            const auto pairings = pairings_with(w.curve, basis_points, p, digits);
            const Real residual = basis::residual_height(gram, pairings, height);
            if (residual > tolerance * (1 + height)) {
                if (index < given.size() && index != basis_points.size()) {
                    throw InputError("given generators are not independent");
                }
                basis_points.push_back(p);
                record_source(index);
                gram = height_matrix(w.curve, basis_points, digits);
                break;
            }
            if (index < given.size()) throw InputError("given generators are not independent");
            const auto relation = basis::find_relation(gram, pairings, tolerance * 1e6, 1000);
            if (!relation) {
                result.notes.push_back("point " + to_string(to_old_model(w.change, p)) +
                                       " is numerically dependent but no relation with "
                                       "denominator <= 1000 was recognised; skipped");
                break;
            }
            // Exact check of d·P − Σ m_i b_i ∈ torsion before trusting the relation.
            const Point lhs = multiply(w.curve, p, relation->denominator);
            const Point rhs = basis::combination(w.curve, basis_points, relation->numerators);
            if (!is_torsion(torsion, subtract(w.curve, lhs, rhs))) {
                result.notes.push_back("point " + to_string(to_old_model(w.change, p)) +
                                       ": numerical relation failed the exact check; skipped");
                break;
            }
            if (relation->denominator == 1) break;  // already in the group
            // P enlarges the lattice: take a prime ℓ | d, Q = (d/ℓ)P has ℓQ = Σ m_i b_i.
            const Integer d = relation->denominator;
            const auto primes = prime_divisors(d);
            const int ell = static_cast<int>(primes.front().get_si());
            const Point q = multiply(w.curve, p, Integer(d / ell));
            basis::enlarge_by_quotient(w.curve, basis_points, relation->numerators, q, ell);
            record_source(index);
            gram = height_matrix(w.curve, basis_points, digits);
        }
    }

    // Saturation at small primes.
    std::vector<int> torsion_orders = torsion.structure;
    basis::SaturationOptions saturation_options;
    saturation_options.prime_bound = options.saturation_prime_bound;
    auto saturated = basis::saturate(w.curve, basis_points, torsion.generators, torsion_orders,
                                     saturation_options);
    basis_points = saturated.generators;
    result.saturated_up_to = saturated.saturated_up_to;
    for (auto& note : saturated.notes) result.notes.push_back(std::move(note));
    for (int ell : saturated.divided_by) {
        result.notes.push_back(fmt::format("saturation divided a combination by {}", ell));
    }

    // LLL in the height pairing, heights, regulator.
    const std::size_t r = basis_points.size();
    if (r > 0) {
        gram = height_matrix(w.curve, basis_points, digits);
        const auto transform = basis::lll_transform(gram);
        std::vector<Point> reduced;
        for (const auto& row : transform) {
            reduced.push_back(basis::combination(w.curve, basis_points, row));
        }
        basis_points = reduced;
        gram = basis::transform_gram(gram, transform);
        result.regulator = with_digits(basis::determinant(gram), options.digits);
        for (std::size_t i = 0; i < r; ++i) {
            result.generator_heights.push_back(with_digits(gram[i][i], options.digits));
        }
    } else {
        result.regulator = Real(1, options.digits);
    }
    for (const Point& p : basis_points) result.generators.push_back(to_old_model(w.change, p));

    // Torsion on the input model.
    result.torsion.structure = torsion.structure;
    for (const Point& p : torsion.points)
        result.torsion.points.push_back(to_old_model(w.change, p));
    for (const Point& p : torsion.generators) {
        result.torsion.generators.push_back(to_old_model(w.change, p));
    }

    // Rank bounds.
    result.rank.lower = static_cast<int>(r);
    if (descent) {
        DescentSummary summary;
        summary.selmer_dimension = descent->curve_side.selmer_dimension;
        summary.isogenous_selmer_dimension = descent->isogenous_side.selmer_dimension;
        summary.found_dimension = descent->curve_side.found_dimension;
        summary.isogenous_found_dimension = descent->isogenous_side.found_dimension;
        result.descent = summary;
        if (descent->rank_upper < result.rank.lower) {
            throw std::logic_error(
                "2-isogeny descent bound below the number of independent points");
        }
        result.rank.upper = descent->rank_upper;
        if (descent->rank_lower > result.rank.lower) {
            result.notes.push_back(fmt::format(
                "descent images prove rank >= {} but only {} independent points were kept",
                descent->rank_lower, result.rank.lower));
            result.rank.lower = descent->rank_lower;
        }
        if (!result.rank.known()) {
            result.notes.push_back(fmt::format(
                "rank in [{}, {}]: the 2-isogeny Selmer groups have dimensions {} and {}; the "
                "quartics found soluble everywhere locally but without a point up to {} are "
                "either points beyond the search or elements of Sha[φ], Sha[φ']",
                result.rank.lower, *result.rank.upper, summary.selmer_dimension,
                summary.isogenous_selmer_dimension, options.quartic_bound));
        }
    } else {
        result.notes.push_back(
            "no rational 2-torsion point: no 2-isogeny descent, rank upper bound unknown "
            "(a full 2-descent over the cubic field is not implemented)");
    }

    // Analytic information when the rank is still open (lseries layer): certified L-values,
    // the root number, and the theorems of Kolyvagin and Gross–Zagier–Kolyvagin.
    if (!result.rank.known() && options.analytic_conductor_bound > 0) {
        lseries::AnalyticOptions analytic_options;
        analytic_options.threads = options.threads;
        try {
            const lseries::LSeriesCurve lcurve = lseries::lseries_curve(curve);
            if (lcurve.conductor > options.analytic_conductor_bound) {
                throw InputError(fmt::format(
                    "conductor {} above the analytic conductor bound {}: raise it to allow",
                    to_string(lcurve.conductor), to_string(options.analytic_conductor_bound)));
            }
            lseries::AnalyticReport analytic;
            analytic.rank = lseries::analytic_rank(curve, analytic_options);
            result.root_number = analytic.rank.root_number;
            if (const auto derivative = lseries::first_derivative(analytic.rank)) {
                analytic.predicted_generator_height =
                    lseries::predicted_generator_height(lcurve, *derivative, 20)
                        .height_times_sha.convert_to<double>();
            }
            result.analytic = analytic;
        } catch (const std::exception& refusal) {  // refusal (InputError) or undecided
            result.notes.push_back(std::string("analytic rank not computed: ") + refusal.what());
        }
    }
    if (result.analytic && result.analytic->rank.proven_rank) {
        const int proven = *result.analytic->rank.proven_rank;
        if (proven < result.rank.lower || (result.rank.upper && proven > *result.rank.upper)) {
            throw std::logic_error("analytic rank outside the algebraic rank bounds");
        }
        if (proven == 0 && result.rank.upper && *result.rank.upper > 0) {
            result.notes.push_back(fmt::format(
                "with rank 0 the {} surplus Selmer dimensions of the descent come from Sha(E)[φ] "
                "and Sha(E')[φ'] (a non-trivial 2-part of Sha)",
                *result.rank.upper));
        }
        result.rank.lower = proven;
        result.rank.upper = proven;
        result.notes.push_back(fmt::format("rank {} proved analytically: {}", proven,
                                           result.analytic->rank.proof_reason));
        // >>> Heegner call site (lseries/heegner.hpp): rank 1 proven, no generator found.
        if (proven == 1 && r == 0 && given.empty() && options.heegner_time_limit_seconds > 0) {
            lseries::HeegnerOptions heegner_options;
            heegner_options.threads = options.threads;
            heegner_options.time_limit_seconds = options.heegner_time_limit_seconds;
            heegner_options.max_terms = options.heegner_max_terms;
            std::vector<std::string> heegner_notes;
            std::optional<lseries::HeegnerResult> heegner;
            try {
                heegner = lseries::heegner_point(curve, result.analytic->rank, heegner_options,
                                                 &heegner_notes);
            } catch (const InputError& refusal) {
                heegner_notes.push_back(std::string("Heegner point not computed: ") +
                                        refusal.what());
            } catch (const std::runtime_error& stopped) {
                heegner_notes.push_back(std::string("Heegner point not computed: ") +
                                        stopped.what());
            }
            if (heegner) {
                BasisOptions again = options;
                again.analytic_conductor_bound = 0;  // the analytic data is kept from here
                MordellWeilBasis completed = mordell_weil_basis(curve, again, {heegner->point});
                completed.analytic = result.analytic;
                completed.analytic->heegner = heegner;
                for (auto& note : heegner_notes) completed.analytic->notes.push_back(note);
                completed.root_number = result.root_number;
                completed.rank.lower = completed.rank.upper.emplace(1);
                completed.generator_sources = {fmt::format("Heegner point (D = {}, index {})",
                                                           heegner->discriminant, heegner->index)};
                completed.notes.insert(completed.notes.begin(), result.notes.begin(),
                                       result.notes.end());
                return completed;
            }
            for (auto& note : heegner_notes) result.analytic->notes.push_back(note);
            result.notes.push_back(
                "rank 1 is proved but no generator was found (search, descent and the Heegner "
                "construction; see the analytic notes)");
        }
        // <<< Heegner call site.
    } else if (result.analytic && result.analytic->rank.root_number) {
        const int parity = *result.analytic->rank.root_number == 1 ? 0 : 1;
        result.notes.push_back(fmt::format(
            "root number {:+d} (conductor {}): the parity conjecture predicts an {} rank; the "
            "L-value enclosure at the order used contains 0, so no rank is proved analytically",
            *result.analytic->rank.root_number, to_string(result.analytic->rank.conductor),
            parity ? "odd" : "even"));
    }

    // How far saturation is proved to be enough.
    if (r > 0 && r <= 8) {
        if (const auto lambda = height_lower_bound(minimal, options.search_height_bound,
                                                   smallest_height, result.notes)) {
            const double regulator = result.regulator.convert_to<double>();
            const double bound = std::sqrt(basis::hermite_constant_power(static_cast<int>(r)) *
                                           regulator / std::pow(*lambda, static_cast<double>(r)));
            result.index_bound = bound;
            result.saturation_complete = next_prime_exceeds(result.saturated_up_to, bound);
            if (!result.saturation_complete) {
                result.notes.push_back(
                    fmt::format("index bound {:.4g}: saturation up to {} would make it complete",
                                bound, static_cast<long>(std::floor(bound))));
            }
        } else {
            result.notes.push_back(fmt::format(
                "saturated up to {} only: no positive lower bound on ĥ from the search region, "
                "so the index is not bounded",
                result.saturated_up_to));
        }
    } else if (r == 0) {
        // The empty set of generators spans only the torsion, which is saturated by definition;
        // whether that is all of E(Q) is the rank question (MordellWeilBasis::generates).
        result.saturated_up_to = options.saturation_prime_bound;
        // (rank 1 proved analytically without a generator: generates() is false, full_rank fails)
        result.saturation_complete = true;
    }
    return result;
}

}  // namespace arcsieve
