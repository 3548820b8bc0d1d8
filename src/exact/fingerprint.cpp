#include "exact/fingerprint.hpp"

#include <algorithm>
#include <cmath>

#include "exact/local_heights.hpp"
#include "exact/materialise.hpp"
#include "exact/real_multiple.hpp"
#include "family/ratio_sum.hpp"

namespace arcsieve::exact {

namespace {

long bit_length(const Integer& n) {
    return static_cast<long>(mpz_sizeinbase(n.get_mpz_t(), 2));
}

// Mazur: a torsion point of E(Q) has order at most 12.
bool has_finite_order(const Curve& e, const Point& p) {
    Point q = p;
    for (int k = 1; k <= 12; ++k, q = add(e, q, p)) {
        if (q.at_infinity) return true;
    }
    return false;
}

}  // namespace

PointFingerprint point_fingerprint(const JacobianCurve& curve, const Multiple& q,
                                   const std::vector<Integer>& correction_primes, long bits) {
    if (q.index < 1) throw InputError("the multiple's index must be at least 1");
    const long index_bits = bit_length(q.index);
    const DuplicationForms forms = duplication_forms(curve);
    const DuplicationNormBounds bounds = duplication_norm_bounds(forms);
    const Integer resultant = duplication_resultant(forms);
    const long terms = bits / 2 + 8;

    PointFingerprint f{Enclosure(bits),
                       Enclosure(bits),
                       Enclosure(bits),
                       Enclosure(bits),
                       Enclosure(bits),
                       {},
                       bits};
    // ĥ(Q) = index² ĥ(P): ĥ(P) needs 2·log2(index) more bits than the answer.
    const Integer square_index = q.index * q.index;
    const Enclosure generator_height = canonical_height_enclosure(
        curve, q.generator, correction_primes, bits + 2 * index_bits + 8);
    f.canonical_height = enclose(square_index, bits + 2 * index_bits + 8) * generator_height;

    // The real point; the interval chain and the series both widen enclosures geometrically,
    // so they run at three times the target precision plus a margin per chain step.
    const long chain_bits = 3 * bits + 12 * index_bits;
    RealPointEnclosure real = real_multiple(curve, q.generator, q.index, q.translate, chain_bits);
    f.archimedean = archimedean_local_height(forms, bounds, real.x, terms);
    f.x = real.x;
    f.y = real.y;

    Enclosure corrections = enclose(0L, bits);
    for (const Integer& prime : correction_primes) {
        const long drop = static_cast<long>(valuation(resultant, prime));
        const auto [correction, point] = padic_correction_with_retries(
            prime, forms, terms, drop, 8 * index_bits, [&](const PadicContext& ctx) {
                const PadicCurve local_curve = padic_curve(ctx, curve);
                return padic_multiple(ctx, local_curve, padic_point(ctx, q.generator), q.index,
                                      padic_point(ctx, q.translate));
            });
        LocalPicture picture{prime, point, correction.value(prime, bits)};
        corrections = corrections + picture.correction;
        f.local.push_back(std::move(picture));
    }
    // 2·log W = ĥ − λ_∞ − Σ c_p (DESIGN.md §2).
    Enclosure twice_log = f.canonical_height - f.archimedean - corrections;
    f.log_denominator = scale_by_power_of_two(twice_log, -1);
    return f;
}

std::vector<Integer> ratio_sum_correction_primes(const Integer& N) {
    family::check_ratio_sum_parameter(N);
    // Δ(E_N) = 2^14 (N+3)² (2N+5)³ (2N−3): factor the pieces, not the product.
    std::vector<Integer> primes{Integer(2), Integer(3)};
    for (const Integer& piece : {Integer(N + 3), Integer(2 * N + 5), Integer(abs(2 * N - 3))}) {
        for (const Integer& p : prime_divisors(piece)) primes.push_back(p);
    }
    std::sort(primes.begin(), primes.end());
    primes.erase(std::unique(primes.begin(), primes.end()), primes.end());
    return height_correction_primes(jacobian_curve(family::ratio_sum_curve(N)), primes);
}

namespace {

struct Endpoints {
    mpfr_t left, right;
    explicit Endpoints(const Enclosure& e) {
        mpfr_init2(left, e.bits());
        mpfr_init2(right, e.bits());
        mpfi_get_left(left, e.get());
        mpfi_get_right(right, e.get());
    }
    ~Endpoints() {
        mpfr_clear(left);
        mpfr_clear(right);
    }
    Endpoints(const Endpoints&) = delete;
    Endpoints& operator=(const Endpoints&) = delete;
};

Integer floor_of(mpfr_t value, long bits, long shift, mpfr_rnd_t rounding) {
    // floor(10^(value − shift)) with the power rounded in the given direction.
    mpfr_t t;
    mpfr_init2(t, bits);
    mpfr_sub_si(t, value, shift, rounding);
    mpfr_exp10(t, t, rounding);
    Integer out;
    mpfr_get_z(out.get_mpz_t(), t, MPFR_RNDD);
    mpfr_clear(t);
    return out;
}

// Digit count and leading digits of |v| from an enclosure of log10 |v| (v an integer).
NumberFingerprint describe(const Enclosure& log10_value, unsigned lead_digits,
                           std::vector<std::string>& notes, const std::string& name) {
    NumberFingerprint out;
    Endpoints ends(log10_value);
    Integer low_floor, high_floor;
    mpfr_get_z(low_floor.get_mpz_t(), ends.left, MPFR_RNDD);
    mpfr_get_z(high_floor.get_mpz_t(), ends.right, MPFR_RNDD);
    if (low_floor != high_floor) {
        notes.push_back(name + ": log10 |" + name + "| = " + log10_value.to_string(25) +
                        " straddles an integer; digit count undecided at this precision");
        return out;
    }
    out.digits = static_cast<std::size_t>(low_floor.get_ui()) + 1;
    out.digits_certain = true;
    const long wanted = static_cast<long>(std::min<std::size_t>(lead_digits, out.digits));
    const long shift = static_cast<long>(out.digits) - wanted;
    const Integer lo = floor_of(ends.left, log10_value.bits(), shift, MPFR_RNDD);
    const Integer hi = floor_of(ends.right, log10_value.bits(), shift, MPFR_RNDU);
    if (shift == 0) {
        // |v| itself is the integer enclosed: certified when the enclosure holds just one.
        mpfr_t t;
        mpfr_init2(t, log10_value.bits());
        mpfr_exp10(t, ends.left, MPFR_RNDD);
        Integer ceiling_low;
        mpfr_get_z(ceiling_low.get_mpz_t(), t, MPFR_RNDU);
        mpfr_clear(t);
        if (ceiling_low == hi) {
            out.lead = to_string(hi);
            return out;
        }
    } else if (lo == hi) {
        out.lead = to_string(lo);
        return out;
    }
    // Keep the common prefix only.
    const std::string a = to_string(lo), b = to_string(hi);
    std::size_t common = 0;
    while (common < a.size() && common < b.size() && a[common] == b[common]) ++common;
    out.lead = a.substr(0, a.size() == b.size() ? common : 0);
    notes.push_back(name + ": only " + std::to_string(out.lead.size()) + " of " +
                    std::to_string(wanted) + " leading digits certified at this precision");
    return out;
}

int certain_sign(const Enclosure& e) {
    if (mpfi_is_strictly_pos(e.get())) return 1;
    if (mpfi_is_strictly_neg(e.get())) return -1;
    return 0;
}

struct Attempt {
    RatioSumFingerprint result;
    bool complete = false;
};

Attempt attempt_ratio_sum(const Integer& N, const Multiple& q, const std::vector<Integer>& primes,
                          const FingerprintOptions& options, long bits) {
    Attempt out;
    RatioSumFingerprint& r = out.result;
    r.bits = bits;
    const JacobianCurve curve = jacobian_curve(family::ratio_sum_curve(N));
    const PointFingerprint f = point_fingerprint(curve, q, primes, bits);
    const Integer k = 8 * (N + 3);
    const Enclosure K = enclose(k, f.x.bits());
    // a = W³(8(N+3) − x + y), b = W³(8(N+3) − x − y), c = W³(−8(N+3) − 2(N+2)x): the map of
    // family/ratio_sum.hpp with x = X/W², y = Y/W³; a + b + c = 2(N+3) W³ (4 − x).
    const std::array<Enclosure, 3> factors = {K - f.x + f.y, K - f.x - f.y,
                                              -K - enclose(Integer(2 * (N + 2)), f.x.bits()) * f.x};
    const int sum_sign = certain_sign(enclose(4L, f.x.bits()) - f.x);
    bool complete = sum_sign != 0;
    if (sum_sign == 0) r.notes.push_back("sign of a + b + c undecided (x(Q) encloses 4)");

    // The common factor: only primes of 2(N+3)(2N+5) can divide all three, and only where
    // W is a p-unit (DESIGN.md §2); read off p-adically.
    Enclosure log_gcd = enclose(0L, bits);
    for (const LocalPicture& local : f.local) {
        const PadicNumber& x = local.point.x;
        if (!x.zero && x.valuation < 0) continue;  // p | W: a ≡ Y (mod p) is a unit
        const PadicContext ctx(local.prime, std::max(x.absolute_precision(), 1L) + 64);
        const PadicNumber kp = padic_from_rational(ctx, Rational(k));
        const PadicNumber twice = padic_from_rational(ctx, Rational(2 * (N + 2)));
        const std::array<PadicNumber, 3> values = {
            padic_add(ctx, padic_subtract(ctx, kp, x), local.point.y),
            padic_subtract(ctx, padic_subtract(ctx, kp, x), local.point.y),
            padic_subtract(ctx, padic_negate(kp), padic_multiply(ctx, twice, x))};
        long v = -1;
        for (const PadicNumber& value : values) {
            if (!value.zero) v = v < 0 ? value.valuation : std::min(v, value.valuation);
        }
        bool known = v >= 0;
        for (const PadicNumber& value : values) {
            if (value.zero && value.valuation <= v) known = false;
        }
        if (!known) {
            complete = false;
            r.notes.push_back("gcd exponent at " + to_string(local.prime) + " undecided");
            continue;
        }
        if (v > 0) {
            r.gcd.push_back(PrimePower{local.prime, static_cast<int>(v)});
            log_gcd = log_gcd + enclose(v, bits) * natural_log(enclose(local.prime, bits));
        }
    }
    const Enclosure log_ten = log_of_ten(bits);
    const char* names[3] = {"a", "b", "c"};
    r.positive = complete;
    double largest = 0;
    for (int i = 0; i < 3; ++i) {
        const int s = certain_sign(factors[i]);
        if (s == 0) {
            complete = false;
            r.positive = false;
            r.notes.push_back(std::string(names[i]) + ": sign undecided at this precision");
            continue;
        }
        const Enclosure log_value =
            3L * f.log_denominator + natural_log(absolute(factors[i])) - log_gcd;
        const Enclosure log10_value = log_value / log_ten;
        largest = std::max(largest, log10_value.upper_double());
        r.numbers[i] = describe(log10_value, options.lead_digits, r.notes, names[i]);
        r.numbers[i].sign = s * (sum_sign == 0 ? 1 : sum_sign);
        if (r.numbers[i].sign < 0) r.positive = false;
        const std::size_t wanted = std::min<std::size_t>(options.lead_digits, r.numbers[i].digits);
        if (!r.numbers[i].digits_certain || r.numbers[i].lead.size() < wanted) complete = false;
    }
    r.log10_size = largest;
    r.certain = complete;
    out.complete = complete;
    return out;
}

}  // namespace

RatioSumFingerprint ratio_sum_fingerprint(const Integer& N, const Multiple& q,
                                          const FingerprintOptions& options) {
    family::check_ratio_sum_parameter(N);
    const Curve e = family::ratio_sum_curve(N);
    if (!on_curve(e, q.generator) || !on_curve(e, q.translate)) {
        throw InputError("the generator and the translate must lie on E_N for N = " + to_string(N));
    }
    if (q.generator.at_infinity) throw InputError("the generator must be a finite point");
    if (has_finite_order(e, q.generator)) {
        throw InputError("the generator " + to_string(q.generator) + " is a torsion point");
    }
    const std::vector<Integer> primes = ratio_sum_correction_primes(N);
    const JacobianCurve curve = jacobian_curve(e);
    // Size first, at low precision: the answer needs log2(index² ĥ) bits before its digits.
    const Enclosure rough = canonical_height_enclosure(curve, q.generator, primes, 64);
    const double log2_height =
        std::log2(std::max(1.0, rough.upper_double())) + 2.0 * bit_length(q.index);
    long bits = 64 + static_cast<long>(3.33 * options.lead_digits) + static_cast<long>(log2_height);
    RatioSumFingerprint last;
    std::vector<std::string> trail;
    while (true) {
        try {
            Attempt a = attempt_ratio_sum(N, q, primes, options, bits);
            // Precision does not cure a lead at an exact boundary: stop when nothing changed.
            const bool stuck = !last.notes.empty() && a.result.notes == last.notes;
            last = a.result;
            if (a.complete) return last;
            if (stuck) break;
        } catch (const EnclosureTooWide& why) {
            trail.push_back(std::string(why.what()) + " at " + std::to_string(bits) + " bits");
        } catch (const PadicPrecisionExhausted& why) {
            trail.push_back(std::string(why.what()) + " at " + std::to_string(bits) + " bits");
        }
        if (2 * bits > options.max_bits) break;
        bits *= 2;
    }
    last.notes.insert(last.notes.end(), trail.begin(), trail.end());
    const SizeEstimate size = estimate_ratio_sum_size(N, q);
    if (size.digits <= options.exact_fallback_digits) {
        const MaterialisedSolution s = materialise_ratio_sum(N, q);
        RatioSumFingerprint exact;
        const std::array<const Integer*, 3> values = {&s.triple.a, &s.triple.b, &s.triple.c};
        for (int i = 0; i < 3; ++i) {
            NumberFingerprint& n = exact.numbers[i];
            n.digits = decimal_digits(*values[i]);
            n.digits_certain = true;
            n.lead = to_string(Integer(abs(*values[i]))).substr(0, options.lead_digits);
            n.sign = sgn(*values[i]);
        }
        exact.gcd = s.gcd;
        exact.positive = s.positive;
        exact.certain = true;
        exact.method = "exact";
        exact.bits = last.bits;
        exact.log10_size = last.log10_size;
        exact.notes.push_back("decided by materialising the solution; the height method left: ");
        for (const std::string& note : last.notes) exact.notes.back() += note + "; ";
        return exact;
    }
    last.certain = false;
    last.notes.push_back("stopped at " + std::to_string(bits) +
                         " bits; the fields above are certified only where stated");
    return last;
}

nlohmann::json to_json(const RatioSumFingerprint& f) {
    nlohmann::json digits = nlohmann::json::array(), lead = nlohmann::json::array();
    for (const NumberFingerprint& n : f.numbers) {
        digits.push_back(n.digits_certain ? nlohmann::json(n.digits) : nlohmann::json(nullptr));
        lead.push_back(n.lead.empty() ? nlohmann::json(nullptr) : nlohmann::json(n.lead));
    }
    nlohmann::json gcd = nlohmann::json::object();
    for (const PrimePower& p : f.gcd) gcd[to_string(p.prime)] = p.exponent;
    nlohmann::json out{{"digits", digits},       {"lead", lead},         {"gcd", gcd},
                       {"positive", f.positive}, {"certain", f.certain}, {"working_bits", f.bits},
                       {"method", f.method}};
    if (!f.notes.empty()) out["notes"] = f.notes;
    return out;
}

}  // namespace arcsieve::exact
