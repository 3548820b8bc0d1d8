#include "survey/problems.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <fstream>
#include <numeric>
#include <queue>
#include <sstream>
#include <unordered_set>

#include "family/ratio_sum.hpp"

namespace arcsieve::survey {
namespace {

void check_family(const std::string& family) {
    if (family != "ratio-sum") {
        throw InputError("unknown family '" + family + "' (known: ratio-sum)");
    }
}

Integer parse_N(std::string_view text, const std::string& where) {
    const auto value = parse_integer(text);
    if (!value) throw InputError(where + "N must be an integer, got '" + std::string(text) + "'");
    family::check_ratio_sum_parameter(*value);
    return *value;
}

std::size_t bit_length(const Integer& n) {
    return n == 0 ? 0 : mpz_sizeinbase(n.get_mpz_t(), 2);
}

}  // namespace

std::string problem_key(const ProblemSpec& problem) {
    if (!problem.family.empty()) {
        return problem.family + " N=" + (problem.N ? to_string(*problem.N) : std::string("?"));
    }
    if (problem.curve) return "curve " + to_string(*problem.curve);
    return "empty problem";
}

std::vector<ProblemSpec> problems_from_range(const std::string& family, std::string_view range,
                                             const Integer& step) {
    check_family(family);
    if (step <= 0) throw InputError("--step must be a positive integer");
    const auto dots = range.find("..");
    const std::string_view low_text =
        dots == std::string_view::npos ? range : range.substr(0, dots);
    const std::string_view high_text =
        dots == std::string_view::npos ? range : range.substr(dots + 2);
    const Integer low = parse_N(low_text, "in the range '" + std::string(range) + "': ");
    const Integer high = parse_N(high_text, "in the range '" + std::string(range) + "': ");
    if (low > high) {
        throw InputError("empty range '" + std::string(range) + "': the first N exceeds the last");
    }
    const Integer count = (high - low) / step + 1;
    if (count > Integer(static_cast<unsigned long>(max_survey_problems))) {
        throw InputError(fmt::format("the range '{}' has {} problems; at most {} per survey", range,
                                     to_string(count), max_survey_problems));
    }
    std::vector<ProblemSpec> problems;
    problems.reserve(count.get_ui());
    for (Integer N = low; N <= high; N += step) {
        ProblemSpec spec;
        spec.family = family;
        spec.N = N;
        problems.push_back(std::move(spec));
    }
    return problems;
}

std::vector<ProblemSpec> problems_from_lines(std::string_view text, const std::string& source) {
    std::vector<ProblemSpec> problems;
    std::size_t line_number = 0;
    std::size_t start = 0;
    while (start < text.size()) {
        std::size_t end = text.find('\n', start);
        if (end == std::string_view::npos) end = text.size();
        const std::string line(text.substr(start, end - start));
        start = end + 1;
        ++line_number;
        if (line.find_first_not_of(" \t\r") == std::string::npos) continue;
        const std::string where = fmt::format("{}:{}: ", source, line_number);
        nlohmann::json object;
        try {
            object = nlohmann::json::parse(line);
        } catch (const nlohmann::json::parse_error&) {
            throw InputError(where + "not a JSON object");
        }
        if (!object.is_object()) throw InputError(where + "not a JSON object");
        for (const auto& [name, value] : object.items()) {
            if (name != "family" && name != "N" && name != "curve" && name != "generators") {
                throw InputError(where + "unknown key '" + name +
                                 "' (known: family, N, curve, generators)");
            }
        }
        ProblemSpec spec;
        if (object.contains("family")) {
            if (!object["family"].is_string()) throw InputError(where + "family must be a string");
            if (object.contains("curve"))
                throw InputError(where + "give family or curve, not both");
            spec.family = object["family"].get<std::string>();
            check_family(spec.family);
            if (!object.contains("N")) throw InputError(where + "family problems need N");
            const auto& n = object["N"];
            std::string n_text;
            if (n.is_number_integer()) {
                n_text = n.dump();
            } else if (n.is_string()) {
                n_text = n.get<std::string>();
            } else {
                throw InputError(where + "N must be an integer or a decimal string");
            }
            try {
                spec.N = parse_N(n_text, "");
            } catch (const InputError& error) {
                throw InputError(where + error.what());
            }
            spec.curve = family::ratio_sum_curve(*spec.N);
        } else if (object.contains("curve")) {
            if (object.contains("N")) throw InputError(where + "N belongs to family problems");
            if (!object["curve"].is_string()) {
                throw InputError(where + "curve must be a string \"[a1,a2,a3,a4,a6]\"");
            }
            try {
                spec.curve = parse_curve(object["curve"].get<std::string>());
            } catch (const InputError& error) {
                throw InputError(where + error.what());
            }
        } else {
            throw InputError(where + "a problem needs family and N, or curve");
        }
        if (object.contains("generators")) {
            const auto& list = object["generators"];
            if (!list.is_array()) throw InputError(where + "generators must be a list of \"x,y\"");
            for (const auto& item : list) {
                if (!item.is_string())
                    throw InputError(where + "each generator is a string \"x,y\"");
                try {
                    spec.generators.push_back(parse_point(*spec.curve, item.get<std::string>()));
                } catch (const InputError& error) {
                    throw InputError(where + error.what());
                }
            }
        }
        if (!spec.family.empty()) spec.curve.reset();  // the job derives it from the family
        problems.push_back(std::move(spec));
        if (problems.size() > max_survey_problems) {
            throw InputError(fmt::format("{}: more than {} problems", source, max_survey_problems));
        }
    }
    if (problems.empty()) throw InputError(source + ": no problems in the file");
    check_no_duplicate_problems(problems);
    return problems;
}

std::vector<ProblemSpec> problems_from_file(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    if (!in) throw InputError("cannot read the problem file '" + path + "'");
    std::ostringstream buffer;
    buffer << in.rdbuf();
    return problems_from_lines(buffer.str(), path);
}

nlohmann::json problem_to_json(const ProblemSpec& problem) {
    nlohmann::json object;
    if (!problem.family.empty()) {
        object["family"] = problem.family;
        if (problem.N) object["N"] = to_string(*problem.N);
    } else if (problem.curve) {
        object["curve"] = to_string(*problem.curve);
    }
    if (!problem.generators.empty()) {
        auto& list = object["generators"] = nlohmann::json::array();
        for (const auto& p : problem.generators) list.push_back(to_string(p));
    }
    return object;
}

void check_no_duplicate_problems(const std::vector<ProblemSpec>& problems) {
    std::unordered_set<std::string> seen;
    for (const auto& p : problems) {
        const std::string key = problem_key(p);
        if (!seen.insert(key).second) throw InputError("the problem '" + key + "' appears twice");
    }
}

std::uint64_t expected_cost(const ProblemSpec& problem) {
    std::size_t bits = 1;
    if (problem.N) {
        bits = bit_length(*problem.N);
    } else if (problem.curve) {
        for (const Rational* a : {&problem.curve->a1, &problem.curve->a2, &problem.curve->a3,
                                  &problem.curve->a4, &problem.curve->a6}) {
            bits = std::max({bits, bit_length(a->get_num()), bit_length(a->get_den())});
        }
    }
    const std::uint64_t b = bits + 1;
    return b * b;
}

Shard parse_shard(std::string_view text) {
    const auto slash = text.find('/');
    if (slash == std::string_view::npos) {
        throw InputError("--shard must look like k/K, e.g. 3/8, got '" + std::string(text) + "'");
    }
    const auto k = parse_integer(text.substr(0, slash));
    const auto K = parse_integer(text.substr(slash + 1));
    if (!k || !K || *K < 1 || *K > 100000 || *k < 1 || *k > *K) {
        throw InputError("--shard k/K needs integers 1 <= k <= K <= 100000, got '" +
                         std::string(text) + "'");
    }
    return Shard{static_cast<unsigned>(k->get_ui()), static_cast<unsigned>(K->get_ui())};
}

std::string to_string(const Shard& shard) {
    return fmt::format("{}/{}", shard.index, shard.count);
}

std::vector<std::size_t> shard_members(const std::vector<ProblemSpec>& problems,
                                       const Shard& shard) {
    std::vector<std::uint64_t> cost(problems.size());
    for (std::size_t i = 0; i < problems.size(); ++i) cost[i] = expected_cost(problems[i]);
    std::vector<std::size_t> order(problems.size());
    std::iota(order.begin(), order.end(), 0);
    std::stable_sort(order.begin(), order.end(),
                     [&](std::size_t a, std::size_t b) { return cost[a] > cost[b]; });
    // Min-heap of (load, shard): the least loaded shard takes the next most expensive problem.
    using Load = std::pair<std::uint64_t, unsigned>;
    std::priority_queue<Load, std::vector<Load>, std::greater<Load>> loads;
    for (unsigned s = 1; s <= shard.count; ++s) loads.push({0, s});
    std::vector<std::size_t> members;
    for (std::size_t position : order) {
        auto [load, s] = loads.top();
        loads.pop();
        if (s == shard.index) members.push_back(position);
        loads.push({load + cost[position], s});
    }
    std::sort(members.begin(), members.end());
    return members;
}

std::string problems_digest(const std::vector<ProblemSpec>& problems) {
    std::uint64_t hash = 14695981039346656037ull;
    for (const auto& p : problems) {
        for (unsigned char ch : problem_key(p) + "\n") {
            hash ^= ch;
            hash *= 1099511628211ull;
        }
    }
    return fmt::format("{:016x}", hash);
}

}  // namespace arcsieve::survey
