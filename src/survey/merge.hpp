// `arcsieve survey merge`: joins the directories of the K shards of one survey into one
// directory equal to an unsharded run's, after checking that every problem has exactly one
// record (no gaps, no duplicates) and that all shards belong to the same survey.
#pragma once

#include <stdexcept>
#include <string>
#include <vector>

namespace arcsieve::survey {

// A merge check failed (missing shard, gap, duplicate, foreign shard): nothing was written.
struct MergeError : std::runtime_error {
    using std::runtime_error::runtime_error;
};

struct MergeReport {
    std::size_t shards = 0;
    std::size_t records = 0;
};

MergeReport merge_shards(const std::vector<std::string>& shard_dirs, const std::string& out_dir);

}  // namespace arcsieve::survey
