// The survey runner with a stand-in job: equal results for any thread count, isolation, failure
// records (error, crash, time-out, memory), resume rules, kill -9 at random moments + resume,
// and progress reports.
#include <gtest/gtest.h>

#include <csignal>
#include <cstdlib>
#include <fstream>
#include <random>
#include <set>

#include "survey/merge.hpp"
#include "survey_test_support.hpp"

namespace arcsieve::survey {
namespace {

using testing::even_range;
using testing::in_subprocess;
using testing::results_without_timing;
using testing::stand_in;
using testing::TemporaryDirectory;

SurveyOptions quiet_options(const std::string& dir, unsigned threads) {
    SurveyOptions options;
    options.out_dir = dir;
    options.threads = threads;
    options.progress = ProgressStyle::quiet;
    return options;
}

TEST(SurveyRunnerTest, ResultsDoNotDependOnThreadCountOrIsolation) {
    const auto problems = even_range(2, 60);
    TemporaryDirectory one("one"), two("two"), threads("threads");
    run_survey(problems, quiet_options(one.path, 1), stand_in(1));
    run_survey(problems, quiet_options(two.path, 2), stand_in(1));
    // In-process mode uses TBB; run it in a child so this process never starts TBB.
    EXPECT_EQ(in_subprocess([&] {
                  auto options = quiet_options(threads.path, 2);
                  options.isolate = false;
                  run_survey(problems, options, stand_in(1));
                  return 0;
              }),
              0);
    const auto reference = results_without_timing(one.path);
    ASSERT_EQ(reference.size(), problems.size());
    EXPECT_EQ(reference.front()["N"], 2);  // problem order, whatever the completion order
    EXPECT_EQ(reference.back()["N"], 60);
    EXPECT_EQ(results_without_timing(two.path), reference);
    EXPECT_EQ(results_without_timing(threads.path), reference);
    // The journal holds each problem once.
    EXPECT_EQ(read_journal(two.path + "/" + journal_file).records.size(), problems.size());
}

TEST(SurveyRunnerTest, FailuresBecomeRecordsAndTheSurveyGoesOn) {
    const auto problems = even_range(2, 14);
    TemporaryDirectory dir("failures");
    auto options = quiet_options(dir.path, 2);
    options.time_limit_seconds = 0.3;
    options.memory_limit_megabytes = testing::sanitizer_scale() ? 0 : 512;
    const JobFunction job = [](const ProblemSpec& p, const JobOptions& o) {
        const long N = p.N->get_si();
        if (N == 4) throw std::runtime_error("stage failed on purpose");
        if (N == 6) std::abort();
        if (N == 8) std::this_thread::sleep_for(std::chrono::seconds(30));  // ignores deadline
        if (N == 10 && !testing::sanitizer_scale()) {
            std::vector<char> huge(std::size_t{4} << 30, 1);  // over the 512 MB guard
            return nlohmann::json{{"size", huge.size()}};
        }
        return testing::stand_in_job(p, o, 0);
    };
    const auto report = run_survey(problems, options, job);
    const auto results = results_without_timing(dir.path);
    ASSERT_EQ(results.size(), problems.size());
    auto status_of = [&](int N) { return results[(N - 2) / 2]["status"].get<std::string>(); };
    EXPECT_EQ(status_of(2), "ok");
    EXPECT_EQ(status_of(4), "error");
    EXPECT_EQ(results[1]["error"], "stage failed on purpose");
    EXPECT_EQ(status_of(6), "crashed");
    EXPECT_EQ(status_of(8), "timeout");
    if (!testing::sanitizer_scale()) {
        EXPECT_EQ(status_of(10), "memory");
    }
    EXPECT_EQ(status_of(12), "ok");
    EXPECT_EQ(status_of(14), "ok");
    EXPECT_EQ(report.failed, testing::sanitizer_scale() ? 3u : 4u);
    // The CSV summary carries the status of every problem.
    const std::string csv = read_file(dir.path + "/" + summary_file);
    EXPECT_NE(csv.find("ratio-sum N=8,ratio-sum,8,,timeout"), std::string::npos) << csv;
}

TEST(SurveyRunnerTest, ResumeRules) {
    const auto problems = even_range(2, 20);
    TemporaryDirectory dir("resume");
    auto options = quiet_options(dir.path, 2);
    EXPECT_EQ(run_survey(problems, options, stand_in(0)).ran, problems.size());
    // A second run without --resume is refused; with it, nothing is redone.
    EXPECT_THROW(run_survey(problems, options, stand_in(0)), InputError);
    options.resume = true;
    const auto again = run_survey(problems, options, stand_in(0));
    EXPECT_EQ(again.ran, 0u);
    EXPECT_EQ(again.already_done, problems.size());
    // Another problem list or another shard in the same directory is refused.
    EXPECT_THROW(run_survey(even_range(2, 22), options, stand_in(0)), InputError);
    options.shard = Shard{1, 2};
    EXPECT_THROW(run_survey(problems, options, stand_in(0)), InputError);
}

TEST(SurveyRunnerTest, KilledAtRandomMomentsAndResumedEqualsUninterrupted) {
    const bool sanitize = testing::sanitizer_scale();
    const int kills = sanitize ? 4 : 12;
    const auto problems = even_range(2, 120);  // 60 problems of about 25 ms each
    const int sleep_ms = 25;
    TemporaryDirectory reference("reference"), killed("killed");
    run_survey(problems, quiet_options(reference.path, 2), stand_in(sleep_ms));

    const unsigned seed = std::random_device{}();
    std::mt19937 random(seed);
    std::uniform_int_distribution<int> delay_ms(10, 90);
    int interrupted_mid_survey = 0;
    for (int k = 0; k < kills; ++k) {
        const pid_t pid = ::fork();
        if (pid == 0) {
            ::setpgid(0, 0);
            auto options = quiet_options(killed.path, 2);
            options.resume = true;
            try {
                run_survey(problems, options, stand_in(sleep_ms));
            } catch (...) {
                ::_exit(1);
            }
            ::_exit(0);
        }
        ::setpgid(pid, pid);
        const int delay = delay_ms(random);
        std::this_thread::sleep_for(std::chrono::milliseconds(delay));
        ::kill(-pid, SIGKILL);  // the driver and its children, as a batch system does
        int status = 0;
        ::waitpid(pid, &status, 0);
        ASSERT_TRUE(WIFSIGNALED(status) || (WIFEXITED(status) && WEXITSTATUS(status) == 0))
            << "seed " << seed << ", kill " << k;
        const std::string journal = killed.path + "/" + journal_file;
        const auto contents = read_journal(journal);
        if (!contents.records.empty() && contents.records.size() < problems.size()) {
            ++interrupted_mid_survey;
        }
        if (k % 3 == 1) {
            // Also leave what a kill inside write() would: half a record, no newline.
            std::ofstream(journal, std::ios::binary | std::ios::app)
                << "{\"problem_key\":\"ratio-sum N=9999\",\"padding\":\"xxxx";
        }
    }
    EXPECT_GE(interrupted_mid_survey, 1) << "seed " << seed << ": no kill landed mid-survey";
    auto options = quiet_options(killed.path, 2);
    options.resume = true;
    const auto report = run_survey(problems, options, stand_in(sleep_ms));
    EXPECT_EQ(report.assigned, problems.size());
    const auto journal = read_journal(killed.path + "/" + journal_file).records;
    std::set<std::string> keys;
    for (const auto& r : journal) keys.insert(r["problem_key"].get<std::string>());
    EXPECT_EQ(keys.size(), journal.size()) << "seed " << seed << ": a record was duplicated";
    EXPECT_EQ(journal.size(), problems.size()) << "seed " << seed;
    EXPECT_EQ(results_without_timing(killed.path), results_without_timing(reference.path))
        << "seed " << seed;
}

TEST(SurveyRunnerTest, ProgressLinesWhenNotOnATerminalAndSilenceWhenQuiet) {
    ::testing::internal::CaptureStderr();
    {
        ProgressMeter meter(4, 1, ProgressStyle::lines, 0);
        meter.record_finished(false);
        meter.record_finished(true);
        meter.finish();
    }
    const std::string lines = ::testing::internal::GetCapturedStderr();
    EXPECT_NE(lines.find("survey: 2/4 done"), std::string::npos) << lines;
    EXPECT_NE(lines.find("problems/s"), std::string::npos) << lines;
    EXPECT_NE(lines.find("1 failed"), std::string::npos) << lines;
    ::testing::internal::CaptureStderr();
    {
        ProgressMeter meter(2, 0, ProgressStyle::bar, 0);
        meter.record_finished(false);
        meter.finish();
    }
    const std::string bar = ::testing::internal::GetCapturedStderr();
    EXPECT_NE(bar.find("\r["), std::string::npos) << bar;
    EXPECT_NE(bar.find("ETA"), std::string::npos) << bar;
    ::testing::internal::CaptureStderr();
    {
        ProgressMeter meter(2, 0, ProgressStyle::quiet, 0);
        meter.record_finished(false);
        meter.finish();
    }
    EXPECT_EQ(::testing::internal::GetCapturedStderr(), "");
}

}  // namespace
}  // namespace arcsieve::survey
