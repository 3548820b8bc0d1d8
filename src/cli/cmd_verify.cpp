// `arcsieve verify FILE --family ratio-sum --N <N>`: checks a solution file (three integers,
// one per line) or a fingerprint JSON record against the equation. Exit 0 when it holds,
// 1 with a message saying what is wrong, 2 for malformed input.
#include <iostream>
#include <memory>

#include "cli/commands.hpp"
#include "exact/verify_solution.hpp"

namespace arcsieve::cli {

void register_verify(CLI::App& app, Context& context) {
    auto* command = app.add_subcommand(
        "verify", "check a solution file or a fingerprint record against the equation");
    auto options = std::make_shared<ProblemOptions>();
    auto path = std::make_shared<std::string>();
    auto json = std::make_shared<bool>(false);
    command->add_option("file", *path, "solution file (a, b, c one per line) or JSON record")
        ->required();
    add_problem_options(*command, *options);
    command->add_flag("--json", *json, "print one JSON object");
    command->callback([options, path, json, &context]() {
        const Problem problem = resolve_problem(*options);
        if (problem.family != "ratio-sum") {
            throw InputError("verify needs --family ratio-sum --N <N>");
        }
        const exact::VerificationReport report = exact::verify_solution_file(*problem.N, *path);
        if (*json) {
            nlohmann::json out{{"file", *path},
                               {"N", to_string(*problem.N)},
                               {"holds", report.holds},
                               {"problems", report.problems},
                               {"remarks", report.remarks}};
            std::cout << out.dump() << "\n";
        } else if (report.holds) {
            std::cout << "holds: " << *path << " satisfies a/(b+c) + b/(c+a) + c/(a+b) = "
                      << to_string(*problem.N) << " exactly\n";
            for (const auto& remark : report.remarks) std::cout << "note: " << remark << "\n";
        } else {
            for (const auto& problem_text : report.problems) {
                std::cout << "wrong: " << problem_text << "\n";
            }
            for (const auto& remark : report.remarks) std::cout << "note: " << remark << "\n";
        }
        context.exit_code = report.holds ? 0 : 1;
    });
}

}  // namespace arcsieve::cli
