// The target region of a family instance (family/target.hpp) as a finite union of arcs of the
// elliptic-log coordinate t on each real component, with certified boundaries: the real points
// where a condition's linear form vanishes, enclosed by interval arithmetic.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "family/target.hpp"
#include "region/arc_log.hpp"

namespace arcsieve::region {

// A real point where at least one condition's form vanishes.
struct BoundaryPoint {
    int component = 0;
    Interval t;                           // enclosure, reduced so that its midpoint lies in [0, 1)
    std::vector<std::size_t> conditions;  // indices into Target::conditions vanishing here
    std::optional<Point> exact_point;     // set when the point is rational and known exactly
    RootBracket x;                        // x-coordinate bracket (unused at infinity)
    int branch = 0;                       // sign of y' = y + (a1 x + a3)/2; 0 when y' = 0
    bool at_infinity = false;
    bool satisfies_conditions =
        false;  // the point itself is a solution (only non-strict forms vanish)
};

// The open stretch of one component between two consecutive boundary points (cyclically), or
// the whole component when it has no boundary point.
struct Gap {
    int component = 0;
    std::optional<std::size_t> start, end;  // indices into Region::boundaries (unset: whole)
    bool inside = false;                    // the conditions hold on the gap
    std::vector<int> signs;                 // sign of each condition's form on the gap
};

// An arc of the region: t in (start, end) on `component`, end > start, end − start <= 1,
// start and end given by enclosures (so end may exceed 1 when the arc wraps past t = 0).
struct Arc {
    int component = 0;
    Interval start, end;
    bool whole_component = false;
    bool start_included = false, end_included = false;  // the boundary points are solutions
};

struct Region {
    family::Target target;
    ArcModel model;
    unsigned digits = 0;                          // certified digits of every boundary enclosure
    std::vector<BoundaryPoint> boundaries;        // sorted by component, then t
    std::vector<Gap> gaps;                        // per component in t order
    std::vector<Arc> arcs;                        // the gaps that are inside, as t-intervals
    bool components_reached[2] = {false, false};  // some arc lies on component 0 / 1
};

// Builds the region at `digits` correct digits (at least; more when boundaries need separating).
Region target_region(const family::Target& target, unsigned digits);

enum class Membership { inside, outside, undecided };

// Where a point with the given component and t-enclosure lies. Undecided when the enclosure
// touches a boundary's enclosure: the caller re-decides with more precision or exactly.
Membership classify(const Region& region, int component, const Interval& t);

// One line per arc, e.g. "component 1: t in (0.12345..., 0.23456...)", for reports.
std::vector<std::string> describe_arcs(const Region& region, unsigned shown_digits = 12);

}  // namespace arcsieve::region
