#include "region/region.hpp"

#include <algorithm>
#include <cmath>
#include <sstream>
#include <stdexcept>

#include "region/interval_ops.hpp"

namespace arcsieve::region {
namespace {

using family::LinearForm;

struct Zero {
    std::optional<Point> exact;
    RootBracket x;
    int branch = 0;
    int component = 0;
    bool at_infinity = false;
    std::vector<std::size_t> forms;  // indices into the distinct-form list
};

bool proportional(const LinearForm& f, const LinearForm& g) {
    // f × g = 0 as vectors.
    return f.coefficient_y * g.coefficient_z == f.coefficient_z * g.coefficient_y &&
           f.coefficient_z * g.coefficient_x == f.coefficient_x * g.coefficient_z &&
           f.coefficient_x * g.coefficient_y == f.coefficient_y * g.coefficient_x;
}

Rational width_for(const Polynomial& p, unsigned bits) {
    Rational scale(1);
    for (const Rational& c : p) scale = std::max(scale, Rational(abs(c)));
    Integer denominator(1);
    mpz_mul_2exp(denominator.get_mpz_t(), denominator.get_mpz_t(), 2 * bits + 8);
    return scale / Rational(denominator);
}

// x ≥ e1 (component 0) or x ≤ e2 (the egg), for an x known to be on the real locus.
int component_of_bracket(const ArcModel& model, RootBracket b, const Polynomial& p) {
    if (model.components == 1) return 0;
    RootBracket e1 = model.roots[0];
    for (int step = 0; step < 400; ++step) {
        if (b.lower >= e1.upper) return 0;
        if (b.upper <= e1.lower) return 1;
        if (b.lower == b.upper && evaluate(model.cubic, b.lower) == 0) return 0;
        refine(model.cubic, e1, (e1.upper - e1.lower) / 4);
        if (!p.empty()) refine(p, b, (b.upper - b.lower) / 4);
    }
    return 0;  // the point is (e1, 0) itself, reached only on the line y' = 0
}

std::optional<Rational> rational_sqrt(const Rational& q) {
    if (q < 0) return std::nullopt;
    if (!mpz_perfect_square_p(q.get_num_mpz_t()) || !mpz_perfect_square_p(q.get_den_mpz_t())) {
        return std::nullopt;
    }
    Integer n, d;
    mpz_sqrt(n.get_mpz_t(), q.get_num_mpz_t());
    mpz_sqrt(d.get_mpz_t(), q.get_den_mpz_t());
    return Rational(n, d);
}

Rational shifted_y(const Curve& curve, const Point& p) {
    return p.y + (curve.a1 * p.x + curve.a3) / 2;
}

// Zeros of one form on the curve (the exact coincidence points are handled by the caller).
std::vector<Zero> zeros_of_form(const ArcModel& model, const LinearForm& form,
                                const std::vector<Point>& coincidences, unsigned bits) {
    const Curve& e = model.curve;
    std::vector<Zero> zeros;
    const Rational& alpha = form.coefficient_x;
    const Rational& beta = form.coefficient_y;
    const Rational& gamma = form.coefficient_z;
    auto exact_zero = [&](const Point& p) {
        Zero z;
        z.exact = p;
        z.at_infinity = p.at_infinity;
        if (!p.at_infinity) {
            z.x = RootBracket{p.x, p.x};
            z.branch = sgn(shifted_y(e, p));
            z.component = component_of(model, p);
        }
        return z;
    };
    if (beta != 0) {
        const Rational m = -alpha / beta, q = -gamma / beta;
        Polynomial g{e.a6 - q * q - e.a3 * q, e.a4 - 2 * m * q - e.a1 * q - e.a3 * m,
                     e.a2 - m * m - e.a1 * m, Rational(1)};
        for (const Point& p : coincidences) {
            if (p.at_infinity || evaluate(form, p) != 0) continue;
            while (degree(g) >= 1 && evaluate(g, p.x) == 0) g = quotient(g, Polynomial{-p.x, 1});
            zeros.push_back(exact_zero(p));
        }
        if (degree(g) < 1) return zeros;
        // y' = y + (a1 x + a3)/2 along the line: slope·x + offset.
        const Rational slope = m + e.a1 / 2, offset = q + e.a3 / 2;
        const Rational width = width_for(g, bits);
        for (RootBracket b : real_roots(g, width)) {
            if (slope != 0) {
                const Rational vanishing = -offset / slope;
                if (b.lower <= vanishing && vanishing <= b.upper && evaluate(g, vanishing) == 0) {
                    b.lower = b.upper = vanishing;
                }
                while (b.lower < vanishing && vanishing < b.upper) {
                    refine(g, b, (b.upper - b.lower) / 4);
                }
            }
            if (b.lower == b.upper) {
                zeros.push_back(exact_zero(Point{b.lower, m * b.lower + q, false}));
                continue;
            }
            Zero z;
            z.x = b;
            const Rational mid = (b.lower + b.upper) / 2;
            z.branch = sgn(slope * mid + offset);
            z.component = component_of_bracket(model, b, g);
            zeros.push_back(z);
        }
        return zeros;
    }
    zeros.push_back(exact_zero(Point::infinity()));
    if (alpha == 0) return zeros;  // γZ vanishes only at infinity
    const Rational x0 = -gamma / alpha;
    const Rational value = evaluate(model.cubic, x0);  // y'^2 at x0
    if (value < 0) return zeros;
    const Rational lift = (e.a1 * x0 + e.a3) / 2;
    if (value == 0) {
        zeros.push_back(exact_zero(Point{x0, -lift, false}));
        return zeros;
    }
    if (auto root = rational_sqrt(value)) {
        zeros.push_back(exact_zero(Point{x0, *root - lift, false}));
        zeros.push_back(exact_zero(Point{x0, -*root - lift, false}));
        return zeros;
    }
    for (int branch : {1, -1}) {
        Zero z;
        z.x = RootBracket{x0, x0};
        z.branch = branch;
        z.component = component_of_bracket(model, z.x, {});
        zeros.push_back(z);
    }
    return zeros;
}

// Points of the curve where two distinct forms vanish together: the intersection of the two
// lines, rational, when it lies on the curve.
std::vector<Point> coincidence_points(const Curve& curve, const std::vector<LinearForm>& forms) {
    std::vector<Point> points;
    for (std::size_t i = 0; i < forms.size(); ++i) {
        for (std::size_t j = i + 1; j < forms.size(); ++j) {
            const LinearForm& f = forms[i];
            const LinearForm& g = forms[j];
            const Rational X =
                f.coefficient_y * g.coefficient_z - f.coefficient_z * g.coefficient_y;
            const Rational Y =
                f.coefficient_z * g.coefficient_x - f.coefficient_x * g.coefficient_z;
            const Rational Z =
                f.coefficient_x * g.coefficient_y - f.coefficient_y * g.coefficient_x;
            Point p;
            if (Z == 0) {
                if (X != 0 || Y == 0) continue;  // the only point at infinity is (0 : 1 : 0)
                p = Point::infinity();
            } else {
                p = Point{X / Z, Y / Z, false};
                if (!on_curve(curve, p)) continue;
            }
            if (std::find(points.begin(), points.end(), p) == points.end()) points.push_back(p);
        }
    }
    return points;
}

Interval normalised(const Interval& t) {
    const double mid = midpoint_double(t);
    const double shift = std::floor(mid);
    if (shift == 0) return t;
    return minus(t, interval_of(Rational(static_cast<long>(shift)), precision_bits(t)));
}

Interval shifted_by(const Interval& t, long k) {
    return plus(t, interval_of(Rational(k), precision_bits(t)));
}

// Sign of α x + β y + γ at the real point (x, y) with y' = branch·sqrt(f(x)), f(x) > 0, exactly.
int form_sign(const ArcModel& model, const LinearForm& form, const Rational& x, int branch) {
    const Curve& e = model.curve;
    const Rational& beta = form.coefficient_y;
    const Rational rational_part =
        form.coefficient_x * x + form.coefficient_z - beta * (e.a1 * x + e.a3) / 2;
    const Rational square = evaluate(model.cubic, x);
    const int s1 = sgn(rational_part);
    const int s2 = sgn(beta) * branch;
    if (s2 == 0 || square == 0) return s1;
    if (s1 == 0) return s2;
    if (s1 == s2) return s1;
    const Rational left = rational_part * rational_part, right = beta * beta * square;
    if (left > right) return s1;
    if (left < right) return s2;
    return 0;
}

struct TestPoint {
    bool at_infinity = false;
    Rational x;
    int branch = 0;
};

// A point strictly inside the gap (start, end) of `component` (end > start, unwrapped).
TestPoint find_test_point(const ArcModel& model, int component, const Interval& start,
                          const Interval& end) {
    if (component == 0 && ((certainly_less(start, interval_with_bits(model.bits)) &&
                            certainly_less(interval_with_bits(model.bits), end)) ||
                           (certainly_less(start, interval_of(Rational(1), model.bits)) &&
                            certainly_less(interval_of(Rational(1), model.bits), end)))) {
        return TestPoint{true, Rational(0), 0};
    }
    const Interval target_raw =
        divided(plus(upper_end(start), lower_end(end)), interval_of(Rational(2), model.bits));
    double target = midpoint_double(target_raw);
    long wrap = static_cast<long>(std::floor(target));
    target -= static_cast<double>(wrap);
    const Interval target_t = lower_end(normalised(target_raw));
    auto inside = [&](const Interval& t) {
        for (long k : {0L, 1L, -1L}) {
            const Interval shifted = shifted_by(t, k);
            if (certainly_less(start, shifted) && certainly_less(shifted, end)) return true;
        }
        return false;
    };
    // Along a branch t is monotone in x; choose the branch holding the target and bisect in x.
    int branch;
    bool t_increases_with_x;
    Rational lower, upper;
    if (component == 0) {
        branch = target < 0.5 ? -1 : 1;
        t_increases_with_x = branch == 1;
        lower = model.roots[0].upper;
        upper = abs(lower) * 2 + 1;
        for (int step = 0; step < 4000; ++step) {
            const Interval t = log_enclosure(model, upper, upper, 0, branch).t;
            const bool far_enough =
                branch == -1 ? certainly_less(t, target_t) : certainly_less(target_t, t);
            if (far_enough) break;
            upper *= 4;
        }
    } else {
        branch = target < 0.5 ? 1 : -1;
        t_increases_with_x = branch == 1;
        lower = model.roots[2].upper;
        upper = model.roots[1].lower;
    }
    for (int step = 0; step < 2000; ++step) {
        const Rational mid = (lower + upper) / 2;
        const Interval t = log_enclosure(model, mid, mid, component, branch).t;
        if (inside(t)) return TestPoint{false, mid, branch};
        const bool below = midpoint_double(t) < target;
        if (below == t_increases_with_x) {
            lower = mid;
        } else {
            upper = mid;
        }
    }
    throw std::runtime_error("target_region: no test point found inside a gap");
}

int sign_at(const ArcModel& model, const LinearForm& form, const TestPoint& p) {
    if (p.at_infinity) return sgn(form.coefficient_y);
    return form_sign(model, form, p.x, p.branch);
}

bool conditions_hold(const family::Target& target, const std::vector<int>& signs,
                     const std::vector<std::size_t>& ignored) {
    for (int s : target.projective ? std::vector<int>{1, -1} : std::vector<int>{1}) {
        bool ok = true;
        for (std::size_t i = 0; i < target.conditions.size() && ok; ++i) {
            if (std::find(ignored.begin(), ignored.end(), i) != ignored.end()) continue;
            const int value = s * signs[i];
            ok = target.conditions[i].strict ? value > 0 : value >= 0;
        }
        if (ok) return true;
    }
    return false;
}

std::optional<Region> try_region(const family::Target& target, unsigned digits) {
    Region region;
    region.target = target;
    region.digits = digits;
    region.model = arc_model(target.curve, digits);
    const ArcModel& model = region.model;
    // Distinct forms up to proportionality, and which conditions use each.
    std::vector<LinearForm> forms;
    std::vector<std::vector<std::size_t>> users;
    for (std::size_t i = 0; i < target.conditions.size(); ++i) {
        const LinearForm& f = target.conditions[i].form;
        if (family::is_zero(f)) {
            throw InputError("condition '" + target.conditions[i].label + "' is identically zero");
        }
        std::size_t k = 0;
        while (k < forms.size() && !proportional(forms[k], f)) ++k;
        if (k == forms.size()) {
            forms.push_back(f);
            users.emplace_back();
        }
        users[k].push_back(i);
    }
    const std::vector<Point> coincidences = coincidence_points(target.curve, forms);
    std::vector<Zero> zeros;
    for (std::size_t k = 0; k < forms.size(); ++k) {
        for (Zero z : zeros_of_form(model, forms[k], coincidences, model.bits)) {
            auto same = std::find_if(zeros.begin(), zeros.end(), [&](const Zero& other) {
                return z.exact && other.exact && *z.exact == *other.exact;
            });
            if (same != zeros.end()) {
                same->forms.push_back(k);
            } else {
                z.forms.push_back(k);
                zeros.push_back(z);
            }
        }
    }
    for (const Zero& z : zeros) {
        BoundaryPoint b;
        b.exact_point = z.exact;
        b.at_infinity = z.at_infinity;
        b.x = z.x;
        b.branch = z.branch;
        LogEnclosure log = z.exact
                               ? log_enclosure(model, *z.exact)
                               : log_enclosure(model, z.x.lower, z.x.upper, z.component, z.branch);
        b.component = log.component;
        b.t = normalised(log.t);
        for (std::size_t k : z.forms) {
            for (std::size_t i : users[k]) b.conditions.push_back(i);
        }
        std::sort(b.conditions.begin(), b.conditions.end());
        region.boundaries.push_back(std::move(b));
    }
    std::sort(region.boundaries.begin(), region.boundaries.end(),
              [](const BoundaryPoint& a, const BoundaryPoint& b) {
                  if (a.component != b.component) return a.component < b.component;
                  return midpoint_double(a.t) < midpoint_double(b.t);
              });
    // Gaps per component; boundaries must be certainly separated (else: more digits).
    for (int component = 0; component < model.components; ++component) {
        std::vector<std::size_t> on;
        for (std::size_t i = 0; i < region.boundaries.size(); ++i) {
            if (region.boundaries[i].component == component) on.push_back(i);
        }
        if (on.empty()) {
            Gap gap;
            gap.component = component;
            const TestPoint p = find_test_point(model, component, interval_with_bits(model.bits),
                                                interval_of(Rational(1), model.bits));
            for (const auto& c : target.conditions) gap.signs.push_back(sign_at(model, c.form, p));
            gap.inside = conditions_hold(target, gap.signs, {});
            region.gaps.push_back(gap);
            continue;
        }
        for (std::size_t j = 0; j < on.size(); ++j) {
            const BoundaryPoint& a = region.boundaries[on[j]];
            const BoundaryPoint& b = region.boundaries[on[(j + 1) % on.size()]];
            const Interval end = j + 1 == on.size() ? shifted_by(b.t, 1) : b.t;
            if (!certainly_less(a.t, end)) return std::nullopt;
            Gap gap;
            gap.component = component;
            gap.start = on[j];
            gap.end = on[(j + 1) % on.size()];
            const TestPoint p = find_test_point(model, component, a.t, end);
            for (const auto& c : target.conditions) gap.signs.push_back(sign_at(model, c.form, p));
            gap.inside = conditions_hold(target, gap.signs, {});
            region.gaps.push_back(gap);
        }
    }
    // A boundary point is a solution when no strict condition vanishes there and the others
    // hold (their signs there are those of the neighbouring gap, where they do not vanish).
    for (std::size_t i = 0; i < region.boundaries.size(); ++i) {
        BoundaryPoint& b = region.boundaries[i];
        bool strict_vanishes = false;
        for (std::size_t c : b.conditions) strict_vanishes |= target.conditions[c].strict;
        if (strict_vanishes) continue;
        for (const Gap& gap : region.gaps) {
            if (gap.start == i)
                b.satisfies_conditions = conditions_hold(target, gap.signs, b.conditions);
        }
    }
    for (const Gap& gap : region.gaps) {
        if (!gap.inside) continue;
        region.components_reached[gap.component] = true;
        Arc arc;
        arc.component = gap.component;
        if (!gap.start) {
            arc.whole_component = true;
            arc.start = interval_with_bits(model.bits);
            arc.end = interval_of(Rational(1), model.bits);
        } else {
            const BoundaryPoint& a = region.boundaries[*gap.start];
            const BoundaryPoint& b = region.boundaries[*gap.end];
            arc.start = a.t;
            arc.end = *gap.end <= *gap.start ? shifted_by(b.t, 1) : b.t;
            arc.start_included = a.satisfies_conditions;
            arc.end_included = b.satisfies_conditions;
        }
        region.arcs.push_back(arc);
    }
    return region;
}

}  // namespace

Region target_region(const family::Target& target, unsigned digits) {
    if (target.variables.empty() || target.conditions.empty()) {
        throw InputError("the target of family '" + target.family + "' has no conditions");
    }
    for (unsigned d = std::max(digits, 10u); d <= 4 * std::max(digits, 10u) + 400; d *= 2) {
        if (auto region = try_region(target, d)) return *region;
    }
    throw std::runtime_error("target_region: boundary points could not be separated");
}

Membership classify(const Region& region, int component, const Interval& t_raw) {
    const Interval t = normalised(t_raw);
    std::vector<std::size_t> on;
    for (std::size_t i = 0; i < region.boundaries.size(); ++i) {
        if (region.boundaries[i].component == component) on.push_back(i);
    }
    std::size_t gap_offset = 0;
    for (const Gap& g : region.gaps) {
        if (g.component < component) ++gap_offset;
    }
    if (on.empty()) {
        return region.gaps[gap_offset].inside ? Membership::inside : Membership::outside;
    }
    std::size_t below = 0;
    for (std::size_t i : on) {
        const Interval& b = region.boundaries[i].t;
        for (long k : {-1L, 0L, 1L}) {
            const Interval shifted = shifted_by(b, k);
            if (!certainly_less(shifted, t) && !certainly_less(t, shifted)) {
                return Membership::undecided;
            }
        }
        if (certainly_less(b, t)) ++below;
    }
    const std::size_t local = (below == 0 || below == on.size()) ? on.size() - 1 : below - 1;
    return region.gaps[gap_offset + local].inside ? Membership::inside : Membership::outside;
}

std::vector<std::string> describe_arcs(const Region& region, unsigned shown_digits) {
    std::vector<std::string> lines;
    for (const Arc& arc : region.arcs) {
        std::ostringstream line;
        line.precision(shown_digits);
        line << "component " << arc.component << ": ";
        if (arc.whole_component) {
            line << "the whole component";
        } else {
            line << "t in " << (arc.start_included ? "[" : "(") << midpoint_double(arc.start)
                 << ", " << midpoint_double(arc.end) << (arc.end_included ? "]" : ")");
        }
        lines.push_back(line.str());
    }
    return lines;
}

}  // namespace arcsieve::region
