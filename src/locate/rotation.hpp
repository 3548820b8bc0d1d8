// The rank-one core of the first-hit search in fixed point: the least n with (A·n + B) mod M in a
// window, by a Euclid-like descent in O(log M) steps (the integer form of the three-distance /
// continued-fraction method), and the plain linear scan (TBB) it is checked and timed against.
#pragma once

#include <cstdint>
#include <functional>
#include <optional>

#include "analytic/real.hpp"

namespace arcsieve::locate {

// A window of residues modulo `modulus`: [low, high] when low <= high, otherwise the wrapped
// window [low, modulus) ∪ [0, high].
struct ResidueWindow {
    Integer low, high;
};

// Least x >= 0 with (step·x + offset) mod modulus in the window, or nullopt if there is none
// (possible only when gcd(step, modulus) leaves the window out). Requires modulus >= 1 and
// 0 <= step, offset, low, high < modulus.
//
// Method: while the values climb by `step` they wrap y times; for fixed y the least x is
// ceil((low + y·modulus − offset)/step), and it works exactly when a residue condition on y
// modulo `step` holds — the same problem with modulus `step`. Replacing the new multiplier s by
// step − s when that is smaller (reflection) halves the modulus at every level, so the depth is
// at most log2(modulus) (cf. the Euclidean algorithm behind continued fractions and the
// three-distance theorem).
std::optional<Integer> first_in_window(const Integer& step, const Integer& offset,
                                       const Integer& modulus, const ResidueWindow& window);

// The same problem with modulus 2^64 by scanning x = 0, 1, …, count − 1 with wrapping 64-bit
// additions, in parallel chunks (TBB); returns the least such x or nullopt.
std::optional<std::uint64_t> linear_first_in_window(std::uint64_t step, std::uint64_t offset,
                                                    std::uint64_t low, std::uint64_t high,
                                                    std::uint64_t count);

enum class CandidateVerdict { inside, outside, undecided };

// The real problem: the least m in [0, max_index] with m·step + offset (mod 1) inside the arc
// (arc_start, arc_end) — enclosures; arc_end > arc_start, arc_end − arc_start < 1 — as decided
// by `verify`. Candidates come from the fixed-point problem with modulus 2^bits (bits from the
// precision of `step`, or 64 with `linear`), its window widened by the worst rounding error
// over the whole index range, so no true hit is skipped; each candidate is then verified, and
// false ones are stepped over.
struct RotationSearch {
    Interval step, offset;
    Interval arc_start, arc_end;
    bool whole_circle = false;  // every m is a candidate
    Integer max_index;
    bool linear = false;  // candidates by the linear scan instead of the descent
};

struct RotationOutcome {
    std::optional<Integer> hit;        // least verified m
    std::optional<Integer> undecided;  // the search stopped at this m: `verify` could not decide
    std::size_t candidates = 0;
};

RotationOutcome first_rotation_hit(const RotationSearch& search,
                                   const std::function<CandidateVerdict(const Integer&)>& verify);

// Certified test of an enclosure t against the open arc (start, end), modulo 1.
CandidateVerdict in_open_arc(const Interval& t, const Interval& start, const Interval& end);

}  // namespace arcsieve::locate
