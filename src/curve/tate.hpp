// Tate's algorithm at a prime (Silverman, Advanced Topics IV.9; Cremona, Algorithms §3.2):
// Kodaira symbol, conductor exponent, Tamagawa number, and the component of the special fibre
// of the Néron model a rational point reduces to.
#pragma once

#include <string>
#include <vector>

#include "curve/minimal_model.hpp"
#include "curve/point.hpp"

namespace arcsieve {

enum class ReductionKind { good, split_multiplicative, nonsplit_multiplicative, additive };

struct LocalReduction {
    Integer prime;
    std::string kodaira;  // "I0", "I7", "I2*", "II", "III", "IV", "IV*", "III*", "II*", ...
    int kodaira_n = 0;    // the n of I_n or I_n*, else 0
    int discriminant_valuation = 0;  // v_p of the minimal discriminant
    int conductor_exponent = 0;
    int tamagawa = 1;
    ReductionKind kind = ReductionKind::good;
    ModelWithChange minimal_at_p;  // model minimal at p and the change from the input curve
};

// Any curve over Q (made integral and minimal at p first). Throws std::invalid_argument when
// `prime` is not prime. conductor_exponent is f with v(Δ) = f + m - 1 (Ogg–Saito).
LocalReduction tate_local(const Curve& curve, const Integer& prime);
// Every prime of bad reduction (dividing the minimal discriminant), primes increasing.
std::vector<LocalReduction> bad_reduction(const Curve& curve);
Integer conductor(const Curve& curve);

// The component of the special fibre P reduces to (P on the input curve).
// index 0 is the identity component. For I_n: i in [0, n/2] with i ↔ n−i identified
// (i = min(v_p(2y + a1 x + a3), n/2) on the minimal model, Silverman Math. Comp. 51 (1988) §5);
// for additive types: 0 or 1 (not on the identity component).
struct ReductionComponent {
    int index = 0;
    bool on_identity_component() const { return index == 0; }
};
ReductionComponent reduction_component(const Curve& curve, const LocalReduction& local,
                                       const Point& p);

}  // namespace arcsieve
