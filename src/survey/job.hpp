// The whole job for one problem (DESIGN.md §3): basis → analytic data → region → first hit →
// fingerprint → materialise (under the size limit) → verification, as one JSON record
// (DESIGN.md §6 keys). Used by `arcsieve solve` and by every survey driver.
#pragma once

#include <chrono>
#include <optional>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "curve/point.hpp"

namespace arcsieve {

struct ProblemSpec {
    std::string family;             // "ratio-sum", or empty with `curve` set
    std::optional<Integer> N;       // the family parameter
    std::optional<Curve> curve;     // a bare curve (no region: curve data, basis only)
    std::vector<Point> generators;  // given generators (checked before use); empty: find them
};

struct JobOptions {
    unsigned digits = 30;                   // digits of printed real numbers
    std::size_t max_solution_digits = 100'000'000;  // refuse to materialise above this
    std::string output_dir;                 // where solution files go; empty: keep in record only
    bool materialise = true;
    std::string ordering;                   // e.g. "a>=b>=c"; empty: none
    std::optional<std::chrono::steady_clock::time_point> deadline;  // cooperative time limit
};

// Never throws for a mathematical failure or time-out: the record then has "error" / "notes".
// Throws InputError for a malformed problem.
nlohmann::json run_problem(const ProblemSpec& problem, const JobOptions& options);

}  // namespace arcsieve
