// Problem lists: ranges, the JSON Lines problem file, keys, and the cost-balanced shard split.
#include <gtest/gtest.h>

#include <algorithm>
#include <numeric>
#include <set>

#include "survey/problems.hpp"

namespace arcsieve::survey {
namespace {

TEST(ProblemRangeTest, EvenRangeHasEveryStepValue) {
    const auto problems = problems_from_range("ratio-sum", "2..200", Integer(2));
    ASSERT_EQ(problems.size(), 100u);
    EXPECT_EQ(*problems.front().N, 2);
    EXPECT_EQ(*problems.back().N, 200);
    EXPECT_EQ(problem_key(problems[6]), "ratio-sum N=14");
}

TEST(ProblemRangeTest, SingleValueAndUnevenEnd) {
    EXPECT_EQ(problems_from_range("ratio-sum", "14", Integer(1)).size(), 1u);
    const auto problems = problems_from_range("ratio-sum", "3..10", Integer(3));
    ASSERT_EQ(problems.size(), 3u);  // 3, 6, 9
    EXPECT_EQ(*problems.back().N, 9);
}

TEST(ProblemRangeTest, MalformedRangesAreInputErrors) {
    EXPECT_THROW(problems_from_range("ratio-sum", "10..2", Integer(1)), InputError);
    EXPECT_THROW(problems_from_range("ratio-sum", "2..x", Integer(1)), InputError);
    EXPECT_THROW(problems_from_range("ratio-sum", "0..10", Integer(1)), InputError);
    EXPECT_THROW(problems_from_range("ratio-sum", "2..10", Integer(0)), InputError);
    EXPECT_THROW(problems_from_range("ratio-sum", "2..10", Integer(-2)), InputError);
    EXPECT_THROW(problems_from_range("two-squares", "2..10", Integer(1)), InputError);
    EXPECT_THROW(problems_from_range("ratio-sum", "1..100000000", Integer(1)), InputError);
}

TEST(ProblemFileTest, ParsesFamilyAndCurveLines) {
    const auto problems = problems_from_lines(
        "{\"family\":\"ratio-sum\",\"N\":22}\n\n{\"family\":\"ratio-sum\",\"N\":\"30\"}\n"
        "{\"curve\":\"[0,0,1,-7,6]\",\"generators\":[\"1,0\"]}\n",
        "test");
    ASSERT_EQ(problems.size(), 3u);
    EXPECT_EQ(*problems[0].N, 22);
    EXPECT_EQ(*problems[1].N, 30);
    ASSERT_TRUE(problems[2].curve.has_value());
    ASSERT_EQ(problems[2].generators.size(), 1u);
    EXPECT_EQ(problem_key(problems[2]), "curve " + to_string(*problems[2].curve));
    // Round trip through the JSON form.
    EXPECT_EQ(problem_to_json(problems[2])["generators"][0], "1,0");
}

TEST(ProblemFileTest, ErrorsNameTheLine) {
    auto message = [](const std::string& text) {
        try {
            problems_from_lines(text, "p.jsonl");
        } catch (const InputError& error) {
            return std::string(error.what());
        }
        return std::string("no error");
    };
    EXPECT_EQ(message("{\"family\":\"ratio-sum\",\"N\":4}\nnot json\n").rfind("p.jsonl:2:", 0), 0u);
    EXPECT_NE(message("{\"family\":\"ratio-sum\"}\n").find("need N"), std::string::npos);
    EXPECT_NE(message("{\"family\":\"ratio-sum\",\"N\":0}\n"), "no error");
    EXPECT_NE(message("{\"family\":\"ratio-sum\",\"N\":2.5}\n"), "no error");
    EXPECT_NE(message("{\"family\":\"ratio-sum\",\"N\":4,\"colour\":1}\n").find("unknown key"),
              std::string::npos);
    EXPECT_NE(message("{\"curve\":\"[0,0,0,0,0]\"}\n"), "no error");  // singular
    EXPECT_NE(message("{\"curve\":\"[0,0,1,-7,6]\",\"generators\":[\"5,5\"]}\n"), "no error");
    EXPECT_NE(message("{\"family\":\"ratio-sum\",\"N\":4}\n{\"family\":\"ratio-sum\",\"N\":4}\n")
                  .find("twice"),
              std::string::npos);
    EXPECT_NE(message("\n\n"), "no error");
}

TEST(ShardTest, ParsesAndRejects) {
    EXPECT_EQ(parse_shard("3/8"), (Shard{3, 8}));
    for (const char* bad : {"0/4", "5/4", "3", "a/b", "1/0", "-1/4", "1/1000000"}) {
        EXPECT_THROW(parse_shard(bad), InputError) << bad;
    }
}

TEST(ShardTest, ShardsPartitionTheListAndAreBalancedByCost) {
    const auto problems = problems_from_range("ratio-sum", "1..5000", Integer(7));
    for (unsigned K : {1u, 2u, 3u, 7u, 16u}) {
        std::vector<int> owner(problems.size(), 0);
        std::vector<std::uint64_t> load(K, 0);
        for (unsigned k = 1; k <= K; ++k) {
            for (std::size_t position : shard_members(problems, Shard{k, K})) {
                ++owner[position];
                load[k - 1] += expected_cost(problems[position]);
            }
        }
        EXPECT_TRUE(std::all_of(owner.begin(), owner.end(), [](int n) { return n == 1; }))
            << "K=" << K;
        // Longest-processing-time-first is within 4/3 of the optimum (R. L. Graham, "Bounds on
        // multiprocessing timing anomalies", SIAM J. Appl. Math. 17 (1969)); the optimum is at
        // least max(total/K, largest cost).
        const std::uint64_t total = std::accumulate(load.begin(), load.end(), std::uint64_t{0});
        std::uint64_t largest = 0;
        for (const auto& p : problems) largest = std::max(largest, expected_cost(p));
        const double lower = std::max<double>(static_cast<double>(total) / K, largest);
        EXPECT_LE(*std::max_element(load.begin(), load.end()), 4.0 / 3.0 * lower) << "K=" << K;
    }
}

TEST(ShardTest, ExpensiveProblemsAreSpreadNotCounted) {
    // Half the problems cheap, half expensive: a split by count into contiguous halves would
    // put all the cost in one shard; the cost split keeps the loads within one problem's cost.
    std::vector<ProblemSpec> problems = problems_from_range("ratio-sum", "1..50", Integer(1));
    auto big = problems_from_range("ratio-sum", "999999999950..999999999999", Integer(1));
    problems.insert(problems.end(), big.begin(), big.end());
    std::uint64_t loads[2] = {0, 0};
    for (unsigned k = 1; k <= 2; ++k) {
        for (auto position : shard_members(problems, Shard{k, 2})) {
            loads[k - 1] += expected_cost(problems[position]);
        }
    }
    const auto gap = loads[0] > loads[1] ? loads[0] - loads[1] : loads[1] - loads[0];
    EXPECT_LE(gap, expected_cost(big.front()));
}

TEST(ProblemDigestTest, DependsOnOrderAndContent) {
    const auto a = problems_from_range("ratio-sum", "2..20", Integer(2));
    auto b = a;
    std::swap(b[0], b[1]);
    EXPECT_NE(problems_digest(a), problems_digest(b));
    EXPECT_EQ(problems_digest(a),
              problems_digest(problems_from_range("ratio-sum", "2..20", Integer(2))));
}

}  // namespace
}  // namespace arcsieve::survey
