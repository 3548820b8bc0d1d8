// SVG pictures: the real locus of a problem's curve with the target arc highlighted and the
// points n·P + T marked up to the first hit; and, for a survey, the digit count of the smallest
// solution against N (log scale) beside the distribution of first-hit indices.
#pragma once

#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <vector>

#include "curve/point.hpp"
#include "family/target.hpp"

namespace arcsieve::survey {

struct LocusPicture {
    std::string title;
    Curve curve;                           // a1 = a3 = 0 expected; others are drawn by y' = y
    std::optional<family::Target> target;  // highlighted where its conditions hold
    std::vector<Point> marked;             // n·P + T for n = 1, 2, ...
    std::optional<Point> hit;              // drawn with its own marker
    std::string marked_label = "n·P + T";
    std::size_t hit_index = 0;  // 0: unknown or not a multiple
};

// Throws std::invalid_argument for a curve with a1 or a3 nonzero.
std::string locus_svg(const LocusPicture& picture);

// From survey records (results.jsonl): digit count (largest of a, b, c) against N on a log
// scale, and a histogram of first-hit indices (max |coefficient|) with logarithmic bins.
std::string survey_svg(const std::vector<nlohmann::json>& records, const std::string& title);

// The points n·P + T, n = 1..count, exactly (for a picture: count stays small).
std::vector<Point> multiples_with_translate(const Curve& curve, const Point& p, const Point& t,
                                            std::size_t count);

}  // namespace arcsieve::survey
