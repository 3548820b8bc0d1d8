// Descent via 2-isogeny (Silverman and Tate, "Rational Points on Elliptic Curves" ch. III.5–6;
// Cremona, "Algorithms for Modular Elliptic Curves" §3.6) for curves with a rational 2-torsion
// point: Selmer groups of both isogenies, local solubility of the quartics, quartic search.
#pragma once

#include <cstdint>
#include <optional>
#include <vector>

#include "curve/point.hpp"

namespace arcsieve::basis {

// y^2 = x^3 + A x^2 + B x, an integral model of the input with a 2-torsion point at (0, 0).
struct TwoTorsionModel {
    Integer A, B;
    Curve curve;         // [0, A, 0, B, 0]
    ModelChange change;  // input curve -> `curve`
};

// The first such model found (the 2-torsion point with the smallest x on the integral
// a1 = a3 = 0 model); nullopt when E(Q) has no point of order 2.
std::optional<TwoTorsionModel> two_torsion_model(const Curve& curve);

// w^2 = c4 u^4 + c2 u^2 v^2 + c0 v^4 has a nontrivial solution over the reals / over Q_p.
// Undecided p-adic cases (recursion deeper than the guard) count as soluble, which keeps
// Selmer bounds valid upper bounds.
bool quartic_soluble_over_reals(const Integer& c4, const Integer& c2, const Integer& c0);
bool quartic_soluble_at(const Integer& c4, const Integer& c2, const Integer& c0,
                        const Integer& prime);

// One side of the descent, for y^2 = x^3 + A x^2 + B x.
struct IsogenySide {
    Integer A, B;
    std::vector<Integer> basis_primes;  // -1 and the primes dividing B: coordinates of Q(S, 2)
    std::vector<Integer> selmer;        // squarefree b1 | B with soluble quartic (incl. 1, B)
    std::vector<Integer> found_images;  // b1 of points found (a group, incl. 1 and B mod squares)
    std::vector<Point> points;          // points found on this side's curve, one per new image
    int selmer_dimension = 0;           // dim over F_2
    int found_dimension = 0;
};

struct DescentOptions {
    std::int64_t quartic_bound = 300;  // search |u|, v <= bound on each soluble quartic
    unsigned threads = 0;
};

struct DescentResult {
    TwoTorsionModel model;
    IsogenySide curve_side;      // E: y^2 = x^3 + A x^2 + B x
    IsogenySide isogenous_side;  // E': y^2 = x^3 - 2A x^2 + (A^2 - 4B) x
    int rank_lower = 0;          // found dims − 2: rank of the subgroup the found images prove
    int rank_upper = 0;          // Selmer dims − 2
    // Points on the input curve: those found on E and the images under the dual isogeny
    // E' -> E of those found on E'.
    std::vector<Point> points_on_input;
};

DescentResult two_isogeny_descent(const Curve& curve, const TwoTorsionModel& model,
                                  const DescentOptions& options);

// The image of P on y^2 = x^3 + A x^2 + B x in Q*/Q*^2 (x mod squares; B for (0,0); 1 for O),
// as a squarefree integer.
Integer descent_image(const Integer& A, const Integer& B, const Point& p);

// The dual isogeny ψ: E' -> E, (x, y) ↦ (y^2/(4x^2), y(x^2 − B')/(8x^2)) with E' given by
// (A', B') (Silverman–Tate III.4).
Point dual_isogeny_image(const Integer& A_isogenous, const Integer& B_isogenous, const Point& p);

Integer squarefree_part(const Integer& n);

}  // namespace arcsieve::basis
