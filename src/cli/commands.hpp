// The arcsieve subcommands. Each register_* adds one subcommand to the app; its callback writes
// to stdout and sets context.exit_code. InputError thrown from a callback becomes exit code 2.
#pragma once

#include <CLI/CLI.hpp>

#include <optional>
#include <string>

#include "curve/curve.hpp"

namespace arcsieve::cli {

struct Context {
    int exit_code = 0;
};

// Options shared by every command that names a problem: --family/--N or --curve.
struct ProblemOptions {
    std::string family;
    std::string N;
    std::string curve;
};

struct Problem {
    std::string family;        // "ratio-sum", or empty for a bare --curve
    std::optional<Integer> N;  // set for family problems
    Curve curve;
};

void add_problem_options(CLI::App& command, ProblemOptions& options);
// Throws InputError with a one-line message when the options do not name exactly one problem.
Problem resolve_problem(const ProblemOptions& options);

void register_inspect(CLI::App& app, Context& context);

}  // namespace arcsieve::cli
