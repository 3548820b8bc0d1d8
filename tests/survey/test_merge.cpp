// Shards and merge: K shard runs merged equal the unsharded run; gaps, duplicates, missing or
// foreign shards are refused.
#include <gtest/gtest.h>

#include <fstream>

#include "survey/merge.hpp"
#include "survey_test_support.hpp"

namespace arcsieve::survey {
namespace {

using testing::even_range;
using testing::results_without_timing;
using testing::stand_in;
using testing::TemporaryDirectory;

struct ShardedRun {
    TemporaryDirectory root{"shards"};
    std::vector<std::string> dirs;
    ShardedRun(const std::vector<ProblemSpec>& problems, unsigned K) {
        for (unsigned k = 1; k <= K; ++k) {
            SurveyOptions options;
            options.out_dir = root.path + "/part" + std::to_string(k);
            options.shard = Shard{k, K};
            options.threads = 2;
            options.progress = ProgressStyle::quiet;
            run_survey(problems, options, stand_in(0));
            dirs.push_back(options.out_dir);
        }
    }
};

TEST(SurveyMergeTest, MergedShardsEqualTheUnshardedRun) {
    const auto problems = even_range(2, 80);
    TemporaryDirectory whole("whole");
    SurveyOptions options;
    options.out_dir = whole.path;
    options.progress = ProgressStyle::quiet;
    run_survey(problems, options, stand_in(0));
    for (unsigned K : {2u, 3u}) {
        ShardedRun run(problems, K);
        const std::string merged = run.root.path + "/merged";
        const auto report = merge_shards(run.dirs, merged);
        EXPECT_EQ(report.records, problems.size());
        EXPECT_EQ(results_without_timing(merged), results_without_timing(whole.path)) << "K=" << K;
        // Shards are not empty and not the same size by accident of the test.
        EXPECT_GT(read_journal(run.dirs[0] + "/" + journal_file).records.size(), 0u);
    }
}

TEST(SurveyMergeTest, RefusesMissingShard) {
    ShardedRun run(even_range(2, 30), 3);
    EXPECT_THROW(merge_shards({run.dirs[0], run.dirs[2]}, run.root.path + "/m"), MergeError);
    EXPECT_THROW(merge_shards({run.dirs[0], run.dirs[0], run.dirs[1]}, run.root.path + "/m"),
                 MergeError);
    EXPECT_FALSE(std::filesystem::exists(run.root.path + "/m/" + results_file));
}

TEST(SurveyMergeTest, RefusesGap) {
    ShardedRun run(even_range(2, 30), 2);
    const std::string journal = run.dirs[1] + "/" + journal_file;
    auto records = read_journal(journal).records;
    records.pop_back();
    std::string text;
    for (const auto& r : records) text += r.dump() + "\n";
    write_file_atomically(journal, text);
    try {
        merge_shards(run.dirs, run.root.path + "/m");
        FAIL() << "a gap was not detected";
    } catch (const MergeError& error) {
        EXPECT_NE(std::string(error.what()).find("gaps"), std::string::npos) << error.what();
    }
}

TEST(SurveyMergeTest, RefusesDuplicate) {
    ShardedRun run(even_range(2, 30), 2);
    const auto records = read_journal(run.dirs[0] + "/" + journal_file).records;
    std::ofstream(run.dirs[0] + "/" + journal_file, std::ios::app)
        << records.front().dump() << "\n";
    EXPECT_THROW(merge_shards(run.dirs, run.root.path + "/m"), MergeError);
}

TEST(SurveyMergeTest, RefusesShardsOfDifferentSurveys) {
    ShardedRun a(even_range(2, 30), 2);
    ShardedRun b(even_range(2, 32), 2);
    EXPECT_THROW(merge_shards({a.dirs[0], b.dirs[1]}, a.root.path + "/m"), MergeError);
    EXPECT_THROW(merge_shards({a.root.path + "/nothing"}, a.root.path + "/m"), InputError);
}

}  // namespace
}  // namespace arcsieve::survey
