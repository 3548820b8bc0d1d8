// The real point n·P + T of a huge multiple as certified enclosures, by a double-and-add chain
// in interval arithmetic on E(R) (y^2 = x^3 + a2 x^2 + a4 x + a6): O(log n) steps, no digits of
// n·P + T itself.
#pragma once

#include <stdexcept>

#include "curve/point.hpp"
#include "exact/enclosure.hpp"

namespace arcsieve::exact {

// The chain met a division by an enclosure containing 0 (a chord or tangent it cannot
// resolve at this precision); callers raise the precision.
struct EnclosureTooWide : std::runtime_error {
    using std::runtime_error::runtime_error;
};

struct RealPointEnclosure {
    Enclosure x, y;
};

// n >= 1; P of infinite order; T torsion or the point at infinity. `bits` is the working
// precision; widths grow by a bounded factor per step of the chain.
RealPointEnclosure real_multiple(const JacobianCurve& curve, const Point& p, const Integer& n,
                                 const Point& translate, long bits);

}  // namespace arcsieve::exact
