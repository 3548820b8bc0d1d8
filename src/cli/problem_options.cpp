#include "cli/commands.hpp"
#include "family/ratio_sum.hpp"

namespace arcsieve::cli {

void add_problem_options(CLI::App& command, ProblemOptions& options) {
    command.add_option("--family", options.family, "problem family: ratio-sum");
    command.add_option("--N", options.N, "the family parameter N (a positive integer)");
    command.add_option("--curve", options.curve, "a curve by its a-invariants \"[a1,a2,a3,a4,a6]\"");
}

Problem resolve_problem(const ProblemOptions& options) {
    if (!options.curve.empty()) {
        if (!options.family.empty() || !options.N.empty()) {
            throw InputError("give either --curve or --family with --N, not both");
        }
        return Problem{"", std::nullopt, parse_curve(options.curve)};
    }
    if (options.family.empty()) {
        throw InputError("name a problem: --family ratio-sum --N <N>, or --curve \"[a1,a2,a3,a4,a6]\"");
    }
    if (options.family != "ratio-sum") {
        throw InputError("unknown family '" + options.family + "' (known: ratio-sum)");
    }
    if (options.N.empty()) throw InputError("--family ratio-sum needs --N");
    const Integer N = family::ratio_sum_parameter(options.N);
    return Problem{"ratio-sum", N, family::ratio_sum_curve(N)};
}

}  // namespace arcsieve::cli
