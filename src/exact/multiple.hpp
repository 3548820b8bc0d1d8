// The object the exact layer works on: Q = index·generator + translate on a curve, the form in
// which the locate layer reports a first hit (rank one) and the materialiser writes it out.
#pragma once

#include "curve/point.hpp"

namespace arcsieve::exact {

// translate is torsion or the point at infinity; index >= 1; generator of infinite order.
struct Multiple {
    Point generator;
    Integer index;
    Point translate = Point::infinity();
};

}  // namespace arcsieve::exact
