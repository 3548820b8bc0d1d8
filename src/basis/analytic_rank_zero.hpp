// A rank-0 certificate for curves the 2-isogeny descent cannot treat: L(E,1) from the rapidly
// converging series L(E,1) = (1 + w) Σ a_n/n · e^{−2πn/√N} (Cremona, Algorithms §2.13), with
// the root number w read off the Fricke functional equation; L(E,1) ≠ 0 ⇒ rank 0 (Kolyvagin).
#pragma once

#include <optional>
#include <string>

#include "curve/curve.hpp"

namespace arcsieve::basis {

struct CentralValue {
    Integer conductor;
    int root_number = 0;     // ±1, confirmed by the functional equation at two points
    double value = 0;        // L(E, 1)
    double error_bound = 0;  // truncation + rounding, rigorous up to floating-point care
    bool proves_rank_zero() const { return root_number == 1 && value > 10 * error_bound; }
};

// nullopt when the conductor exceeds max_conductor (the series would be too long) or the
// functional equation does not confirm a root number (then nothing is claimed).
std::optional<CentralValue> central_value(const Curve& curve, const Integer& max_conductor);

}  // namespace arcsieve::basis
