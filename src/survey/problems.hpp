// Survey input: the list of problems (a range of N with a step, or our JSON Lines problem file),
// each problem's stable key, its expected cost, and the deterministic cost-balanced split of a
// problem list into shards.
#pragma once

#include <cstdint>
#include <nlohmann/json.hpp>
#include <string>
#include <string_view>
#include <vector>

#include "survey/job.hpp"

namespace arcsieve::survey {

using arcsieve::to_string;  // keeps the Integer/Curve overloads visible beside Shard's

// Largest number of problems one survey accepts (keeps a typo such as 2..1e12 from exhausting
// memory before any work starts).
inline constexpr std::size_t max_survey_problems = 10'000'000;

// "ratio-sum N=14" or "curve [a1,a2,a3,a4,a6]": unique within a survey, used for resume and merge.
std::string problem_key(const ProblemSpec& problem);

// "lo..hi" or a single "N", every `step`-th value from lo. Throws InputError on malformed text,
// a non-positive step, lo > hi, an N the family rejects, or more than max_survey_problems values.
std::vector<ProblemSpec> problems_from_range(const std::string& family, std::string_view range,
                                             const Integer& step);

// One problem per line (blank lines are skipped):
//   {"family":"ratio-sum","N":14}                 (N as a number or a decimal string)
//   {"curve":"[0,0,1,-7,6]","generators":["1,0"]} (a bare curve, optional given points)
// Throws InputError naming the file and line on anything malformed, and on duplicate problems.
std::vector<ProblemSpec> problems_from_lines(std::string_view text, const std::string& source);
std::vector<ProblemSpec> problems_from_file(const std::string& path);

nlohmann::json problem_to_json(const ProblemSpec& problem);

// Throws InputError when two problems have the same key.
void check_no_duplicate_problems(const std::vector<ProblemSpec>& problems);

// Integer cost estimate used to balance shards: grows with the size of the curve's coefficients
// (bit length of N, or of the largest a-invariant, squared). Integer so that every node of a
// cluster computes the same split.
std::uint64_t expected_cost(const ProblemSpec& problem);

struct Shard {
    unsigned index = 1;  // 1-based, 1 <= index <= count
    unsigned count = 1;
    bool operator==(const Shard&) const = default;
};

// Parses "k/K" with 1 <= k <= K <= 100000; throws InputError otherwise.
Shard parse_shard(std::string_view text);
std::string to_string(const Shard& shard);

// Positions (increasing) of the problems that belong to `shard`: longest-expected-cost-first
// greedy assignment to the least loaded shard (ties: lower position, lower shard). Depends only
// on the list and K, so the K shards partition the list exactly.
std::vector<std::size_t> shard_members(const std::vector<ProblemSpec>& problems,
                                       const Shard& shard);

// Digest of the ordered key list (FNV-1a 64, hex): identifies a survey definition in manifests.
std::string problems_digest(const std::vector<ProblemSpec>& problems);

}  // namespace arcsieve::survey
