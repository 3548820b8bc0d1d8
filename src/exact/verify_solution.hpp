// Checking a claimed solution against a/(b+c) + b/(c+a) + c/(a+b) = N: a solution file (three
// integers, one per line, as write_solution produces) or a fingerprint record, with a message
// saying exactly what is wrong (which digit, truncation, degenerate, not a solution).
#pragma once

#include <nlohmann/json.hpp>
#include <string>
#include <string_view>
#include <vector>

#include "arith/rational.hpp"
#include "family/ratio_sum.hpp"

namespace arcsieve::exact {

struct VerificationReport {
    bool holds = false;                 // the equation holds exactly (and nothing is wrong)
    std::vector<std::string> problems;  // what is wrong, most specific first
    std::vector<std::string> remarks;   // true but noteworthy (not positive, not coprime)
};

// Text with three integers, one per line, each followed by a newline. Throws InputError for
// malformed text (a non-digit character, more than three numbers); a missing number or a
// missing final newline is reported as truncation.
VerificationReport verify_solution_text(const Integer& N, std::string_view text);

// The triple itself: denominators, the cleared equation, and, when it fails, whether changing
// one variable would repair it (solving the cubic for that variable by integer Newton steps)
// and whether the repaired value differs from the given one in a single digit.
VerificationReport verify_triple(const Integer& N, const family::Triple& triple);

// A JSON record with "generators", "hit" {"coeffs": [n], "translate": [x, y] or null},
// "digits" and "lead" (DESIGN.md §6): recomputes the fingerprint and compares; a record with
// "solution" is checked as a triple as well. Throws InputError for a malformed record.
VerificationReport verify_fingerprint_record(const Integer& N, const nlohmann::json& record);

// Reads the file (JSON when its first non-blank character is '{'). Throws InputError when it
// cannot be read or is malformed.
VerificationReport verify_solution_file(const Integer& N, const std::string& path);

}  // namespace arcsieve::exact
