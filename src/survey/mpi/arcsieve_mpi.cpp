// arcsieve-mpi: the survey driver for clusters. Rank 0 owns the output directory (journal,
// resume, final results) and hands out one problem at a time to whichever worker rank is free;
// workers run the whole job (in a child process, as `arcsieve survey` does) and send the record
// back. Every rank builds the same problem list from the same arguments, so only positions and
// records travel.
#include <fmt/format.h>
#include <mpi.h>
#include <unistd.h>

#include <CLI/CLI.hpp>
#include <chrono>
#include <iostream>
#include <thread>

#include "survey/journal.hpp"
#include "survey/runner.hpp"

namespace {

using namespace arcsieve;

constexpr int task_tag = 1;    // rank 0 -> worker: a position (uint64), or stop_marker
constexpr int record_tag = 2;  // worker -> rank 0: the record as JSON text
constexpr std::uint64_t stop_marker = ~std::uint64_t{0};

struct Arguments {
    std::string family = "ratio-sum";
    std::string range;
    std::string step = "1";
    std::string input;
    std::string out;
    std::string shard = "1/1";
    bool resume = false;
    bool quiet = false;
    bool in_process = false;
    double time_limit = 600;
    std::size_t memory_limit = 4096;
    std::size_t size_limit = 10'000;
    unsigned digits = 30;
    bool no_materialise = false;
    double progress_every = 10;
};

std::vector<ProblemSpec> build_problems(const Arguments& args) {
    if (!args.input.empty() && !args.range.empty()) {
        throw InputError("give either --N or --input, not both");
    }
    if (!args.input.empty()) return survey::problems_from_file(args.input);
    if (args.range.empty())
        throw InputError("name the problems: --N lo..hi [--step s] or --input FILE");
    const auto step = parse_integer(args.step);
    if (!step) throw InputError("--step must be a positive integer");
    return survey::problems_from_range(args.family, args.range, *step);
}

survey::SurveyOptions survey_options(const Arguments& args) {
    survey::SurveyOptions options;
    options.out_dir = args.out;
    options.resume = args.resume;
    options.threads = 1;  // one problem per worker rank at a time
    options.shard = survey::parse_shard(args.shard);
    options.time_limit_seconds = args.time_limit;
    options.memory_limit_megabytes = args.memory_limit;
    options.isolate = !args.in_process;
    options.progress = args.quiet ? survey::ProgressStyle::quiet : survey::ProgressStyle::automatic;
    options.progress_interval_seconds = args.progress_every;
    options.job.digits = args.digits;
    options.job.max_solution_digits = args.size_limit;
    options.job.materialise = !args.no_materialise;
    options.job.output_dir = args.out + "/solutions";
    return options;
}

nlohmann::json run_one(const ProblemSpec& problem, const survey::SurveyOptions& options) {
    if (options.isolate) return survey::run_problem_isolated(problem, options, run_problem);
    return survey::run_problem_guarded(problem, options.job, options.time_limit_seconds,
                                       run_problem);
}

void send_task(std::uint64_t position, int worker) {
    MPI_Send(&position, 1, MPI_UINT64_T, worker, task_tag, MPI_COMM_WORLD);
}

int coordinate(const std::vector<ProblemSpec>& problems, const survey::SurveyOptions& options,
               const survey::PreparedSurvey& prepared, int ranks) {
    survey::JournalWriter journal(options.out_dir + "/" + survey::journal_file);
    survey::ProgressMeter meter(prepared.members.size(), prepared.already_done, options.progress,
                                options.progress_interval_seconds);
    std::size_t next = 0, outstanding = 0, failed = 0;
    auto record_done = [&](const nlohmann::json& record) {
        const bool bad = record.value("status", "ok") != "ok";
        failed += bad ? 1 : 0;
        journal.append(record);
        meter.record_finished(bad);
    };
    if (ranks == 1) {  // no workers: rank 0 does the work itself
        for (std::size_t position : prepared.pending)
            record_done(run_one(problems[position], options));
    } else {
        for (int worker = 1; worker < ranks; ++worker) {
            if (next < prepared.pending.size()) {
                send_task(prepared.pending[next++], worker);
                ++outstanding;
            } else {
                send_task(stop_marker, worker);
            }
        }
        while (outstanding > 0) {
            int arrived = 0;
            MPI_Status status;
            MPI_Iprobe(MPI_ANY_SOURCE, record_tag, MPI_COMM_WORLD, &arrived, &status);
            if (!arrived) {
                // Sleep instead of a blocking receive: Open MPI's blocking calls spin and would
                // take a core away from the workers.
                std::this_thread::sleep_for(std::chrono::milliseconds(2));
                continue;
            }
            int length = 0;
            MPI_Get_count(&status, MPI_CHAR, &length);
            std::string text(static_cast<std::size_t>(length), '\0');
            MPI_Recv(text.data(), length, MPI_CHAR, status.MPI_SOURCE, record_tag, MPI_COMM_WORLD,
                     MPI_STATUS_IGNORE);
            --outstanding;
            record_done(nlohmann::json::parse(text));
            if (next < prepared.pending.size()) {
                send_task(prepared.pending[next++], status.MPI_SOURCE);
                ++outstanding;
            } else {
                send_task(stop_marker, status.MPI_SOURCE);
            }
        }
    }
    meter.finish();
    survey::finalise_survey(problems, prepared.members, options.out_dir);
    if (options.progress != survey::ProgressStyle::quiet) {
        std::cerr << fmt::format(
            "arcsieve-mpi: {} problems, {} already done, {} run on {} worker "
            "rank(s) ({} not ok)\n",
            prepared.members.size(), prepared.already_done, prepared.pending.size(),
            std::max(1, ranks - 1), failed);
    }
    return 0;
}

void work(const std::vector<ProblemSpec>& problems, const survey::SurveyOptions& options) {
    while (true) {
        std::uint64_t position = 0;
        MPI_Recv(&position, 1, MPI_UINT64_T, 0, task_tag, MPI_COMM_WORLD, MPI_STATUS_IGNORE);
        if (position == stop_marker) return;
        const std::string text = run_one(problems.at(position), options).dump();
        MPI_Send(text.data(), static_cast<int>(text.size()), MPI_CHAR, 0, record_tag,
                 MPI_COMM_WORLD);
    }
}

}  // namespace

