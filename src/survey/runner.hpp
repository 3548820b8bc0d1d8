// Running a survey: many problems side by side (one child process per problem, so a time limit
// and a memory guard can be enforced and a crash costs one record, or in-process with oneTBB),
// records appended durably under the output directory, resume, shards, progress reports, and
// the final sorted results and CSV summary.
#pragma once

#include <functional>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "survey/job.hpp"
#include "survey/problems.hpp"

namespace arcsieve::survey {

// The work done for one problem; the shipped one is arcsieve::run_problem. Tests pass their own.
using JobFunction = std::function<nlohmann::json(const ProblemSpec&, const JobOptions&)>;

enum class ProgressStyle { automatic, bar, lines, quiet };

struct SurveyOptions {
    std::string out_dir;
    bool resume = false;
    unsigned threads = 0;                    // problems run at once; 0: the machine's cores
    Shard shard;                             // 1/1: the whole list
    double time_limit_seconds = 0;           // per problem; 0: none
    std::size_t memory_limit_megabytes = 0;  // per problem (address space); 0: none
    bool isolate = true;  // child process per problem; false: in-process (limits cooperative only)
    ProgressStyle progress = ProgressStyle::automatic;
    double progress_interval_seconds = 10;  // for plain lines
    JobOptions job;
};

struct SurveyReport {
    std::size_t assigned = 0;      // problems in this shard
    std::size_t already_done = 0;  // found in the journal on resume
    std::size_t ran = 0;           // run now
    std::size_t failed = 0;        // records of this run with a status other than "ok"
    bool torn_tail_dropped = false;
    double seconds = 0;
};

// File names under the output directory.
inline constexpr const char* manifest_file = "manifest.json";
inline constexpr const char* journal_file = "records.jsonl";  // completion order, append-only
inline constexpr const char* results_file = "results.jsonl";  // problem order, written at the end
inline constexpr const char* summary_file = "summary.csv";

// Runs (or, with resume, continues) a survey. Throws InputError when the directory holds a
// different survey, or holds one and resume is off.
SurveyReport run_survey(const std::vector<ProblemSpec>& problems, const SurveyOptions& options,
                        const JobFunction& job);

// Runs one problem in a child process under the limits and returns its record (never throws
// for a failure of the job: the record says what happened).
nlohmann::json run_problem_isolated(const ProblemSpec& problem, const SurveyOptions& options,
                                    const JobFunction& job);

// Runs the job in this process, turning exceptions into an error record, and adds
// "problem_key", "status" and "seconds".
nlohmann::json run_problem_guarded(const ProblemSpec& problem, const JobOptions& options,
                                   double time_limit_seconds, const JobFunction& job);

// The bookkeeping keys every survey record carries: "problem_key", "status" ("ok" unless the
// record has "error"; "timeout" and "crashed" come from the runner).
nlohmann::json finish_record(nlohmann::json record, const ProblemSpec& problem);

// The record without its timing fields: what must agree between runs of the same survey.
nlohmann::json without_timing(nlohmann::json record);

// Manifest, shared by drivers (the MPI one too): survey identity and this shard's problems.
nlohmann::json make_manifest(const std::vector<ProblemSpec>& problems, const Shard& shard,
                             const std::vector<std::size_t>& members);

// Prepares the directory (manifest check or creation, torn-tail repair) and returns the keys
// already done. Used by run_survey and the MPI driver.
struct PreparedSurvey {
    std::vector<std::size_t> members;  // positions in `problems` assigned to this shard
    std::vector<std::size_t> pending;  // members without a record yet
    std::size_t already_done = 0;
    bool torn_tail_dropped = false;
};
PreparedSurvey prepare_survey(const std::vector<ProblemSpec>& problems, const std::string& out_dir,
                              const Shard& shard, bool resume);

// Writes results.jsonl (records in problem order) and summary.csv from the journal.
void finalise_survey(const std::vector<ProblemSpec>& problems,
                     const std::vector<std::size_t>& members, const std::string& out_dir);

// One CSV line per record (header included): the columns a spreadsheet needs.
std::string summary_csv(const std::vector<nlohmann::json>& records);

// Progress reports on stderr: a bar with rate and ETA on a terminal, plain lines otherwise.
class ProgressMeter {
  public:
    ProgressMeter(std::size_t total, std::size_t already_done, ProgressStyle style,
                  double interval_seconds);
    void record_finished(bool failed);
    void finish();

  private:
    void print(bool final);
    std::size_t total_, done_, done_at_start_, failed_ = 0;
    ProgressStyle style_;
    double interval_;
    double started_, last_print_ = -1e9;
};

}  // namespace arcsieve::survey
