#include "basis/division.hpp"

#include <algorithm>
#include <stdexcept>

#include "arith/modular.hpp"

namespace arcsieve::basis {

namespace {

using Poly = IntegerPolynomial;

void trim(Poly& p) {
    while (!p.empty() && p.back() == 0) p.pop_back();
}

Poly multiply(const Poly& a, const Poly& b) {
    if (a.empty() || b.empty()) return {};
    Poly c(a.size() + b.size() - 1, 0);
    for (std::size_t i = 0; i < a.size(); ++i) {
        if (a[i] == 0) continue;
        for (std::size_t j = 0; j < b.size(); ++j) c[i + j] += a[i] * b[j];
    }
    trim(c);
    return c;
}

Poly subtract(const Poly& a, const Poly& b) {
    Poly c(std::max(a.size(), b.size()), 0);
    for (std::size_t i = 0; i < a.size(); ++i) c[i] += a[i];
    for (std::size_t i = 0; i < b.size(); ++i) c[i] -= b[i];
    trim(c);
    return c;
}

Poly scale(const Poly& a, const Integer& s) {
    Poly c = a;
    for (auto& x : c) x *= s;
    trim(c);
    return c;
}

Integer integral(const Rational& q) {
    if (q.get_den() != 1)
        throw std::invalid_argument("division polynomials need an integral curve");
    return q.get_num();
}

std::uint64_t mod_of(const Integer& n, std::uint64_t p) {
    return mpz_fdiv_ui(n.get_mpz_t(), p);
}

using SmallPoly = std::vector<std::uint64_t>;

void trim_small(SmallPoly& p) {
    while (!p.empty() && p.back() == 0) p.pop_back();
}

// gcd of polynomials over F_p (p prime), monic or empty.
SmallPoly gcd_mod(SmallPoly a, SmallPoly b, std::uint64_t p) {
    trim_small(a);
    trim_small(b);
    while (!b.empty()) {
        // a mod b
        const std::uint64_t inverse = pow_mod(b.back(), p - 2, p);
        while (a.size() >= b.size() && !a.empty()) {
            const std::uint64_t factor = mul_mod(a.back(), inverse, p);
            const std::size_t shift = a.size() - b.size();
            for (std::size_t i = 0; i < b.size(); ++i) {
                a[i + shift] = (a[i + shift] + p - mul_mod(factor, b[i], p)) % p;
            }
            trim_small(a);
        }
        std::swap(a, b);
    }
    return a;
}

// Rational reconstruction of r mod m (Wang's algorithm): a/b with |a|, b <= bound, or nullopt.
std::optional<Rational> reconstruct(const Integer& r, const Integer& m, const Integer& bound) {
    Integer r0 = m, r1 = r, s0 = 0, s1 = 1;
    while (r1 > bound) {
        const Integer q = r0 / r1;
        Integer t = r0 - q * r1;
        r0 = r1;
        r1 = t;
        t = s0 - q * s1;
        s0 = s1;
        s1 = t;
    }
    if (s1 == 0 || abs(s1) > bound) return std::nullopt;
    Rational result(r1, s1);
    result.canonicalize();
    return result;
}

Integer evaluate_at(const Poly& p, const Integer& x, const Integer& m) {
    Integer v = 0;
    for (std::size_t i = p.size(); i-- > 0;) {
        v = (v * x + p[i]) % m;
    }
    return v;
}

}  // namespace

MultiplicationByN multiplication_polynomials(const Curve& e, int n) {
    if (n < 1) throw std::invalid_argument("multiplication_polynomials: n < 1");
    const BInvariants b = b_invariants(e);
    const Integer b2 = integral(b.b2), b4 = integral(b.b4), b6 = integral(b.b6),
                  b8 = integral(b.b8);
    // f_n = ψ_n (n odd) or ψ_n/ψ_2 (n even), polynomials in x; F = ψ_2² = 4x³+b2x²+2b4x+b6.
    const Poly F{b6, 2 * b4, b2, 4};
    std::vector<Poly> f(static_cast<std::size_t>(std::max(n + 2, 5)));
    f[0] = {};
    f[1] = {1};
    f[2] = {1};
    f[3] = {b8, 3 * b6, 3 * b4, b2, 3};
    f[4] = {b4 * b8 - b6 * b6, b2 * b8 - b4 * b6, 10 * b8, 10 * b6, 5 * b4, b2, 2};
    const Poly F2 = multiply(F, F);
    for (std::size_t k = 5; k < f.size(); ++k) {
        const std::size_t m = k / 2;
        if (k % 2 == 1) {
            // ψ_{2m+1} = ψ_{m+2}ψ_m³ − ψ_{m−1}ψ_{m+1}³, the even-index factors carrying F.
            Poly left = multiply(f[m + 2], multiply(f[m], multiply(f[m], f[m])));
            Poly right = multiply(f[m - 1], multiply(f[m + 1], multiply(f[m + 1], f[m + 1])));
            if (m % 2 == 0) {
                left = multiply(left, F2);
            } else {
                right = multiply(right, F2);
            }
            f[k] = subtract(left, right);
        } else {
            // ψ_{2m} = (ψ_m/ψ_2)(ψ_{m+2}ψ_{m−1}² − ψ_{m−2}ψ_{m+1}²): the same in f either parity.
            f[k] = multiply(f[m], subtract(multiply(f[m + 2], multiply(f[m - 1], f[m - 1])),
                                           multiply(f[m - 2], multiply(f[m + 1], f[m + 1]))));
        }
    }
    const std::size_t nn = static_cast<std::size_t>(n);
    MultiplicationByN result;
    Poly neighbours = multiply(f[nn + 1], f[nn - 1]);
    if (n % 2 == 0) {
        result.psi_squared = multiply(multiply(f[nn], f[nn]), F);
    } else {
        result.psi_squared = multiply(f[nn], f[nn]);
        neighbours = multiply(neighbours, F);
    }
    if (n == 1) neighbours = {};  // ψ_0 = 0
    // φ_n = x ψ_n² − ψ_{n+1} ψ_{n−1}
    Poly x_psi(result.psi_squared.size() + 1, 0);
    for (std::size_t i = 0; i < result.psi_squared.size(); ++i)
        x_psi[i + 1] = result.psi_squared[i];
    result.phi = subtract(x_psi, neighbours);
    return result;
}

std::vector<Rational> rational_roots(const IntegerPolynomial& input) {
    Poly h = input;
    trim(h);
    if (h.empty()) throw std::invalid_argument("rational_roots of the zero polynomial");
    std::vector<Rational> roots;
    // Strip the root 0.
    std::size_t zeros = 0;
    while (zeros < h.size() && h[zeros] == 0) ++zeros;
    if (zeros > 0) {
        roots.push_back(0);
        h.erase(h.begin(), h.begin() + static_cast<long>(zeros));
    }
    if (h.size() <= 1) return roots;
    // A root a/b in lowest terms has a | h(0) and b | lead(h), so |a|, b <= X.
    const Integer X = std::max(Integer(abs(h.front())), Integer(abs(h.back())));
    // Square-free part would be needed for repeated roots; callers pass square-free input, and
    // a prime with h mod p square-free (and of full degree) is chosen, so every rational root
    // reduces to a simple root mod p and lifts uniquely (Hensel).
    Poly derivative;
    for (std::size_t i = 1; i < h.size(); ++i)
        derivative.push_back(h[i] * Integer(static_cast<long>(i)));
    std::uint64_t p = 0;
    for (std::uint64_t candidate = 1009; candidate < 200000; candidate += 2) {
        if (!mpz_probab_prime_p(Integer(static_cast<unsigned long>(candidate)).get_mpz_t(), 25))
            continue;
        if (mod_of(h.back(), candidate) == 0) continue;
        SmallPoly hp, dp;
        for (const auto& c : h) hp.push_back(mod_of(c, candidate));
        for (const auto& c : derivative) dp.push_back(mod_of(c, candidate));
        if (gcd_mod(hp, dp, candidate).size() == 1) {
            p = candidate;
            break;
        }
    }
    if (p == 0) throw std::runtime_error("rational_roots: input not square-free");
    const Integer P(static_cast<unsigned long>(p));
    // Modulus needed: p^k > 2 X^2 for unique reconstruction.
    const Integer needed = 2 * X * X + 1;
    for (std::uint64_t r0 = 0; r0 < p; ++r0) {
        const Integer r0_big(static_cast<unsigned long>(r0));
        if (evaluate_at(h, r0_big, P) != 0) continue;
        // Newton (Hensel) lifting, doubling the precision each step.
        Integer root = r0_big, modulus = P;
        while (modulus < needed) {
            modulus *= modulus;
            const Integer value = evaluate_at(h, root, modulus);
            const Integer slope = evaluate_at(derivative, root, modulus);
            Integer inverse;
            if (mpz_invert(inverse.get_mpz_t(), slope.get_mpz_t(), modulus.get_mpz_t()) == 0) {
                throw std::logic_error("rational_roots: Hensel slope not invertible");
            }
            root = (root - value * inverse) % modulus;
            if (root < 0) root += modulus;
        }
        Integer bound;
        mpz_sqrt(bound.get_mpz_t(), Integer(modulus / 2).get_mpz_t());
        auto candidate = reconstruct(root, modulus, bound);
        if (!candidate) continue;
        // Exact check: h(a/b) = 0 ⇔ Σ h_i a^i b^(d−i) = 0.
        const Integer a = candidate->get_num(), b = candidate->get_den();
        Integer value = 0, b_power = 1;
        std::vector<Integer> b_powers(h.size());
        for (std::size_t i = 0; i < h.size(); ++i) {
            b_powers[i] = b_power;
            b_power *= b;
        }
        const std::size_t d = h.size() - 1;
        for (std::size_t i = h.size(); i-- > 0;) value = value * a + h[i] * b_powers[d - i];
        if (value == 0 && std::find(roots.begin(), roots.end(), *candidate) == roots.end()) {
            roots.push_back(*candidate);
        }
    }
    return roots;
}

std::optional<Point> divide_point(const Curve& e, const Point& q, int ell) {
    if (ell < 2) throw std::invalid_argument("divide_point: ell < 2");
    if (q.at_infinity) return Point::infinity();
    const MultiplicationByN m = multiplication_polynomials(e, ell);
    // d_Q·(x_Q ψ² − φ) = n_Q ψ² − d_Q φ
    const Integer nq = q.x.get_num(), dq = q.x.get_den();
    const Poly h = subtract(scale(m.psi_squared, nq), scale(m.phi, dq));
    const BInvariants b = b_invariants(e);
    for (const Rational& x : rational_roots(h)) {
        const Rational disc = ((4 * x + b.b2) * x + 2 * b.b4) * x + b.b6;
        if (disc < 0) continue;
        if (!mpz_perfect_square_p(disc.get_num_mpz_t()) ||
            !mpz_perfect_square_p(disc.get_den_mpz_t())) {
            continue;
        }
        Integer sn, sd;
        mpz_sqrt(sn.get_mpz_t(), disc.get_num_mpz_t());
        mpz_sqrt(sd.get_mpz_t(), disc.get_den_mpz_t());
        const Rational s(sn, sd);
        for (const Rational& root : {s, Rational(-s)}) {
            Point r{x, (root - e.a1 * x - e.a3) / 2, false};
            if (arcsieve::multiply(e, r, static_cast<std::int64_t>(ell)) == q) return r;
        }
    }
    return std::nullopt;
}

}  // namespace arcsieve::basis
