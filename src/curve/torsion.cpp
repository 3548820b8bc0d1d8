#include "curve/torsion.hpp"

#include <algorithm>
#include <array>
#include <numeric>
#include <stdexcept>

#include "arith/factor.hpp"
#include "curve/minimal_model.hpp"

namespace arcsieve {
namespace {

// Mazur: a rational torsion point has order at most 12, and the group at most 16 points.
constexpr int mazur_max_order = 12;

// The cubic of y^2 = x^3 + a x^2 + b x + c with integer coefficients.
struct Cubic {
    Integer a, b, c;
    Integer at(const Integer& x) const { return ((x + a) * x + b) * x + c; }
};

// A model y^2 = x^3 + a x^2 + b x + c with integer a, b, c, and the change from the input.
struct IntegralCubicModel {
    Curve curve;
    Cubic cubic;
    ModelChange change;  // input curve -> curve
};

IntegralCubicModel cubic_model_from(const ModelWithChange& integral) {
    const ModelChange to_cubic = a1_a3_free_change(integral.curve);
    IntegralCubicModel out;
    out.curve = apply(integral.curve, to_cubic);
    out.change = compose(integral.change, to_cubic);
    out.cubic = Cubic{Integer(out.curve.a2.get_num()), Integer(out.curve.a4.get_num()),
                      Integer(out.curve.a6.get_num())};
    return out;
}

Integer floor_div(const Integer& a, long b) {
    Integer q;
    mpz_fdiv_q_ui(q.get_mpz_t(), a.get_mpz_t(), static_cast<unsigned long>(b));
    return q;
}

// The integer in [low, high] where the monotone f changes sign and vanishes, if any.
void bisect_for_root(const Cubic& f, Integer low, Integer high, std::vector<Integer>& roots) {
    if (low > high) return;
    const int s_low = sgn(f.at(low)), s_high = sgn(f.at(high));
    if (s_low == 0) roots.push_back(low);
    if (s_high == 0) roots.push_back(high);
    if (s_low == 0 || s_high == 0 || s_low == s_high) return;
    while (high - low > 1) {
        Integer mid = floor_div(low + high, 2);
        const int s_mid = sgn(f.at(mid));
        if (s_mid == 0) {
            roots.push_back(mid);
            return;
        }
        if (s_mid == s_low) {
            low = mid;
        } else {
            high = mid;
        }
    }
}

// Every integer root of x^3 + a x^2 + b x + c, exactly: f is monotone between its critical
// points x = (-a ± sqrt(a^2 - 3b))/3, so bisection on each monotone stretch (kept 3 away from
// the approximate critical points, whose neighbours are tested one by one) finds every root.
std::vector<Integer> integer_roots(const Cubic& f) {
    std::vector<Integer> roots;
    Integer bound =
        1 + std::max({Integer(abs(f.a)), Integer(abs(f.b)), Integer(abs(f.c))});  // Cauchy's bound
    const Integer critical_discriminant = f.a * f.a - 3 * f.b;
    std::vector<Integer> breaks;  // approximate critical points, increasing
    if (critical_discriminant >= 0) {
        Integer root;
        mpz_sqrt(root.get_mpz_t(), critical_discriminant.get_mpz_t());
        breaks = {floor_div(-f.a - root, 3), floor_div(-f.a + root, 3)};
    }
    Integer low = -bound;
    for (const Integer& point : breaks) {
        bisect_for_root(f, low, point - 3, roots);
        for (Integer x = std::max(Integer(point - 2), low); x <= point + 2; ++x) {
            if (f.at(x) == 0) roots.push_back(x);
        }
        low = std::max(low, Integer(point + 3));
    }
    bisect_for_root(f, low, bound, roots);
    std::sort(roots.begin(), roots.end());
    roots.erase(std::unique(roots.begin(), roots.end()), roots.end());
    return roots;
}

// #E(F_p) for y^2 = f(x) at an odd prime p of good reduction: 1 + Σ_x (1 + (f(x)/p)).
long count_points_mod(const Cubic& f, long p) {
    const long a = mpz_fdiv_ui(f.a.get_mpz_t(), static_cast<unsigned long>(p));
    const long b = mpz_fdiv_ui(f.b.get_mpz_t(), static_cast<unsigned long>(p));
    const long c = mpz_fdiv_ui(f.c.get_mpz_t(), static_cast<unsigned long>(p));
    std::vector<signed char> chi(static_cast<std::size_t>(p), -1);
    chi[0] = 0;
    for (long y = 1; y < p; ++y) chi[static_cast<std::size_t>(y * y % p)] = 1;
    long count = 1;
    for (long x = 0; x < p; ++x) {
        const long value = (((x + a) * x % p + b) * x % p + c) % p;
        count += 1 + chi[static_cast<std::size_t>(value)];
    }
    return count;
}

// gcd of #E(F_p) over the first good odd primes: E(Q)_tors injects into E(F_p) for such p
// (Silverman AEC VII.3.1 and VIII.7), so the torsion order divides it.
long torsion_order_bound(const IntegralCubicModel& model) {
    const Integer delta(discriminant(model.curve).get_num());
    long bound = 0;
    int used = 0;
    for (long p = 3; p < 2000 && used < 14; p += 2) {
        if (!is_probable_prime(Integer(p)) ||
            mpz_divisible_ui_p(delta.get_mpz_t(), static_cast<unsigned long>(p))) {
            continue;
        }
        bound = std::gcd(bound, count_points_mod(model.cubic, p));
        ++used;
        if (bound == 1) break;
    }
    return bound;
}

// Order of an integral point on y^2 = f(x), f integral, if it is torsion: by the generalised
// Nagell–Lutz theorem (Silverman–Tate, Rational Points, II.5) every multiple of a torsion point
// is integral, so a non-integral multiple proves infinite order; Mazur bounds the order.
std::optional<int> order_on_cubic_model(const Curve& model, const Point& p) {
    Point multiple = p;
    for (int k = 1; k <= mazur_max_order; ++k) {
        if (multiple.at_infinity) return k;
        if (multiple.x.get_den() != 1 || multiple.y.get_den() != 1) return std::nullopt;
        multiple = add(model, multiple, p);
    }
    return std::nullopt;
}

// All y > 0 with y^2 | D, from D's factorisation.
std::vector<Integer> square_divisor_roots(const Integer& D) {
    std::vector<Integer> out = {Integer(1)};
    for (const auto& pp : factor(D)) {
        const std::size_t existing = out.size();
        Integer power = 1;
        for (int k = 1; 2 * k <= pp.exponent; ++k) {
            power *= pp.prime;
            for (std::size_t i = 0; i < existing; ++i) out.push_back(out[i] * power);
        }
    }
    return out;
}

struct TorsionPoint {
    Point point;  // on the cubic model
    int order;
};

}  // namespace

TorsionGroup torsion_subgroup(const Curve& curve) {
    const IntegralCubicModel model = cubic_model_from(minimal_model(curve));
    const long bound = torsion_order_bound(model);
    std::vector<TorsionPoint> found = {TorsionPoint{Point::infinity(), 1}};
    auto record = [&](const Point& p) {
        for (const auto& known : found) {
            if (known.point == p) return;
        }
        if (auto order = order_on_cubic_model(model.curve, p); order && bound % *order == 0) {
            found.push_back(TorsionPoint{p, *order});
        }
    };
    if (bound > 1) {
        // Points of order 2: (x, 0) with x an integer root of the cubic.
        for (const Integer& x : integer_roots(model.cubic))
            record(Point{Rational(x), Rational(0), false});
        if (static_cast<long>(found.size()) < bound) {
            // Nagell–Lutz (Silverman–Tate II.5): other torsion points have integer x and y with
            // y^2 dividing the cubic's discriminant D = Δ/16 of this model. A y survives only if
            // y^2 mod q is a value of f mod q for a few small q; then its x is solved for exactly.
            const Integer D = Integer(discriminant(model.curve).get_num()) / 16;
            std::vector<std::pair<long, std::vector<bool>>> sieves;
            for (long q : {5L, 7L, 11L, 13L, 17L, 19L, 23L, 29L, 31L, 37L, 41L, 43L}) {
                std::vector<bool> values(static_cast<std::size_t>(q), false);
                for (long x = 0; x < q; ++x) {
                    values[mpz_fdiv_ui(model.cubic.at(Integer(x)).get_mpz_t(),
                                       static_cast<unsigned long>(q))] = true;
                }
                sieves.emplace_back(q, std::move(values));
            }
            for (const Integer& y : square_divisor_roots(D)) {
                bool possible = true;
                for (const auto& [q, values] : sieves) {
                    const Integer y2 = y * y;
                    if (!values[mpz_fdiv_ui(y2.get_mpz_t(), static_cast<unsigned long>(q))]) {
                        possible = false;
                        break;
                    }
                }
                if (!possible) continue;
                Cubic shifted = model.cubic;
                shifted.c -= y * y;
                for (const Integer& x : integer_roots(shifted)) {
                    record(Point{Rational(x), Rational(y), false});
                    record(Point{Rational(x), Rational(-y), false});
                }
                if (static_cast<long>(found.size()) == bound) break;
            }
        }
    }
    if (found.size() > 16 || bound % static_cast<long>(found.size()) != 0) {
        throw std::logic_error("torsion_subgroup: found " + std::to_string(found.size()) +
                               " points, not a divisor of the bound " + std::to_string(bound));
    }
    const int order = static_cast<int>(found.size());
    int two_torsion = 0;
    for (const auto& t : found) two_torsion += t.order == 2;

    // Generators and a canonical listing on the input curve: multiples k·G (+ H).
    auto to_input = [&](const Point& p) { return to_old_model(model.change, p); };
    auto smallest_of_order = [&](int wanted, const Point* avoid) {
        const Point* best = nullptr;
        for (const auto& t : found) {
            if (t.order != wanted || (avoid && t.point == *avoid)) continue;
            if (!best || t.point.x < best->x || (t.point.x == best->x && t.point.y > best->y)) {
                best = &t.point;
            }
        }
        return *best;
    };
    TorsionGroup group;
    if (order == 1) {
        group.points = {Point::infinity()};
        return group;
    }
    std::vector<Point> listing;
    if (two_torsion == 3) {
        const int cyclic = order / 2;
        const Point g = smallest_of_order(cyclic, nullptr);
        const Point half = multiply(model.curve, g, std::int64_t{cyclic / 2});
        const Point h = smallest_of_order(2, cyclic % 2 == 0 ? &half : nullptr);
        group.structure = {2, cyclic};
        group.generators = {to_input(h), to_input(g)};
        for (int j = 0; j < 2; ++j) {
            for (int k = 0; k < cyclic; ++k) {
                Point p = multiply(model.curve, g, std::int64_t{k});
                if (j == 1) p = add(model.curve, p, h);
                listing.push_back(p);
            }
        }
    } else {
        const Point g = smallest_of_order(order, nullptr);
        group.structure = {order};
        group.generators = {to_input(g)};
        for (int k = 0; k < order; ++k)
            listing.push_back(multiply(model.curve, g, std::int64_t{k}));
    }
    for (const Point& p : listing) group.points.push_back(to_input(p));
    return group;
}

std::optional<int> torsion_order(const Curve& curve, const Point& p) {
    if (!on_curve(curve, p)) throw std::invalid_argument("torsion_order: point not on the curve");
    if (p.at_infinity) return 1;
    const IntegralCubicModel model = cubic_model_from(integral_model(curve));
    return order_on_cubic_model(model.curve, to_new_model(model.change, p));
}

}  // namespace arcsieve
