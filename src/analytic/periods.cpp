#include "analytic/periods.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>

#include "analytic/landen.hpp"

namespace arcsieve {
namespace {

// With Y = 2y + a1 x + a3 every model becomes Y^2 = f(x) = 4x^3 + b2 x^2 + 2 b4 x + b6
// (Silverman AEC III.1), and the Néron differential dx/(2y + a1 x + a3) becomes dx/Y.
struct Cubic {
    Rational b2, b4, b6;
};

Cubic cubic_of(const Curve& curve) {
    const BInvariants b = b_invariants(curve);
    return Cubic{b.b2, b.b4, b.b6};
}

Real cubic_value(const Cubic& f, const Real& x, unsigned digits) {
    return ((4 * x + make_real(f.b2, digits)) * x + 2 * make_real(f.b4, digits)) * x +
           make_real(f.b6, digits);
}

Real cubic_slope(const Cubic& f, const Real& x, unsigned digits) {
    return (12 * x + 2 * make_real(f.b2, digits)) * x + 2 * make_real(f.b4, digits);
}

int sign_of(const Rational& q) {
    return sgn(q);
}

// Real roots of f at `digits` digits, decreasing: the trigonometric form when Δ > 0 and
// Cardano's formula (the larger cube root first, so nothing cancels) when Δ < 0, on the
// depressed cubic 4X^3 − g2 X − g3 with X = x + b2/12, g2 = c4/12, g3 = c6/216; then Newton
// steps on f itself, so each root gets its own relative accuracy even when |b2| is large.
std::vector<Real> cubic_real_roots(const Curve& curve, int discriminant_sign, unsigned digits) {
    const Cubic f = cubic_of(curve);
    const Rational g2 = c4(curve) / 12, g3 = c6(curve) / 216;
    const Real shift = make_real(f.b2 / 12, digits);
    std::vector<Real> roots;
    if (discriminant_sign > 0) {
        // X^3 + pX + q with p = −g2/4 < 0: X_k = m cos(θ − 2πk/3), m = sqrt(g2/3),
        // cos 3θ = sqrt(27) g3 / g2^{3/2} (common practice, Viète's trigonometric solution).
        const Real g2_real = make_real(g2, digits);
        const Real m = sqrt(g2_real / 3);
        Real argument =
            sqrt(make_real(27, digits)) * make_real(g3, digits) / (g2_real * sqrt(g2_real));
        if (argument > 1) argument = make_real(1, digits);
        if (argument < -1) argument = make_real(-1, digits);
        const Real theta = acos(argument) / 3;
        const Real third_turn = 2 * pi_real(digits) / 3;
        for (int k = 0; k < 3; ++k) roots.push_back(m * cos(theta - k * third_turn) - shift);
    } else {
        const Real p = make_real(-g2 / 4, digits), q = make_real(-g3 / 4, digits);
        const Real d = q * q / 4 + p * p * p / 27;
        const Real root_d = sqrt(d);
        Real big = q < 0 ? Real(-q / 2 + root_d) : Real(-q / 2 - root_d);
        Real root(0, digits);
        if (big != 0) {
            const Real u = cbrt(big);
            root = u - p / (3 * u);
        }
        roots.push_back(root - shift);
    }
    const Real tiny = ldexp(make_real(1, digits), -static_cast<int>(bits_for_digits(digits)));
    for (Real& root : roots) {
        for (int step = 0; step < 60; ++step) {
            const Real slope = cubic_slope(f, root, digits);
            if (slope == 0) break;
            const Real correction = cubic_value(f, root, digits) / slope;
            root -= correction;
            if (abs(correction) <= tiny * abs(root)) break;
        }
    }
    std::sort(roots.begin(), roots.end(), [](const Real& a, const Real& b) { return a > b; });
    return roots;
}

// Decimal digits lost to nearly coincident roots: log10(max |e_i| / min |e_i − e_j|).
unsigned root_conditioning(const std::vector<Real>& roots, const Real& beta) {
    Real largest = abs(roots[0]);
    for (const Real& e : roots) largest = std::max(largest, Real(abs(e)));
    Real separation = beta;
    if (roots.size() == 3) {
        const Real upper_gap = roots[0] - roots[1], lower_gap = roots[1] - roots[2];
        separation = upper_gap < lower_gap ? upper_gap : lower_gap;
    }
    if (separation <= 0) return 0;
    const double ratio = static_cast<double>(log10(largest / separation));
    return ratio > 0 ? static_cast<unsigned>(std::ceil(ratio)) : 0;
}

// The complex pair for Δ < 0: (x − e2)(x − e3) = (x − e1)^2 + α (x − e1) + β^2 with
// α = 3 e1 + b2/4 and β = |e1 − e2| = sqrt(f'(e1)/4) (Cohen Algorithm 7.4.7).
struct ComplexPair {
    Real alpha, beta;
};

ComplexPair complex_pair(const Curve& curve, const Real& e1, unsigned digits) {
    const Cubic f = cubic_of(curve);
    ComplexPair pair{Real(3 * e1 + make_real(f.b2, digits) / 4),
                     Real(sqrt(cubic_slope(f, e1, digits) / 4))};
    return pair;
}

unsigned digits_of_structure(const RealStructure& real) {
    return real.real_period.precision();
}

long working_bits(const RealStructure& real) {
    return static_cast<long>(bits_for_digits(digits_of_structure(real)));
}

// Start of the descent for the period and for the logarithm (Cohen Algorithm 7.4.8):
// Δ > 0: a0 = sqrt(e1 − e3), b0 = sqrt(e1 − e2); Δ < 0: a0 = 2 sqrt(β), b0 = sqrt(2β + α).
struct DescentStart {
    Real a0, b0;
};

DescentStart descent_start(const Curve& curve, const RealStructure& real) {
    if (real.components == 2) {
        return DescentStart{Real(sqrt(real.roots[0] - real.roots[2])),
                            Real(sqrt(real.roots[0] - real.roots[1]))};
    }
    const ComplexPair pair = complex_pair(curve, real.roots[0], digits_of_structure(real));
    return DescentStart{Real(2 * sqrt(pair.beta)), Real(sqrt(2 * pair.beta + pair.alpha))};
}

bool in_unit_interval(const Real& t) {
    return t >= 0 && t < 1;
}

}  // namespace

RealStructure real_structure(const Curve& curve, unsigned digits) {
    if (is_singular(curve)) throw InputError("real_structure: the curve is singular");
    if (digits == 0) throw InputError("real_structure: at least one digit must be asked for");
    const int delta_sign = sign_of(discriminant(curve));
    // First pass to measure how close the roots are, then the final precision with guard digits.
    unsigned working = digits + 20;
    for (int pass = 0; pass < 2; ++pass) {
        std::vector<Real> roots = cubic_real_roots(curve, delta_sign, working);
        Real beta(0, working);
        if (delta_sign < 0) beta = complex_pair(curve, roots[0], working).beta;
        const unsigned needed = digits + 20 + root_conditioning(roots, beta);
        if (pass == 0 && needed > working) {
            working = needed;
            continue;
        }
        RealStructure real;
        real.components = delta_sign > 0 ? 2 : 1;
        real.roots = roots;
        real.digits = digits;
        const Real pi = pi_real(working);
        const long bits = static_cast<long>(bits_for_digits(working));
        if (delta_sign > 0) {
            // ω1 = π / AGM(sqrt(e1 − e3), sqrt(e1 − e2)), ω2 = i π / AGM(sqrt(e1 − e3),
            // sqrt(e2 − e3)) (Cohen Algorithm 7.4.7).
            const Real a0 = sqrt(roots[0] - roots[2]);
            auto first = detail::agm_sequence(a0, Real(sqrt(roots[0] - roots[1])), bits);
            auto second = detail::agm_sequence(a0, Real(sqrt(roots[1] - roots[2])), bits);
            real.real_period = pi / first.a.back();
            real.imaginary_period_re = make_real(0, working);
            real.imaginary_period_im = pi / second.a.back();
        } else {
            // ω1 = 2π / AGM(2 sqrt β, sqrt(2β + α)), ω2 = ω1/2 + i π / AGM(2 sqrt β, sqrt(2β − α)).
            const ComplexPair pair = complex_pair(curve, roots[0], working);
            const Real a0 = 2 * sqrt(pair.beta);
            auto first = detail::agm_sequence(a0, Real(sqrt(2 * pair.beta + pair.alpha)), bits);
            Real minus = 2 * pair.beta - pair.alpha;
            if (minus < 0) minus = make_real(0, working);
            auto second = detail::agm_sequence(a0, Real(sqrt(minus)), bits);
            real.real_period = 2 * pi / first.a.back();
            real.imaginary_period_re = real.real_period / 2;
            real.imaginary_period_im = pi / second.a.back();
        }
        return real;
    }
    throw std::logic_error("real_structure: unreachable");
}

namespace {

// x − e_i for every real root, the difference nearest zero recomputed from
// Y^2 = 4 (x − e1)(x − e2)(x − e3) (resp. 4 u (u^2 + α u + β^2)), which is exact in Y and
// keeps full relative accuracy next to a 2-torsion point.
std::vector<Real> root_differences(const Curve& curve, const RealStructure& real, const Rational& x,
                                   const Rational& y_squared_4) {
    const unsigned digits = digits_of_structure(real);
    const Real x_real = make_real(x, digits);
    std::vector<Real> d;
    for (const Real& e : real.roots) d.push_back(x_real - e);
    const Real y2 = make_real(y_squared_4, digits);  // = Y^2
    if (real.components == 2) {
        std::size_t nearest = 0;
        for (std::size_t i = 1; i < 3; ++i) {
            if (abs(d[i]) < abs(d[nearest])) nearest = i;
        }
        Real others = make_real(4, digits);
        for (std::size_t i = 0; i < 3; ++i) {
            if (i != nearest) others *= d[i];
        }
        d[nearest] = y2 / others;  // keeps its sign: x − e2 < 0 on the egg
    } else {
        const ComplexPair pair = complex_pair(curve, real.roots[0], digits);
        if (abs(d[0]) < pair.beta) {
            const Real quadratic = d[0] * d[0] + pair.alpha * d[0] + pair.beta * pair.beta;
            d[0] = y2 / (4 * quadratic);
        }
    }
    return d;
}

}  // namespace

EllipticLog elliptic_log(const Curve& curve, const RealStructure& real, const Point& p) {
    const unsigned digits = digits_of_structure(real);
    EllipticLog result{0, make_real(0, digits)};
    if (p.at_infinity) return result;
    if (!on_curve(curve, p)) throw InputError("elliptic_log: the point is not on the curve");
    const Rational Y = 2 * p.y + curve.a1 * p.x + curve.a3;
    const Rational Y2 = Y * Y;
    const int y_sign = sgn(Y);
    const std::vector<Real> d = root_differences(curve, real, p.x, Y2);
    const DescentStart start = descent_start(curve, real);
    const long bits = working_bits(real);
    const auto agm = detail::agm_sequence(start.a0, start.b0, bits);
    const Real half_pi = pi_real(digits) / 2;
    const Real pi = pi_real(digits);
    const Real half = make_real(1, digits) / 2;

    if (real.components == 2) {
        const bool egg = d[0] < 0;
        Real c0(0, digits), gap0(0, digits);
        int descent_sign = y_sign;  // sign of Y on the identity-component point used
        if (!egg) {
            c0 = sqrt(d[2]);
            gap0 = d[0] / (c0 + start.a0);
        } else {
            result.component = 1;
            // P + T3 with T3 = (e3, ·): x − e3 ↦ (e1 − e3)(e2 − e3)/(x − e3) (translation by a
            // 2-torsion point), and the sign of Y flips (the line through T3 has slope Y/(x − e3)).
            if (d[2] == 0) return result;  // P = T3 itself: t = 0 on the egg
            const Real e1e3 = real.roots[0] - real.roots[2];
            const Real e2e3 = real.roots[1] - real.roots[2];
            c0 = sqrt(e1e3 * e2e3 / d[2]);
            gap0 = e1e3 * (-d[1]) / (d[2] * (c0 + start.a0));
            descent_sign = -y_sign;
        }
        const auto end = detail::landen_descent(agm, c0, gap0);
        // t0 = z0 / ω1 with z0 = arcsin(a_N/c_N)/a_N and ω1 = π/a_N.
        Real t0 = detail::arcsine_of_ratio(end.a, end.gap, half_pi) / pi;
        if (gap0 == 0) t0 = half;
        // Near O, ℘'(z) ≈ −2/z^3 < 0: the half with Y < 0 is t ∈ (0, 1/2).
        result.t = descent_sign > 0 ? Real(1 - t0) : t0;
        if (descent_sign == 0) result.t = t0;
    } else {
        const ComplexPair pair = complex_pair(curve, real.roots[0], digits);
        const Real& u = d[0];
        if (u <= 0 || Y2 == 0) {  // the real 2-torsion point (e1, ·)
            result.t = half;
            return result;
        }
        const Real s = sqrt(u), root_beta = sqrt(pair.beta);
        // c0 = (u + β)/sqrt(u) ≥ 2 sqrt(β) = a0, and c0 − a0 = (sqrt(u) − sqrt(β))^2 / sqrt(u);
        // c0 is unchanged by u ↦ β^2/u (translation by the 2-torsion point), so the descent
        // gives z ∈ (0, ω1/4] and u < β selects the other half (Cohen Algorithm 7.4.8).
        const Real c0 = (u + pair.beta) / s;
        const Real diff = u - pair.beta;
        const Real gap0 = diff * diff / (s * (s + root_beta) * (s + root_beta));
        const auto end = detail::landen_descent(agm, c0, gap0);
        // ω1 = 2π/a_N, so t = z/ω1 = arcsin(a_N/c_N)/(2π).
        Real t0 = detail::arcsine_of_ratio(end.a, end.gap, half_pi) / (2 * pi);
        if (u < pair.beta) t0 = half - t0;
        result.t = y_sign > 0 ? Real(1 - t0) : t0;
    }
    if (!in_unit_interval(result.t)) result.t = result.t - floor(result.t);
    return result;
}

EllipticLog elliptic_log(const Curve& curve, const Point& p, unsigned digits) {
    const RealStructure real = real_structure(curve, digits + 5);
    EllipticLog result = elliptic_log(curve, real, p);
    return result;
}

RealPoint point_from_log(const Curve& curve, const RealStructure& real, int component,
                         const Real& t_in) {
    const unsigned digits = digits_of_structure(real);
    if (component != 0 && component != 1) {
        throw InputError("point_from_log: the component must be 0 or 1");
    }
    if (component == 1 && real.components == 1) {
        throw InputError("point_from_log: the curve has one real component (discriminant < 0)");
    }
    Real t = with_digits(t_in, digits);
    t = t - floor(t);
    RealPoint out{make_real(0, digits), make_real(0, digits), false};
    const Real half = make_real(1, digits) / 2;
    const Real pi = pi_real(digits);
    if (t == 0 && component == 0) {
        out.at_infinity = true;
        return out;
    }
    const DescentStart start = descent_start(curve, real);
    const auto agm = detail::agm_sequence(start.a0, start.b0, working_bits(real));
    // Invert the descent: c_n = c_{n+1} + (a_n^2 − b_n^2)/(4 c_{n+1}) and
    // gap_n = gap_{n+1} (1 − (a_n − b_n)/(2 c_{n+1})), both free of cancellation.
    auto ascend = [&](const Real& theta, Real& c0, Real& gap0) {
        const Real& a_end = agm.a.back();
        const Real sine = sin(theta);
        const Real complement = (pi / 2 - theta) / 2;
        Real gap = 2 * a_end * sin(complement) * sin(complement) / sine;
        Real c = a_end + gap;
        for (std::size_t n = agm.a.size() - 1; n-- > 0;) {
            const Real& a = agm.a[n];
            const Real& b = agm.b[n];
            const Real next_gap = gap * (1 - (a - b) / (2 * c));
            c = c + (a - b) * (a + b) / (4 * c);
            gap = next_gap;
        }
        c0 = c;
        gap0 = gap;
    };
    const Real t0 = t <= half ? t : Real(1 - t);
    const int y_sign = t < half ? -1 : (t > half ? 1 : 0);
    Real x(0, digits), Y(0, digits);
    const Real four = make_real(4, digits);
    if (real.components == 2) {
        const Real& e1 = real.roots[0];
        const Real& e2 = real.roots[1];
        const Real& e3 = real.roots[2];
        Real d1(0, digits), d2(0, digits), d3(0, digits);
        int sign = y_sign;
        if (t0 == 0) {  // component 1, t = 0: T3
            x = e3;
            Y = make_real(0, digits);
        } else {
            Real c0(0, digits), gap0(0, digits);
            ascend(pi * t0, c0, gap0);
            d1 = gap0 * (c0 + start.a0);  // x − e1 on the identity component
            d3 = c0 * c0;
            d2 = d1 + (e1 - e2);
            if (component == 1) {
                const Real e2e3 = e2 - e3;
                const Real new_d3 = start.a0 * start.a0 * e2e3 / d3;
                const Real new_d2 = -e2e3 * d1 / d3;
                d1 = new_d3 - (e1 - e3);
                d2 = new_d2;
                d3 = new_d3;
                sign = -sign;
                x = e3 + d3;
            } else {
                x = d1 > (e1 - e3) ? Real(e3 + d3) : Real(e1 + d1);
            }
            Y = 2 * sqrt(abs(d1 * d2 * d3));
            if (sign < 0) Y = -Y;
            if (sign == 0) Y = make_real(0, digits);
        }
    } else {
        const ComplexPair pair = complex_pair(curve, real.roots[0], digits);
        const bool outer = t0 <= half / 2;  // u ≥ β
        const Real t1 = outer ? t0 : Real(half - t0);
        Real u(0, digits);
        if (t1 != 0) {
            Real c0(0, digits), gap0(0, digits);
            ascend(2 * pi * t1, c0, gap0);
            // c0 = (u + β)/sqrt(u): sqrt(u) solves s^2 − c0 s + β = 0, discriminant c0^2 − a0^2.
            const Real larger = (c0 + sqrt(gap0 * (c0 + start.a0))) / 2;
            const Real s = outer ? larger : Real(pair.beta / larger);
            u = s * s;
        }
        x = real.roots[0] + u;
        Y = 2 * sqrt(u * (u * u + pair.alpha * u + pair.beta * pair.beta));
        if (y_sign < 0) Y = -Y;
        if (y_sign == 0) Y = make_real(0, digits);
    }
    out.x = x;
    out.y = (Y - make_real(curve.a1, digits) * x - make_real(curve.a3, digits)) / 2;
    return out;
}

// ---- certified versions ------------------------------------------------------------------

namespace detail {
namespace {

Interval cubic_value_enclosure(const Cubic& f, const Interval& x, unsigned digits) {
    return ((4 * x + make_interval(f.b2, digits)) * x + 2 * make_interval(f.b4, digits)) * x +
           make_interval(f.b6, digits);
}

int certain_sign(const Interval& value) {
    if (lower(value) > 0) return 1;
    if (upper(value) < 0) return -1;
    return 0;
}

// An interval around the approximate root `root` in which f certainly changes sign (so it holds
// a root; the intervals of distinct roots are disjoint because they are far narrower than the
// root separation the guard digits were chosen for).
Interval certified_root(const Cubic& f, const Real& root, const Real& scale, unsigned digits) {
    const long bits = static_cast<long>(bits_for_digits(digits));
    for (long slack = 6; slack < bits; slack += 16) {
        const Real radius = ldexp(Real(scale), static_cast<int>(slack - bits));
        const Real low = root - radius, high = root + radius;
        const int sign_low =
            certain_sign(cubic_value_enclosure(f, make_interval(low, digits), digits));
        const int sign_high =
            certain_sign(cubic_value_enclosure(f, make_interval(high, digits), digits));
        if (sign_low != 0 && sign_high != 0 && sign_low != sign_high) {
            return make_interval(low, high, digits);
        }
    }
    throw std::runtime_error("the real roots of the curve could not be certified at " +
                             std::to_string(digits) + " digits");
}

Interval interval_sqrt(const Interval& x) {
    return sqrt(clamp_non_negative(x));
}

}  // namespace

IntervalStructure interval_structure(const Curve& curve, const RealStructure& real) {
    const unsigned digits = digits_of_structure(real);
    const Cubic f = cubic_of(curve);
    IntervalStructure out;
    out.components = real.components;
    out.digits = digits;
    Real scale = make_real(1, digits);
    for (const Real& e : real.roots) {
        if (abs(e) > scale) scale = abs(e);
    }
    for (const Real& e : real.roots) out.roots.push_back(certified_root(f, e, scale, digits));
    const Interval pi = pi_interval(digits);
    // Stop the interval AGM well before the precision runs out: its widths stop shrinking.
    const long bits = static_cast<long>(bits_for_digits(digits)) - 24;
    if (out.components == 2) {
        out.a0 = interval_sqrt(out.roots[0] - out.roots[2]);
        out.b0 = interval_sqrt(out.roots[0] - out.roots[1]);
        out.agm = agm_sequence(out.a0, out.b0, bits);
        const auto second = agm_sequence(out.a0, interval_sqrt(out.roots[1] - out.roots[2]), bits);
        out.real_period = pi / hull(out.agm.a.back(), out.agm.b.back());
        out.imaginary_period_im = pi / hull(second.a.back(), second.b.back());
    } else {
        const Interval& e1 = out.roots[0];
        out.alpha = 3 * e1 + make_interval(f.b2, digits) / 4;
        const Interval slope =
            (12 * e1 + 2 * make_interval(f.b2, digits)) * e1 + 2 * make_interval(f.b4, digits);
        out.beta = interval_sqrt(slope / 4);
        out.a0 = 2 * interval_sqrt(out.beta);
        out.b0 = interval_sqrt(2 * out.beta + out.alpha);
        out.agm = agm_sequence(out.a0, out.b0, bits);
        const auto second = agm_sequence(out.a0, interval_sqrt(2 * out.beta - out.alpha), bits);
        out.real_period = 2 * pi / hull(out.agm.a.back(), out.agm.b.back());
        out.imaginary_period_im = pi / hull(second.a.back(), second.b.back());
    }
    return out;
}

}  // namespace detail

namespace {

// t0 = I·M/π (Δ > 0) or I·M/(2π) (Δ < 0) from the end of an interval descent: the exact
// I(a_N, b_N, c_N) lies in [S/a_N, S/b_N] with S = arcsin(a_N/c_N) (landen.hpp: the integrand
// decreases in b, and (w^2 − a^2 + b^2) ≥ w^2 b^2/a^2), and the exact AGM M in [b_N, a_N].
Interval certified_fraction_of_period(const detail::LandenEnd<Interval>& end, const Interval& pi) {
    const Interval a = end.a, b = end.b;
    const Interval s =
        detail::arcsine_of_ratio(a, detail::clamp_non_negative(end.gap), Interval(pi / 2));
    return s * hull(Interval(b / a), Interval(a / b)) / pi;
}

Interval point_interval(long numerator, long denominator, unsigned digits) {
    return make_interval(Rational(numerator, denominator), digits);
}

}  // namespace

EllipticLogEnclosure elliptic_log_enclosure(const Curve& curve, const Point& p, unsigned digits) {
    if (!p.at_infinity && !on_curve(curve, p)) {
        throw InputError("elliptic_log_enclosure: the point is not on the curve");
    }
    const RealStructure real = real_structure(curve, digits + 10);
    if (p.at_infinity) return EllipticLogEnclosure{0, make_interval(0L, digits_of_structure(real))};
    return detail::elliptic_log_enclosure_on(curve, real, detail::interval_structure(curve, real),
                                             p);
}

EllipticLogEnclosure detail::elliptic_log_enclosure_on(const Curve& curve,
                                                       const RealStructure& real,
                                                       const IntervalStructure& box,
                                                       const Point& p) {
    const unsigned working = digits_of_structure(real);
    EllipticLogEnclosure result{0, make_interval(0L, working)};
    if (p.at_infinity) return result;
    const Rational Y = 2 * p.y + curve.a1 * p.x + curve.a3;
    const Rational Y2 = Y * Y;
    const int y_sign = sgn(Y);
    const Interval x = make_interval(p.x, working);
    const Interval y2 = make_interval(Y2, working);
    const Interval pi = pi_interval(working);
    std::vector<Interval> d;
    for (const Interval& e : box.roots) d.push_back(x - e);
    // The component and the nearest root are decided on the approximations (the roots are far
    // apart compared with the working precision); the enclosures below do not depend on it.
    const std::vector<Real> approx = root_differences(curve, real, p.x, Y2);

    if (box.components == 2) {
        const bool egg = approx[0] < 0;
        std::size_t nearest = 0;
        for (std::size_t i = 1; i < 3; ++i) {
            if (abs(approx[i]) < abs(approx[nearest])) nearest = i;
        }
        if (Y2 == 0) {  // a 2-torsion point: t = 0 or 1/2 exactly
            result.component = egg ? 1 : 0;
            result.t = nearest == 2 ? make_interval(0L, working) : point_interval(1, 2, working);
            return result;
        }
        Interval others = make_interval(4L, working);
        for (std::size_t i = 0; i < 3; ++i) {
            if (i != nearest) others *= d[i];
        }
        d[nearest] = intersect(d[nearest], Interval(y2 / others));
        Interval c0, gap0;
        int descent_sign = y_sign;
        if (!egg) {
            const Interval d0 = detail::clamp_non_negative(d[0]);
            c0 = sqrt(detail::clamp_non_negative(d[2]));
            gap0 = d0 / (c0 + box.a0);
        } else {
            result.component = 1;
            const Interval e1e3 = box.roots[0] - box.roots[2];
            const Interval e2e3 = box.roots[1] - box.roots[2];
            const Interval d2 = detail::clamp_non_negative(d[2]);
            c0 = sqrt(e1e3 * e2e3 / d2);
            gap0 = e1e3 * detail::clamp_non_negative(-d[1]) / (d2 * (c0 + box.a0));
            descent_sign = -y_sign;
        }
        const auto end = detail::landen_descent(box.agm, c0, gap0);
        const Interval t0 = certified_fraction_of_period(end, pi);
        result.t = descent_sign > 0 ? Interval(1 - t0) : t0;
        return result;
    }
    if (Y2 == 0) {
        result.t = point_interval(1, 2, working);
        return result;
    }
    Interval u = detail::clamp_non_negative(d[0]);
    const Interval quadratic = u * u + box.alpha * u + box.beta * box.beta;
    u = intersect(u, Interval(y2 / (4 * quadratic)));
    const Interval s = sqrt(u), root_beta = sqrt(box.beta);
    const Interval c0 = (u + box.beta) / s;
    const Interval diff = u - box.beta;
    const Interval gap0 = diff * diff / (s * (s + root_beta) * (s + root_beta));
    const auto end = detail::landen_descent(box.agm, c0, gap0);
    const Interval z_fraction = certified_fraction_of_period(end, pi) / 2;
    const Interval half = point_interval(1, 2, working);
    Interval t0;
    if (upper(diff) < 0) {
        t0 = half - z_fraction;
    } else if (lower(diff) >= 0) {
        t0 = z_fraction;
    } else {
        t0 = hull(z_fraction, Interval(half - z_fraction));
    }
    result.t = y_sign > 0 ? Interval(1 - t0) : t0;
    return result;
}

}  // namespace arcsieve
