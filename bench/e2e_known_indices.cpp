// End-to-end benchmark over problems whose first-hit index or digit counts are published:
// runs the whole job (arcsieve::run_problem) for each row, checks the answer against the
// published value, and prints the time per problem next to a baseline measured in the same run:
// exact iteration P, 2P, 3P, ... (+ each torsion translate) until a multiple satisfies the
// target exactly, for the rows where that finishes within its budget.
#include <fmt/format.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <string>
#include <vector>

#include "family/target.hpp"
#include "survey/job.hpp"

namespace {

using namespace arcsieve;
using Clock = std::chrono::steady_clock;

struct KnownRow {
    long N;
    long index;                       // published |first-hit index|, 0 if not published
    std::vector<std::size_t> digits;  // published digit counts, sorted; empty if not published
    const char* source;
};

const std::vector<KnownRow> rows{
    {4, 9, {79, 80, 81}, "MathOverflow question 227713 (index 9, solution digits)"},
    {12,
     0,
     {2705, 2705, 2707},
     "public forum report (r/mathmemes 2022), from memory of the paper's method: weak source"},
};

double seconds_since(Clock::time_point t) {
    return std::chrono::duration<double>(Clock::now() - t).count();
}

// Baseline: the first n with n·P + T on the target by exact point arithmetic.
std::optional<long> iterate_exactly(const Integer& N, const Point& p,
                                    const std::vector<Point>& torsion, long max_index,
                                    double budget_seconds) {
    const family::Target target = family::ratio_sum_target(N);
    const Curve& curve = target.curve;
    const auto start = Clock::now();
    Point multiple = Point::infinity();
    for (long n = 1; n <= max_index; ++n) {
        multiple = add(curve, multiple, p);
        for (const auto& t : torsion) {
            const Point q = add(curve, multiple, t);
            if (!q.at_infinity && family::satisfies_exactly(target, q)) return n;
        }
        if (seconds_since(start) > budget_seconds) return std::nullopt;
    }
    return std::nullopt;
}

Point point_of(const Curve& curve, const nlohmann::json& value) {
    if (value.is_null()) return Point::infinity();
    return parse_point(curve, value[0].get<std::string>() + "," + value[1].get<std::string>());
}

}  // namespace

int main() {
    std::printf("%-5s %-8s %-22s %-10s %-12s %-14s %s\n", "N", "index", "digits (sorted)", "check",
                "job s", "baseline s", "source");
    int failures = 0;
    for (const auto& row : rows) {
        ProblemSpec spec;
        spec.family = "ratio-sum";
        spec.N = Integer(row.N);
        JobOptions options;
        options.max_solution_digits = 10'000;
        const auto start = Clock::now();
        const nlohmann::json record = run_problem(spec, options);
        const double job_seconds = seconds_since(start);
        long index = 0;
        if (record.contains("hit") && record["hit"].is_object() &&
            record["hit"]["coeffs"].size() == 1) {
            index = std::labs(record["hit"]["coeffs"][0].get<long>());
        }
        std::vector<std::size_t> digits;
        if (record.contains("digits") && record["digits"].is_array()) {
            for (const auto& d : record["digits"]) {
                if (d.is_number()) digits.push_back(d.get<std::size_t>());
            }
        }
        std::sort(digits.begin(), digits.end());
        const bool index_ok = row.index == 0 || index == row.index;
        const bool digits_ok = row.digits.empty() || digits == row.digits;
        failures += (index_ok && digits_ok) ? 0 : 1;
        std::string baseline = "-";
        if (index > 0 && record.contains("generators") && !record["generators"].empty()) {
            const Curve curve = family::ratio_sum_target(Integer(row.N)).curve;
            std::vector<Point> torsion{Point::infinity()};
            for (const auto& t : record.value("torsion", nlohmann::json::array())) {
                torsion.push_back(point_of(curve, t));
            }
            const Point p = point_of(curve, record["generators"][0]);
            const auto base_start = Clock::now();
            // Both signs of the generator: the job reports |index|.
            auto found = iterate_exactly(Integer(row.N), p, torsion, index, 120);
            if (!found)
                found = iterate_exactly(Integer(row.N), negate(curve, p), torsion, index, 120);
            baseline = found ? fmt::format("{:.3f} (n={})", seconds_since(base_start), *found)
                             : "over budget";
        }
        std::string digits_text;
        for (auto d : digits) digits_text += (digits_text.empty() ? "" : ",") + std::to_string(d);
        std::printf("%-5ld %-8ld %-22s %-10s %-12.3f %-14s %s\n", row.N, index, digits_text.c_str(),
                    index_ok && digits_ok ? "ok" : "MISMATCH", job_seconds, baseline.c_str(),
                    row.source);
    }
    return failures == 0 ? 0 : 1;
}
