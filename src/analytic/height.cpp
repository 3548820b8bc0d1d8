#include "analytic/height.hpp"

#include <cmath>
#include <stdexcept>

#include "analytic/landen.hpp"
#include "arith/factor.hpp"
#include "curve/minimal_model.hpp"

namespace arcsieve {
namespace {

// Decimal digits of log max(|num|, |den|) of x: the archimedean height of a point near O grows
// like log|x| while its elliptic log shrinks like |x|^{-1/2}, so t needs that many more digits.
unsigned size_digits(const Rational& x) {
    const std::size_t num = decimal_digits(Integer(x.get_num()));
    const std::size_t den = decimal_digits(Integer(x.get_den()));
    return static_cast<unsigned>(std::max(num, den));
}

// Guard digits for a height of P at `digits` digits: t must be known to
// digits + log10|x|/2 + log10 log|x| places and the sum of local heights can be large.
unsigned working_digits_for(const Point& p, unsigned digits) {
    if (p.at_infinity) return digits + 10;
    const unsigned size = size_digits(p.x);
    return digits + size / 2 + 15 + static_cast<unsigned>(std::log10(1.0 + size));
}

// Silverman's model-independent local height λ^S (Advanced Topics VI.3.4) from the q-series,
// λ^S = −½ B2(T) log|q| − log|1 − u| − Σ_{n≥1} log|(1 − q^n u)(1 − q^n u^{-1})|,
// B2(T) = T^2 − T + 1/6, T = log|u| / log|q|, for the lattice Z + τZ, q = e^{2πiτ},
// u = e^{2πiz}. All our lattices give real q (rectangular: τ = i s; rhombic: τ = ½ + i s),
// and u = ±ρ e^{2πit} with ρ ∈ (|q|, 1], so each |1 − a e^{iθ}|^2 is
// (1 − a)^2 + 4a sin^2(θ/2) for a ≥ 0 and (1 + a)^2 + 4|a| cos^2(θ/2) for a < 0.
template <class Number>
struct QSeriesPoint {
    Number log_abs_q;  // log|q| < 0
    bool q_negative = false;
    Number rho;        // |u|
    Number T;          // log ρ / log|q| ∈ [0, 1)
    Number sine_sq;    // sin^2(πt) of the angle of u = ρ e^{2πit}
    Number cosine_sq;  // cos^2(πt)
};

// |1 − a e^{2πit}|^2 for real a of the given sign.
template <class Number>
Number squared_modulus_one_minus(const Number& a, bool a_negative,
                                 const QSeriesPoint<Number>& point) {
    if (!a_negative) return (1 - a) * (1 - a) + 4 * a * point.sine_sq;
    return (1 + a) * (1 + a) - 4 * a * point.cosine_sq;
}

template <class Number>
Number constant(long value, unsigned digits) {
    if constexpr (std::is_same_v<Number, Real>) {
        return make_real(value, digits);
    } else {
        return make_interval(value, digits);
    }
}

bool below_bits(const Real& x, long bits) {
    return x == 0 || mpfr_get_exp(x.backend().data()) < -bits;
}
bool below_bits(const Interval& x, long bits) {
    const Real top = upper(Interval(abs(x)));
    return below_bits(top, bits);
}

// λ^S by the q-series. For intervals the truncated tail is added as ±4|q|^{K+1}/(ρ(1 − |q|)):
// each omitted factor has |w| = |q|^n ρ^{±1} ≤ 1/2 and |log|1 − w|| ≤ 2|w|.
template <class Number>
Number silverman_local_height_q_series(const QSeriesPoint<Number>& point, unsigned digits) {
    const long bits = static_cast<long>(bits_for_digits(digits)) + 10;
    const Number& T = point.T;
    const Number b2 = T * T - T + constant<Number>(1, digits) / 6;
    Number product = squared_modulus_one_minus(point.rho, false, point);  // |1 − u|^2
    if constexpr (std::is_same_v<Number, Real>) {
        if (product == 0) throw std::domain_error("local height at the point at infinity");
    } else {
        if (lower(product) <= 0) {
            throw std::runtime_error("local height: the point is too close to O for the precision");
        }
    }
    const Number abs_q = exp(point.log_abs_q);
    Number q_power = constant<Number>(1, digits);
    Number tail = q_power;
    for (int n = 1; n < 10000000; ++n) {
        q_power *= abs_q;
        const bool negative = point.q_negative && (n % 2 == 1);
        const Number a = negative ? Number(-q_power * point.rho) : Number(q_power * point.rho);
        const Number a_inverse =
            negative ? Number(-q_power / point.rho) : Number(q_power / point.rho);
        product *= squared_modulus_one_minus(a, negative, point) *
                   squared_modulus_one_minus(a_inverse, negative, point);
        tail = q_power / point.rho;
        if (below_bits(tail, bits)) break;
    }
    Number value = -b2 * point.log_abs_q / 2 - log(product) / 2;
    if constexpr (std::is_same_v<Number, Interval>) {
        const Real bound = upper(Interval(4 * tail * abs_q / (1 - abs_q)));
        const Real low = -bound;
        value += make_interval(low, bound, digits);
    }
    return value;
}

// The q-series data of the real point (component, t), choosing for Δ > 0 whichever of the
// bases (ω1, ω2) and (ω2, −ω1) has the smaller |q| (|q| ≤ e^{−2π}·…, fast for every lattice).
QSeriesPoint<Real> q_series_point(const RealStructure& real, int component, const Real& t_in,
                                  unsigned digits) {
    const Real pi = pi_real(digits);
    Real t = with_digits(t_in, digits);
    t = t - floor(t);
    QSeriesPoint<Real> point{make_real(0, digits), false,
                             make_real(1, digits), make_real(0, digits),
                             make_real(0, digits), make_real(0, digits)};
    const Real s = with_digits(real.imaginary_period_im, digits) /
                   with_digits(real.real_period, digits);  // Im τ
    if (real.components == 1) {
        // τ = ½ + i s: q = −e^{−2πs}, u = e^{2πit}.
        point.log_abs_q = -2 * pi * s;
        point.q_negative = true;
        const Real sine = sin(pi * t);
        point.sine_sq = sine * sine;
        point.cosine_sq = 1 - point.sine_sq;
        return point;
    }
    if (s >= 1) {
        // τ = i s: q = e^{−2πs}; on the egg z = tω1 + ω2/2, so u = e^{2πit} q^{1/2}, T = ½.
        point.log_abs_q = -2 * pi * s;
        if (component == 1) {
            point.rho = exp(-pi * s);
            point.T = make_real(1, digits) / 2;
        }
        const Real sine = sin(pi * t);
        point.sine_sq = sine * sine;
        point.cosine_sq = 1 - point.sine_sq;
        return point;
    }
    // Basis (ω2, −ω1) normalised by ω2 = iW: τ' = i/s, z' = z/ω2 = −i t/s (+ ½ on the egg).
    // By λ(P) = λ(−P) take T = min(t, 1 − t); then u = ±e^{−2πT/s} is real.
    point.log_abs_q = -2 * pi / s;
    const Real T = t <= 0.5 ? t : Real(1 - t);
    point.T = T;
    point.rho = exp(-2 * pi * T / s);
    // u = +ρ (angle 0) on the identity component, −ρ (angle π) on the egg.
    point.sine_sq = component == 1 ? make_real(1, digits) : make_real(0, digits);
    point.cosine_sq = 1 - point.sine_sq;
    return point;
}

// The same data as certified intervals, from the certified lattice (landen.hpp); the basis
// choice only affects speed, so it is made on the midpoints.
QSeriesPoint<Interval> q_series_point_enclosure(const detail::IntervalStructure& box, int component,
                                                Interval t, unsigned digits) {
    const Interval pi = pi_interval(digits);
    const Real middle = median(t);
    if (middle >= 1) t = t - 1;
    if (middle < 0) t = t + 1;
    QSeriesPoint<Interval> point{interval_zero(digits),     false,
                                 make_interval(1L, digits), interval_zero(digits),
                                 interval_zero(digits),     interval_zero(digits)};
    const Interval s = box.imaginary_period_im / box.real_period;
    const Interval sine = sin(pi * t), cosine = cos(pi * t);
    if (box.components == 1) {
        point.log_abs_q = -2 * pi * s;
        point.q_negative = true;
        point.sine_sq = sine * sine;
        point.cosine_sq = cosine * cosine;
        return point;
    }
    if (median(s) >= 1) {
        point.log_abs_q = -2 * pi * s;
        if (component == 1) {
            point.rho = exp(-pi * s);
            point.T = make_interval(Rational(1, 2), digits);
        }
        point.sine_sq = sine * sine;
        point.cosine_sq = cosine * cosine;
        return point;
    }
    point.log_abs_q = -2 * pi / s;
    const Interval half = make_interval(Rational(1, 2), digits);
    point.T = detail::clamp_non_negative(Interval(half - abs(Interval(t - half))));
    point.rho = exp(-2 * pi * point.T / s);
    point.sine_sq = make_interval(component == 1 ? 1L : 0L, digits);
    point.cosine_sq = make_interval(component == 1 ? 0L : 1L, digits);
    return point;
}

// log|Δ| of the model (the archimedean absolute value).
Real log_abs_discriminant(const Curve& curve, unsigned digits) {
    const Rational delta = abs(discriminant(curve));
    return log(make_real(Integer(delta.get_num()), digits)) -
           log(make_real(Integer(delta.get_den()), digits));
}

// Primes where λ_p needs Silverman's §5 formulas: those dividing Δ (numerator or denominator)
// or a denominator of the model; elsewhere λ_p = max(0, log|x|_p).
std::vector<Integer> special_primes(const Curve& curve) {
    Integer product = 1;
    const Rational delta = discriminant(curve);
    product *= Integer(delta.get_num());
    product *= Integer(delta.get_den());
    for (const Rational* a : {&curve.a1, &curve.a2, &curve.a3, &curve.a4, &curve.a6}) {
        product *= Integer(a->get_den());
    }
    return prime_divisors(product);
}

// a/b in lowest terms (mpq_class's two-argument constructor does not canonicalise).
Rational fraction(long a, long b) {
    Rational q(a, b);
    q.canonicalize();
    return q;
}

constexpr int infinite_valuation = 1 << 28;

int valuation_or_infinite(const Rational& q, const Integer& p) {
    return q == 0 ? infinite_valuation : valuation(q, p);
}

}  // namespace

// λ_p = coefficient · log p, exactly (Silverman, Math. Comp. 51 (1988) Theorem 5.2, on a model
// minimal at p; the (1/6)(v(Δ') − v(Δ)) term moves it to the model given).
Rational nonarchimedean_local_height_coefficient(const Curve& curve, const Point& p,
                                                 const Integer& prime) {
    if (p.at_infinity) throw InputError("local height at the point at infinity");
    const ModelWithChange minimal = minimal_model_at(curve, prime);
    const Curve& e = minimal.curve;
    const Point q = to_new_model(minimal.change, p);
    const Rational delta_shift =
        fraction(valuation(discriminant(e), prime) - valuation(discriminant(curve), prime), 6);
    const Rational psi2 = 2 * q.y + e.a1 * q.x + e.a3;
    const Rational slope = 3 * q.x * q.x + 2 * e.a2 * q.x + e.a4 - e.a1 * q.y;
    const int v_psi2 = valuation_or_infinite(psi2, prime);
    if (valuation_or_infinite(slope, prime) <= 0 || v_psi2 <= 0) {
        // Non-singular reduction: max(0, log|x'|_p) = max(0, −v_p(x')) log p.
        const int vx = valuation_or_infinite(q.x, prime);
        return Rational(vx < 0 ? -vx : 0) + delta_shift;
    }
    const int N = valuation(discriminant(e), prime);
    if (valuation_or_infinite(c4(e), prime) == 0) {
        // Multiplicative reduction I_N, component i = min(v(ψ2), N/2): −i(N − i)/N log p.
        Rational i = v_psi2 * 2 < N ? Rational(v_psi2) : fraction(N, 2);
        return -i * (N - i) / N + delta_shift;
    }
    const BInvariants b = b_invariants(e);
    const Rational& x = q.x;
    const Rational psi3 = (((3 * x + b.b2) * x + 3 * b.b4) * x + 3 * b.b6) * x + b.b8;
    const int v_psi3 = valuation_or_infinite(psi3, prime);
    // Additive reduction: −(2/3) v(ψ2) log p if v(ψ3) ≥ 3 v(ψ2), else −(1/4) v(ψ3) log p
    // (twice Silverman's −(1/3) v(ψ2) and −(1/8) v(ψ3)).
    if (v_psi2 < infinite_valuation && static_cast<long>(v_psi3) >= 3L * v_psi2) {
        return fraction(-2L * v_psi2, 3) + delta_shift;
    }
    return fraction(-v_psi3, 4) + delta_shift;
}

Real nonarchimedean_local_height(const Curve& curve, const Point& p, const Integer& prime,
                                 unsigned digits) {
    if (prime < 2 || !is_probable_prime(prime)) throw InputError("local height: not a prime");
    const Rational coefficient = nonarchimedean_local_height_coefficient(curve, p, prime);
    return make_real(coefficient, digits + 5) * log(make_real(prime, digits + 5));
}

Real archimedean_local_height_at_log(const Curve& curve, const RealStructure& real, int component,
                                     const Real& t) {
    const unsigned digits = real.real_period.precision();
    if (component == 1 && real.components == 1) {
        throw InputError("archimedean local height: the curve has one real component");
    }
    const QSeriesPoint<Real> point = q_series_point(real, component, t, digits);
    // Ours = 2 λ^S + (1/6) log|Δ| on the model given (height.hpp).
    return 2 * silverman_local_height_q_series(point, digits) +
           log_abs_discriminant(curve, digits) / 6;
}

Real archimedean_local_height(const Curve& curve, const Point& p, unsigned digits) {
    if (p.at_infinity) throw InputError("local height at the point at infinity");
    const RealStructure real = real_structure(curve, working_digits_for(p, digits));
    const EllipticLog log = elliptic_log(curve, real, p);
    return archimedean_local_height_at_log(curve, real, log.component, log.t);
}

Real canonical_height(const Curve& curve, const Point& p, unsigned digits) {
    if (!p.at_infinity && !on_curve(curve, p)) {
        throw InputError("canonical_height: the point is not on the curve");
    }
    const unsigned working = working_digits_for(p, digits);
    if (p.at_infinity) return make_real(0, working);
    Real total = archimedean_local_height(curve, p, digits);
    // Good primes: Σ max(0, log|x|_p) = log of the denominator of x without the special primes.
    Integer good_denominator(p.x.get_den());
    for (const Integer& prime : special_primes(curve)) {
        while (good_denominator % prime == 0) good_denominator /= prime;
        total += nonarchimedean_local_height(curve, p, prime, working);
    }
    total += log(make_real(good_denominator, working));
    return total;
}

Real height_pairing(const Curve& curve, const Point& p, const Point& q, unsigned digits) {
    const Point sum = add(curve, p, q);
    return (canonical_height(curve, sum, digits + 2) - canonical_height(curve, p, digits + 2) -
            canonical_height(curve, q, digits + 2)) /
           2;
}

std::vector<std::vector<Real>> height_matrix(const Curve& curve, const std::vector<Point>& points,
                                             unsigned digits) {
    const std::size_t n = points.size();
    std::vector<Real> heights;
    for (const Point& p : points) heights.push_back(canonical_height(curve, p, digits + 5));
    std::vector<std::vector<Real>> matrix(n, std::vector<Real>(n, make_real(0, digits + 5)));
    for (std::size_t i = 0; i < n; ++i) {
        matrix[i][i] = heights[i];
        for (std::size_t j = i + 1; j < n; ++j) {
            const Real sum = canonical_height(curve, add(curve, points[i], points[j]), digits + 5);
            matrix[i][j] = (sum - heights[i] - heights[j]) / 2;
            matrix[j][i] = matrix[i][j];
        }
    }
    return matrix;
}

Real regulator(const Curve& curve, const std::vector<Point>& points, unsigned digits) {
    // The determinant by Gaussian elimination with partial pivoting; extra digits absorb the
    // cancellation of a nearly singular matrix of moderate size.
    const unsigned working = digits + 10 + 2 * static_cast<unsigned>(points.size());
    std::vector<std::vector<Real>> m = height_matrix(curve, points, working);
    const std::size_t n = m.size();
    Real determinant = make_real(1, working);
    for (std::size_t column = 0; column < n; ++column) {
        std::size_t pivot = column;
        for (std::size_t row = column + 1; row < n; ++row) {
            if (abs(m[row][column]) > abs(m[pivot][column])) pivot = row;
        }
        if (m[pivot][column] == 0) return make_real(0, working);
        if (pivot != column) {
            std::swap(m[pivot], m[column]);
            determinant = -determinant;
        }
        determinant *= m[column][column];
        for (std::size_t row = column + 1; row < n; ++row) {
            const Real factor = m[row][column] / m[column][column];
            for (std::size_t k = column; k < n; ++k) m[row][k] -= factor * m[column][k];
        }
    }
    return determinant;
}

Interval canonical_height_enclosure(const Curve& curve, const Point& p, unsigned digits) {
    if (!p.at_infinity && !on_curve(curve, p)) {
        throw InputError("canonical_height_enclosure: the point is not on the curve");
    }
    const unsigned working = working_digits_for(p, digits) + 10;
    if (p.at_infinity) return make_interval(0L, working);
    const RealStructure real = real_structure(curve, working);
    const unsigned precision = real.real_period.precision();
    const detail::IntervalStructure box = detail::interval_structure(curve, real);
    const EllipticLogEnclosure logarithm = detail::elliptic_log_enclosure_on(curve, real, box, p);
    const QSeriesPoint<Interval> point =
        q_series_point_enclosure(box, logarithm.component, logarithm.t, precision);
    const Rational delta = abs(discriminant(curve));
    const Interval log_delta = log(make_interval(Integer(delta.get_num()), precision)) -
                               log(make_interval(Integer(delta.get_den()), precision));
    Interval total = 2 * silverman_local_height_q_series(point, precision) + log_delta / 6;
    Integer good_denominator(p.x.get_den());
    for (const Integer& prime : special_primes(curve)) {
        while (good_denominator % prime == 0) good_denominator /= prime;
        total +=
            make_interval(nonarchimedean_local_height_coefficient(curve, p, prime), precision) *
            log(make_interval(prime, precision));
    }
    total += log(make_interval(good_denominator, precision));
    return total;
}

}  // namespace arcsieve
