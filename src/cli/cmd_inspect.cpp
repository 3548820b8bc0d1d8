// `arcsieve inspect`: curve data for a family problem or a bare curve (text or --json).
#include <iostream>

#include <nlohmann/json.hpp>

#include "cli/commands.hpp"

namespace arcsieve::cli {

void register_inspect(CLI::App& app, Context& context) {
    auto* command = app.add_subcommand("inspect", "print the curve's model and invariants");
    auto options = std::make_shared<ProblemOptions>();
    auto json = std::make_shared<bool>(false);
    add_problem_options(*command, *options);
    command->add_flag("--json", *json, "print one JSON object");
    command->callback([options, json, &context]() {
        const Problem problem = resolve_problem(*options);
        nlohmann::json record;
        if (!problem.family.empty()) {
            record["family"] = problem.family;
            record["N"] = to_string(*problem.N);
        }
        record["curve"] = to_string(problem.curve);
        record["discriminant"] = to_string(discriminant(problem.curve));
        record["j_invariant"] = to_string(j_invariant(problem.curve));
        if (*json) {
            std::cout << record.dump() << "\n";
        } else {
            std::cout << "curve         " << to_string(problem.curve) << "\n"
                      << "discriminant  " << to_string(discriminant(problem.curve)) << "\n"
                      << "j-invariant   " << to_string(j_invariant(problem.curve)) << "\n";
        }
        context.exit_code = 0;
    });
}

}  // namespace arcsieve::cli
