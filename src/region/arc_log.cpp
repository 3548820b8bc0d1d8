#include "region/arc_log.hpp"

#include <cmath>
#include <stdexcept>

#include "region/interval_ops.hpp"

namespace arcsieve::region {
namespace {

void trim(Polynomial& p) {
    while (!p.empty() && p.back() == 0) p.pop_back();
}

int sign_of(const Rational& q) {
    return sgn(q);
}

// Sturm chain of a squarefree polynomial: p, p', −rem(p, p'), … (Sturm 1829; common practice).
std::vector<Polynomial> sturm_chain(const Polynomial& p) {
    std::vector<Polynomial> chain{p, derivative(p)};
    while (degree(chain.back()) > 0) {
        Polynomial r = remainder(chain[chain.size() - 2], chain.back());
        for (Rational& c : r) c = -c;
        if (r.empty()) break;
        chain.push_back(std::move(r));
    }
    return chain;
}

int sign_variations(const std::vector<Polynomial>& chain, const Rational& x) {
    int variations = 0, previous = 0;
    for (const Polynomial& q : chain) {
        const int s = sign_of(evaluate(q, x));
        if (s == 0) continue;
        if (previous != 0 && s != previous) ++variations;
        previous = s;
    }
    return variations;
}

// The rational with the least denominator in [lower, upper] (Stern–Brocot descent by continued
// fractions; common practice), used to catch rational roots exactly.
Rational simplest_between(Rational lower, Rational upper) {
    Integer floor_lower;
    mpz_fdiv_q(floor_lower.get_mpz_t(), lower.get_num_mpz_t(), lower.get_den_mpz_t());
    if (Rational(floor_lower) == lower) return lower;
    if (Rational(floor_lower + 1) <= upper) return Rational(floor_lower + 1);
    // Both in (f, f+1): recurse on the reciprocals of the fractional parts.
    const Rational inner = simplest_between(1 / (upper - floor_lower), 1 / (lower - floor_lower));
    return Rational(floor_lower) + 1 / inner;
}

Polynomial squarefree_part(const Polynomial& p) {
    const Polynomial g = polynomial_gcd(p, derivative(p));
    if (degree(g) <= 0) return p;
    return quotient(p, g);
}

void refine_squarefree(const Polynomial& q, RootBracket& b, const Rational& width) {
    if (b.lower == b.upper) return;
    if (evaluate(q, b.upper) == 0) {
        b.lower = b.upper;
        return;
    }
    const int upper_sign = sign_of(evaluate(q, b.upper));
    while (b.upper - b.lower > width) {
        const Rational mid = (b.lower + b.upper) / 2;
        const int s = sign_of(evaluate(q, mid));
        if (s == 0) {
            b.lower = b.upper = mid;
            return;
        }
        if (s == upper_sign) {
            b.upper = mid;
        } else {
            b.lower = mid;
        }
    }
}

// Roots in (lower, upper] by Sturm counts and bisection.
void isolate(const Polynomial& q, const std::vector<Polynomial>& chain, const Rational& lower,
             int lower_variations, const Rational& upper, int upper_variations,
             std::vector<RootBracket>& out) {
    const int count = lower_variations - upper_variations;
    if (count <= 0) return;
    if (count == 1) {
        out.push_back(RootBracket{lower, upper});
        return;
    }
    const Rational mid = (lower + upper) / 2;
    const int mid_variations = sign_variations(chain, mid);
    isolate(q, chain, lower, lower_variations, mid, mid_variations, out);
    isolate(q, chain, mid, mid_variations, upper, upper_variations, out);
}

Interval bracket_interval(const RootBracket& b, unsigned bits) {
    return span(interval_of(b.lower, bits), interval_of(b.upper, bits));
}

Interval clamp_nonnegative(const Interval& a) {
    Interval r = a;
    mpfi_ptr p = r.backend().data();
    if (mpfr_sgn(&p->left) < 0) mpfr_set_zero(&p->left, 1);
    if (mpfr_sgn(&p->right) < 0) mpfr_set_zero(&p->right, 1);
    return r;
}

double spread_limit(const Interval& smallest, unsigned bits) {
    return std::ldexp(std::max(lower_double(smallest), 0.0), -static_cast<int>(bits));
}

Interval reciprocal_sqrt_between(const Interval& largest, const Interval& smallest) {
    // [1/sqrt(upper(largest)), 1/sqrt(lower(smallest))]
    const unsigned bits = common_bits(largest, smallest);
    Interval one = interval_of(Rational(1), bits);
    Interval from_largest = divided(one, sqrt_of_nonnegative(upper_end(largest)));
    Interval from_smallest = divided(one, sqrt_of_nonnegative(lower_end(smallest)));
    return span(from_largest, from_smallest);
}

Interval max_of(const Interval& a, const Interval& b) {
    return certainly_less(a, b) ? b : (certainly_less(b, a) ? a : hull_of(a, b));
}
Interval min_of(const Interval& a, const Interval& b) {
    return certainly_less(a, b) ? a : (certainly_less(b, a) ? b : hull_of(a, b));
}

// u(x) = ∫_x^∞ dt / (2 sqrt f(t)) = R_F(x − e1, x − e2, x − e3) on the identity component.
Interval identity_integral(const ArcModel& m, const Interval& x) {
    if (m.components == 2) {
        return carlson_rf(clamp_nonnegative(minus(x, m.root_values[0])),
                          clamp_nonnegative(minus(x, m.root_values[1])),
                          clamp_nonnegative(minus(x, m.root_values[2])));
    }
    return carlson_rf_conjugate(clamp_nonnegative(minus(x, m.root_values[0])),
                                minus(x, m.complex_root_re), m.complex_root_im);
}

// On the egg: P + (e3, 0) lies on the identity component with the same t, and
// x(P + (e3,0)) = e3 + (e3 − e1)(e3 − e2)/(x − e3) (the chord through a 2-torsion point).
Interval egg_integral(const ArcModel& m, const Interval& x) {
    const Interval& e1 = m.root_values[0];
    const Interval& e2 = m.root_values[1];
    const Interval& e3 = m.root_values[2];
    const Interval product = times(minus(e3, e1), minus(e3, e2));
    const Interval d = clamp_nonnegative(minus(x, e3));
    if (!certainly_positive(d)) {
        // x may be e3 itself (t = 0): u lies between 0 and its value at the upper end of d.
        Interval dd = upper_end(d);
        if (!certainly_positive(dd))
            return span(interval_with_bits(m.bits), interval_with_bits(m.bits));
        const Interval shifted = divided(product, dd);
        const Interval at_upper =
            carlson_rf(plus(minus(e3, e1), shifted), plus(minus(e3, e2), shifted), shifted);
        return span(interval_with_bits(m.bits), at_upper);
    }
    const Interval shifted = divided(product, d);  // x' − e3
    return carlson_rf(clamp_nonnegative(plus(minus(e3, e1), shifted)),
                      clamp_nonnegative(plus(minus(e3, e2), shifted)), shifted);
}

}  // namespace

Rational evaluate(const Polynomial& p, const Rational& x) {
    Rational value(0);
    for (std::size_t i = p.size(); i-- > 0;) value = value * x + p[i];
    return value;
}

Polynomial derivative(const Polynomial& p) {
    Polynomial d;
    for (std::size_t i = 1; i < p.size(); ++i) d.push_back(Rational(static_cast<long>(i)) * p[i]);
    trim(d);
    return d;
}

int degree(const Polynomial& p) {
    for (std::size_t i = p.size(); i-- > 0;) {
        if (p[i] != 0) return static_cast<int>(i);
    }
    return -1;
}

Polynomial remainder(const Polynomial& a, const Polynomial& b) {
    Polynomial r = a;
    trim(r);
    const int db = degree(b);
    if (db < 0) throw std::domain_error("polynomial division by zero");
    while (degree(r) >= db) {
        const int dr = degree(r);
        const Rational factor = r[dr] / b[db];
        for (int i = 0; i <= db; ++i) r[dr - db + i] -= factor * b[i];
        r[dr] = 0;
        trim(r);
    }
    return r;
}

Polynomial quotient(const Polynomial& a, const Polynomial& b) {
    Polynomial r = a;
    trim(r);
    const int db = degree(b);
    if (db < 0) throw std::domain_error("polynomial division by zero");
    Polynomial q(std::max(0, degree(r) - db + 1), Rational(0));
    while (degree(r) >= db) {
        const int dr = degree(r);
        const Rational factor = r[dr] / b[db];
        q[dr - db] = factor;
        for (int i = 0; i <= db; ++i) r[dr - db + i] -= factor * b[i];
        r[dr] = 0;
        trim(r);
    }
    trim(q);
    return q;
}

Polynomial polynomial_gcd(Polynomial a, Polynomial b) {
    trim(a);
    trim(b);
    while (!b.empty()) {
        Polynomial r = remainder(a, b);
        a = std::move(b);
        b = std::move(r);
    }
    if (!a.empty()) {
        const Rational lead = a.back();
        for (Rational& c : a) c /= lead;
    }
    return a;
}

std::vector<RootBracket> real_roots(const Polynomial& p, const Rational& width) {
    Polynomial q = p;
    trim(q);
    if (degree(q) < 1) return {};
    q = squarefree_part(q);
    // Cauchy's bound: every root has |r| < 1 + max |q_i / q_n| (common practice).
    Rational bound(0);
    for (int i = 0; i < degree(q); ++i) bound = std::max(bound, Rational(abs(q[i] / q.back())));
    bound += 1;
    const auto chain = sturm_chain(q);
    std::vector<RootBracket> roots;
    isolate(q, chain, -bound, sign_variations(chain, -bound), bound, sign_variations(chain, bound),
            roots);
    for (RootBracket& b : roots) {
        refine_squarefree(q, b, width);
        if (b.lower == b.upper) continue;
        const Rational simple = simplest_between(b.lower, b.upper);
        if (evaluate(q, simple) == 0) b.lower = b.upper = simple;
    }
    return roots;
}

void refine(const Polynomial& p, RootBracket& bracket, const Rational& width) {
    refine_squarefree(squarefree_part(p), bracket, width);
}

Interval carlson_rf(const Interval& x0, const Interval& y0, const Interval& z0) {
    const unsigned bits = common_bits(common_bits(x0, y0), z0);
    Interval x = clamp_nonnegative(x0), y = clamp_nonnegative(y0), z = clamp_nonnegative(z0);
    const Interval four = interval_of(Rational(4), bits);
    const int cap = 8 * static_cast<int>(bits) + 200;
    for (int iteration = 0; iteration < cap; ++iteration) {
        const Interval sx = sqrt_of_nonnegative(x), sy = sqrt_of_nonnegative(y),
                       sz = sqrt_of_nonnegative(z);
        const Interval lambda = plus(plus(times(sx, sy), times(sy, sz)), times(sz, sx));
        x = divided(plus(x, lambda), four);
        y = divided(plus(y, lambda), four);
        z = divided(plus(z, lambda), four);
        const Interval hi = max_of(max_of(x, y), z);
        const Interval lo = min_of(min_of(x, y), z);
        const double spread = upper_double(minus(upper_end(hi), lower_end(lo)));
        const double widths = std::max({width_double(x), width_double(y), width_double(z)});
        if (lower_double(lo) > 0 && spread <= spread_limit(lo, bits) + 4 * widths) break;
    }
    return reciprocal_sqrt_between(max_of(max_of(x, y), z), min_of(min_of(x, y), z));
}

Interval carlson_rf_conjugate(const Interval& x0, const Interval& re0, const Interval& im0) {
    const unsigned bits = common_bits(common_bits(x0, re0), im0);
    Interval x = clamp_nonnegative(x0), re = re0, im = im0;
    const Interval four = interval_of(Rational(4), bits);
    const Interval two = interval_of(Rational(2), bits);
    const int cap = 8 * static_cast<int>(bits) + 200;
    auto modulus = [&]() { return sqrt_of_nonnegative(plus(times(re, re), times(im, im))); };
    for (int iteration = 0; iteration < cap; ++iteration) {
        // √w = a + ib with a = sqrt((|w| + re)/2); √w·√w̄ = |w|, √x(√w + √w̄) = 2a√x.
        const Interval abs_w = modulus();
        const Interval a = sqrt_of_nonnegative(divided(plus(abs_w, re), two));
        const Interval lambda = plus(times(scaled(a, 2), sqrt_of_nonnegative(x)), abs_w);
        x = divided(plus(x, lambda), four);
        re = divided(plus(re, lambda), four);
        im = divided(im, four);
        if (!certainly_positive(re)) continue;
        const Interval abs_next = modulus();
        const Interval hi = max_of(x, abs_next), lo = min_of(x, re);
        const double spread = upper_double(minus(upper_end(hi), lower_end(lo)));
        const double widths = std::max({width_double(x), width_double(re), width_double(im)});
        if (lower_double(lo) > 0 && spread <= spread_limit(lo, bits) + 4 * widths) break;
    }
    return reciprocal_sqrt_between(max_of(x, modulus()), min_of(x, re));
}

ArcModel arc_model(const Curve& curve, unsigned digits) {
    if (is_singular(curve)) throw InputError("the curve " + to_string(curve) + " is singular");
    const BInvariants b = b_invariants(curve);
    ArcModel m;
    m.curve = curve;
    m.cubic = Polynomial{b.b6 / 4, b.b4 / 2, b.b2 / 4, Rational(1)};
    m.bits = bits_for_digits(digits) + 40;
    // Brackets well below the working precision relative to the size of the roots.
    Rational scale(1);
    for (const Rational& c : m.cubic) scale = std::max(scale, Rational(abs(c)));
    Integer denominator(1);
    mpz_mul_2exp(denominator.get_mpz_t(), denominator.get_mpz_t(), m.bits + 8);
    const Rational width = scale / Rational(denominator);
    auto roots = real_roots(m.cubic, width);
    m.roots.assign(roots.rbegin(), roots.rend());
    m.components = m.roots.size() == 3 ? 2 : 1;
    for (const RootBracket& r : m.roots) m.root_values.push_back(bracket_interval(r, m.bits));
    const Interval zero = interval_with_bits(m.bits);
    if (m.components == 2) {
        m.half_period = carlson_rf(zero, minus(m.root_values[0], m.root_values[1]),
                                   minus(m.root_values[0], m.root_values[2]));
    } else {
        // f = (x − e1)(x² + p x + q): p = A + e1, q = B + e1 p; e2, e3 = −p/2 ± i sqrt(q − p²/4).
        const Interval& e1 = m.root_values[0];
        const Interval p = plus(interval_of(m.cubic[2], m.bits), e1);
        const Interval q = plus(interval_of(m.cubic[1], m.bits), times(e1, p));
        const Interval half_p = divided(p, interval_of(Rational(2), m.bits));
        m.complex_root_re = negated(half_p);
        m.complex_root_im = sqrt_of_nonnegative(minus(q, times(half_p, half_p)));
        m.half_period = carlson_rf_conjugate(zero, minus(e1, m.complex_root_re), m.complex_root_im);
    }
    return m;
}

int component_of(const ArcModel& model, const Point& p) {
    if (p.at_infinity || model.components == 1) return 0;
    RootBracket e1 = model.roots[0];
    while (true) {
        if (p.x >= e1.upper) return 0;
        if (p.x < e1.lower) return 1;
        if (evaluate(model.cubic, p.x) == 0) return 0;  // x = e1 exactly
        refine(model.cubic, e1, (e1.upper - e1.lower) / 1024);
    }
}

LogEnclosure log_enclosure(const ArcModel& model, const Rational& x_lower, const Rational& x_upper,
                           int component, int branch) {
    if (component < 0 || component >= model.components) {
        throw std::invalid_argument("log_enclosure: no such real component");
    }
    const Interval x_low = interval_of(x_lower, model.bits);
    const Interval x_high = interval_of(x_upper, model.bits);
    Interval u;
    if (component == 0) {
        if (x_upper < model.roots[0].lower) {
            throw std::invalid_argument("log_enclosure: x is left of the identity component");
        }
        u = hull_of(identity_integral(model, x_low), identity_integral(model, x_high));
    } else {
        if (x_lower > model.roots[1].upper || x_upper < model.roots[2].lower) {
            throw std::invalid_argument("log_enclosure: x is not on the egg");
        }
        u = hull_of(egg_integral(model, x_low), egg_integral(model, x_high));
    }
    const Interval period = scaled(model.half_period, 2);
    const Interval s = divided(u, period);
    const Interval one = interval_of(Rational(1), model.bits);
    // Identity component: t ∈ (0, 1/2) where y' < 0. Egg: t ∈ (0, 1/2) where y' > 0.
    const int first_half_branch = component == 0 ? -1 : 1;
    LogEnclosure result{component, s};
    if (branch == first_half_branch) {
        result.t = s;
    } else if (branch == -first_half_branch) {
        result.t = minus(one, s);
    } else if (upper_double(s) < 0.25) {
        result.t = span(negated(s), s);
    } else {
        result.t = hull_of(s, minus(one, s));
    }
    return result;
}

LogEnclosure log_enclosure(const ArcModel& model, const Point& p) {
    if (p.at_infinity) {
        return LogEnclosure{0, interval_with_bits(model.bits)};
    }
    const Rational y_shifted = p.y + (model.curve.a1 * p.x + model.curve.a3) / 2;
    return log_enclosure(model, p.x, p.x, component_of(model, p), sgn(y_shifted));
}

}  // namespace arcsieve::region
