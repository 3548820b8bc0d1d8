#include "lseries/heegner.hpp"

#include <fmt/format.h>
#include <tbb/parallel_for.h>

#include <algorithm>
#include <atomic>
#include <chrono>
#include <cmath>
#include <map>
#include <set>
#include <sstream>
#include <stdexcept>

#include "analytic/height.hpp"
#include "analytic/periods.hpp"
#include "arith/modular.hpp"
#include "curve/torsion.hpp"
#include "lseries/special_values.hpp"
#include "lseries/threads.hpp"

namespace arcsieve::lseries {

namespace {

constexpr double ln2 = 0.69314718055994530942;
constexpr double ln10 = 2.30258509299404568402;

using Clock = std::chrono::steady_clock;

double seconds_since(Clock::time_point start) {
    return std::chrono::duration<double>(Clock::now() - start).count();
}

void report(const HeegnerOptions& options, const std::string& line) {
    if (options.progress) options.progress(line);
}

// A raw MPFR number with RAII (the hot loop avoids Boost's temporaries).
struct Mpfr {
    mpfr_t v;
    explicit Mpfr(mpfr_prec_t bits) { mpfr_init2(v, bits); }
    ~Mpfr() { mpfr_clear(v); }
    Mpfr(const Mpfr&) = delete;
    Mpfr& operator=(const Mpfr&) = delete;
};

unsigned digits_for_bits(unsigned bits) {
    return bits * 30103u / 100000u + 2u;
}

Interval interval_bits(unsigned bits) {
    return interval_zero(digits_for_bits(bits));
}

// The reduced form equivalent to (a, b, c) under SL2(Z) (positive definite; Cohen GTM 138
// Algorithm 5.4.2).
std::tuple<Integer, Integer, Integer> reduce_form(Integer a, Integer b, Integer c, long D) {
    for (;;) {
        const Integer two_a = 2 * a;
        Integer r;
        mpz_fdiv_r(r.get_mpz_t(), b.get_mpz_t(), two_a.get_mpz_t());
        if (r > a) r -= two_a;
        if (r != b) {
            b = r;
            c = (b * b - D) / (4 * a);
        }
        if (a > c) {
            std::swap(a, c);
            b = -b;
            continue;
        }
        if (a == c && b < 0) b = -b;
        return {a, b, c};
    }
}

double log_abs_q(const HeegnerForm& form, long D) {
    // |q| = e^{−2π Im τ} with Im τ = √|D| / (2A): log|q| = −π√|D|/A.
    return -M_PI * std::sqrt(static_cast<double>(-D)) / form.a.get_d();
}

std::uint64_t terms_for_form(const HeegnerForm& form, long D, unsigned digits) {
    const double decay = -log_abs_q(form, D);
    const double need = digits * ln10 + std::log(8.0 / std::min(1.0, decay)) + 8;
    return static_cast<std::uint64_t>(std::ceil(need / decay)) + 8;
}

// Σ_{lo <= n < hi} a_n/n q^n for one form, as an enclosure at `result_bits`.
void chunk_sum(const HeegnerForm& form, long D, const std::vector<std::int32_t>& a,
               std::uint64_t lo, std::uint64_t hi, unsigned target_bits, Interval& out_real,
               Interval& out_imag) {
    const double log_q = log_abs_q(form, D);
    const double decay_bits = -static_cast<double>(lo) * log_q / ln2;
    const double length = static_cast<double>(hi - lo);
    const int guard = 24 + static_cast<int>(std::log2(length + 1) * 2);
    const long precision_long =
        std::max(64L, static_cast<long>(target_bits) + guard - static_cast<long>(decay_bits));
    const auto precision = static_cast<mpfr_prec_t>(precision_long);
    const mpfr_prec_t setup = precision + 32;
    // q^lo = e^{−π lo √|D|/A} e^{−iπ (lo·b mod 2A)/A} and q, at the setup precision.
    Mpfr pi(setup), root(setup), modulus(setup), angle(setup), qr(precision), qi(precision),
        pr(precision), pim(precision), sr(precision), si(precision), tr(precision), ti(precision),
        u1(precision), u2(precision);
    mpfr_const_pi(pi.v, MPFR_RNDN);
    mpfr_set_si(root.v, -D, MPFR_RNDN);
    mpfr_sqrt(root.v, root.v, MPFR_RNDN);
    auto set_power = [&](std::uint64_t n, mpfr_t re, mpfr_t im) {
        Integer reduced = Integer(static_cast<unsigned long>(n)) * form.b;
        const Integer two_a = 2 * form.a;
        mpz_fdiv_r(reduced.get_mpz_t(), reduced.get_mpz_t(), two_a.get_mpz_t());
        Mpfr e(setup), th(setup), cs(setup), sn(setup);
        mpfr_mul_ui(e.v, root.v, static_cast<unsigned long>(n), MPFR_RNDN);
        mpfr_mul(e.v, e.v, pi.v, MPFR_RNDN);
        mpfr_div_z(e.v, e.v, form.a.get_mpz_t(), MPFR_RNDN);
        mpfr_neg(e.v, e.v, MPFR_RNDN);
        mpfr_exp(modulus.v, e.v, MPFR_RNDN);
        mpfr_mul_z(th.v, pi.v, reduced.get_mpz_t(), MPFR_RNDN);
        mpfr_div_z(th.v, th.v, form.a.get_mpz_t(), MPFR_RNDN);
        mpfr_neg(th.v, th.v, MPFR_RNDN);
        mpfr_sin_cos(sn.v, cs.v, th.v, MPFR_RNDN);
        mpfr_mul(re, cs.v, modulus.v, MPFR_RNDN);
        mpfr_mul(im, sn.v, modulus.v, MPFR_RNDN);
    };
    set_power(1, qr.v, qi.v);
    set_power(lo, pr.v, pim.v);
    mpfr_set_zero(sr.v, 1);
    mpfr_set_zero(si.v, 1);
    for (std::uint64_t n = lo; n < hi; ++n) {
        const std::int32_t coefficient = a[n];
        if (coefficient != 0) {
            mpfr_mul_si(tr.v, pr.v, coefficient, MPFR_RNDN);
            mpfr_div_ui(tr.v, tr.v, static_cast<unsigned long>(n), MPFR_RNDN);
            mpfr_add(sr.v, sr.v, tr.v, MPFR_RNDN);
            mpfr_mul_si(ti.v, pim.v, coefficient, MPFR_RNDN);
            mpfr_div_ui(ti.v, ti.v, static_cast<unsigned long>(n), MPFR_RNDN);
            mpfr_add(si.v, si.v, ti.v, MPFR_RNDN);
        }
        // (pr + i pim)(qr + i qi)
        mpfr_mul(u1.v, pr.v, qr.v, MPFR_RNDN);
        mpfr_mul(u2.v, pim.v, qi.v, MPFR_RNDN);
        mpfr_mul(tr.v, pr.v, qi.v, MPFR_RNDN);
        mpfr_mul(ti.v, pim.v, qr.v, MPFR_RNDN);
        mpfr_sub(pr.v, u1.v, u2.v, MPFR_RNDN);
        mpfr_add(pim.v, tr.v, ti.v, MPFR_RNDN);
    }
    // A priori rounding bound: every |q^n| computed carries relative error <= (4L + 8)u, each
    // term two more roundings, each accumulation one rounding of a partial sum bounded by
    // Σ 2|q|^n; with |a_n|/n <= 2: radius <= u (6L + 16)·2|q|^lo/(1 − |q|), doubled for safety.
    const double log_radius =
        (1.0 - static_cast<double>(precision)) * ln2 + std::log(6 * length + 16) + std::log(4.0) +
        static_cast<double>(lo) * log_q - std::log(-std::expm1(log_q)) + std::log(2.0);
    Mpfr radius(64), low(precision + 8), high(precision + 8);
    mpfr_set_d(radius.v, log_radius, MPFR_RNDU);
    mpfr_exp(radius.v, radius.v, MPFR_RNDU);
    out_real = interval_bits(target_bits + 32);
    out_imag = interval_bits(target_bits + 32);
    auto enclose = [&](const Mpfr& mid, Interval& out) {
        mpfr_sub(low.v, mid.v, radius.v, MPFR_RNDD);
        mpfr_add(high.v, mid.v, radius.v, MPFR_RNDU);
        mpfi_interv_fr(out.backend().data(), low.v, high.v);
    };
    enclose(sr, out_real);
    enclose(si, out_imag);
}

std::string hex_of(const Real& value) {
    mpfr_exp_t exponent = 0;
    char* digits = mpfr_get_str(nullptr, &exponent, 16, 0, value.backend().data(), MPFR_RNDN);
    std::string text = digits;
    mpfr_free_str(digits);
    return text + "@" + std::to_string(static_cast<long>(exponent));
}

Real real_of_hex(const std::string& text, unsigned bits) {
    const auto at = text.find('@');
    if (at == std::string::npos) throw InputError("partial sum: malformed number '" + text + "'");
    std::string mantissa = text.substr(0, at);
    const long exponent = std::stol(text.substr(at + 1));
    bool negative = !mantissa.empty() && mantissa[0] == '-';
    if (negative) mantissa = mantissa.substr(1);
    // value = 0.mantissa (base 16) × 16^exponent
    const std::string literal =
        std::string(negative ? "-" : "") + "0." + mantissa + "@" + std::to_string(exponent);
    Real r(0, digits_for_bits(bits));
    if (mpfr_set_str(r.backend().data(), literal.c_str(), 16, MPFR_RNDN) != 0) {
        throw InputError("partial sum: malformed number '" + text + "'");
    }
    return r;
}

std::string interval_text(const Interval& x) {
    const unsigned digits = x.precision();
    Real lo(0, digits), hi(0, digits);
    mpfi_get_left(lo.backend().data(), x.backend().data());
    mpfi_get_right(hi.backend().data(), x.backend().data());
    return hex_of(lo) + " " + hex_of(hi);
}

}  // namespace

HeightPrediction predicted_generator_height(const LSeriesCurve& curve,
                                            const Interval& first_derivative, unsigned digits) {
    HeightPrediction result;
    const RealStructure real = real_structure(curve.minimal.curve, digits);
    result.omega = real.real_period * real.components;
    for (const auto& local : curve.bad_primes) result.tamagawa_product *= local.tamagawa;
    result.torsion_order = static_cast<int>(torsion_subgroup(curve.minimal.curve).points.size());
    const Real derivative = Real(median(first_derivative), digits);
    result.height_times_sha = derivative * result.torsion_order * result.torsion_order /
                              (result.omega * result.tamagawa_product);
    return result;
}

bool is_fundamental_discriminant(long D) {
    auto squarefree = [](long m) {
        m = std::labs(m);
        for (long p = 2; p * p <= m; ++p) {
            if (m % (p * p) == 0) return false;
        }
        return true;
    };
    const long r = ((D % 4) + 4) % 4;
    if (r == 1) return squarefree(D);
    if (r != 0) return false;
    const long m = D / 4;
    const long s = ((m % 4) + 4) % 4;
    return (s == 2 || s == 3) && squarefree(m);
}

bool satisfies_heegner_hypothesis(const LSeriesCurve& curve, long D) {
    if (D >= -4 || !is_fundamental_discriminant(D)) return false;
    for (const auto& local : curve.bad_primes) {
        if (kronecker(D, local.prime.get_ui()) != 1) return false;
    }
    return true;
}

std::optional<Integer> square_root_mod_4n(const Integer& conductor,
                                          const std::vector<LocalReduction>& bad, long D) {
    // Prime powers of 4N.
    std::vector<std::pair<std::uint64_t, int>> powers;
    int two = 2;
    for (const auto& local : bad) {
        if (local.prime == 2)
            two += local.conductor_exponent;
        else
            powers.push_back({local.prime.get_ui(), local.conductor_exponent});
    }
    Integer x = 0, modulus = 1;
    auto combine = [&](const Integer& r, const Integer& m) {  // CRT
        Integer inverse;
        mpz_invert(inverse.get_mpz_t(), modulus.get_mpz_t(), m.get_mpz_t());
        Integer t = ((r - x) % m + m) % m * inverse % m;
        x += modulus * t;
        modulus *= m;
    };
    {
        const std::uint64_t m = 1ULL << two;
        const auto d = static_cast<std::uint64_t>(
            ((D % static_cast<long>(m)) + static_cast<long>(m)) % static_cast<long>(m));
        std::optional<std::uint64_t> root;
        for (std::uint64_t y = 0; y < m && !root; ++y) {
            if (y * y % m == d) root = y;
        }
        if (!root) return std::nullopt;
        combine(Integer(static_cast<unsigned long>(*root)), Integer(static_cast<unsigned long>(m)));
    }
    for (const auto& [p, k] : powers) {
        const auto d = static_cast<std::uint64_t>(
            ((D % static_cast<long>(p)) + static_cast<long>(p)) % static_cast<long>(p));
        if (d == 0 || pow_mod(d, (p - 1) / 2, p) != 1) return std::nullopt;
        Integer root = static_cast<unsigned long>(sqrt_mod_prime(d, p));
        Integer pk = static_cast<unsigned long>(p);
        // Hensel: r <- r − (r² − D)/(2r) modulo p^j, j = 2..k.
        for (int j = 2; j <= k; ++j) {
            pk *= static_cast<unsigned long>(p);
            Integer inverse, twice = 2 * root;
            mpz_invert(inverse.get_mpz_t(), twice.get_mpz_t(), pk.get_mpz_t());
            root = ((root - (root * root - D) * inverse) % pk + pk) % pk;
        }
        combine(root, pk);
    }
    const Integer two_n = 2 * conductor;
    Integer beta = x % two_n;
    if ((beta * beta - D) % (4 * conductor) != 0) throw std::logic_error("square root mod 4N");
    return beta;
}

int class_number(long D) {
    int count = 0;
    for (long a = 1; 3 * a * a <= -D; ++a) {
        for (long b = -a + 1; b <= a; ++b) {
            const long numerator = b * b - D;
            if (numerator % (4 * a) != 0) continue;
            const long c = numerator / (4 * a);
            if (c < a || (c == a && b < 0)) continue;
            if (std::gcd(std::gcd(a, std::labs(b)), c) != 1) continue;
            ++count;
        }
    }
    return count;
}

std::vector<HeegnerForm> heegner_forms(const Integer& conductor, long D, const Integer& beta) {
    const int h = class_number(D);
    std::vector<HeegnerForm> forms;
    std::set<std::tuple<Integer, Integer, Integer>> seen;
    for (long a = 1; static_cast<int>(forms.size()) < h; ++a) {
        if (a > 10'000'000) throw std::runtime_error("heegner_forms: classes not all found");
        const Integer A = conductor * a;
        for (long k = 0; k < a; ++k) {
            const Integer b = beta + 2 * conductor * k;
            const Integer numerator = b * b - D;
            if (numerator % (4 * A) != 0) continue;
            const Integer c = numerator / (4 * A);
            Integer g;
            mpz_gcd(g.get_mpz_t(), A.get_mpz_t(), b.get_mpz_t());
            mpz_gcd(g.get_mpz_t(), g.get_mpz_t(), c.get_mpz_t());
            if (g != 1) continue;
            auto key = reduce_form(A, b, c, D);
            if (seen.insert(key).second) forms.push_back({A, b, c});
        }
    }
    return forms;
}

HeegnerPlan plan_heegner(const LSeriesCurve& curve, const Interval& first_derivative,
                         const HeegnerOptions& options) {
    HeegnerPlan plan;
    plan.conductor = curve.conductor;
    const HeightPrediction prediction = predicted_generator_height(curve, first_derivative, 30);
    plan.predicted_generator_height = prediction.height_times_sha.convert_to<double>();
    const RealStructure real = real_structure(curve.minimal.curve, 30);
    // Gross–Zagier 1986, Theorem I.6.3, in Gross's form L'(E/K,1) = ‖ω‖² ĥ_K(y_K)/(c² u² √|D|)
    // with L(E/K,s) = L(E,s) L(E_D,s), ‖ω‖² = ∫_{C/Λ} |ω ∧ ω̄| = 2·covolume(Λ), Manin constant
    // c = 1 and u = 1 for D < −4. In arcsieve's normalisation this reads
    // ĥ(y_K) = √|D| L'(E,1) L(E_D,1) / (4·covolume): the factor 2 between ĥ_K and ours was
    // fixed on 37a1 (tests/lseries/test_heegner.cpp checks it on several D and curves).
    const double covolume = (real.real_period * real.imaginary_period_im).convert_to<double>();
    struct Candidate {
        long D;
        Integer beta;
        std::vector<HeegnerForm> forms;
        double cost;
    };
    std::vector<Candidate> candidates;
    for (long D = -7; - D <= options.max_discriminant &&
                      static_cast<int>(candidates.size()) < options.discriminants_compared;
         --D) {
        if (options.discriminant != 0 && D != options.discriminant) continue;
        if (!satisfies_heegner_hypothesis(curve, D)) continue;
        const auto beta = square_root_mod_4n(curve.conductor, curve.bad_primes, D);
        if (!beta) continue;
        Candidate c{D, *beta, heegner_forms(curve.conductor, D, *beta), 0};
        for (const auto& f : c.forms) c.cost += 1.0 / -log_abs_q(f, D);
        candidates.push_back(std::move(c));
    }
    if (candidates.empty()) {
        throw InputError(
            fmt::format("no discriminant D with |D| <= {} satisfies the Heegner "
                        "hypothesis for conductor {}: raise the discriminant bound",
                        options.max_discriminant, to_string(curve.conductor)));
    }
    std::sort(candidates.begin(), candidates.end(),
              [](const Candidate& x, const Candidate& y) { return x.cost < y.cost; });
    // Digits: x(P) = X/W² with log max(|X|, W²) ≈ ĥ(P) needs about 2ĥ/ln 10 digits to be
    // recognised by continued fractions; ℘' and the index add a little (extra_digits).
    const double generator_height = std::max(1.0, plan.predicted_generator_height);
    // L(E_D,1) needs about |D|√N terms: candidates beyond twist_limit are skipped (the cheapest
    // sums come from small |D| anyway), and one table of a_n serves every candidate.
    const std::uint64_t twist_limit = std::min<std::uint64_t>(options.max_terms, 30'000'000);
    std::vector<std::int32_t> a;
    for (const Candidate& c : candidates) {
        const Integer twisted_conductor = curve.conductor * c.D * c.D;
        const std::uint64_t twist_terms = special_value_terms(twisted_conductor, 12);
        if (twist_terms > twist_limit) {
            report(options,
                   fmt::format("D = {}: L(E_D,1) needs {} terms, skipped", c.D, twist_terms));
            continue;
        }
        if (a.size() <= twist_terms) {
            a = dirichlet_coefficients(curve, static_cast<std::uint32_t>(twist_terms + 1),
                                       options.threads);
        }
        const Interval value = twisted_central_value(curve.conductor, c.D, a, 12, options.threads);
        if (contains_zero(value)) {
            report(options, fmt::format("D = {}: L(E_D,1) enclosure contains 0, skipped", c.D));
            continue;
        }
        plan.discriminant = c.D;
        plan.beta = c.beta;
        plan.forms = c.forms;
        plan.class_number = static_cast<int>(c.forms.size());
        plan.twisted_value = value;
        const double l_prime = median(first_derivative).convert_to<double>();
        const double l_twist = median(value).convert_to<double>();
        plan.predicted_heegner_height =
            std::sqrt(static_cast<double>(-c.D)) * l_prime * l_twist / (4 * covolume);
        plan.predicted_index = std::sqrt(plan.predicted_heegner_height /
                                         std::max(1e-30, plan.predicted_generator_height));
        break;
    }
    if (plan.discriminant == 0) {
        throw InputError(fmt::format(
            "no usable discriminant among {} candidates: each had L(E_D,1) = 0 numerically or "
            "its L(E_D,1) needed more than {} terms; raise the discriminant bound or the term "
            "limit",
            candidates.size(), twist_limit));
    }
    plan.digits = static_cast<unsigned>(std::ceil(1.1 * 2 * generator_height / ln10 +
                                                  std::log10(plan.predicted_index + 2) +
                                                  options.extra_digits));
    for (const auto& f : plan.forms) {
        const std::uint64_t m = terms_for_form(f, plan.discriminant, plan.digits);
        plan.form_terms.push_back(m);
        plan.max_terms = std::max(plan.max_terms, m);
        plan.total_terms += m;
    }
    // Time: a sample of the sum at full precision, scaled by the mean precision (≈ 0.55 of the
    // full cost as the precision falls with |q|^n), plus a_p by baby-step giant-step. The
    // sample is timed on this machine, so a loaded machine inflates the estimate.
    {
        const std::uint64_t sample = std::min<std::uint64_t>(3000, plan.max_terms);
        const auto a = dirichlet_coefficients(curve, static_cast<std::uint32_t>(sample + 1), 1);
        Interval re, im;
        const auto start = Clock::now();
        chunk_sum(plan.forms.front(), plan.discriminant, a, 1, sample + 1,
                  static_cast<unsigned>(plan.digits * 3.33), re, im);
        const double per_term = seconds_since(start) / static_cast<double>(sample);
        const double threads = options.threads == 0 ? 2.0 : options.threads;
        const double primes =
            static_cast<double>(plan.max_terms) / std::log(static_cast<double>(plan.max_terms) + 2);
        // a_p: about 2.5e-7·p^{1/4} s per prime (baby-step giant-step, measured at 10^6..10^7).
        const double per_prime = 2.5e-7 * std::pow(static_cast<double>(plan.max_terms), 0.25);
        const double core_seconds =
            0.55 * per_term * static_cast<double>(plan.total_terms) + per_prime * primes;
        plan.core_hours = core_seconds / 3600;
        plan.seconds_estimate = core_seconds / threads;
    }
    return plan;
}

HeegnerPartialSum heegner_partial_sum(const HeegnerPlan& plan, const std::vector<std::int32_t>& a,
                                      std::uint64_t begin, std::uint64_t end, unsigned threads,
                                      double deadline_seconds) {
    if (begin < 1 || end < begin) throw std::invalid_argument("heegner_partial_sum: bad range");
    const unsigned target_bits = static_cast<unsigned>(plan.digits * 3.33) + 16;
    struct Task {
        std::size_t form;
        std::uint64_t lo, hi;
    };
    std::vector<Task> tasks;
    constexpr std::uint64_t chunk = 16384;
    for (std::size_t i = 0; i < plan.forms.size(); ++i) {
        const std::uint64_t stop = std::min(end, plan.form_terms[i] + 1);
        for (std::uint64_t lo = begin; lo < stop; lo += chunk) {
            tasks.push_back({i, lo, std::min(stop, lo + chunk)});
        }
    }
    if (!tasks.empty() && a.size() <= tasks.back().hi - 1) {
        for (const Task& t : tasks) {
            if (a.size() < t.hi) throw std::logic_error("heegner_partial_sum: too few a_n");
        }
    }
    std::vector<Interval> real(tasks.size()), imaginary(tasks.size());
    std::atomic<bool> late{false};
    const auto start = Clock::now();
    run_with_threads(threads, [&] {
        tbb::parallel_for(std::size_t{0}, tasks.size(), [&](std::size_t k) {
            if (late.load()) return;
            if (deadline_seconds > 0 && seconds_since(start) > deadline_seconds) {
                late = true;
                return;
            }
            chunk_sum(plan.forms[tasks[k].form], plan.discriminant, a, tasks[k].lo, tasks[k].hi,
                      target_bits, real[k], imaginary[k]);
        });
    });
    if (late) {
        throw std::runtime_error(
            fmt::format("Heegner sum stopped at the time limit of {:.0f} s", deadline_seconds));
    }
    HeegnerPartialSum sum;
    sum.begin = begin;
    sum.end = end;
    sum.real = interval_bits(target_bits + 32);
    sum.imaginary = interval_bits(target_bits + 32);
    for (std::size_t k = 0; k < tasks.size(); ++k) {
        mpfi_add(sum.real.backend().data(), sum.real.backend().data(), real[k].backend().data());
        mpfi_add(sum.imaginary.backend().data(), sum.imaginary.backend().data(),
                 imaginary[k].backend().data());
    }
    return sum;
}

HeegnerPartialSum merge(const HeegnerPartialSum& x, const HeegnerPartialSum& y) {
    if (x.begin < y.end && y.begin < x.end && x.begin != x.end && y.begin != y.end) {
        throw std::invalid_argument("merge: overlapping ranges of n");
    }
    HeegnerPartialSum sum;
    sum.begin = std::min(x.begin, y.begin);
    sum.end = std::max(x.end, y.end);
    const unsigned digits = std::max(x.real.precision(), y.real.precision());
    sum.real = interval_zero(digits);
    sum.imaginary = interval_zero(digits);
    mpfi_add(sum.real.backend().data(), x.real.backend().data(), y.real.backend().data());
    mpfi_add(sum.imaginary.backend().data(), x.imaginary.backend().data(),
             y.imaginary.backend().data());
    return sum;
}

std::string serialise(const HeegnerPartialSum& sum) {
    return fmt::format("heegner-partial-sum {} {} {} {} {}", sum.begin, sum.end,
                       sum.real.precision(), interval_text(sum.real), interval_text(sum.imaginary));
}

HeegnerPartialSum deserialise_partial_sum(const std::string& text) {
    std::istringstream in(text);
    std::string tag, rl, rh, il, ih;
    HeegnerPartialSum sum;
    unsigned digits = 0;
    in >> tag >> sum.begin >> sum.end >> digits >> rl >> rh >> il >> ih;
    if (!in || tag != "heegner-partial-sum" || digits == 0 || digits > 100000) {
        throw InputError("not a Heegner partial sum line: '" + text.substr(0, 60) + "'");
    }
    const unsigned bits = digits * 3322u / 1000u + 8;
    sum.real = make_interval(real_of_hex(rl, bits), real_of_hex(rh, bits), digits);
    sum.imaginary = make_interval(real_of_hex(il, bits), real_of_hex(ih, bits), digits);
    return sum;
}

HeegnerTrace heegner_trace(const HeegnerPlan& plan, const HeegnerPartialSum& total) {
    if (total.begin != 1 || total.end < plan.max_terms + 1) {
        throw std::invalid_argument("heegner_trace: the partial sums do not cover [1, M]");
    }
    HeegnerTrace trace{total.real, total.imaginary};
    const unsigned digits = total.real.precision();
    for (std::size_t i = 0; i < plan.forms.size(); ++i) {
        // |Σ_{n>M}| <= 2 |q|^{M+1} / (1 − |q|) since |a_n|/n <= 2.
        const double log_tail = std::log(2.0) +
                                static_cast<double>(plan.form_terms[i] + 1) *
                                    log_abs_q(plan.forms[i], plan.discriminant) -
                                std::log(-std::expm1(log_abs_q(plan.forms[i], plan.discriminant))) +
                                std::log(2.0);
        Real bound(0, 20);
        mpfr_set_d(bound.backend().data(), log_tail, MPFR_RNDU);
        mpfr_exp(bound.backend().data(), bound.backend().data(), MPFR_RNDU);
        const Interval pm = make_interval(Real(-bound), bound, digits);
        trace.real += pm;
        trace.imaginary += pm;
    }
    return trace;
}

namespace {

// Continued-fraction convergents of x; the first X/W² (W² a square denominator) that gives a
// point on the curve with y close to `y_hint` is returned.
std::optional<Point> recognise_point(const Curve& curve, const Real& x, const Real& y_hint,
                                     unsigned digits) {
    const unsigned working = digits;
    Real rest(x, working);
    Integer h1 = 1, h2 = 0, k1 = 0, k2 = 1;
    Integer limit;
    mpz_ui_pow_ui(limit.get_mpz_t(), 10, std::max(4u, digits / 2 - 2));
    Real tolerance(1, working);
    tolerance /= boost::multiprecision::pow(Real(10, working), static_cast<int>(digits) - 8);
    for (int step = 0; step < 100000; ++step) {
        Real floor_value(0, working);
        mpfr_floor(floor_value.backend().data(), rest.backend().data());
        Integer q;
        mpfr_get_z(q.get_mpz_t(), floor_value.backend().data(), MPFR_RNDN);
        const Integer h = q * h1 + h2, k = q * k1 + k2;
        h2 = h1;
        h1 = h;
        k2 = k1;
        k1 = k;
        if (k > limit) break;
        // Only a convergent that explains every digit of x counts (|x − h/k| tiny), so a
        // small rational point near a crude convergent is never taken for the answer.
        const Real approximation = make_real(Rational(h, k), working) - x;
        const bool explains = abs(approximation) < tolerance * (1 + abs(x));
        if (explains && mpz_perfect_square_p(k.get_mpz_t())) {
            Rational candidate(h, k);
            candidate.canonicalize();
            // y² + (a1 x + a3) y = x³ + a2 x² + a4 x + a6
            const Rational linear = curve.a1 * candidate + curve.a3;
            const Rational cubic =
                ((candidate + curve.a2) * candidate + curve.a4) * candidate + curve.a6;
            const Rational disc = linear * linear + 4 * cubic;
            if (disc >= 0 && mpz_perfect_square_p(disc.get_num_mpz_t()) &&
                mpz_perfect_square_p(disc.get_den_mpz_t())) {
                Integer rn, rd;
                mpz_sqrt(rn.get_mpz_t(), disc.get_num_mpz_t());
                mpz_sqrt(rd.get_mpz_t(), disc.get_den_mpz_t());
                Rational root(rn, rd);
                root.canonicalize();
                Point best;
                bool found = false;
                double best_distance = 0;
                for (int sign : {1, -1}) {
                    Point p{candidate, (sign * root - linear) / 2, false};
                    p.y.canonicalize();
                    if (!on_curve(curve, p)) continue;
                    const double distance =
                        std::fabs((make_real(p.y, 30) - Real(y_hint, 30)).convert_to<double>());
                    if (!found || distance < best_distance) {
                        best = p;
                        best_distance = distance;
                        found = true;
                    }
                }
                if (found && !torsion_order(curve, best)) return best;
            }
        }
        Real fraction = rest - floor_value;
        if (fraction == 0) break;
        rest = 1 / fraction;
    }
    return std::nullopt;
}

double fractional_distance(double value) {
    return std::fabs(value - std::round(value));
}

}  // namespace

std::optional<HeegnerResult> recover_heegner_point(const LSeriesCurve& curve,
                                                   const HeegnerPlan& plan,
                                                   const HeegnerTrace& trace) {
    const unsigned digits = plan.digits;
    const Curve& e = curve.minimal.curve;
    const RealStructure real = real_structure(e, digits + 10);
    const Real zr(median(trace.real), digits + 10), zi(median(trace.imaginary), digits + 10);
    const TorsionGroup torsion = torsion_subgroup(e);
    struct Log {
        double s2;
        Real s1;
    };
    std::vector<Log> torsion_logs;
    for (const Point& t : torsion.points) {
        if (t.at_infinity) {
            torsion_logs.push_back({0.0, Real(0, digits + 10)});
            continue;
        }
        const EllipticLog log = elliptic_log(e, real, t);
        torsion_logs.push_back({0.5 * log.component, Real(log.t, digits + 10)});
    }
    // Index candidates: ℓ² near predicted_heegner / predicted_generator, and their small
    // multiples (|Sha| a square); every ℓ up to 4 besides.
    std::vector<int> indices;
    const double predicted = std::max(1.0, plan.predicted_index);
    for (int k = 1; k <= 3; ++k) {
        const int l = static_cast<int>(std::lround(predicted * k));
        for (int d : {0, -1, 1}) {
            if (l + d >= 1 && std::find(indices.begin(), indices.end(), l + d) == indices.end())
                indices.push_back(l + d);
        }
    }
    for (int l = 1; l <= 4; ++l) {
        if (std::find(indices.begin(), indices.end(), l) == indices.end()) indices.push_back(l);
    }
    const bool rectangular = real.components == 2;
    for (int multiplier : {1, 2, 3, 4}) {
        // w = multiplier·z = s1 ω1 + s2 ω2
        const Real wr = zr * multiplier, wi = zi * multiplier;
        const Real s2 = wi / real.imaginary_period_im;
        const Real s1 = (wr - s2 * real.imaginary_period_re) / real.real_period;
        const double s2d = s2.convert_to<double>();
        const bool on_real_locus =
            rectangular ? fractional_distance(2 * s2d) < 1e-6 : fractional_distance(s2d) < 1e-6;
        if (!on_real_locus) continue;
        for (int l : indices) {
            for (const Log& t : torsion_logs) {
                for (int m2 = 0; m2 < l; ++m2) {
                    const double s2u = (s2d - t.s2 + m2) / l;
                    if (rectangular ? fractional_distance(2 * s2u) > 1e-6
                                    : fractional_distance(s2u) > 1e-6)
                        continue;
                    const int component = rectangular && fractional_distance(s2u) > 0.25 ? 1 : 0;
                    for (int m1 = 0; m1 < l; ++m1) {
                        Real t_value = (s1 - t.s1 + m1) / l;
                        t_value -= floor(t_value);
                        const RealPoint p = point_from_log(e, real, component, t_value);
                        if (p.at_infinity) continue;
                        const auto point = recognise_point(e, p.x, p.y, digits);
                        if (!point) continue;
                        HeegnerResult result;
                        result.point = to_old_model(curve.minimal.change, *point);
                        result.discriminant = plan.discriminant;
                        result.index = l;
                        result.multiplier = multiplier;
                        result.digits = digits;
                        result.terms = plan.total_terms;
                        result.height = canonical_height(curve.input, result.point, 20);
                        return result;
                    }
                }
            }
        }
    }
    return std::nullopt;
}

std::optional<HeegnerResult> heegner_point(const Curve& curve, const AnalyticRank& rank,
                                           const HeegnerOptions& options,
                                           std::vector<std::string>* notes) {
    auto note = [&](const std::string& text) {
        if (notes) notes->push_back(text);
        report(options, text);
    };
    const auto derivative = first_derivative(rank);
    if (!derivative) {
        note("Heegner point not attempted: analytic rank 1 is not proven");
        return std::nullopt;
    }
    const auto start = Clock::now();
    const LSeriesCurve lcurve = lseries_curve(curve);
    HeegnerOptions current = options;
    for (int attempt = 0; attempt < 3; ++attempt) {
        const HeegnerPlan plan = plan_heegner(lcurve, *derivative, current);
        note(
            fmt::format("Heegner plan: D = {}, {} forms, predicted ĥ(P) = {:.6g} (BSD, |Sha| = "
                        "1), ĥ(y_K) = {:.6g} (Gross–Zagier), index ≈ {:.3g}, {} digits, {} "
                        "terms (max {}), estimate {:.1f} s ({:.3g} core-hours)",
                        plan.discriminant, plan.forms.size(), plan.predicted_generator_height,
                        plan.predicted_heegner_height, plan.predicted_index, plan.digits,
                        plan.total_terms, plan.max_terms, plan.seconds_estimate, plan.core_hours));
        if (plan.max_terms > options.max_terms) {
            throw InputError(fmt::format(
                "the Heegner sum needs {} terms (a_n up to {}; about {:.3g} core-hours), above "
                "the limit of {} terms: raise the Heegner term limit to allow it",
                plan.total_terms, plan.max_terms, plan.core_hours, options.max_terms));
        }
        const double remaining = options.time_limit_seconds - seconds_since(start);
        if (plan.seconds_estimate > remaining) {
            throw InputError(fmt::format(
                "the Heegner sum is estimated at {:.0f} s ({} terms, {:.3g} core-hours), above "
                "the time left ({:.0f} s of the limit): raise the time limit to allow it",
                plan.seconds_estimate, plan.total_terms, plan.core_hours, remaining));
        }
        const auto a = dirichlet_coefficients(
            lcurve, static_cast<std::uint32_t>(plan.max_terms + 1), options.threads);
        const HeegnerPartialSum sum =
            heegner_partial_sum(plan, a, 1, plan.max_terms + 1, options.threads,
                                options.time_limit_seconds - seconds_since(start));
        const HeegnerTrace trace = heegner_trace(plan, sum);
        if (auto result = recover_heegner_point(lcurve, plan, trace)) {
            result->seconds = seconds_since(start);
            result->notes.push_back(
                fmt::format("Heegner point for D = {} ({} classes), index {}, {} digits, {} terms",
                            plan.discriminant, plan.forms.size(), result->index, plan.digits,
                            plan.total_terms));
            return result;
        }
        note(fmt::format("no rational point recognised at {} digits; raising the precision",
                         plan.digits));
        current.extra_digits = current.extra_digits * 2 + plan.digits / 2;
    }
    note("Heegner point not recovered after three precisions");
    return std::nullopt;
}

}  // namespace arcsieve::lseries
