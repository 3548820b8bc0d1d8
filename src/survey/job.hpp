// The whole job for one problem (DESIGN.md §3): basis → analytic data → region → first hit →
// fingerprint → materialise (under the size limit) → verification, as one JSON record
// (DESIGN.md §6 keys). Used by `arcsieve solve` and by every survey driver.
#pragma once

#include <chrono>
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <vector>

#include "curve/point.hpp"

namespace arcsieve {

struct ProblemSpec {
    std::string family;             // "ratio-sum", or empty with `curve` set
    std::optional<Integer> N;       // the family parameter
    std::optional<Curve> curve;     // a bare curve (no region: curve data, basis only)
    std::vector<Point> generators;  // given generators (checked before use); empty: find them
};

struct JobOptions {
    unsigned digits = 30;                           // digits of printed real numbers
    std::size_t max_solution_digits = 100'000'000;  // refuse to materialise above this
    // Where solutions longer than 1000 digits go (as "solution_file", a name relative to this
    // directory: a, b, c one per line); empty: they stay in the record.
    std::string output_dir;
    bool materialise = true;
    std::string ordering;                                           // e.g. "a>=b>=c"; empty: none
    std::optional<std::chrono::steady_clock::time_point> deadline;  // cooperative time limit
};

// The record's JSON forms: a curve as its a-invariants [a1,a2,a3,a4,a6] (numbers when they fit in
// 64 bits, else decimal strings), a point as ["x","y"] with rational strings (null for O).
nlohmann::json curve_record(const Curve& curve);
nlohmann::json point_record(const Point& p);

// Never throws for a mathematical failure or time-out: the record then has "error" / "notes".
// Throws InputError for a malformed problem.
nlohmann::json run_problem(const ProblemSpec& problem, const JobOptions& options);

}  // namespace arcsieve
