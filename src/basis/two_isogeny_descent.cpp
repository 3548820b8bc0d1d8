#include "basis/two_isogeny_descent.hpp"

#include <algorithm>
#include <array>
#include <stdexcept>

#include "arith/factor.hpp"
#include "basis/square_sieve.hpp"

namespace arcsieve::basis {

namespace {

Integer cubic_value(const Integer& a2, const Integer& a4, const Integer& a6, const Integer& x) {
    return ((x + a2) * x + a4) * x + a6;
}

// Integer roots of the monic x^3 + a2 x^2 + a4 x + a6 (rational roots of a monic integer
// polynomial are integers; |root| <= 1 + max |a_i|, Cauchy). The cubic is monotone between its
// critical points: short windows around their integer approximations are scanned, the monotone
// stretches between them are bisected exactly.
std::vector<Integer> integer_roots_of_cubic(const Integer& a2, const Integer& a4,
                                            const Integer& a6) {
    const Integer bound = 1 + std::max({Integer(abs(a2)), Integer(abs(a4)), Integer(abs(a6))});
    std::vector<Integer> roots;
    auto add_root = [&](const Integer& r) {
        if (std::find(roots.begin(), roots.end(), r) == roots.end()) roots.push_back(r);
    };
    auto bisect = [&](Integer lo, Integer hi) {
        if (lo > hi) return;
        Integer f_lo = cubic_value(a2, a4, a6, lo);
        const Integer f_hi = cubic_value(a2, a4, a6, hi);
        if (f_lo == 0) add_root(lo);
        if (f_hi == 0) add_root(hi);
        if (sgn(f_lo) * sgn(f_hi) >= 0) return;
        while (hi - lo > 1) {
            const Integer mid = (lo + hi) / 2;
            const Integer f_mid = cubic_value(a2, a4, a6, mid);
            if (f_mid == 0) {
                add_root(mid);
                return;
            }
            if (sgn(f_mid) == sgn(f_lo)) {
                lo = mid;
                f_lo = f_mid;
            } else {
                hi = mid;
            }
        }
    };
    auto scan = [&](const Integer& lo, const Integer& hi) {
        for (Integer x = lo; x <= hi; ++x) {
            if (cubic_value(a2, a4, a6, x) == 0) add_root(x);
        }
    };
    const Integer disc = a2 * a2 - 3 * a4;  // critical points (−a2 ± sqrt(disc)) / 3
    if (disc < 0) {
        bisect(-bound, bound);
    } else {
        Integer s;
        mpz_sqrt(s.get_mpz_t(), disc.get_mpz_t());
        Integer c1, c2;
        mpz_fdiv_q_ui(c1.get_mpz_t(), Integer(-a2 - s).get_mpz_t(), 3);
        mpz_fdiv_q_ui(c2.get_mpz_t(), Integer(-a2 + s).get_mpz_t(), 3);
        if (c2 - c1 <= 8) {
            bisect(-bound, c1 - 4);
            scan(c1 - 4, c2 + 4);
            bisect(c2 + 4, bound);
        } else {
            bisect(-bound, c1 - 4);
            scan(c1 - 4, c1 + 4);
            bisect(c1 + 4, c2 - 4);
            scan(c2 - 4, c2 + 4);
            bisect(c2 + 4, bound);
        }
    }
    std::sort(roots.begin(), roots.end());
    return roots;
}

Integer lcm_of_denominators(const Curve& e) {
    Integer l = 1;
    for (const Rational* a : {&e.a1, &e.a2, &e.a3, &e.a4, &e.a6}) {
        mpz_lcm(l.get_mpz_t(), l.get_mpz_t(), a->get_den_mpz_t());
    }
    return l;
}

Integer as_integer(const Rational& q) {
    if (q.get_den() != 1) throw std::logic_error("expected an integral coefficient");
    return q.get_num();
}

// Taylor coefficients g_i(x0) of a polynomial with coefficients c[0..d] (repeated synthetic
// division, common practice).
std::vector<Integer> taylor_at(const std::vector<Integer>& c, const Integer& x0) {
    std::vector<Integer> t = c;
    const int d = static_cast<int>(c.size()) - 1;
    for (int i = 0; i < d; ++i) {
        for (int j = d - 1; j >= i; --j) t[j] += x0 * t[j + 1];
    }
    return t;
}

int valuation_or_max(const Integer& n, const Integer& p) {
    return n == 0 ? 1 << 20 : valuation(n, p);
}

bool is_square_unit(const Integer& unit, const Integer& p) {
    if (p == 2) return mpz_fdiv_ui(unit.get_mpz_t(), 8) == 1;
    return mpz_legendre(unit.get_mpz_t(), p.get_mpz_t()) == 1;
}

// Is there x in x0 + p^k Z_p with g(x) a square in Q_p (zero included)? The classical lifting
// argument (Cremona, Algorithms §3.6; Merriman, Siksek and Smart, Acta Arith. 77 (1996)):
// if the valuation of g(x0) is below that of every other Taylor term, the square class of g is
// constant on the disc and decided by g(x0); a Hensel root makes it soluble; otherwise split
// the disc into p smaller ones.
bool soluble_on_disc(const std::vector<Integer>& g, const Integer& x0, int k, const Integer& p,
                     int depth) {
    if (depth > 64) return true;  // undecided: soluble (keeps the Selmer bound an upper bound)
    const auto t = taylor_at(g, x0);
    if (t[0] == 0) return true;
    const int v = valuation(t[0], p);
    if (t[1] != 0 && v > 2 * valuation(t[1], p)) return true;  // Hensel: a p-adic root of g
    int m = 1 << 20;
    for (std::size_t i = 1; i < t.size(); ++i) {
        m = std::min(m, valuation_or_max(t[i], p) + static_cast<int>(i) * k);
    }
    if (v < m) {
        Integer unit = t[0];
        for (int i = 0; i < v; ++i) unit /= p;
        const int margin = m - v;
        if (p != 2 || margin >= 3) return v % 2 == 0 && is_square_unit(unit, p);
        if (v % 2 == 1 && margin >= 1) return false;
        if (margin == 2 && mpz_fdiv_ui(unit.get_mpz_t(), 4) == 3) return false;
    }
    Integer step;
    mpz_pow_ui(step.get_mpz_t(), p.get_mpz_t(), static_cast<unsigned long>(k));
    for (Integer r = 0; r < p; ++r) {
        if (soluble_on_disc(g, x0 + r * step, k + 1, p, depth + 1)) return true;
    }
    return false;
}

std::vector<int> exponent_vector(const Integer& n, const std::vector<Integer>& basis_primes) {
    std::vector<int> bits(basis_primes.size(), 0);
    bits[0] = n < 0 ? 1 : 0;
    for (std::size_t i = 1; i < basis_primes.size(); ++i) {
        bits[i] = mpz_divisible_p(n.get_mpz_t(), basis_primes[i].get_mpz_t()) ? 1 : 0;
    }
    return bits;
}

// Rank over F_2 of squarefree integers given by their exponent vectors.
int f2_rank(std::vector<std::vector<int>> rows) {
    int rank = 0;
    const std::size_t columns = rows.empty() ? 0 : rows[0].size();
    for (std::size_t c = 0; c < columns; ++c) {
        std::size_t pivot = static_cast<std::size_t>(rank);
        while (pivot < rows.size() && rows[pivot][c] == 0) ++pivot;
        if (pivot == rows.size()) continue;
        std::swap(rows[pivot], rows[static_cast<std::size_t>(rank)]);
        for (std::size_t r = 0; r < rows.size(); ++r) {
            if (r != static_cast<std::size_t>(rank) && rows[r][c] == 1) {
                for (std::size_t j = 0; j < columns; ++j)
                    rows[r][j] ^= rows[static_cast<std::size_t>(rank)][j];
            }
        }
        ++rank;
    }
    return rank;
}

bool in_span(const std::vector<Integer>& group, const Integer& b,
             const std::vector<Integer>& basis_primes) {
    std::vector<std::vector<int>> rows;
    for (const Integer& g : group) rows.push_back(exponent_vector(g, basis_primes));
    const int before = f2_rank(rows);
    rows.push_back(exponent_vector(b, basis_primes));
    return f2_rank(rows) == before;
}

Integer image_in_basis(const Rational& x, const std::vector<Integer>& basis_primes) {
    // x mod squares; for points of the descent the class lies in the span of basis_primes.
    Integer n = x.get_num() * x.get_den();
    Integer result = sgn(n) < 0 ? -1 : 1;
    n = abs(n);
    for (std::size_t i = 1; i < basis_primes.size(); ++i) {
        int v = 0;
        while (mpz_divisible_p(n.get_mpz_t(), basis_primes[i].get_mpz_t())) {
            n /= basis_primes[i];
            ++v;
        }
        if (v % 2 == 1) result *= basis_primes[i];
    }
    if (!mpz_perfect_square_p(n.get_mpz_t())) {
        throw std::logic_error("descent image outside the span of the primes dividing B");
    }
    return result;
}

IsogenySide run_side(const Integer& A, const Integer& B, const std::vector<Integer>& bad_primes,
                     const DescentOptions& options) {
    IsogenySide side;
    side.A = A;
    side.B = B;
    side.basis_primes.push_back(-1);
    for (const Integer& p : prime_divisors(B)) side.basis_primes.push_back(p);
    const std::size_t k = side.basis_primes.size();
    if (k > 20) throw InputError("2-isogeny descent: B has too many prime factors");
    // Every squarefree divisor of B (with sign): 2^k candidates.
    for (std::uint64_t mask = 0; mask < (std::uint64_t{1} << k); ++mask) {
        Integer b1 = 1;
        for (std::size_t i = 0; i < k; ++i) {
            if (mask >> i & 1) b1 *= side.basis_primes[i];
        }
        const Integer b2 = B / b1;
        bool soluble = quartic_soluble_over_reals(b1, A, b2);
        for (std::size_t i = 0; soluble && i < bad_primes.size(); ++i) {
            soluble = quartic_soluble_at(b1, A, b2, bad_primes[i]);
        }
        if (soluble) side.selmer.push_back(b1);
    }
    side.found_images = {Integer(1), squarefree_part(B)};
    // Search each soluble quartic not yet explained by the images found so far.
    for (const Integer& b1 : side.selmer) {
        if (in_span(side.found_images, b1, side.basis_primes)) continue;
        const Integer b2 = B / b1;
        BinaryForm form{{b2, Integer(0), A, Integer(0), b1}};
        std::vector<OuterValue> outer;
        for (std::int64_t v = 1; v <= options.quartic_bound; ++v) outer.push_back({v, v});
        auto hits = square_values(form, outer, 0, options.quartic_bound, options.threads);
        std::sort(hits.begin(), hits.end(), [](const SquareValue& a, const SquareValue& b) {
            return std::max(a.u, a.t) < std::max(b.u, b.t);
        });
        for (const auto& hit : hits) {
            if (hit.u == 0) continue;  // the point (0, 0) or nothing new
            // Silverman–Tate III.6: x = b1 u^2/v^2, y = b1 u w/v^3.
            const Integer u(static_cast<long>(hit.u)), v(static_cast<long>(hit.t));
            Point p{Rational(b1 * u * u, v * v), Rational(b1 * u * hit.root, v * v * v), false};
            p.x.canonicalize();
            p.y.canonicalize();
            side.points.push_back(p);
            side.found_images.push_back(b1);
            break;
        }
    }
    std::vector<std::vector<int>> rows;
    for (const Integer& b : side.selmer) rows.push_back(exponent_vector(b, side.basis_primes));
    side.selmer_dimension = f2_rank(rows);
    rows.clear();
    for (const Integer& b : side.found_images)
        rows.push_back(exponent_vector(b, side.basis_primes));
    side.found_dimension = f2_rank(rows);
    return side;
}

}  // namespace

Integer squarefree_part(const Integer& n) {
    if (n == 0) throw std::domain_error("squarefree_part(0)");
    Integer result = sgn(n) < 0 ? -1 : 1;
    for (const auto& pp : factor(n)) {
        if (pp.exponent % 2 == 1) result *= pp.prime;
    }
    return result;
}

std::optional<TwoTorsionModel> two_torsion_model(const Curve& curve) {
    // Scale to an integral model (x = x'/d^2), then remove a1, a3 (point.hpp), then move an
    // integer root of the cubic to 0.
    const Integer d = lcm_of_denominators(curve);
    ModelChange to_integral;
    to_integral.u = Rational(1, d);
    to_integral.u.canonicalize();
    const Curve integral = apply(curve, to_integral);
    const ModelChange to_short = a1_a3_free_change(integral);
    const Curve short_form = apply(integral, to_short);
    const Integer a2 = as_integer(short_form.a2), a4 = as_integer(short_form.a4),
                  a6 = as_integer(short_form.a6);
    const auto roots = integer_roots_of_cubic(a2, a4, a6);
    if (roots.empty()) return std::nullopt;
    const Integer r = roots.front();
    ModelChange shift;
    shift.r = r;
    TwoTorsionModel model;
    model.change = compose(compose(to_integral, to_short), shift);
    model.curve = apply(curve, model.change);
    model.A = as_integer(model.curve.a2);
    model.B = as_integer(model.curve.a4);
    if (model.curve.a1 != 0 || model.curve.a3 != 0 || model.curve.a6 != 0) {
        throw std::logic_error("two_torsion_model: shifted model is not [0,A,0,B,0]");
    }
    return model;
}

bool quartic_soluble_over_reals(const Integer& c4, const Integer& c2, const Integer& c0) {
    if (c4 > 0 || c0 > 0) return true;
    // Both ends negative: need c4 s^2 + c2 s + c0 >= 0 for some s = u^2/v^2 > 0.
    return c2 > 0 && c2 * c2 - 4 * c4 * c0 >= 0;
}

bool quartic_soluble_at(const Integer& c4, const Integer& c2, const Integer& c0,
                        const Integer& prime) {
    // Points (u : v) with v a unit: x = u/v in Z_p on g(x) = c4 x^4 + c2 x^2 + c0; the rest
    // have v in pZ_p: y = v/u in pZ_p on the reversed polynomial.
    const std::vector<Integer> g{c0, 0, c2, 0, c4}, reversed{c4, 0, c2, 0, c0};
    return soluble_on_disc(g, 0, 0, prime, 0) || soluble_on_disc(reversed, 0, 1, prime, 0);
}

Integer descent_image(const Integer& A, const Integer& B, const Point& p) {
    (void)A;
    if (p.at_infinity) return 1;
    if (p.x == 0) return squarefree_part(B);
    std::vector<Integer> basis_primes{-1};
    for (const Integer& q : prime_divisors(B)) basis_primes.push_back(q);
    return image_in_basis(p.x, basis_primes);
}

Point dual_isogeny_image(const Integer& A_isogenous, const Integer& B_isogenous, const Point& p) {
    (void)A_isogenous;
    if (p.at_infinity || p.x == 0) return Point::infinity();
    const Rational x2 = p.x * p.x;
    Point image{p.y * p.y / (4 * x2), p.y * (x2 - Rational(B_isogenous)) / (8 * x2), false};
    return image;
}

DescentResult two_isogeny_descent(const Curve& curve, const TwoTorsionModel& model,
                                  const DescentOptions& options) {
    const Integer& A = model.A;
    const Integer& B = model.B;
    const Integer A_isogenous = -2 * A, B_isogenous = A * A - 4 * B;
    // Local conditions only at ∞ and the primes dividing 2 B (A^2 − 4B): elsewhere every
    // quartic of the descent is soluble (Silverman–Tate III.6; Cremona §3.6).
    std::vector<Integer> bad_primes = prime_divisors(2 * B * B_isogenous);
    DescentResult result;
    result.model = model;
    result.curve_side = run_side(A, B, bad_primes, options);
    result.isogenous_side = run_side(A_isogenous, B_isogenous, bad_primes, options);
    result.rank_lower =
        result.curve_side.found_dimension + result.isogenous_side.found_dimension - 2;
    result.rank_upper =
        result.curve_side.selmer_dimension + result.isogenous_side.selmer_dimension - 2;
    for (const Point& p : result.curve_side.points) {
        result.points_on_input.push_back(to_old_model(model.change, p));
    }
    for (const Point& p : result.isogenous_side.points) {
        const Point image = dual_isogeny_image(A_isogenous, B_isogenous, p);
        if (!image.at_infinity) result.points_on_input.push_back(to_old_model(model.change, image));
    }
    for (const Point& p : result.points_on_input) {
        if (!on_curve(curve, p)) throw std::logic_error("descent produced a point off the curve");
    }
    return result;
}

}  // namespace arcsieve::basis
