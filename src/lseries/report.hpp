// The analytic data of one curve as report lines and as a JSON object (keys in arcsieve's own
// words), for the basis/solve output: root number and its basis, L-value enclosures, the
// proven rank and its theorem, the BSD-predicted generator height, the Heegner construction.
#pragma once

#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <vector>

#include "lseries/analytic_rank.hpp"
#include "lseries/heegner.hpp"

namespace arcsieve::lseries {

struct AnalyticReport {
    AnalyticRank rank;
    std::optional<double> predicted_generator_height;  // ĥ·|Sha| by BSD (conditional)
    std::optional<HeegnerResult> heegner;
    std::vector<std::string> notes;  // Heegner refusals, time limits, ...
};

// "label   text" lines, label padded to 18 columns like the rest of the report.
std::vector<std::string> report_lines(const AnalyticReport& report);
nlohmann::json to_json(const AnalyticReport& report);

}  // namespace arcsieve::lseries
