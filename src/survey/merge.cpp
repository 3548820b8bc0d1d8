#include "survey/merge.hpp"

#include <fmt/format.h>

#include <filesystem>
#include <map>
#include <nlohmann/json.hpp>
#include <set>

#include "arith/rational.hpp"
#include "survey/journal.hpp"
#include "survey/problems.hpp"
#include "survey/runner.hpp"

namespace arcsieve::survey {
namespace {

std::string list_some(const std::vector<std::string>& items) {
    std::string text;
    for (std::size_t i = 0; i < items.size() && i < 5; ++i) text += (i ? ", " : "") + items[i];
    if (items.size() > 5) text += fmt::format(" and {} more", items.size() - 5);
    return text;
}

}  // namespace

MergeReport merge_shards(const std::vector<std::string>& shard_dirs, const std::string& out_dir) {
    if (shard_dirs.empty()) throw InputError("survey merge needs the shard directories");
    if (out_dir.empty()) throw InputError("survey merge needs --out DIR");
    std::string digest;
    std::size_t problem_count = 0;
    unsigned shard_count = 0;
    std::set<unsigned> seen_shards;
    std::map<std::size_t, std::string> key_at;        // position -> key, over all shards
    std::map<std::string, nlohmann::json> record_of;  // key -> record
    std::vector<std::string> gaps, duplicates;
    for (const auto& dir : shard_dirs) {
        const std::string manifest_path = dir + "/" + manifest_file;
        if (!std::filesystem::exists(manifest_path)) {
            throw InputError("'" + dir + "' is not a survey directory (no " + manifest_file + ")");
        }
        nlohmann::json manifest;
        try {
            manifest = nlohmann::json::parse(read_file(manifest_path));
        } catch (const nlohmann::json::parse_error&) {
            throw InputError("'" + manifest_path + "' is damaged");
        }
        const Shard shard = parse_shard(manifest.value("shard", std::string()));
        if (digest.empty()) {
            digest = manifest.value("problems_digest", "");
            problem_count = manifest.value("problem_count", std::size_t{0});
            shard_count = shard.count;
        } else if (manifest.value("problems_digest", "") != digest || shard.count != shard_count) {
            throw MergeError("'" + dir + "' belongs to a different survey or split than '" +
                             shard_dirs.front() + "'");
        }
        if (!seen_shards.insert(shard.index).second) {
            throw MergeError(fmt::format("shard {} is given twice", to_string(shard)));
        }
        const auto& keys = manifest.at("assigned");
        const auto& positions = manifest.at("positions");
        std::set<std::string> assigned;
        for (std::size_t i = 0; i < keys.size(); ++i) {
            const std::string key = keys[i].get<std::string>();
            const auto position = positions.at(i).get<std::size_t>();
            if (!key_at.emplace(position, key).second) duplicates.push_back(key);
            assigned.insert(key);
        }
        const JournalContents journal = read_journal(dir + "/" + journal_file);
        if (journal.torn_tail) {
            throw MergeError("'" + dir + "' ends in a torn record: resume that shard first");
        }
        for (const auto& record : journal.records) {
            const std::string key = record.value("problem_key", std::string());
            if (!assigned.count(key)) {
                throw MergeError("'" + dir + "' has a record for '" + key +
                                 "', which is not one of its problems");
            }
            if (!record_of.emplace(key, record).second) duplicates.push_back(key);
        }
        for (const auto& key : assigned) {
            if (!record_of.count(key)) gaps.push_back(key);
        }
    }
    std::vector<std::string> missing_shards;
    for (unsigned k = 1; k <= shard_count; ++k) {
        if (!seen_shards.count(k)) missing_shards.push_back(fmt::format("{}/{}", k, shard_count));
    }
    if (!missing_shards.empty()) {
        throw MergeError("missing shards: " + list_some(missing_shards));
    }
    if (!duplicates.empty()) throw MergeError("duplicate records: " + list_some(duplicates));
    if (!gaps.empty()) {
        throw MergeError(
            fmt::format("{} problems have no record (gaps): {}", gaps.size(), list_some(gaps)));
    }
    if (key_at.size() != problem_count) {
        throw MergeError(fmt::format("the shards cover {} of the survey's {} problems",
                                     key_at.size(), problem_count));
    }
    std::error_code error;
    std::filesystem::create_directories(out_dir, error);
    if (error) throw InputError("cannot create the output directory '" + out_dir + "'");
    if (std::filesystem::exists(out_dir + "/" + manifest_file)) {
        throw InputError("'" + out_dir + "' already holds a survey; merge into a new directory");
    }
    std::vector<nlohmann::json> ordered;
    std::string lines;
    nlohmann::json manifest;
    manifest["format"] = "arcsieve survey directory, version 1";
    manifest["problems_digest"] = digest;
    manifest["problem_count"] = problem_count;
    manifest["shard"] = "1/1";
    manifest["merged_from"] = shard_dirs;
    auto& keys = manifest["assigned"] = nlohmann::json::array();
    auto& positions = manifest["positions"] = nlohmann::json::array();
    for (const auto& [position, key] : key_at) {
        ordered.push_back(record_of.at(key));
        lines += ordered.back().dump() + "\n";
        keys.push_back(key);
        positions.push_back(position);
    }
    write_file_atomically(out_dir + "/" + journal_file, lines);
    write_file_atomically(out_dir + "/" + results_file, lines);
    write_file_atomically(out_dir + "/" + summary_file, summary_csv(ordered));
    write_file_atomically(out_dir + "/" + manifest_file, manifest.dump(1) + "\n");
    return MergeReport{seen_shards.size(), ordered.size()};
}

}  // namespace arcsieve::survey
