// The arcsieve subcommands. Each register_* adds one subcommand to the app; its callback writes
// to stdout and sets context.exit_code. InputError thrown from a callback becomes exit code 2.
#pragma once

#include <CLI/CLI.hpp>

#include <optional>
#include <string>

#include <nlohmann/json.hpp>

#include <ostream>
#include <vector>

#include "curve/point.hpp"

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
void register_verify(CLI::App&, Context&);
void register_survey(CLI::App& app, Context& context);
void register_solve(CLI::App& app, Context& context);
void register_plot(CLI::App& app, Context& context);
void register_basis(CLI::App& app, Context& context);
void register_locate(CLI::App& app, Context& context);

// Analytic part of `inspect` (periods, components, and per point its component, elliptic log
// and canonical height): appends to the JSON record and to the text report.
void inspect_analytic(const Curve& curve, const std::vector<Point>& points, unsigned digits,
                      nlohmann::json& record, std::ostream& text);

}  // namespace arcsieve::cli
