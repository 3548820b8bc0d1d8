#include "curve/minimal_model.hpp"

#include <optional>
#include <stdexcept>

#include "arith/factor.hpp"

namespace arcsieve {
namespace {

Integer numerator_of(const Rational& q) {
    return Integer(q.get_num());
}

// v_p of an integer, with 0 standing for +infinity (returned as a large number).
int valuation_or_infinity(const Integer& n, const Integer& p) {
    return n == 0 ? 1 << 20 : valuation(n, p);
}

// n/d mod p^k for d a p-adic unit (d != 0 mod p), as an integer in [0, p^k).
Integer residue_of(const Rational& q, const Integer& modulus) {
    Integer inverse;
    const Integer den(q.get_den());
    if (mpz_invert(inverse.get_mpz_t(), den.get_mpz_t(), modulus.get_mpz_t()) == 0) {
        throw std::logic_error("residue_of: denominator not invertible");
    }
    Integer out = Integer(q.get_num()) * inverse;
    mpz_mod(out.get_mpz_t(), out.get_mpz_t(), modulus.get_mpz_t());
    return out;
}

void append(ModelWithChange& model, const ModelChange& step) {
    model.curve = apply(model.curve, step);
    model.change = compose(model.change, step);
}

// A change with u = p taking the integral model `e` to another integral model, if one exists
// (then e is not minimal at p). Kraus's conditions are avoided on purpose: at p = 2, 3 the
// change is found by a finite search, at p >= 5 from the short model.
std::optional<ModelChange> lowering_change(const Curve& e, const Integer& p) {
    const Integer delta = numerator_of(discriminant(e));
    if (valuation(delta, p) < 12) return std::nullopt;
    if (p == 2 || p == 3) {
        // If (p, r, s, t) works, so does the change with s reduced mod p, then r mod p^2 (t moves
        // by p^2·s·k) and t mod p^3: composing with an integral change after the scaling keeps
        // the model integral. So the box s < p, r < p^2, t < p^3 is searched completely.
        const long q = p.get_si();
        for (long s = 0; s < q; ++s) {
            for (long r = 0; r < q * q; ++r) {
                const ModelChange partial{Rational(p), Rational(r), Rational(s), Rational(0)};
                const Curve trial = apply(e, partial);
                if (trial.a1.get_den() != 1 || trial.a2.get_den() != 1) continue;
                for (long t = 0; t < q * q * q; ++t) {
                    const ModelChange change{Rational(p), Rational(r), Rational(s), Rational(t)};
                    if (is_integral(apply(e, change))) return change;
                }
            }
        }
        return std::nullopt;
    }
    // p >= 5 (Cremona, Algorithms §3.2): the model is non-minimal iff v(c4) >= 4, v(c6) >= 6.
    const Integer c4_value = numerator_of(c4(e)), c6_value = numerator_of(c6(e));
    if (valuation_or_infinity(c4_value, p) < 4 || valuation_or_infinity(c6_value, p) < 6) {
        return std::nullopt;
    }
    // s = -a1/2, r = -b2/12, t = -(a3 + r a1)/2 take e to y^2 = x^3 - c4/48 x - c6/864, whose
    // coefficients stay p-integral after dividing by p^4, p^6. These r, s, t are p-integral;
    // integers congruent to them mod p^6 change each new a_i (a polynomial in r, s, t over
    // p^i) by a p-integral amount, and add no other denominator.
    const Rational s = -e.a1 / 2;
    const Rational r = -b_invariants(e).b2 / 12;
    const Rational t = -(e.a3 + r * e.a1) / 2;
    Integer modulus;
    mpz_pow_ui(modulus.get_mpz_t(), p.get_mpz_t(), 6);
    return ModelChange{Rational(p), Rational(residue_of(r, modulus)),
                       Rational(residue_of(s, modulus)), Rational(residue_of(t, modulus))};
}

// Integral change (u = 1) to the reduced form a1, a3 ∈ {0,1}, a2 ∈ {-1,0,1}.
void reduce(ModelWithChange& model) {
    auto floor_div = [](const Integer& a, long b) {
        Integer q;
        mpz_fdiv_q_ui(q.get_mpz_t(), a.get_mpz_t(), static_cast<unsigned long>(b));
        return q;
    };
    const Integer a1 = numerator_of(model.curve.a1);
    append(model, ModelChange{Rational(1), Rational(0), Rational(-floor_div(a1, 2)), Rational(0)});
    const Integer a2 = numerator_of(model.curve.a2);
    // a2 + 3r ∈ {-1, 0, 1}: r = -floor((a2 + 1)/3).
    append(model,
           ModelChange{Rational(1), Rational(-floor_div(a2 + 1, 3)), Rational(0), Rational(0)});
    const Integer a3 = numerator_of(model.curve.a3);
    append(model, ModelChange{Rational(1), Rational(0), Rational(0), Rational(-floor_div(a3, 2))});
}

}  // namespace

ModelWithChange integral_model(const Curve& curve) {
    // Scale by the least D with D^i a_i integral: at each prime q of a denominator,
    // D carries q^e with e = max_i ceil(v_q(den a_i) / i).
    const std::array<const Rational*, 5> a = {&curve.a1, &curve.a2, &curve.a3, &curve.a4,
                                              &curve.a6};
    const std::array<int, 5> weight = {1, 2, 3, 4, 6};
    Integer denominators = 1;
    for (const Rational* entry : a) denominators *= Integer(entry->get_den());
    Integer scale = 1;
    for (const auto& prime_power : factor(denominators)) {
        const Integer& q = prime_power.prime;
        int e = 0;
        for (std::size_t i = 0; i < 5; ++i) {
            const int v = valuation(Integer(a[i]->get_den()), q);
            e = std::max(e, (v + weight[i] - 1) / weight[i]);
        }
        Integer power;
        mpz_pow_ui(power.get_mpz_t(), q.get_mpz_t(), static_cast<unsigned long>(e));
        scale *= power;
    }
    ModelWithChange out{curve, ModelChange{}};
    if (scale != 1) append(out, ModelChange{Rational(1, 1) / Rational(scale), 0, 0, 0});
    return out;
}

bool is_minimal_at(const Curve& integral_curve, const Integer& prime) {
    if (!is_integral(integral_curve))
        throw std::invalid_argument("is_minimal_at: model not integral");
    return !lowering_change(integral_curve, prime).has_value();
}

ModelWithChange minimal_model_at(const Curve& curve, const Integer& prime) {
    if (prime < 2 || !is_probable_prime(prime)) {
        throw std::invalid_argument("minimal_model_at: " + to_string(prime) + " is not prime");
    }
    ModelWithChange model = integral_model(curve);
    while (auto step = lowering_change(model.curve, prime)) append(model, *step);
    return model;
}

ModelWithChange minimal_model(const Curve& curve) {
    ModelWithChange model = integral_model(curve);
    // A prime where the model is not minimal divides c4 and c6 four and six times (the
    // smaller model's c4/p^4, c6/p^6 are integers) and Δ twelve times: only the factors of
    // gcd(c4, c6, Δ) need a look, a far smaller number to factor than Δ.
    Integer common = gcd(numerator_of(c4(model.curve)), numerator_of(c6(model.curve)));
    common = gcd(common, numerator_of(discriminant(model.curve)));
    for (const auto& prime_power : factor(common)) {
        while (auto step = lowering_change(model.curve, prime_power.prime)) append(model, *step);
    }
    reduce(model);
    return model;
}

}  // namespace arcsieve
