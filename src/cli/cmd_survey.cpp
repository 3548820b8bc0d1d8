// `arcsieve survey` (many problems: parallel, resumable, sharded) and `arcsieve survey merge`
// (join shard directories, checking gaps and duplicates).
#include <fmt/format.h>

#include <iostream>
#include <memory>

#include "cli/commands.hpp"
#include "survey/merge.hpp"
#include "survey/runner.hpp"

namespace arcsieve::cli {
namespace {

struct SurveyArguments {
    std::string family = "ratio-sum";
    std::string range;
    std::string step = "1";
    std::string input;
    std::string out;
    std::string shard = "1/1";
    bool resume = false;
    bool quiet = false;
    bool in_process = false;
    unsigned threads = 0;
    double time_limit = 600;
    std::size_t memory_limit = 4096;
    std::size_t max_digits = 10'000;
    unsigned digits = 30;
    bool no_materialise = false;
    std::string ordering;
    double progress_every = 10;
};

struct MergeArguments {
    std::vector<std::string> shards;
    std::string out;
};

const char* survey_footer = R"(DESCRIPTION
  Runs the whole job (curve, basis, region, first hit, fingerprint, exact solution under the
  size limit, verification) for every problem of a list, several problems at once. Each problem
  runs in its own child process, so the time limit and the memory guard hold and a crash costs
  only that problem's record. Every finished record is appended to DIR/records.jsonl with
  write+fsync before the next is reported; --resume skips what is there and drops a torn last
  line. At the end DIR/results.jsonl (problem order) and DIR/summary.csv are written. The
  records do not depend on --threads or on the shard split.

PROBLEMS
  --N lo..hi [--step s]   the family parameter from lo to hi in steps of s
  --input FILE            one JSON object per line, e.g.
                            {"family":"ratio-sum","N":22}
                            {"curve":"[0,0,1,-7,6]","generators":["1,0"]}

SHARDS
  --shard k/K takes the k-th of K parts, balanced by expected cost; every part computes the
  same split from the same problem list. `arcsieve survey merge --out ALL DIR1 ... DIRK`
  joins the parts and fails (exit 1) on a missing part, a gap or a duplicate.

EXIT STATUS
  0 the survey finished (failed problems are records with "status" not "ok"); 2 bad input.

EXAMPLES
  Every even N from 16 to 96 on two cores, at most 60 s per problem:
    arcsieve survey --N 16..96 --step 2 --threads 2 --time-limit 60 --out runs/even-16-96
  The same survey continued after a crash or a kill:
    arcsieve survey --N 16..96 --step 2 --out runs/even-16-96 --resume
  The third of four parts of a larger survey, then the join:
    arcsieve survey --N 2..4000 --step 2 --shard 3/4 --out runs/part3
    arcsieve survey merge --out runs/all runs/part1 runs/part2 runs/part3 runs/part4
)";

}  // namespace

