// The readable report of one problem's record (DESIGN.md §6 keys), as `arcsieve solve` prints
// it: curve, torsion, rank and generators, region, hit, heights, digits, the solution or its
// file, and what is proven versus conditional. Pure formatting: nothing is recomputed.
#pragma once

#include <nlohmann/json.hpp>
#include <string>

namespace arcsieve::survey {

std::string readable_report(const nlohmann::json& record);

// "settled" in the survey sense: rank known, basis proved saturated, and either the first hit
// certified with its solution verified or its digits certified, or no solution proved. False
// when any of these is missing or unknown.
bool settled_completely(const nlohmann::json& record);

}  // namespace arcsieve::survey
