#include "exact/local_heights.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <stdexcept>

#include "arith/factor.hpp"

namespace arcsieve::exact {

DuplicationForms duplication_forms(const JacobianCurve& e) {
    // b-invariants with a1 = a3 = 0 (Silverman AEC III.1).
    return DuplicationForms{4 * e.a2, 2 * e.a4, 4 * e.a6, 4 * e.a2 * e.a6 - e.a4 * e.a4};
}

namespace {

std::array<Integer, 5> first_form(const DuplicationForms& f) {
    return {Integer(1), Integer(0), -f.b4, -2 * f.b6, -f.b8};
}
std::array<Integer, 5> second_form(const DuplicationForms& f) {
    return {Integer(0), Integer(4), f.b2, 2 * f.b4, f.b6};
}

// Fraction-free Gaussian elimination (Bareiss 1968): exact determinant over Z.
Integer bareiss_determinant(std::vector<std::vector<Integer>> m) {
    const std::size_t n = m.size();
    Integer previous = 1;
    int sign = 1;
    for (std::size_t k = 0; k + 1 < n; ++k) {
        if (m[k][k] == 0) {
            std::size_t swap_row = k + 1;
            while (swap_row < n && m[swap_row][k] == 0) ++swap_row;
            if (swap_row == n) return Integer(0);
            std::swap(m[k], m[swap_row]);
            sign = -sign;
        }
        for (std::size_t i = k + 1; i < n; ++i) {
            for (std::size_t j = k + 1; j < n; ++j) {
                m[i][j] = (m[i][j] * m[k][k] - m[i][k] * m[k][j]);
                mpz_divexact(m[i][j].get_mpz_t(), m[i][j].get_mpz_t(), previous.get_mpz_t());
            }
        }
        previous = m[k][k];
    }
    return sign * m[n - 1][n - 1];
}

}  // namespace

Integer duplication_resultant(const DuplicationForms& forms) {
    const auto f1 = first_form(forms), f2 = second_form(forms);
    std::vector<std::vector<Integer>> sylvester(8, std::vector<Integer>(8, Integer(0)));
    for (int shift = 0; shift < 4; ++shift) {
        for (int j = 0; j < 5; ++j) {
            sylvester[shift][shift + j] = f1[j];
            sylvester[4 + shift][shift + j] = f2[j];
        }
    }
    return bareiss_determinant(sylvester);
}

std::vector<Integer> height_correction_primes(const JacobianCurve& curve,
                                              const std::vector<Integer>& discriminant_primes) {
    std::vector<Integer> primes = discriminant_primes;
    primes.push_back(Integer(2));
    primes.push_back(Integer(3));
    std::sort(primes.begin(), primes.end());
    primes.erase(std::unique(primes.begin(), primes.end()), primes.end());
    Integer rest = abs(duplication_resultant(duplication_forms(curve)));
    if (rest == 0) throw std::runtime_error("duplication resultant vanishes: singular curve");
    std::vector<Integer> used;
    for (const Integer& p : primes) {
        Integer quotient;
        if (mpz_remove(quotient.get_mpz_t(), rest.get_mpz_t(), p.get_mpz_t()) > 0) {
            used.push_back(p);
        }
        rest = quotient;
    }
    if (rest != 1) {
        throw std::runtime_error("duplication resultant has a prime outside the discriminant's: " +
                                 to_string(rest));
    }
    return used;
}

namespace {

// Both forms at v = (X, Z) in interval arithmetic.
std::pair<Enclosure, Enclosure> forms_at(const DuplicationForms& f, const Enclosure& X,
                                         const Enclosure& Z) {
    const long bits = std::max(X.bits(), Z.bits());
    const Enclosure x2 = square(X), z2 = square(Z);
    const Enclosure z3 = z2 * Z, x3 = x2 * X;
    const Enclosure f1 = square(x2) - enclose(f.b4, bits) * x2 * z2 -
                         enclose(Integer(2 * f.b6), bits) * X * z3 -
                         enclose(f.b8, bits) * square(z2);
    const Enclosure f2 = enclose(4L, bits) * x3 * Z + enclose(f.b2, bits) * x2 * z2 +
                         enclose(Integer(2 * f.b4), bits) * X * z3 +
                         enclose(f.b6, bits) * square(z2);
    return {f1, f2};
}

double lower_magnitude(const Enclosure& a) {
    mpfr_t m;
    mpfr_init2(m, 64);
    mpfi_mig(m, a.get());
    const double d = mpfr_get_d(m, MPFR_RNDD);
    mpfr_clear(m);
    return d;
}

}  // namespace

DuplicationNormBounds duplication_norm_bounds(const DuplicationForms& f) {
    const long bits = 128;
    // Upper bound: for |X|, |Z| <= 1 each form is at most the sum of its |coefficients|.
    Integer upper1 = 1 + abs(f.b4) + 2 * abs(f.b6) + abs(f.b8);
    Integer upper2 = 4 + abs(f.b2) + 2 * abs(f.b4) + abs(f.b6);
    const Integer upper = std::max(upper1, upper2);
    // Lower bound: min over the boundary of the unit square, v = (1, s) and v = (s, 1),
    // s ∈ [−1, 1], by interval bisection until each piece has a positive lower bound.
    double lower = std::numeric_limits<double>::infinity();
    for (int edge = 0; edge < 2; ++edge) {
        std::vector<std::pair<Rational, Rational>> work{{Rational(-1), Rational(1)}};
        long pieces = 0;
        while (!work.empty()) {
            auto [lo, hi] = work.back();
            work.pop_back();
            if (++pieces > 2'000'000) {
                throw std::runtime_error("cannot bound the duplication map away from zero");
            }
            Enclosure s = hull(enclose(lo, bits), enclose(hi, bits));
            Enclosure one = enclose(1L, bits);
            const auto [f1, f2] = edge == 0 ? forms_at(f, one, s) : forms_at(f, s, one);
            const double bound = std::max(lower_magnitude(f1), lower_magnitude(f2));
            if (bound > 0) {
                lower = std::min(lower, bound);
            } else {
                const Rational mid = (lo + hi) / 2;
                work.push_back({lo, mid});
                work.push_back({mid, hi});
            }
        }
    }
    DuplicationNormBounds b;
    // Outward margins cover the rounding of std::log.
    b.log_lower = std::log(lower) - 1e-9;
    b.log_upper = std::log(upper.get_d()) + 1e-9;
    return b;
}

Enclosure archimedean_local_height(const DuplicationForms& f, const DuplicationNormBounds& bounds,
                                   const Enclosure& x, long terms) {
    const long bits = x.bits();
    Enclosure term_range(bits);
    {
        Enclosure lo = enclose(0L, bits), hi = enclose(0L, bits);
        mpfi_set_d(lo.get(), bounds.log_lower);
        mpfi_set_d(hi.get(), bounds.log_upper);
        term_range = hull(lo, hi);
    }
    const Enclosure norm = maximum(absolute(x), enclose(1L, bits));
    Enclosure sum = natural_log(norm);
    Enclosure X = x / norm, Z = enclose(1L, bits) / norm;
    long used = 0;
    for (; used < terms; ++used) {
        auto [f1, f2] = forms_at(f, X, Z);
        const Enclosure nf = maximum(absolute(f1), absolute(f2));
        if (!nf.is_finite() || nf.contains_zero()) break;
        Enclosure term = natural_log(nf);
        Enclosure clipped(bits);
        mpfi_intersect(clipped.get(), term.get(), term_range.get());
        if (mpfi_is_empty(clipped.get())) clipped = term_range;  // cannot happen; stay safe
        sum = sum + scale_by_power_of_two(clipped, -2 * (used + 1));
        X = f1 / nf;
        Z = f2 / nf;
        // Once an iterate is known only roughly, further terms add nothing but width.
        mpfr_t w;
        mpfr_init2(w, 64);
        mpfi_diam_abs(w, X.get());
        const double wx = mpfr_get_d(w, MPFR_RNDU);
        mpfi_diam_abs(w, Z.get());
        const double wz = mpfr_get_d(w, MPFR_RNDU);
        mpfr_clear(w);
        if (!(wx < 1e-3 && wz < 1e-3)) {
            ++used;
            break;
        }
    }
    // Tail Σ_{k >= used} 4^-(k+1) t_k with t_k in the term range: (term range) · 4^-used / 3.
    Enclosure tail = term_range / enclose(3L, bits);
    tail = scale_by_power_of_two(tail, -2 * used);
    return sum + tail;
}

Enclosure PadicHeightCorrection::value(const Integer& prime, long bits) const {
    Enclosure log_p = natural_log(enclose(prime, bits));
    Rational tail_width(max_drop);
    Integer power;
    mpz_ui_pow_ui(power.get_mpz_t(), 4, static_cast<unsigned long>(terms_used));
    tail_width /= Rational(3 * power);
    Enclosure sum = hull(enclose(partial_sum, bits), enclose(partial_sum + tail_width, bits));
    return -(log_p * sum);
}

namespace {

struct PadicForms {
    PadicNumber b2, b4, b6, b8, two, four;
};

PadicForms padic_forms(const PadicContext& ctx, const DuplicationForms& f) {
    const PadicContext wide(ctx.prime(), 4 * ctx.precision() + 64);
    auto lift = [&](const Integer& v) { return padic_from_rational(wide, Rational(v)); };
    return PadicForms{lift(f.b2), lift(f.b4),       lift(f.b6),
                      lift(f.b8), lift(Integer(2)), lift(Integer(4))};
}

}  // namespace

PadicHeightCorrection padic_height_correction(const PadicContext& ctx,
                                              const DuplicationForms& forms, const PadicNumber& x,
                                              long terms, long max_drop) {
    const PadicForms f = padic_forms(ctx, forms);
    const PadicNumber one =
        padic_from_rational(PadicContext(ctx.prime(), 4 * ctx.precision() + 64), Rational(1));
    PadicNumber X, Z;
    if (!x.zero && x.valuation < 0) {
        X = one;
        Z = padic_divide(ctx, one, x);
    } else {
        X = x;
        Z = one;
    }
    PadicHeightCorrection result;
    result.max_drop = max_drop;
    Integer power_of_four = 1;
    auto mul = [&](const PadicNumber& a, const PadicNumber& b) {
        return padic_multiply(ctx, a, b);
    };
    auto add = [&](const PadicNumber& a, const PadicNumber& b) { return padic_add(ctx, a, b); };
    for (long k = 0; k < terms; ++k) {
        const PadicNumber x2 = mul(X, X), z2 = mul(Z, Z);
        const PadicNumber x3 = mul(x2, X), z3 = mul(z2, Z);
        PadicNumber f1 = mul(x2, x2);
        f1 = padic_subtract(ctx, f1, mul(f.b4, mul(x2, z2)));
        f1 = padic_subtract(ctx, f1, mul(mul(f.two, f.b6), mul(X, z3)));
        f1 = padic_subtract(ctx, f1, mul(f.b8, mul(z2, z2)));
        PadicNumber f2 = mul(f.four, mul(x3, Z));
        f2 = add(f2, mul(f.b2, mul(x2, z2)));
        f2 = add(f2, mul(mul(f.two, f.b4), mul(X, z3)));
        f2 = add(f2, mul(f.b6, mul(z2, z2)));
        // e = min(v(f1), v(f2)) must be determined by the digits held.
        long e = -1;
        bool determined = true;
        for (const PadicNumber* value : {&f1, &f2}) {
            if (!value->zero) e = e < 0 ? value->valuation : std::min(e, value->valuation);
        }
        if (e < 0) determined = false;
        for (const PadicNumber* value : {&f1, &f2}) {
            if (value->zero && value->valuation <= e) determined = false;
        }
        if (!determined || e > max_drop) break;
        power_of_four *= 4;
        result.partial_sum += Rational(Integer(e), power_of_four);
        result.terms_used = k + 1;
        X = padic_shift(f1, -e);
        Z = padic_shift(f2, -e);
    }
    result.partial_sum.canonicalize();
    return result;
}

Enclosure canonical_height_enclosure(const JacobianCurve& curve, const Point& p,
                                     const std::vector<Integer>& correction_primes, long bits) {
    if (p.at_infinity) return enclose(0L, bits);
    const DuplicationForms forms = duplication_forms(curve);
    const DuplicationNormBounds bounds = duplication_norm_bounds(forms);
    const long guard_bits = bits + 32;
    // Each term carries weight 4^-(k+1): bits/2 terms reach 2^-bits.
    const long terms = guard_bits / 2 + 4;
    // The iteration amplifies enclosure widths by up to about 2^4 per term (the map has degree 4
    // and interval evaluation overestimates), so the series runs at three times the precision.
    Enclosure height = archimedean_local_height(forms, bounds, enclose(p.x, 3 * guard_bits), terms);
    Integer w;
    mpz_sqrt(w.get_mpz_t(), p.x.get_den().get_mpz_t());
    height = height + 2L * natural_log(enclose(w, guard_bits));
    const Integer resultant = duplication_resultant(forms);
    for (const Integer& prime : correction_primes) {
        const long drop = static_cast<long>(valuation(resultant, prime));
        const auto [correction, point] = padic_correction_with_retries(
            prime, forms, terms, drop, 0,
            [&](const PadicContext& ctx) { return padic_point(ctx, p); });
        height = height + correction.value(prime, guard_bits);
    }
    return height;
}

}  // namespace arcsieve::exact
