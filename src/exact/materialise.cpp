#include "exact/materialise.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <optional>
#include <sstream>

#include "exact/fingerprint.hpp"
#include "exact/local_heights.hpp"

namespace arcsieve::exact {

namespace {

// In-place Jacobian doubling on y² = x³ + a2 x² + a4 x + a6 (x = X/Z², y = Y/Z³):
// M = 3X² + 2 a2 X Z² + a4 Z⁴, Z' = 2YZ, X' = M² − a2 Z'² − 8 X Y², Y' = M (4XY² − X') − 8Y⁴
// (Silverman AEC III.2.3 with λ = M / 2YZ). Temporaries are reused across the chain.
struct Workspace {
    Integer z2, z4, m, t, y2, s, u;
};

void double_in_place(const JacobianCurve& e, JacobianPoint& p, Workspace& w) {
    mpz_mul(w.z2.get_mpz_t(), p.Z.get_mpz_t(), p.Z.get_mpz_t());
    mpz_mul(w.z4.get_mpz_t(), w.z2.get_mpz_t(), w.z2.get_mpz_t());
    mpz_mul(w.m.get_mpz_t(), p.X.get_mpz_t(), p.X.get_mpz_t());
    mpz_mul_ui(w.m.get_mpz_t(), w.m.get_mpz_t(), 3);
    if (e.a2 != 0) {
        mpz_mul(w.t.get_mpz_t(), p.X.get_mpz_t(), w.z2.get_mpz_t());
        mpz_mul(w.t.get_mpz_t(), w.t.get_mpz_t(), e.a2.get_mpz_t());
        mpz_addmul_ui(w.m.get_mpz_t(), w.t.get_mpz_t(), 2);
    }
    if (e.a4 != 0) mpz_addmul(w.m.get_mpz_t(), w.z4.get_mpz_t(), e.a4.get_mpz_t());
    mpz_mul(w.y2.get_mpz_t(), p.Y.get_mpz_t(), p.Y.get_mpz_t());
    mpz_mul(w.s.get_mpz_t(), p.X.get_mpz_t(), w.y2.get_mpz_t());
    mpz_mul_2exp(w.s.get_mpz_t(), w.s.get_mpz_t(), 2);
    mpz_mul(p.Z.get_mpz_t(), p.Z.get_mpz_t(), p.Y.get_mpz_t());
    mpz_mul_2exp(p.Z.get_mpz_t(), p.Z.get_mpz_t(), 1);
    mpz_mul(p.X.get_mpz_t(), w.m.get_mpz_t(), w.m.get_mpz_t());
    mpz_submul_ui(p.X.get_mpz_t(), w.s.get_mpz_t(), 2);
    if (e.a2 != 0) {
        mpz_mul(w.u.get_mpz_t(), w.y2.get_mpz_t(), w.z2.get_mpz_t());
        mpz_mul_2exp(w.u.get_mpz_t(), w.u.get_mpz_t(), 2);
        mpz_submul(p.X.get_mpz_t(), w.u.get_mpz_t(), e.a2.get_mpz_t());
    }
    mpz_sub(w.s.get_mpz_t(), w.s.get_mpz_t(), p.X.get_mpz_t());
    mpz_mul(p.Y.get_mpz_t(), w.m.get_mpz_t(), w.s.get_mpz_t());
    mpz_mul(w.u.get_mpz_t(), w.y2.get_mpz_t(), w.y2.get_mpz_t());
    mpz_submul_ui(p.Y.get_mpz_t(), w.u.get_mpz_t(), 8);
}

// x-only projective point x = X / Z.
struct LinePoint {
    Integer X, Z;
};

struct LadderWorkspace {
    Integer t1, t2, t3, t4;
};

// x(2Q) = F1 / F2 (Silverman AEC III.2.3(d)): F1 = X⁴ − b4 X²Z² − 2 b6 X Z³ − b8 Z⁴,
// F2 = 4 Z (X³ + a2 X² Z + a4 X Z² + a6 Z³). With a6 = 0 (the ratio-sum curves)
// F1 = (X² − a4 Z²)² and F2 = 4 XZ (X² + a2 XZ + a4 Z²).
void line_double(const JacobianCurve& e, LinePoint& p, LadderWorkspace& w) {
    mpz_mul(w.t1.get_mpz_t(), p.X.get_mpz_t(), p.X.get_mpz_t());  // X²
    mpz_mul(w.t2.get_mpz_t(), p.Z.get_mpz_t(), p.Z.get_mpz_t());  // Z²
    mpz_mul(w.t3.get_mpz_t(), p.X.get_mpz_t(), p.Z.get_mpz_t());  // XZ
    if (e.a6 == 0) {
        // F2 = 4 XZ (X² + a2 XZ + a4 Z²)
        mpz_set(w.t4.get_mpz_t(), w.t1.get_mpz_t());
        mpz_addmul(w.t4.get_mpz_t(), w.t3.get_mpz_t(), e.a2.get_mpz_t());
        mpz_addmul(w.t4.get_mpz_t(), w.t2.get_mpz_t(), e.a4.get_mpz_t());
        mpz_mul(p.Z.get_mpz_t(), w.t3.get_mpz_t(), w.t4.get_mpz_t());
        mpz_mul_2exp(p.Z.get_mpz_t(), p.Z.get_mpz_t(), 2);
        // F1 = (X² − a4 Z²)²
        mpz_submul(w.t1.get_mpz_t(), w.t2.get_mpz_t(), e.a4.get_mpz_t());
        mpz_mul(p.X.get_mpz_t(), w.t1.get_mpz_t(), w.t1.get_mpz_t());
        return;
    }
    const Integer b4 = 2 * e.a4, b6 = 4 * e.a6, b8 = 4 * e.a2 * e.a6 - e.a4 * e.a4;
    // F2 = 4 (XZ·X² + a2 X² Z² + a4 XZ·Z² + a6 Z²·Z²)
    Integer x2z2 = w.t1 * w.t2, z4 = w.t2 * w.t2, xz3 = w.t3 * w.t2;
    Integer f2 = w.t3 * w.t1 + e.a2 * x2z2 + e.a4 * xz3 + e.a6 * z4;
    mpz_mul_2exp(p.Z.get_mpz_t(), f2.get_mpz_t(), 2);
    p.X = w.t1 * w.t1 - b4 * x2z2 - 2 * b6 * xz3 - b8 * z4;
}

// x(Q1 + Q2) from x(Q1), x(Q2) and x(Q1 − Q2) = x(P) = Xp / Zp:
// x₊ x₋ (x1 − x2)² = (x1 x2 − a4)² − 4 a6 (x1 + x2) − 4 a2 a6 (derived from AEC III.2.3 and
// checked in the tests), so X₊ = Zp·N, Z₊ = Xp·(X1 Z2 − X2 Z1)² with
// N = (X1X2 − a4 Z1Z2)² − 4 a6 Z1Z2 (X1Z2 + X2Z1) − 4 a2 a6 (Z1Z2)².
void line_add(const JacobianCurve& e, LinePoint& q1, const LinePoint& q2, const LinePoint& diff,
              LadderWorkspace& w) {
    mpz_mul(w.t1.get_mpz_t(), q1.X.get_mpz_t(), q2.X.get_mpz_t());  // X1X2
    mpz_mul(w.t2.get_mpz_t(), q1.Z.get_mpz_t(), q2.Z.get_mpz_t());  // Z1Z2
    // X1Z2 − X2Z1 = (X1 − Z1)(X2 + Z2) − X1X2 + Z1Z2 (three products instead of four)
    mpz_sub(w.t3.get_mpz_t(), q1.X.get_mpz_t(), q1.Z.get_mpz_t());
    mpz_add(w.t4.get_mpz_t(), q2.X.get_mpz_t(), q2.Z.get_mpz_t());
    mpz_mul(w.t3.get_mpz_t(), w.t3.get_mpz_t(), w.t4.get_mpz_t());
    mpz_sub(w.t3.get_mpz_t(), w.t3.get_mpz_t(), w.t1.get_mpz_t());
    mpz_add(w.t3.get_mpz_t(), w.t3.get_mpz_t(), w.t2.get_mpz_t());
    if (e.a6 != 0) {
        // X1Z2 + X2Z1 = (X1Z2 − X2Z1) + 2 X2Z1
        Integer cross_sum = w.t3 + 2 * (q2.X * q1.Z);
        Integer n = w.t1 - e.a4 * w.t2;
        n = n * n - 4 * e.a6 * w.t2 * cross_sum - 4 * e.a2 * e.a6 * w.t2 * w.t2;
        mpz_mul(q1.X.get_mpz_t(), n.get_mpz_t(), diff.Z.get_mpz_t());
    } else {
        mpz_submul(w.t1.get_mpz_t(), w.t2.get_mpz_t(), e.a4.get_mpz_t());
        mpz_mul(q1.X.get_mpz_t(), w.t1.get_mpz_t(), w.t1.get_mpz_t());
        if (diff.Z != 1) mpz_mul(q1.X.get_mpz_t(), q1.X.get_mpz_t(), diff.Z.get_mpz_t());
    }
    mpz_mul(q1.Z.get_mpz_t(), w.t3.get_mpz_t(), w.t3.get_mpz_t());
    mpz_mul(q1.Z.get_mpz_t(), q1.Z.get_mpz_t(), diff.X.get_mpz_t());
}

// Divides X and Z by their common factor at the given primes (cheap divisibility tests).
void strip_common_factor(LinePoint& p, const std::vector<Integer>& primes) {
    for (const Integer& prime : primes) {
        if (prime == 2) {
            const mp_bitcnt_t k =
                std::min(mpz_scan1(p.X.get_mpz_t(), 0), mpz_scan1(p.Z.get_mpz_t(), 0));
            if (p.X != 0 && p.Z != 0 && k > 0) {
                mpz_tdiv_q_2exp(p.X.get_mpz_t(), p.X.get_mpz_t(), k);
                mpz_tdiv_q_2exp(p.Z.get_mpz_t(), p.Z.get_mpz_t(), k);
            }
            continue;
        }
        while (p.X != 0 && p.Z != 0 && mpz_divisible_p(p.X.get_mpz_t(), prime.get_mpz_t()) &&
               mpz_divisible_p(p.Z.get_mpz_t(), prime.get_mpz_t())) {
            mpz_divexact(p.X.get_mpz_t(), p.X.get_mpz_t(), prime.get_mpz_t());
            mpz_divexact(p.Z.get_mpz_t(), p.Z.get_mpz_t(), prime.get_mpz_t());
        }
    }
}

// Montgomery's ladder on x only (Montgomery, Math. Comp. 48 (1987), for Weierstrass curves):
// keeps (kP, (k+1)P), one doubling and one differential addition per bit. Unlike chord
// additions, these formulas add common factors only at the primes of the duplication
// resultant and of x(P); they are stripped after every step. Returns x(nP).
LinePoint line_ladder(const JacobianCurve& e, const Point& p, const Integer& n,
                      const std::vector<Integer>& strip_primes) {
    const LinePoint base{Integer(p.x.get_num()), Integer(p.x.get_den())};
    LadderWorkspace w;
    LinePoint low = base, high = base;
    line_double(e, high, w);
    strip_common_factor(high, strip_primes);
    const long top = static_cast<long>(mpz_sizeinbase(n.get_mpz_t(), 2)) - 1;
    for (long bit = top - 1; bit >= 0; --bit) {
        const bool set = mpz_tstbit(n.get_mpz_t(), static_cast<mp_bitcnt_t>(bit));
        // The last step needs only the point that becomes nP.
        if (set) {
            line_add(e, low, high, base, w);
            strip_common_factor(low, strip_primes);
            if (bit > 0) {
                line_double(e, high, w);
                strip_common_factor(high, strip_primes);
            }
        } else {
            if (bit > 0) {
                line_add(e, high, low, base, w);
                strip_common_factor(high, strip_primes);
            }
            line_double(e, low, w);
            strip_common_factor(low, strip_primes);
        }
    }
    return low;
}

// Arithmetic on E over F_ℓ for one word-sized prime ℓ: the sign of y(nP + T) and a check of
// x(nP + T), independent of the ladder. Returns nullopt if the chain meets the point at
// infinity mod ℓ (then another ℓ is tried).
std::optional<std::pair<Integer, Integer>> multiple_mod(const JacobianCurve& e, const Point& p,
                                                        const Integer& n, const Point& t,
                                                        const Integer& ell) {
    auto reduce = [&](const Rational& q) -> std::optional<Integer> {
        Integer den(q.get_den()), inverse;
        if (mpz_invert(inverse.get_mpz_t(), den.get_mpz_t(), ell.get_mpz_t()) == 0)
            return std::nullopt;
        Integer r = Integer(q.get_num()) * inverse;
        mpz_mod(r.get_mpz_t(), r.get_mpz_t(), ell.get_mpz_t());
        return r;
    };
    auto px = reduce(p.x), py = reduce(p.y);
    if (!px || !py) return std::nullopt;
    struct Affine {
        Integer x, y;
        bool infinity = false;
    };
    auto modded = [&](Integer v) {
        mpz_mod(v.get_mpz_t(), v.get_mpz_t(), ell.get_mpz_t());
        return v;
    };
    auto inverse_of = [&](const Integer& v) -> std::optional<Integer> {
        Integer r;
        if (mpz_invert(r.get_mpz_t(), v.get_mpz_t(), ell.get_mpz_t()) == 0) return std::nullopt;
        return r;
    };
    auto add_points = [&](const Affine& a, const Affine& b) -> std::optional<Affine> {
        if (a.infinity) return b;
        if (b.infinity) return a;
        Integer lambda;
        if (a.x == b.x) {
            if (modded(a.y + b.y) == 0) return Affine{Integer(0), Integer(0), true};
            auto inv = inverse_of(modded(2 * a.y));
            if (!inv) return std::nullopt;
            lambda = modded((3 * a.x * a.x + 2 * e.a2 * a.x + e.a4) * *inv);
        } else {
            auto inv = inverse_of(modded(b.x - a.x));
            if (!inv) return std::nullopt;
            lambda = modded((b.y - a.y) * *inv);
        }
        const Integer x3 = modded(lambda * lambda - e.a2 - a.x - b.x);
        return Affine{x3, modded(lambda * (a.x - x3) - a.y), false};
    };
    const Affine base{*px, *py, false};
    Affine result = base;
    const long top = static_cast<long>(mpz_sizeinbase(n.get_mpz_t(), 2)) - 1;
    for (long bit = top - 1; bit >= 0; --bit) {
        auto d = add_points(result, result);
        if (!d) return std::nullopt;
        result = *d;
        if (mpz_tstbit(n.get_mpz_t(), static_cast<mp_bitcnt_t>(bit))) {
            auto s = add_points(result, base);
            if (!s) return std::nullopt;
            result = *s;
        }
    }
    if (!t.at_infinity) {
        auto tx = reduce(t.x), ty = reduce(t.y);
        if (!tx || !ty) return std::nullopt;
        auto s = add_points(result, Affine{*tx, *ty, false});
        if (!s) return std::nullopt;
        result = *s;
    }
    if (result.infinity) return std::nullopt;
    return std::make_pair(result.x, result.y);
}

std::optional<int> torsion_order_small(const Curve& e, const Point& t) {
    Point q = t;
    for (int k = 1; k <= 12; ++k) {
        if (q.at_infinity) return k;
        q = add(e, q, t);
    }
    return std::nullopt;
}

std::vector<Integer> prime_support(const Integer& value) {
    if (value == 0) return {};
    return prime_divisors(abs(value));
}

// From x = X / Z in lowest terms (Z = W² on an integral model) to (X, Y, W): Y² = W⁶ f(x) by
// an exact square root, its sign from the independent chain mod ℓ, which also checks X.
ReducedPoint complete_point(const JacobianCurve& e, LinePoint line, const Point& p,
                            const Integer& n, const Point& t) {
    if (line.Z < 0) {
        line.Z = -line.Z;
        line.X = -line.X;
    }
    Integer g;
    ReducedPoint r;
    Integer remainder;
    mpz_sqrtrem(r.W.get_mpz_t(), remainder.get_mpz_t(), line.Z.get_mpz_t());
    if (remainder != 0) throw std::runtime_error("ladder denominator is not a square");
    r.X = std::move(line.X);
    // Y² = X³ + a2 X² W² + a4 X W⁴ + a6 W⁶
    const Integer& z = line.Z;
    Integer y2 = r.X * r.X;
    Integer inner = r.X + e.a2 * z;
    y2 *= inner;
    if (e.a4 != 0) y2 += e.a4 * (r.X * (z * z));
    if (e.a6 != 0) y2 += e.a6 * (z * z * z);
    mpz_sqrtrem(r.Y.get_mpz_t(), remainder.get_mpz_t(), y2.get_mpz_t());
    if (remainder != 0) throw std::runtime_error("materialised point is not on the curve (bug)");
    if (r.Y == 0) return r;
    Integer ell;
    mpz_ui_pow_ui(ell.get_mpz_t(), 2, 62);
    for (int attempt = 0; attempt < 64; ++attempt) {
        mpz_nextprime(ell.get_mpz_t(), ell.get_mpz_t());
        const auto local = multiple_mod(e, p, n, t, ell);
        if (!local) continue;
        Integer w_mod = r.W, x_mod = r.X, y_mod = r.Y;
        for (Integer* v : {&w_mod, &x_mod, &y_mod})
            mpz_mod(v->get_mpz_t(), v->get_mpz_t(), ell.get_mpz_t());
        if (w_mod == 0 || y_mod == 0) continue;
        Integer w2 = w_mod * w_mod % ell, w3 = w2 * w_mod % ell;
        if ((local->first * w2 - x_mod) % ell != 0) {
            throw std::runtime_error("materialised x disagrees with the chain mod a prime (bug)");
        }
        Integer expected = local->second * w3 % ell;
        if (expected == y_mod) return r;
        if ((expected + y_mod) % ell == 0) {
            r.Y = -r.Y;
            return r;
        }
        throw std::runtime_error("materialised y disagrees with the chain mod a prime (bug)");
    }
    throw std::runtime_error("could not fix the sign of y (no usable prime)");
}

}  // namespace

JacobianPoint jacobian_chain(const JacobianCurve& e, const Point& p, const Integer& n) {
    if (n < 1) throw std::invalid_argument("jacobian_chain needs n >= 1");
    const JacobianPoint base = to_jacobian(p);
    JacobianPoint result = base;
    Workspace w;
    const long top = static_cast<long>(mpz_sizeinbase(n.get_mpz_t(), 2)) - 1;
    for (long bit = top - 1; bit >= 0; --bit) {
        if (result.is_infinity() || result.Y == 0) {
            result = JacobianPoint{Integer(1), Integer(1), Integer(0)};
        } else {
            double_in_place(e, result, w);
        }
        if (mpz_tstbit(n.get_mpz_t(), static_cast<mp_bitcnt_t>(bit))) {
            result = jacobian_add(e, result, base);
        }
    }
    return result;
}

ReducedPoint materialise_point(const JacobianCurve& e, const Multiple& q,
                               const std::vector<Integer>& extraneous_primes, bool check_reduced) {
    if (q.generator.at_infinity) throw InputError("the generator must be a finite point");
    if (q.index < 1) throw InputError("the multiple's index must be at least 1");
    const Curve curve{Rational(0), Rational(e.a2), Rational(0), Rational(e.a4), Rational(e.a6)};
    // Fold the translate into the base point when the index allows: n(P + T') = nP + T for
    // T' = (n⁻¹ mod m)·T, m the order of T. With a6 = 0 the 2-torsion point (0, 0) acts by
    // x ↦ a4 / x, which is also cheap. Anything else is added at the end with one full gcd.
    Point base = q.generator;
    Point rest = q.translate;
    bool translate_by_origin = false;
    if (!rest.at_infinity) {
        const auto order = torsion_order_small(curve, rest);
        if (!order) throw InputError("the translate is not a torsion point");
        auto fold = [&](const Point& t, int m) {
            Integer inverse, modulus(m), index_mod = q.index % m;
            if (mpz_invert(inverse.get_mpz_t(), index_mod.get_mpz_t(), modulus.get_mpz_t()) == 0) {
                return false;
            }
            base = add(curve, base, multiply(curve, t, inverse));
            return true;
        };
        if (fold(rest, *order)) {
            rest = Point::infinity();
        } else if (e.a6 == 0) {
            const Point origin{Rational(0), Rational(0), false};
            const Point other = subtract(curve, rest, origin);
            const auto other_order = torsion_order_small(curve, other);
            if (other.at_infinity || (other_order && fold(other, *other_order))) {
                rest = Point::infinity();
                translate_by_origin = true;
            }
        }
    }
    if (base.at_infinity)
        throw InputError("the generator plus the translate is the point at infinity");
    std::vector<Integer> strip = extraneous_primes;
    for (const Integer& v : {Integer(base.x.get_num()), Integer(base.x.get_den())}) {
        for (const Integer& p : prime_support(v)) strip.push_back(p);
    }
    if (translate_by_origin) {
        for (const Integer& p : prime_support(e.a4)) strip.push_back(p);
    }
    std::sort(strip.begin(), strip.end());
    strip.erase(std::unique(strip.begin(), strip.end()), strip.end());
    LinePoint line = line_ladder(e, base, q.index, strip);
    if (translate_by_origin) {
        // x(Q + (0, 0)) = a4 / x(Q) on y² = x (x² + a2 x + a4).
        std::swap(line.X, line.Z);
        line.X *= e.a4;
        strip_common_factor(line, strip);
    }
    if (line.Z == 0) throw InputError("n·P + T is the point at infinity");
    ReducedPoint r;
    if (rest.at_infinity) {
        r = complete_point(
            e, std::move(line), base, q.index,
            translate_by_origin ? Point{Rational(0), Rational(0), false} : Point::infinity());
    } else {
        // General translate: chord addition in Jacobian coordinates, then one full gcd.
        const ReducedPoint s = complete_point(e, std::move(line), base, q.index, Point::infinity());
        JacobianPoint sum = jacobian_add(e, JacobianPoint{s.X, s.Y, s.W}, to_jacobian(rest));
        if (sum.is_infinity()) throw InputError("n·P + T is the point at infinity");
        Integer z2 = sum.Z * sum.Z, g;
        mpz_gcd(g.get_mpz_t(), sum.X.get_mpz_t(), z2.get_mpz_t());
        LinePoint reduced{sum.X / g, z2 / g};
        r = complete_point(e, std::move(reduced), q.generator, q.index, q.translate);
    }
    if (check_reduced) {
        Integer g;
        mpz_gcd(g.get_mpz_t(), r.X.get_mpz_t(), r.W.get_mpz_t());
        if (g != 1) {
            throw std::runtime_error(
                "materialised point not in lowest terms: gcd " +
                (mpz_sizeinbase(g.get_mpz_t(), 10) < 60 ? to_string(g) : std::string("(large)")));
        }
    }
    return r;
}

SizeEstimate estimate_ratio_sum_size(const Integer& N, const Multiple& q) {
    const std::vector<Integer> primes = ratio_sum_correction_primes(N);
    const JacobianCurve e = jacobian_curve(family::ratio_sum_curve(N));
    const Enclosure h = canonical_height_enclosure(e, q.generator, primes, 64);
    const double index = q.index.get_d();
    // log10 |a| ≈ 3 log10 W ≈ (3/2) n² ĥ(P) / ln 10.
    SizeEstimate s;
    s.digits = 1.5 * index * index * h.upper_double() / std::log(10.0) + 1;
    const double bytes_per_digit = std::log2(10.0) / 8;
    // The last doubling holds X, Y, Z, M, Y², Y⁴ and S at once: about 13 numbers of the
    // solution's size; the check and the decimal conversion need about as much again.
    s.memory_bytes = 14 * s.digits * bytes_per_digit + s.digits;
    s.disk_bytes = 3 * (s.digits + 1);
    return s;
}

namespace {

std::string human_bytes(double bytes) {
    const char* units[] = {"B", "kB", "MB", "GB", "TB", "PB", "EB"};
    int u = 0;
    while (bytes >= 1000 && u < 6) {
        bytes /= 1000;
        ++u;
    }
    std::ostringstream out;
    out.precision(3);
    out << bytes << " " << units[u];
    return out.str();
}

std::string human_count(double digits) {
    std::ostringstream out;
    out.precision(3);
    out << digits;
    return out.str();
}

}  // namespace

std::string size_limit_message(const SizeEstimate& estimate, double max_digits) {
    return "the solution would have about " + human_count(estimate.digits) +
           " digits per number, above the limit of " + human_count(max_digits) +
           "; writing it needs about " + human_bytes(estimate.memory_bytes) + " of memory and " +
           human_bytes(estimate.disk_bytes) + " of disk (raise the limit with " +
           max_digits_option + ")";
}

bool satisfies_ratio_sum_fast(const Integer& N, const family::Triple& t) {
    if (t.a + t.b == 0 || t.b + t.c == 0 || t.c + t.a == 0) return false;
    const Integer s = t.a + t.b + t.c;
    const Integer ab = t.a * t.b;
    const Integer p2 = ab + t.c * (t.a + t.b);
    const Integer p3 = ab * t.c;
    const Integer lhs = s * s * s;
    const Integer rhs = (N + 2) * (s * p2) - (N + 3) * p3;
    return lhs == rhs;
}

MaterialisedSolution materialise_ratio_sum(const Integer& N, const Multiple& q,
                                           const MaterialiseOptions& options) {
    family::check_ratio_sum_parameter(N);
    const Curve curve = family::ratio_sum_curve(N);
    if (!on_curve(curve, q.generator) || !on_curve(curve, q.translate)) {
        throw InputError("the generator and the translate must lie on E_N for N = " + to_string(N));
    }
    if (q.index < 1) throw InputError("the multiple's index must be at least 1");
    if (q.generator.at_infinity || torsion_order_small(curve, q.generator)) {
        throw InputError("the generator " + to_string(q.generator) + " is a torsion point");
    }
    MaterialisedSolution out;
    out.estimate = estimate_ratio_sum_size(N, q);
    if (out.estimate.digits > options.max_digits) {
        throw SizeLimitExceeded(size_limit_message(out.estimate, options.max_digits));
    }
    const JacobianCurve e = jacobian_curve(curve);
    const std::vector<Integer> primes = ratio_sum_correction_primes(N);
    const ReducedPoint r = materialise_point(e, q, primes, options.check_coprime);
    // (a : b : c) = (8(N+3) W³ − X W + Y : 8(N+3) W³ − X W − Y : −8(N+3) W³ − 2(N+2) X W),
    // the map of family/ratio_sum.hpp with x = X/W², y = Y/W³.
    Integer w3 = r.W * r.W;
    w3 *= r.W;
    w3 *= 8 * (N + 3);
    Integer xw = r.X * r.W;
    family::Triple t{w3 - xw + r.Y, w3 - xw - r.Y, Integer(-w3 - 2 * (N + 2) * xw)};
    w3 = 0;
    xw = 0;
    // The common factor can only involve primes of 2(N+3)(2N+5) (DESIGN.md §2); remove it
    // prime by prime without a full gcd.
    for (const Integer& p : primes) {
        long v = -1;
        for (const Integer* value : {&t.a, &t.b, &t.c}) {
            if (*value == 0) continue;
            long k = 0;
            Integer power = p;
            // The exponents the map produces are small: test p, p², p³, ...
            while (mpz_divisible_p(value->get_mpz_t(), power.get_mpz_t())) {
                ++k;
                power *= p;
            }
            v = v < 0 ? k : std::min(v, k);
        }
        if (v > 0) {
            Integer power;
            mpz_pow_ui(power.get_mpz_t(), p.get_mpz_t(), static_cast<unsigned long>(v));
            for (Integer* value : {&t.a, &t.b, &t.c}) {
                mpz_divexact(value->get_mpz_t(), value->get_mpz_t(), power.get_mpz_t());
            }
            out.gcd.push_back(PrimePower{p, static_cast<int>(v)});
        }
    }
    if (t.a + t.b + t.c < 0) {
        t.a = -t.a;
        t.b = -t.b;
        t.c = -t.c;
    }
    if (t.a + t.b == 0 || t.b + t.c == 0 || t.c + t.a == 0) {
        throw InputError("n·P + T maps to a triple with a vanishing denominator (degenerate)");
    }
    if (options.check_coprime) {
        Integer g;
        mpz_gcd(g.get_mpz_t(), t.a.get_mpz_t(), t.b.get_mpz_t());
        mpz_gcd(g.get_mpz_t(), g.get_mpz_t(), t.c.get_mpz_t());
        if (g != 1) throw std::runtime_error("triple not coprime after removing the known primes");
    }
    out.positive = t.a > 0 && t.b > 0 && t.c > 0;
    out.verified = satisfies_ratio_sum_fast(N, t);
    if (!out.verified) throw std::runtime_error("materialised triple fails the equation (bug)");
    out.digits = {decimal_digits(t.a), decimal_digits(t.b), decimal_digits(t.c)};
    out.triple = std::move(t);
    return out;
}

std::vector<std::string> write_solution(const family::Triple& t, const std::string& path,
                                        bool one_file_per_variable) {
    std::vector<std::string> written;
    auto write = [&](const std::string& name, std::initializer_list<const Integer*> values) {
        std::FILE* file = std::fopen(name.c_str(), "w");
        if (file == nullptr) throw InputError("cannot open '" + name + "' for writing");
        for (const Integer* v : values) {
            if (mpz_out_str(file, 10, v->get_mpz_t()) == 0 || std::fputc('\n', file) == EOF) {
                std::fclose(file);
                throw InputError("writing '" + name + "' failed (disk full?)");
            }
        }
        if (std::fclose(file) != 0) throw InputError("closing '" + name + "' failed");
        written.push_back(name);
    };
    if (one_file_per_variable) {
        write(path + ".a", {&t.a});
        write(path + ".b", {&t.b});
        write(path + ".c", {&t.c});
    } else {
        write(path, {&t.a, &t.b, &t.c});
    }
    return written;
}

std::string short_form(const Integer& value, unsigned edge) {
    const std::size_t digits = decimal_digits(value);
    const std::string sign = value < 0 ? "-" : "";
    if (digits <= 2 * edge + 3) return to_string(value);
    Integer power, head, tail;
    mpz_ui_pow_ui(power.get_mpz_t(), 10, digits - edge);
    mpz_tdiv_q(head.get_mpz_t(), value.get_mpz_t(), power.get_mpz_t());
    mpz_ui_pow_ui(power.get_mpz_t(), 10, edge);
    mpz_tdiv_r(tail.get_mpz_t(), value.get_mpz_t(), power.get_mpz_t());
    std::string tail_text = to_string(Integer(abs(tail)));
    tail_text.insert(0, edge - tail_text.size(), '0');
    return sign + to_string(Integer(abs(head))) + "…" + tail_text + " (" + std::to_string(digits) +
           " digits)";
}

}  // namespace arcsieve::exact
