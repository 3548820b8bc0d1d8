// `arcsieve basis`: Mordell–Weil generators, rank bounds, heights, regulator and how complete
// the result is, for a family problem or a bare curve (text or --json).
#include <fmt/format.h>

#include <iostream>
#include <memory>
#include <nlohmann/json.hpp>

#include "basis/mordell_weil.hpp"
#include "cli/commands.hpp"

namespace arcsieve::cli {

namespace {

struct BasisCommandOptions {
    ProblemOptions problem;
    bool json = false;
    int effort = 1;
    std::vector<std::string> generators;
    int saturation_bound = -1;
    std::string search_bound;
    long long quartic_bound = -1;
    unsigned digits = 30;
};

std::string decimal(const Real& value, unsigned digits) {
    return value.str(static_cast<std::streamsize>(digits), std::ios_base::fmtflags(0));
}

std::string torsion_text(const TorsionGroup& torsion) {
    if (torsion.structure.empty()) return "trivial";
    std::string text;
    for (std::size_t i = 0; i < torsion.structure.size(); ++i) {
        text += (i ? " x " : "") + fmt::format("Z/{}", torsion.structure[i]);
    }
    return text;
}

}  // namespace

void register_basis(CLI::App& app, Context& context) {
    auto* command = app.add_subcommand(
        "basis", "Mordell–Weil generators, rank bounds, heights, regulator, saturation");
    auto options = std::make_shared<BasisCommandOptions>();
    add_problem_options(*command, options->problem);
    command->add_flag("--json", options->json, "print one JSON object");
    command->add_option("--effort", options->effort,
                        "search effort: 0 quick, 1 default, 2.. larger searches (each x3)");
    command->add_option("--generator", options->generators,
                        "a known generator \"x,y\" or \"(X:Y:Z)\" (repeatable; checked first)");
    command->add_option("--saturate-up-to", options->saturation_bound,
                        "prove saturation at every prime up to this bound");
    command->add_option("--search-bound", options->search_bound,
                        "naive height bound of the direct point search");
    command->add_option("--quartic-bound", options->quartic_bound,
                        "coordinate bound of the search on the descent quartics");
    command->add_option("--digits", options->digits, "decimal digits of heights and regulator");
    command->callback([options, &context]() {
        const Problem problem = resolve_problem(options->problem);
        BasisOptions basis_options = BasisOptions::with_effort(options->effort);
        if (options->saturation_bound >= 0) {
            basis_options.saturation_prime_bound = options->saturation_bound;
        }
        if (!options->search_bound.empty()) {
            const auto bound = parse_integer(options->search_bound);
            if (!bound) throw InputError("--search-bound must be an integer");
            basis_options.search_height_bound = *bound;
        }
        if (options->quartic_bound >= 0) basis_options.quartic_bound = options->quartic_bound;
        basis_options.digits = options->digits;
        std::vector<Point> given;
        for (const auto& text : options->generators)
            given.push_back(parse_point(problem.curve, text));
        const MordellWeilBasis result = mordell_weil_basis(problem.curve, basis_options, given);
        const unsigned digits = options->digits;

        nlohmann::json record;
        if (!problem.family.empty()) {
            record["family"] = problem.family;
            record["N"] = to_string(*problem.N);
        }
        record["curve"] = to_string(problem.curve);
        record["rank"] = {{"lower", result.rank.lower},
                          {"upper", result.rank.upper ? nlohmann::json(*result.rank.upper)
                                                      : nlohmann::json(nullptr)}};
        nlohmann::json generators = nlohmann::json::array(), heights = nlohmann::json::array();
        for (std::size_t i = 0; i < result.generators.size(); ++i) {
            generators.push_back(
                {to_string(result.generators[i].x), to_string(result.generators[i].y)});
            heights.push_back(decimal(result.generator_heights[i], digits));
        }
        record["generators"] = generators;
        record["generator_heights"] = heights;
        record["regulator"] = decimal(result.regulator, digits);
        record["saturated_up_to"] = result.saturated_up_to;
        record["saturation_complete"] = result.saturation_complete;
        record["index_bound"] =
            result.index_bound ? nlohmann::json(*result.index_bound) : nlohmann::json(nullptr);
        record["basis_complete"] = result.generates();
        record["settled"] = result.settled();
        nlohmann::json torsion_points = nlohmann::json::array();
        for (const Point& p : result.torsion.points) {
            if (!p.at_infinity) torsion_points.push_back({to_string(p.x), to_string(p.y)});
        }
        record["torsion"] = {{"structure", result.torsion.structure}, {"points", torsion_points}};
        if (result.descent) {
            record["descent"] = {
                {"selmer_dimension", result.descent->selmer_dimension},
                {"isogenous_selmer_dimension", result.descent->isogenous_selmer_dimension},
                {"found_dimension", result.descent->found_dimension},
                {"isogenous_found_dimension", result.descent->isogenous_found_dimension}};
        } else {
            record["descent"] = nullptr;
        }
        record["notes"] = result.notes;

        if (options->json) {
            std::cout << record.dump() << "\n";
        } else {
            std::cout << "curve           " << to_string(problem.curve) << "\n";
            std::cout << "rank            "
                      << (result.rank.known()
                              ? std::to_string(result.rank.lower)
                              : fmt::format("between {} and {}", result.rank.lower,
                                            result.rank.upper ? std::to_string(*result.rank.upper)
                                                              : std::string("(unknown)")))
                      << "\n";
            std::cout << "torsion         " << torsion_text(result.torsion) << "\n";
            for (std::size_t i = 0; i < result.generators.size(); ++i) {
                std::cout << fmt::format("generator {:<5} ", i + 1)
                          << to_string(result.generators[i]) << "   height "
                          << decimal(result.generator_heights[i], digits) << "\n";
            }
            std::cout << "regulator       " << decimal(result.regulator, digits) << "\n";
            std::cout << "saturation      every prime up to " << result.saturated_up_to
                      << (result.generates() ? " (enough: the generators and torsion generate E(Q))"
                          : result.saturation_complete
                              ? " (the span is saturated; E(Q) only if the rank equals the "
                                "number of generators, not proven)"
                              : " (completeness not proved)")
                      << "\n";
            for (const auto& note : result.notes) std::cout << "note            " << note << "\n";
        }
        context.exit_code = 0;
    });
}

}  // namespace arcsieve::cli
