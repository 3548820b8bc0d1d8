// `arcsieve locate`: the region and the first hit for a family problem (no exact coordinates),
// as text or one JSON object with the DESIGN.md §6 keys ("hit" with "coeffs" and "translate").
#include <iostream>
#include <nlohmann/json.hpp>
#include <sstream>

#include "analytic/height.hpp"
#include "basis/point_search.hpp"
#include "cli/commands.hpp"
#include "curve/torsion.hpp"
#include "family/target.hpp"
#include "locate/first_hit.hpp"
#include "survey/job.hpp"

namespace arcsieve::cli {
namespace {

struct LocateOptions {
    ProblemOptions problem;
    std::vector<std::string> generators;
    std::string ordering;
    std::string index_bound = "1000000000000";
    std::string method = "rotation";
    std::string search_bound = "1000";
    unsigned digits = 20;
    bool json = false;
};

nlohmann::json hit_json(const locate::Hit& hit) {
    nlohmann::json h;
    h["coeffs"] = nlohmann::json::array();
    for (const Integer& c : hit.coefficients) {
        if (c.fits_slong_p()) {
            h["coeffs"].push_back(c.get_si());
        } else {
            h["coeffs"].push_back(to_string(c));
        }
    }
    h["translate"] = point_record(hit.translate);
    h["component"] = hit.component;
    h["t"] = hit.t_approx;
    h["decided_exactly"] = hit.decided_exactly;
    h["canonical_height"] =
        hit.canonical_height ? nlohmann::json(*hit.canonical_height) : nlohmann::json(nullptr);
    return h;
}

void run_locate(const LocateOptions& options, Context& context) {
    const Problem problem = resolve_problem(options.problem);
    if (problem.family.empty()) {
        throw InputError("locate needs a family problem: --family ratio-sum --N <N>");
    }
    const auto index_bound = parse_integer(options.index_bound);
    if (!index_bound || *index_bound < 1) {
        throw InputError("--index-bound must be a positive integer, got '" + options.index_bound +
                         "'");
    }
    const auto search_bound = parse_integer(options.search_bound);
    if (!search_bound || *search_bound < 1 || *search_bound > 1'000'000) {
        throw InputError("--search-bound must be an integer in [1, 1000000], got '" +
                         options.search_bound + "'");
    }
    if (options.method != "rotation" && options.method != "linear-scan") {
        throw InputError("--method must be rotation or linear-scan, got '" + options.method + "'");
    }
    if (options.digits < 5 || options.digits > 2000) {
        throw InputError("--digits must be between 5 and 2000");
    }
    const family::Target target = family::ratio_sum_target(*problem.N, options.ordering);
    const Curve& curve = target.curve;
    std::vector<std::string> notes;
    std::vector<Point> generators;
    std::string source = "given";
    for (const std::string& text : options.generators) {
        const Point p = parse_point(curve, text);
        if (p.at_infinity || torsion_order(curve, p)) {
            throw InputError("the generator " + text + " is a torsion point, not a generator");
        }
        generators.push_back(p);
    }
    if (generators.empty()) {
        source = "point search";
        PointSearchOptions search;
        search.height_bound = *search_bound;
        for (const Point& p : search_points(curve, search)) {
            if (!torsion_order(curve, p)) {
                generators.push_back(p);
                break;
            }
        }
        notes.push_back(
            generators.empty()
                ? "no point of infinite order with naive height <= " + options.search_bound +
                      " was found; give one with --generator or raise --search-bound"
                : "the generator was found by a point search (smallest naive height) and is not "
                  "proven to generate E(Q) modulo torsion: the hit is the first in the subgroup "
                  "it generates");
    }
    const TorsionGroup torsion = torsion_subgroup(curve);
    nlohmann::json record;
    record["family"] = target.family;
    record["N"] = to_string(*problem.N);
    record["curve"] = curve_record(curve);
    record["torsion"] = nlohmann::json::array();
    for (const Point& t : torsion.points) record["torsion"].push_back(point_record(t));
    record["generators"] = nlohmann::json::array();
    for (const Point& p : generators) record["generators"].push_back(point_record(p));
    record["generator_source"] = source;
    if (!options.ordering.empty()) record["ordering"] = options.ordering;
    record["hit"] = nullptr;
    record["canonical_height"] = nullptr;
    locate::FirstHitResult result;
    if (!generators.empty()) {
        locate::FirstHitOptions search;
        search.index_bound = *index_bound;
        search.digits = options.digits;
        search.method = options.method == "rotation" ? locate::RankOneMethod::rotation
                                                     : locate::RankOneMethod::linear_scan;
        try {
            const auto heights = height_matrix(curve, generators, 17);
            locate::GramMatrix gram(heights.size());
            for (std::size_t i = 0; i < heights.size(); ++i) {
                for (const Real& h : heights[i]) gram[i].push_back(static_cast<double>(h));
            }
            search.height_matrix = gram;
        } catch (const std::exception& error) {
            if (generators.size() > 1) throw;
            notes.push_back(std::string("canonical height unavailable: ") + error.what());
        }
        result = locate::first_hit(target, generators, torsion.points, search);
        record["outcome"] = locate::to_string(result.outcome);
        record["method"] = result.method;
        record["index_bound"] = to_string(result.index_bound);
        record["digits"] = result.digits;
        record["candidates"] = result.candidates;
        if (!result.hits.empty()) {
            record["hit"] = hit_json(result.hits.front());
            record["canonical_height"] = record["hit"]["canonical_height"];
            record["companions"] = nlohmann::json::array();
            for (const auto& h : result.hits) record["companions"].push_back(hit_json(h));
        }
        for (const std::string& note : result.notes) notes.push_back(note);
    }
    const region::Region region = region::target_region(target, 20);
    record["region"] = region::describe_arcs(region, 15);
    if (target.parameter % 2 != 0 && result.outcome != locate::SearchOutcome::found) {
        notes.push_back(
            "Bremner and Macleod (Annales Math. Inform. 43 (2014)) prove that odd N has no "
            "positive solution");
    }
    if (result.outcome == locate::SearchOutcome::found && target.parameter % 2 != 0) {
        notes.push_back("a hit for odd N contradicts Bremner and Macleod (2014): please report");
        context.exit_code = 1;
    }
    record["notes"] = notes;
    if (options.json) {
        std::cout << record.dump() << "\n";
        return;
    }
    std::ostringstream out;
    out << "curve         " << to_string(curve) << "\n";
    out << "torsion       " << torsion.points.size() << " points\n";
    for (const Point& p : generators)
        out << "generator     " << to_string(p) << " (" << source << ")\n";
    for (const std::string& arc : region::describe_arcs(region, 15))
        out << "region        " << arc << "\n";
    if (!generators.empty()) {
        out << "outcome       " << locate::to_string(result.outcome) << " (" << result.method
            << ", |n| <= " << to_string(result.index_bound) << ", " << result.candidates
            << " candidates verified)\n";
    }
    for (const auto& h : result.hits) {
        out << "hit           n =";
        for (const Integer& c : h.coefficients) out << " " << to_string(c);
        out << ", translate " << (h.translate.at_infinity ? "(0:1:0)" : to_string(h.translate))
            << ", component " << h.component << ", t = " << h.t_approx;
        if (h.canonical_height) out << ", height " << *h.canonical_height;
        out << "\n";
    }
    for (const std::string& note : notes) out << "note          " << note << "\n";
    std::cout << out.str();
}

}  // namespace

void register_locate(CLI::App& app, Context& context) {
    auto* command =
        app.add_subcommand("locate", "find the first combination of generators landing on the arc");
    auto options = std::make_shared<LocateOptions>();
    add_problem_options(*command, options->problem);
    command->add_option(
        "--generator", options->generators,
        "a point of infinite order \"x,y\" (repeat for rank >= 2); default: search");
    command->add_option("--ordering", options->ordering, "an ordering such as \"a>=b>=c\"");
    command->add_option("--index-bound", options->index_bound,
                        "rank 1: search |n| up to this (default 10^12)");
    command->add_option("--method", options->method, "rotation (default) or linear-scan");
    command->add_option("--search-bound", options->search_bound,
                        "naive-height bound of the point search when no generator is given");
    command->add_option("--digits", options->digits, "correct digits beyond the index bound's");
    command->add_flag("--json", options->json, "print one JSON object");
    command->callback([options, &context]() { run_locate(*options, context); });
}

}  // namespace arcsieve::cli
