#include "survey/job.hpp"

#include <fmt/format.h>

#include <chrono>
#include <cmath>
#include <filesystem>
#include <functional>

#include "analytic/height.hpp"
#include "basis/mordell_weil.hpp"
#include "basis/saturation.hpp"
#include "curve/tate.hpp"
#include "exact/fingerprint.hpp"
#include "exact/materialise.hpp"
#include "family/ratio_sum.hpp"
#include "family/target.hpp"
#include "locate/first_hit.hpp"
#include "region/region.hpp"
#include "survey/report.hpp"

namespace arcsieve {
namespace {

using Clock = std::chrono::steady_clock;

// a-invariants as JSON numbers when they fit in 64 bits (DESIGN.md §6), else as strings.
nlohmann::json invariant_json(const Rational& a) {
    if (a.get_den() == 1 && a.get_num().fits_slong_p()) return a.get_num().get_si();
    return to_string(a);
}

std::string real_text(const Real& value, unsigned digits) {
    return value.str(static_cast<std::streamsize>(digits));
}

struct Stages {
    nlohmann::json& record;
    const JobOptions& options;

    bool out_of_time() const { return options.deadline && Clock::now() > *options.deadline; }

    // Runs one stage; a throw becomes the record's error (later stages depend on this one, so
    // the job stops there), and a passed deadline stops the job between stages.
    bool run(const std::string& name, const std::function<void()>& body) {
        if (out_of_time()) {
            record["status"] = "timeout";
            record["error"] = "time limit reached before the " + name + " stage";
            return false;
        }
        try {
            body();
        } catch (const InputError&) {
            throw;
        } catch (const std::exception& error) {
            record["error"] = name + " stage failed: " + error.what();
            return false;
        }
        record["stages_completed"].push_back(name);
        return true;
    }
};

}  // namespace

nlohmann::json curve_record(const Curve& curve) {
    return nlohmann::json::array({invariant_json(curve.a1), invariant_json(curve.a2),
                                  invariant_json(curve.a3), invariant_json(curve.a4),
                                  invariant_json(curve.a6)});
}

nlohmann::json point_record(const Point& p) {
    if (p.at_infinity) return nullptr;
    return nlohmann::json::array({to_string(p.x), to_string(p.y)});
}

nlohmann::json run_problem(const ProblemSpec& problem, const JobOptions& options) {
    const auto started = Clock::now();
    nlohmann::json record;
    record["notes"] = nlohmann::json::array();
    record["stages_completed"] = nlohmann::json::array();
    record["proven"] = nlohmann::json::array();
    record["conditional"] = nlohmann::json::array();
    Curve curve;
    const bool is_family = !problem.family.empty();
    if (is_family) {
        if (problem.family != "ratio-sum") {
            throw InputError("unknown family '" + problem.family + "' (known: ratio-sum)");
        }
        if (!problem.N) throw InputError("the ratio-sum problem needs N");
        family::check_ratio_sum_parameter(*problem.N);
        record["family"] = problem.family;
        record["N"] = problem.N->fits_slong_p() ? nlohmann::json(problem.N->get_si())
                                                : nlohmann::json(to_string(*problem.N));
        curve = family::ratio_sum_curve(*problem.N);
    } else if (problem.curve) {
        curve = *problem.curve;
    } else {
        throw InputError("a problem needs a family with N, or a curve");
    }
    for (const auto& p : problem.generators) {
        if (!on_curve(curve, p)) {
            throw InputError("the given point " + to_string(p) + " is not on the curve");
        }
    }
    std::optional<family::Target> target;
    if (is_family) target = family::ratio_sum_target(*problem.N, options.ordering);  // may throw
    record["curve"] = curve_record(curve);
    record["discriminant"] = to_string(discriminant(curve));
    if (!options.ordering.empty()) record["ordering"] = options.ordering;

    Stages stages{record, options};
    auto finish = [&]() {
        record["settled"] = survey::settled_completely(record);
        record["seconds"] = std::chrono::duration<double>(Clock::now() - started).count();
        return record;
    };

    stages.run("conductor", [&] { record["conductor"] = to_string(conductor(curve)); });

    MordellWeilBasis basis;
    const bool have_basis = stages.run("basis", [&] {
        BasisOptions basis_options = BasisOptions::with_effort(1);
        basis_options.digits = options.digits;
        basis = mordell_weil_basis(curve, basis_options, problem.generators);
        auto& torsion = record["torsion"] = nlohmann::json::array();
        for (const auto& t : basis.torsion.points) {
            if (!t.at_infinity) torsion.push_back(point_record(t));
        }
        record["torsion_structure"] = basis.torsion.structure;
        record["rank"] = {{"lower", basis.rank.lower},
                          {"upper", basis.rank.upper ? nlohmann::json(*basis.rank.upper)
                                                     : nlohmann::json(nullptr)}};
        auto& generators = record["generators"] = nlohmann::json::array();
        for (const auto& g : basis.generators) generators.push_back(point_record(g));
        auto& heights = record["generator_heights"] = nlohmann::json::array();
        for (const auto& h : basis.generator_heights)
            heights.push_back(real_text(h, options.digits));
        record["regulator"] = real_text(basis.regulator, options.digits);
        record["saturated_up_to"] = basis.saturated_up_to;
        record["saturation_complete"] = basis.saturation_complete;
        for (const auto& note : basis.notes) record["notes"].push_back("basis: " + note);
        if (basis.rank.known()) {
            record["proven"].push_back(fmt::format("rank = {}", basis.rank.lower));
        } else {
            record["conditional"].push_back(
                basis.rank.upper ? fmt::format("rank between {} and {}: not decided",
                                               basis.rank.lower, *basis.rank.upper)
                                 : fmt::format("rank >= {}; no upper bound", basis.rank.lower));
        }
        if (basis.generates()) {
            record["proven"].push_back(
                "the generators and torsion generate E(Q) (rank proven, full rank, saturated)");
        } else if (basis.saturation_complete && !basis.generators.empty()) {
            record["proven"].push_back(
                "the generators and torsion span a saturated subgroup of E(Q) (index bound from "
                "the lower bound on ĥ)");
            record["conditional"].push_back(
                "E(Q) generated: not proven, the rank is not proven equal to the number of "
                "generators");
        } else if (!basis.generators.empty()) {
            record["conditional"].push_back(fmt::format(
                "saturation proved only at primes <= {}: the generators may have a finite index",
                basis.saturated_up_to));
        }
    });
    if (!have_basis) return finish();
    if (!target) {
        record["notes"].push_back("a bare curve has no target region: curve data and basis only");
        return finish();
    }

    std::optional<region::Region> arcs;
    const bool have_region = stages.run("region", [&] {
        arcs = region::target_region(*target, options.digits);
        auto& out = record["region"];
        out["arcs"] = region::describe_arcs(*arcs);
        out["components"] = arcs->model.components;
    });
    if (!have_region) return finish();

    record["hit"] = nullptr;
    record["basis_complete"] = basis.generates();

    // The first-hit search runs with or without generators: with none it tests every torsion
    // point exactly, so a torsion solution (N = 2: (3, 1, 1)) is never missed.
    locate::FirstHitResult located;
    const bool have_hit = stages.run("locate", [&] {
        locate::FirstHitOptions locate_options;
        locate_options.digits = std::max(20u, options.digits);
        locate_options.points_generate_modulo_2 = basis.generates_modulo_2();
        // The height pairing: needed for rank >= 2, and gives ĥ of the hit at rank one.
        const auto heights = height_matrix(curve, basis.generators, options.digits);
        locate::GramMatrix gram(heights.size());
        for (std::size_t i = 0; i < heights.size(); ++i) {
            for (const auto& h : heights[i]) gram[i].push_back(static_cast<double>(h));
        }
        if (!gram.empty()) locate_options.height_matrix = gram;
        // Rank >= 2: search up to 10^4 × the largest generator height (about index 100 along
        // each generator); the lattice has ~π·bound/√regulator points there, each cheap to test.
        double largest = 0;
        for (std::size_t i = 0; i < gram.size(); ++i) largest = std::max(largest, gram[i][i]);
        if (gram.size() >= 2) locate_options.height_bound = 1e4 * largest;
        located =
            locate::first_hit(*target, basis.generators, basis.torsion.points, locate_options);
        record["outcome"] = locate::to_string(located.outcome);
        record["locate_method"] = located.method;
        record["candidates_checked"] = located.candidates;
        for (const auto& note : located.notes) record["notes"].push_back("locate: " + note);
    });
    if (!have_hit) return finish();
    const bool basis_complete = basis.generates();
    if (located.outcome != locate::SearchOutcome::found || located.hits.empty()) {
        // An empty region needs no basis at all. "Unreachable" (every generator and torsion
        // point on the identity component, the region on the egg) is a proof once the points
        // generate E(Q)/2E(Q) (rank proven, full rank, saturated at 2): then [E(Q) : <points>]
        // is odd, and for odd m the component of mQ equals that of Q, so every rational point
        // is on the identity component. Saturation at larger primes does not matter here.
        // With no generators and the rank proven 0, E(Q) is the torsion group, every point of
        // which locate tested exactly.
        const bool proof =
            located.outcome == locate::SearchOutcome::no_region ||
            (located.outcome == locate::SearchOutcome::unreachable && basis.generates_modulo_2()) ||
            (located.outcome == locate::SearchOutcome::none_in_torsion && basis.generates());
        if (proof) {
            std::string reason;
            switch (located.outcome) {
                case locate::SearchOutcome::no_region:
                    reason =
                        "no real point satisfies the sign conditions (sign pattern decided "
                        "exactly between the region's boundary points)";
                    break;
                case locate::SearchOutcome::unreachable:
                    reason =
                        "every rational point lies on the identity component (rank proven, "
                        "the points generate E(Q)/2E(Q)), the target arc on the egg";
                    break;
                default:
                    reason = fmt::format(
                        "E(Q) is the torsion group (rank 0 proven), and each of its {} points "
                        "was tested exactly against the conditions",
                        basis.torsion.points.size());
            }
            record["proven"].push_back("no positive solution: " + reason);
            record["no_solution_proven"] = true;
        } else {
            record["conditional"].push_back(
                located.outcome == locate::SearchOutcome::none_in_torsion
                    ? "no torsion point is a solution, and no point of infinite order was found; "
                      "the rank is not proven to be 0"
                    : "no hit found: " + locate::to_string(located.outcome));
        }
        return finish();
    }
    const locate::Hit& hit = located.hits.front();
    bool torsion_hit = true;
    for (const auto& n : hit.coefficients) torsion_hit = torsion_hit && n == 0;
    {
        auto& out = record["hit"];
        out["coeffs"] = nlohmann::json::array();
        for (const auto& n : hit.coefficients) {
            out["coeffs"].push_back(n.fits_slong_p() ? nlohmann::json(n.get_si())
                                                     : nlohmann::json(to_string(n)));
        }
        out["translate"] = point_record(hit.translate);
        out["component"] = hit.component;
        out["t"] = hit.t_approx;
        out["companions"] = located.hits.size() - 1;
        record["hit_certified"] = true;  // locate decides membership with certified enclosures
        if (hit.canonical_height) record["canonical_height"] = *hit.canonical_height;
        record["proven"].push_back("the combination lands on the target arc (certified enclosure)");
        if (torsion_hit) {
            // ĥ >= 0 with equality exactly on torsion points (Silverman AEC VIII.9.3), whatever
            // the rank.
            record["proven"].push_back(
                "it is a torsion point: least canonical height (ĥ = 0) among all solutions");
        } else if (basis_complete) {
            record["proven"].push_back("it is the solution of least canonical height");
        } else {
            record["conditional"].push_back(
                "least height only within the subgroup the generators span (basis not proved "
                "complete)");
        }
    }

    // The exact layer works on index·generator + translate: rank one directly; for a higher
    // rank the combination is formed exactly first (hits there have small coefficients).
    if (torsion_hit) {
        // A torsion point is small: map it exactly and check the equation (no fingerprint).
        stages.run("materialise", [&] {
            const auto image = family::point_to_triple(*problem.N, hit.translate);
            if (const auto* degenerate = std::get_if<family::Degenerate>(&image)) {
                throw std::runtime_error("the torsion hit is degenerate: " + degenerate->reason);
            }
            const auto& triple = std::get<family::Triple>(image);
            const bool holds = family::satisfies_ratio_sum(*problem.N, triple);
            record["verified"] = holds;
            record["positive"] = triple.a > 0 && triple.b > 0 && triple.c > 0;
            record["digits"] = {decimal_digits(triple.a), decimal_digits(triple.b),
                                decimal_digits(triple.c)};
            record["solution"] = {to_string(triple.a), to_string(triple.b), to_string(triple.c)};
            record["digits_certified"] = true;  // exact integers
            if (holds) record["proven"].push_back("the solution satisfies the equation exactly");
        });
        return finish();
    }

    exact::Multiple multiple;
    bool have_multiple = stages.run("combination", [&] {
        if (hit.coefficients.size() == 1) {
            multiple.generator =
                hit.coefficients[0] < 0 ? negate(curve, basis.generators[0]) : basis.generators[0];
            multiple.index = abs(hit.coefficients[0]);
        } else {
            multiple.generator = basis::combination(curve, basis.generators, hit.coefficients);
            multiple.index = 1;
        }
        multiple.translate = hit.translate;
    });
    if (!have_multiple) return finish();

    stages.run("fingerprint", [&] {
        exact::FingerprintOptions fingerprint_options;
        fingerprint_options.lead_digits = options.digits;
        const auto fingerprint =
            exact::ratio_sum_fingerprint(*problem.N, multiple, fingerprint_options);
        const nlohmann::json json = exact::to_json(fingerprint);
        record["digits"] = json.value("digits", nlohmann::json());
        record["lead"] = json.value("lead", nlohmann::json());
        record["gcd_removed"] = json.value("gcd", nlohmann::json());
        record["digits_certified"] = fingerprint.certain;
        if (!record.contains("canonical_height")) {
            record["canonical_height"] = json.value("canonical_height", nlohmann::json());
        }
        record["log10_size"] = fingerprint.log10_size;
        for (const auto& note : fingerprint.notes)
            record["notes"].push_back("fingerprint: " + note);
        if (fingerprint.certain) {
            record["proven"].push_back("digit counts and leading digits (certified enclosures)");
        } else {
            record["conditional"].push_back("some digits of the fingerprint are not certified");
        }
    });

    if (!options.materialise) {
        record["notes"].push_back("materialisation switched off");
        return finish();
    }
    const auto estimate = exact::estimate_ratio_sum_size(*problem.N, multiple);
    if (estimate.digits > static_cast<double>(options.max_solution_digits)) {
        record["notes"].push_back(
            "not written out: " +
            exact::size_limit_message(estimate, static_cast<double>(options.max_solution_digits)));
        return finish();
    }
    stages.run("materialise", [&] {
        exact::MaterialiseOptions materialise_options;
        materialise_options.max_digits = static_cast<double>(options.max_solution_digits);
        exact::MaterialisedSolution solution;
        if (hit.coefficients.size() == 1) {
            solution = exact::materialise_ratio_sum(*problem.N, multiple, materialise_options);
        } else {
            // Rank >= 2: the combination stage already computed the point exactly (its
            // coordinates are too large for the ladder's prime-by-prime gcd removal, which
            // factors the base point); map it with the family layer's full-gcd normalisation.
            const Point q = add(curve, multiple.generator, multiple.translate);
            const auto image = family::point_to_triple(*problem.N, q);
            if (const auto* degenerate = std::get_if<family::Degenerate>(&image)) {
                throw std::runtime_error("the hit is degenerate: " + degenerate->reason);
            }
            solution.triple = std::get<family::Triple>(image);
            solution.digits = {decimal_digits(solution.triple.a), decimal_digits(solution.triple.b),
                               decimal_digits(solution.triple.c)};
            solution.positive =
                solution.triple.a > 0 && solution.triple.b > 0 && solution.triple.c > 0;
            solution.verified = family::satisfies_ratio_sum(*problem.N, solution.triple);
        }
        // Checked here once more with the family layer's own exact evaluation of the equation.
        const bool holds =
            solution.verified && family::satisfies_ratio_sum(*problem.N, solution.triple);
        record["verified"] = holds;
        record["positive"] = solution.positive;
        record["digits"] = {solution.digits[0], solution.digits[1], solution.digits[2]};
        const std::size_t largest =
            std::max({solution.digits[0], solution.digits[1], solution.digits[2]});
        // Short solutions go into the record; long ones (and any, when a directory is given)
        // to a file of three lines a, b, c.
        constexpr std::size_t inline_digits = 1000;
        if (largest <= inline_digits) {
            record["solution"] = {to_string(solution.triple.a), to_string(solution.triple.b),
                                  to_string(solution.triple.c)};
        }
        if (!options.output_dir.empty() && largest > inline_digits) {
            std::filesystem::create_directories(options.output_dir);
            const std::string name = "ratio-sum-N" + to_string(*problem.N) + ".solution.txt";
            exact::write_solution(solution.triple, options.output_dir + "/" + name, false);
            record["solution_file"] = name;  // relative to the output directory
        } else if (largest > inline_digits) {
            record["solution"] = {to_string(solution.triple.a), to_string(solution.triple.b),
                                  to_string(solution.triple.c)};
        }
        if (holds) {
            record["proven"].push_back("the solution satisfies the equation exactly");
        }
    });
    return finish();
}

}  // namespace arcsieve
