// `arcsieve solve`: the whole job for one problem (default: ratio-sum, N = 14), printed as a
// readable report or, with --json, as the DESIGN.md §6 record.
#include <oneapi/tbb/global_control.h>

#include <chrono>
#include <filesystem>
#include <iostream>
#include <memory>

#include "cli/commands.hpp"
#include "survey/job.hpp"
#include "survey/report.hpp"

namespace arcsieve::cli {
namespace {

struct SolveArguments {
    ProblemOptions problem;
    std::string generators;
    bool json = false;
    std::string ordering;
    std::size_t size_limit = 100'000;
    unsigned digits = 30;
    unsigned threads = 0;
    std::string out = ".";
    double time_limit = 0;
    bool no_materialise = false;
};

const char* solve_footer = R"(DESCRIPTION
  Finds the curve behind the problem, its torsion, rank bounds and generators, the arcs of the
  real locus where solutions live, the first combination of generators plus torsion that lands
  there, its canonical height, the exact digit counts and leading digits of the smallest
  solution, and the solution itself when it has at most --size-limit digits (written to a file
  under --out when it is too long to print). The report ends with what is proven and what is
  conditional (for example a rank bound that is not sharp, or saturation proved only at small
  primes). Without a problem, solves ratio-sum with N = 14.

EXIT STATUS
  0 done; 1 the job could not be completed or a check failed (the report says which); 2 bad input.

EXAMPLES
  The built-in problem, a/(b+c) + b/(c+a) + c/(a+b) = 14:
    arcsieve solve
  N = 22 with the largest variable first, as one JSON record:
    arcsieve solve --family ratio-sum --N 22 --ordering "a>=b>=c" --json
  A bare curve with a known point, curve data and basis only:
    arcsieve solve --curve "[0,0,1,-7,6]" --generators "1,0"
)";

std::vector<Point> parse_generators(const Curve& curve, const std::string& text) {
    std::vector<Point> points;
    std::size_t start = 0;
    while (start <= text.size() && !text.empty()) {
        std::size_t end = text.find(';', start);
        if (end == std::string::npos) end = text.size();
        points.push_back(parse_point(curve, text.substr(start, end - start)));
        start = end + 1;
    }
    return points;
}

}  // namespace

void register_solve(CLI::App& app, Context& context) {
    auto* command = app.add_subcommand("solve", "the whole job for one problem");
    auto args = std::make_shared<SolveArguments>();
    add_problem_options(*command, args->problem);
    command->add_option("--generators", args->generators,
                        "known points to start from, \"x1,y1;x2,y2\"");
    command->add_flag("--json", args->json, "print the record as one JSON object");
    command->add_option("--ordering", args->ordering,
                        "extra ordering of the variables, e.g. \"a>=b>=c\"");
    command
        ->add_option("--size-limit", args->size_limit,
                     "largest solution (decimal digits per variable) written out exactly")
        ->capture_default_str();
    command->add_option("--digits", args->digits, "decimal digits of printed real numbers")
        ->capture_default_str();
    command->add_option("--threads", args->threads, "threads for the parallel parts (0: all)")
        ->capture_default_str();
    command->add_option("--out", args->out, "directory for solution files")->capture_default_str();
    command->add_option("--time-limit", args->time_limit, "seconds before giving up (0: none)")
        ->capture_default_str();
    command->add_flag("--no-materialise", args->no_materialise,
                      "never write the solution out, fingerprint only");
    command->footer(solve_footer);
    command->callback([args, &context]() {
        ProblemOptions options = args->problem;
        if (options.family.empty() && options.N.empty() && options.curve.empty()) {
            options.family = "ratio-sum";  // the built-in default problem
            options.N = "14";
        } else if (options.family.empty() && !options.N.empty()) {
            options.family = "ratio-sum";
        }
        if (args->digits < 5 || args->digits > 10000) {
            throw InputError("--digits must be between 5 and 10000");
        }
        if (args->time_limit < 0) throw InputError("--time-limit must be >= 0");
        const Problem problem = resolve_problem(options);
        ProblemSpec spec;
        spec.family = problem.family;
        spec.N = problem.N;
        if (problem.family.empty()) spec.curve = problem.curve;
        if (!args->generators.empty())
            spec.generators = parse_generators(problem.curve, args->generators);
        JobOptions job;
        job.digits = args->digits;
        job.max_solution_digits = args->size_limit;
        job.materialise = !args->no_materialise;
        job.ordering = args->ordering;
        job.output_dir = args->out;
        if (args->time_limit > 0) {
            job.deadline = std::chrono::steady_clock::now() +
                           std::chrono::duration_cast<std::chrono::steady_clock::duration>(
                               std::chrono::duration<double>(args->time_limit));
        }
        std::unique_ptr<oneapi::tbb::global_control> parallelism;
        if (args->threads > 0) {
            parallelism = std::make_unique<oneapi::tbb::global_control>(
                oneapi::tbb::global_control::max_allowed_parallelism, args->threads);
        }
        nlohmann::json record = run_problem(spec, job);
        if (record.contains("solution_file")) {
            record["solution_file"] =
                (std::filesystem::path(args->out) / record["solution_file"].get<std::string>())
                    .string();
        }
        if (args->json) {
            std::cout << record.dump() << "\n";
        } else {
            std::cout << survey::readable_report(record);
        }
        const bool failed = record.contains("error") ||
                            (record.contains("verified") && record["verified"] == false);
        context.exit_code = failed ? 1 : 0;
    });
}

}  // namespace arcsieve::cli