int main(int argc, char** argv) {
    MPI_Init(&argc, &argv);
    int rank = 0, ranks = 1;
    MPI_Comm_rank(MPI_COMM_WORLD, &rank);
    MPI_Comm_size(MPI_COMM_WORLD, &ranks);

    CLI::App app{"arcsieve-mpi: the arcsieve survey across the ranks of an MPI job"};
    Arguments args;
    app.add_option("--family", args.family, "problem family (ratio-sum)")->capture_default_str();
    app.add_option("--N", args.range, "range of N, 'lo..hi' (or one N)");
    app.add_option("--step", args.step, "step through the range")->capture_default_str();
    app.add_option("--input", args.input, "problem file, one JSON object per line");
    app.add_option("--out", args.out, "output directory (written by rank 0 only)")->required();
    app.add_option("--shard", args.shard, "the k-th of K cost-balanced parts, 'k/K'")
        ->capture_default_str();
    app.add_flag("--resume", args.resume, "continue the survey already in --out");
    app.add_flag("--quiet", args.quiet, "no progress reports");
    app.add_option("--time-limit", args.time_limit, "seconds per problem (0: none)")
        ->capture_default_str();
    app.add_option("--memory-limit", args.memory_limit, "megabytes per problem (0: none)")
        ->capture_default_str();
    app.add_option("--size-limit", args.size_limit, "largest solution (digits) written out")
        ->capture_default_str();
    app.add_option("--digits", args.digits, "decimal digits of printed reals")
        ->capture_default_str();
    app.add_flag("--no-materialise", args.no_materialise, "fingerprints only");
    app.add_flag("--in-process", args.in_process, "run problems inside the worker rank");
    app.add_option("--progress-every", args.progress_every, "seconds between progress lines")
        ->capture_default_str();
    app.footer(R"(EXAMPLES
  Even N from 16 to 96 on four ranks (rank 0 hands out problems, ranks 1-3 work):
    mpirun -n 4 arcsieve-mpi --N 16..96 --step 2 --out runs/even-16-96
  The records are those `arcsieve survey` writes for the same problems.)");

    int code = 0;
    try {
        app.parse(argc, argv);
        const auto problems = build_problems(args);
        const auto options = survey_options(args);
        int ready = 0;
        survey::PreparedSurvey prepared;
        if (rank == 0) {
            try {
                prepared = survey::prepare_survey(problems, options.out_dir, options.shard,
                                                  options.resume);
                ready = 1;
            } catch (const InputError& error) {
                std::cerr << "arcsieve-mpi: error: " << error.what() << "\n";
            }
        }
        MPI_Bcast(&ready, 1, MPI_INT, 0, MPI_COMM_WORLD);
        if (!ready) {
            code = 2;
        } else if (rank == 0) {
            code = coordinate(problems, options, prepared, ranks);
        } else {
            work(problems, options);
        }
    } catch (const CLI::ParseError& error) {
        code = rank == 0 ? app.exit(error) : (error.get_exit_code() == 0 ? 0 : 2);
        if (code != 0) code = 2;
    } catch (const InputError& error) {
        if (rank == 0) std::cerr << "arcsieve-mpi: error: " << error.what() << "\n";
        code = 2;
    } catch (const std::exception& error) {
        std::cerr << "arcsieve-mpi: internal error on rank " << rank << ": " << error.what()
                  << "\n";
        MPI_Abort(MPI_COMM_WORLD, 3);
    }
    MPI_Finalize();
    return code;
}
