// Integral and global minimal Weierstrass models over Q (Laska–Kraus–Connell; Cremona,
// "Algorithms for Modular Elliptic Curves" §3.2), with the change of variables from the input.
#pragma once

#include "curve/curve.hpp"

namespace arcsieve {

struct ModelWithChange {
    Curve curve;         // the new model
    ModelChange change;  // maps the input curve to `curve` (apply(input, change) == curve)
};

// Scales by the least D with D^i a_i integral (u = 1/D, r = s = t = 0).
ModelWithChange integral_model(const Curve& curve);
// Global minimal model in reduced form (a1, a3 ∈ {0, 1}, a2 ∈ {−1, 0, 1}).
ModelWithChange minimal_model(const Curve& curve);
// A model minimal at p (integral everywhere); the change has u a power of p. (A non-integral
// input is first made integral by integral_model, whose u = 1/D is part of the change.)
// Throws std::invalid_argument when `prime` is not prime.
ModelWithChange minimal_model_at(const Curve& curve, const Integer& prime);
// Throws std::invalid_argument for a non-integral model.
bool is_minimal_at(const Curve& integral_curve, const Integer& prime);

}  // namespace arcsieve
