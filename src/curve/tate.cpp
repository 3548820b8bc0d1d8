#include "curve/tate.hpp"

#include <stdexcept>

#include "arith/factor.hpp"

namespace arcsieve {
namespace {

Integer as_integer(const Rational& q) {
    if (q.get_den() != 1) throw std::logic_error("Tate's algorithm: model not integral");
    return Integer(q.get_num());
}

// v_p(n), with a large number standing for v_p(0) = infinity.
int ord(const Integer& n, const Integer& p) {
    return n == 0 ? 1 << 20 : valuation(n, p);
}

Integer mod(const Integer& a, const Integer& m) {
    Integer out;
    mpz_mod(out.get_mpz_t(), a.get_mpz_t(), m.get_mpz_t());
    return out;
}

Integer inverse_mod(const Integer& a, const Integer& m) {
    Integer out;
    if (mpz_invert(out.get_mpz_t(), a.get_mpz_t(), m.get_mpz_t()) == 0) {
        throw std::logic_error("Tate's algorithm: inverting a non-unit");
    }
    return out;
}

bool divides(const Integer& p, const Integer& n) {
    return mpz_divisible_p(n.get_mpz_t(), p.get_mpz_t()) != 0;
}

// Does a X^2 + b X + c (a a unit mod p, discriminant a unit mod p) have a root in F_p?
// For odd p: the discriminant is a square. For p = 2 (b odd there): X(X + 1) + c... is 0 at
// X = 0 or 1 iff c is even.
bool quadratic_has_roots(const Integer& a, const Integer& b, const Integer& c, const Integer& p) {
    if (p == 2) return divides(p, c);
    const Integer discriminant = mod(b * b - 4 * a * c, p);
    return mpz_legendre(discriminant.get_mpz_t(), p.get_mpz_t()) == 1;
}

// Polynomials over F_p as coefficient vectors, lowest degree first, no trailing zeros.
using Polynomial = std::vector<Integer>;

void trim(Polynomial& f) {
    while (!f.empty() && f.back() == 0) f.pop_back();
}

Polynomial remainder(Polynomial f, const Polynomial& g, const Integer& p) {
    const Integer lead_inverse = inverse_mod(g.back(), p);
    trim(f);
    while (f.size() >= g.size()) {
        const Integer quotient = mod(f.back() * lead_inverse, p);
        const std::size_t shift = f.size() - g.size();
        for (std::size_t i = 0; i < g.size(); ++i)
            f[shift + i] = mod(f[shift + i] - quotient * g[i], p);
        trim(f);
    }
    return f;
}

Polynomial multiply_mod(const Polynomial& f, const Polynomial& g, const Polynomial& modulus,
                        const Integer& p) {
    if (f.empty() || g.empty()) return {};
    Polynomial product(f.size() + g.size() - 1, Integer(0));
    for (std::size_t i = 0; i < f.size(); ++i) {
        for (std::size_t j = 0; j < g.size(); ++j) product[i + j] += f[i] * g[j];
    }
    for (auto& coefficient : product) coefficient = mod(coefficient, p);
    return remainder(product, modulus, p);
}

// Number of distinct roots in F_p of the monic T^3 + b T^2 + c T + d: the degree of
// gcd(P, T^p - T) over F_p (common practice).
int cubic_root_count(const Integer& b, const Integer& c, const Integer& d, const Integer& p) {
    const Polynomial cubic = {mod(d, p), mod(c, p), mod(b, p), Integer(1)};
    Polynomial power = {Integer(1)}, base = {Integer(0), Integer(1)};
    for (long bit = static_cast<long>(mpz_sizeinbase(p.get_mpz_t(), 2)) - 1; bit >= 0; --bit) {
        power = multiply_mod(power, power, cubic, p);
        if (mpz_tstbit(p.get_mpz_t(), static_cast<mp_bitcnt_t>(bit))) {
            power = multiply_mod(power, base, cubic, p);
        }
    }
    // power = T^p mod P; subtract T.
    power.resize(std::max<std::size_t>(power.size(), 2), Integer(0));
    power[1] = mod(power[1] - 1, p);
    trim(power);
    Polynomial f = cubic, g = power;
    while (!g.empty()) {
        Polynomial r = remainder(f, g, p);
        f = std::move(g);
        g = std::move(r);
    }
    return static_cast<int>(f.size()) - 1;
}

struct Invariants {
    Integer a1, a2, a3, a4, a6, b2, b4, b6, b8, c4, c6, delta;
};

Invariants invariants_of(const Curve& e) {
    Invariants v;
    v.a1 = as_integer(e.a1);
    v.a2 = as_integer(e.a2);
    v.a3 = as_integer(e.a3);
    v.a4 = as_integer(e.a4);
    v.a6 = as_integer(e.a6);
    const BInvariants b = b_invariants(e);
    v.b2 = as_integer(b.b2);
    v.b4 = as_integer(b.b4);
    v.b6 = as_integer(b.b6);
    v.b8 = as_integer(b.b8);
    v.c4 = as_integer(c4(e));
    v.c6 = as_integer(c6(e));
    v.delta = as_integer(discriminant(e));
    return v;
}

void finish(LocalReduction& out, const std::string& symbol, int n, int conductor_exponent,
            int tamagawa, ReductionKind kind) {
    out.kodaira = symbol;
    out.kodaira_n = n;
    out.conductor_exponent = conductor_exponent;
    out.tamagawa = tamagawa;
    out.kind = kind;
}

}  // namespace

LocalReduction tate_local(const Curve& curve, const Integer& p) {
    if (p < 2 || !is_probable_prime(p)) {
        throw std::invalid_argument("tate_local: " + to_string(p) + " is not prime");
    }
    LocalReduction out;
    out.prime = p;
    out.minimal_at_p = minimal_model_at(curve, p);
    Curve e = out.minimal_at_p.curve;
    // Tate's algorithm as laid out in Cremona, Algorithms §3.2 and Silverman, Advanced Topics
    // IV.9.4; every translation below has u = 1, so valuations of Δ, c4 do not move.
    auto translate = [&](const Integer& r, const Integer& s, const Integer& t) {
        e = apply(e, ModelChange{Rational(1), Rational(r), Rational(s), Rational(t)});
    };
    const Integer p2 = p * p, p3 = p2 * p, p4 = p3 * p;
    {
        Invariants v = invariants_of(e);
        const int n = ord(v.delta, p);
        out.discriminant_valuation = n;
        if (n == 0) {
            finish(out, "I0", 0, 0, 1, ReductionKind::good);
            return out;
        }
        // Step 1–2: move the singular point of the reduction to (0, 0).
        Integer r, t;
        if (p == 2) {
            if (divides(p, v.b2)) {
                r = mod(v.a4, p);
                t = mod(r * (1 + v.a2 + v.a4) + v.a6, p);
            } else {
                r = mod(v.a3, p);
                t = mod(r + v.a4, p);
            }
        } else if (p == 3) {
            r = divides(p, v.b2) ? mod(-v.b6, p) : mod(-v.b2 * v.b4, p);
            t = mod(v.a1 * r + v.a3, p);
        } else {
            // The double root of the reduced cubic: x0 = -b2/12 (cusp) or
            // x0 = -(c6 + b2 c4)/(12 c4) (node), from the short model y^2 = x^3 - c4/48 x - c6/864.
            r = divides(p, v.c4) ? mod(-v.b2 * inverse_mod(Integer(12), p), p)
                                 : mod(-(v.c6 + v.b2 * v.c4) * inverse_mod(12 * v.c4, p), p);
            t = mod(-(v.a1 * r + v.a3) * inverse_mod(Integer(2), p), p);
        }
        translate(r, 0, t);
        v = invariants_of(e);
        if (!divides(p, v.c4)) {
            // Multiplicative: split iff the tangent directions T^2 + a1 T - a2 are rational.
            const bool split = quadratic_has_roots(Integer(1), v.a1, -v.a2, p);
            finish(out, "I" + std::to_string(n), n, 1, split ? n : (n % 2 == 0 ? 2 : 1),
                   split ? ReductionKind::split_multiplicative
                         : ReductionKind::nonsplit_multiplicative);
            return out;
        }
        if (ord(v.a6, p) < 2) {
            finish(out, "II", 0, n, 1, ReductionKind::additive);
            return out;
        }
        if (ord(v.b8, p) < 3) {
            finish(out, "III", 0, n - 1, 2, ReductionKind::additive);
            return out;
        }
        if (ord(v.b6, p) < 3) {
            const bool rational = quadratic_has_roots(Integer(1), v.a3 / p, -v.a6 / p2, p);
            finish(out, "IV", 0, n - 2, rational ? 3 : 1, ReductionKind::additive);
            return out;
        }
        // Step 6: now p | a1, a2; p^2 | a3, a4; p^3 | a6.
        Integer s;
        if (p == 2) {
            s = mod(v.a2, p);
            t = 2 * mod(v.a6 / 4, p);
        } else {
            s = mod(-v.a1 * inverse_mod(Integer(2), p), p);
            t = mod(-v.a3 * inverse_mod(Integer(2), p2), p2);
        }
        translate(0, s, t);
        v = invariants_of(e);
        // The cubic P(T) = T^3 + a2/p T^2 + a4/p^2 T + a6/p^3.
        const Integer b = v.a2 / p, c = v.a4 / p2, d = v.a6 / p3;
        const Integer w =
            27 * d * d - b * b * c * c + 4 * b * b * b * d - 18 * b * c * d + 4 * c * c * c;
        const Integer x = b * b - 3 * c;
        if (!divides(p, w)) {
            finish(out, "I0*", 0, n - 4, 1 + cubic_root_count(b, c, d, p), ReductionKind::additive);
            return out;
        }
        if (!divides(p, x)) {
            // Step 7, I_m*: move the double root of P to 0. For a double root α and simple root β,
            // x = (α-β)^2 and 9d - bc = 2α(α-β)^2; at p = 2, 3 from P'(α) = 0.
            Integer alpha;
            if (p == 2) {
                alpha = mod(c, p);
            } else if (p == 3) {
                alpha = mod(b * c, p);
            } else {
                alpha = mod((9 * d - b * c) * inverse_mod(2 * x, p), p);
            }
            translate(p * alpha, 0, 0);
            // Alternately test Y^2 + a3/p^k Y - a6/p^2k and a2/p X^2 + a4/p^(k+1) X + a6/p^(2k+1)
            // for distinct roots, translating y or x by the double root when there are none.
            int m = 1;
            Integer mx = p2, my = p2;
            int tamagawa = 0;
            for (;;) {
                v = invariants_of(e);
                Integer xa3 = v.a3 / my, xa6 = v.a6 / (mx * my);
                if (!divides(p, xa3 * xa3 + 4 * xa6)) {
                    tamagawa = quadratic_has_roots(Integer(1), xa3, -xa6, p) ? 4 : 2;
                    break;
                }
                const Integer y_root =
                    p == 2 ? mod(xa6, p) : mod(-xa3 * inverse_mod(Integer(2), p), p);
                translate(0, 0, my * y_root);
                my *= p;
                ++m;
                v = invariants_of(e);
                const Integer xa2 = v.a2 / p, xa4 = v.a4 / (p * mx);
                xa6 = v.a6 / (mx * my);
                if (!divides(p, xa4 * xa4 - 4 * xa2 * xa6)) {
                    tamagawa = quadratic_has_roots(xa2, xa4, xa6, p) ? 4 : 2;
                    break;
                }
                const Integer x_root =
                    p == 2 ? mod(xa6 * xa2, p) : mod(-xa4 * inverse_mod(2 * xa2, p), p);
                translate(mx * x_root, 0, 0);
                mx *= p;
                ++m;
            }
            finish(out, "I" + std::to_string(m) + "*", m, n - m - 4, tamagawa,
                   ReductionKind::additive);
            return out;
        }
        // Step 8: a triple root α of P (α = -b/3, or α = -d at p = 3); move it to 0.
        const Integer alpha = p == 3 ? mod(-d, p) : mod(-b * inverse_mod(Integer(3), p), p);
        translate(p * alpha, 0, 0);
        v = invariants_of(e);
        const Integer x3 = v.a3 / p2, x6 = v.a6 / p4;
        if (!divides(p, x3 * x3 + 4 * x6)) {
            const bool rational = quadratic_has_roots(Integer(1), x3, -x6, p);
            finish(out, "IV*", 0, n - 6, rational ? 3 : 1, ReductionKind::additive);
            return out;
        }
        // Step 9–10.
        const Integer y_root = p == 2 ? mod(x6, p) : mod(-x3 * inverse_mod(Integer(2), p), p);
        translate(0, 0, p2 * y_root);
        v = invariants_of(e);
        if (ord(v.a4, p) < 4) {
            finish(out, "III*", 0, n - 7, 2, ReductionKind::additive);
            return out;
        }
        if (ord(v.a6, p) < 6) {
            finish(out, "II*", 0, n - 8, 1, ReductionKind::additive);
            return out;
        }
        // Step 11 would rescale a non-minimal model; minimal_model_at has already done that.
        throw std::logic_error("Tate's algorithm met a non-minimal model after minimisation");
    }
}

std::vector<LocalReduction> bad_reduction(const Curve& curve) {
    const ModelWithChange minimal = minimal_model(curve);
    std::vector<LocalReduction> out;
    for (const auto& prime_power : factor(as_integer(discriminant(minimal.curve)))) {
        out.push_back(tate_local(curve, prime_power.prime));
    }
    return out;
}

Integer conductor(const Curve& curve) {
    Integer out = 1;
    for (const auto& local : bad_reduction(curve)) {
        Integer power;
        mpz_pow_ui(power.get_mpz_t(), local.prime.get_mpz_t(),
                   static_cast<unsigned long>(local.conductor_exponent));
        out *= power;
    }
    return out;
}

ReductionComponent reduction_component(const Curve& curve, const LocalReduction& local,
                                       const Point& point) {
    if (!on_curve(curve, point))
        throw std::invalid_argument("reduction_component: point not on curve");
    if (local.kind == ReductionKind::good || point.at_infinity) return ReductionComponent{0};
    const Curve& e = local.minimal_at_p.curve;
    const Point q = to_new_model(local.minimal_at_p.change, point);
    const Integer& p = local.prime;
    // A point with a pole at p reduces to the identity, which is a smooth point.
    if (q.x != 0 && valuation(q.x, p) < 0) return ReductionComponent{0};
    // Singular reduction: both partial derivatives of the Weierstrass equation vanish mod p.
    const Rational psi2 = 2 * q.y + e.a1 * q.x + e.a3;
    const Rational phi = 3 * q.x * q.x + 2 * e.a2 * q.x + e.a4 - e.a1 * q.y;
    const bool singular =
        (psi2 == 0 || valuation(psi2, p) > 0) && (phi == 0 || valuation(phi, p) > 0);
    if (!singular) return ReductionComponent{0};
    if (local.kind == ReductionKind::additive) return ReductionComponent{1};
    // I_n: i = min(v(ψ2(P)), n/2) (Silverman, Math. Comp. 51 (1988), §5).
    const int n = local.kodaira_n;
    const int v = psi2 == 0 ? n : valuation(psi2, p);
    return ReductionComponent{std::min(v, n / 2)};
}

}  // namespace arcsieve