void register_survey(CLI::App& app, Context& context) {
    auto* command = app.add_subcommand(
        "survey", "run the whole job for many problems: parallel, resumable, sharded");
    auto args = std::make_shared<SurveyArguments>();
    command->add_option("--family", args->family, "problem family (ratio-sum)")
        ->capture_default_str();
    command->add_option("--N", args->range, "range of N, 'lo..hi' (or one N)");
    command->add_option("--step", args->step, "step through the range")->capture_default_str();
    command->add_option("--input", args->input, "problem file, one JSON object per line");
    command->add_option("--out", args->out, "output directory for records and summary");
    command->add_option("--shard", args->shard, "run the k-th of K cost-balanced parts, 'k/K'")
        ->capture_default_str();
    command->add_flag("--resume", args->resume, "continue the survey already in --out");
    command->add_flag("--quiet", args->quiet, "no progress reports");
    command->add_option("--threads", args->threads, "problems at once (0: one per core)")
        ->capture_default_str();
    command->add_option("--time-limit", args->time_limit, "seconds per problem (0: none)")
        ->capture_default_str();
    command->add_option("--memory-limit", args->memory_limit, "megabytes per problem (0: none)")
        ->capture_default_str();
    command
        ->add_option("--size-limit", args->max_digits,
                     "largest solution (digits) written out exactly")
        ->capture_default_str();
    command->add_option("--digits", args->digits, "decimal digits of printed reals")
        ->capture_default_str();
    command->add_option("--ordering", args->ordering, "extra ordering constraint, e.g. 'a>=b>=c'");
    command->add_flag("--no-materialise", args->no_materialise,
                      "never write solutions out, fingerprints only");
    command->add_flag("--in-process", args->in_process,
                      "run problems as threads of this process (no hard limits)");
    command
        ->add_option("--progress-every", args->progress_every,
                     "seconds between plain progress lines when not on a terminal")
        ->capture_default_str();
    command->footer(survey_footer);

    auto* merge = command->add_subcommand("merge", "join shard directories into one survey");
    auto merge_args = std::make_shared<MergeArguments>();
    merge->add_option("--out", merge_args->out, "directory for the joined survey")->required();
    merge->add_option("shards", merge_args->shards, "the shard directories")->required();
    merge->footer(R"(DESCRIPTION
  Checks that the directories are the K parts of one survey (same problem list, each part once),
  that every problem has exactly one record, and writes records.jsonl, results.jsonl and
  summary.csv as an unsharded run would. Nothing is written when a check fails (exit 1).

EXAMPLES
    arcsieve survey merge --out runs/all runs/part1 runs/part2 runs/part3 runs/part4
)");
    merge->callback([merge_args, &context]() {
        try {
            const auto report = survey::merge_shards(merge_args->shards, merge_args->out);
            std::cout << fmt::format("merged {} shards, {} records into {}\n", report.shards,
                                     report.records, merge_args->out);
            context.exit_code = 0;
        } catch (const survey::MergeError& error) {
            std::cerr << "arcsieve: merge refused: " << error.what() << "\n";
            context.exit_code = 1;
        }
    });

    command->callback([command, merge, args, &context]() {
        if (merge->parsed()) return;
        std::vector<ProblemSpec> problems;
        if (!args->input.empty() && !args->range.empty()) {
            throw InputError("give either --N or --input, not both");
        }
        if (!args->input.empty()) {
            problems = survey::problems_from_file(args->input);
        } else if (!args->range.empty()) {
            const auto step = parse_integer(args->step);
            if (!step) throw InputError("--step must be a positive integer");
            problems = survey::problems_from_range(args->family, args->range, *step);
        } else {
            throw InputError("name the problems: --N lo..hi [--step s] or --input FILE");
        }
        if (args->out.empty()) throw InputError("a survey needs --out DIR");
        if (args->time_limit < 0) throw InputError("--time-limit must be >= 0");
        if (args->progress_every <= 0) throw InputError("--progress-every must be > 0");
        survey::SurveyOptions options;
        options.out_dir = args->out;
        options.resume = args->resume;
        options.threads = args->threads;
        options.shard = survey::parse_shard(args->shard);
        options.time_limit_seconds = args->time_limit;
        options.memory_limit_megabytes = args->memory_limit;
        options.isolate = !args->in_process;
        options.progress =
            args->quiet ? survey::ProgressStyle::quiet : survey::ProgressStyle::automatic;
        options.progress_interval_seconds = args->progress_every;
        options.job.digits = args->digits;
        options.job.max_solution_digits = args->max_digits;
        options.job.materialise = !args->no_materialise;
        options.job.ordering = args->ordering;
        options.job.output_dir = args->out + "/solutions";
        const auto report = survey::run_survey(problems, options, run_problem);
        if (!args->quiet) {
            std::cerr << fmt::format(
                "survey: {} problems in this part, {} already done, {} run now ({} not ok), "
                "{:.1f} s{}\n",
                report.assigned, report.already_done, report.ran, report.failed, report.seconds,
                report.torn_tail_dropped ? "; a torn last record was dropped and redone" : "");
        }
        context.exit_code = 0;
        (void)command;
    });
}

}  // namespace arcsieve::cli
