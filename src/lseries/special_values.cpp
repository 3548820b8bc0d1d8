#include "lseries/special_values.hpp"

#include <fmt/format.h>
#include <tbb/blocked_range.h>
#include <tbb/parallel_reduce.h>

#include <cmath>
#include <cstdlib>
#include <sstream>
#include <stdexcept>

#include "lseries/threads.hpp"

namespace arcsieve::lseries {

namespace {

constexpr double ln2 = 0.69314718055994530942;
constexpr double ln10 = 2.30258509299404568402;

unsigned digits_for_bits(unsigned bits) {
    return bits * 30103u / 100000u + 2u;
}

Interval interval_at_bits(unsigned bits) {
    Interval r = interval_zero(digits_for_bits(bits));
    return r;
}

mpfi_ptr raw(Interval& x) {
    return x.backend().data();
}
mpfi_srcptr raw(const Interval& x) {
    return x.backend().data();
}

// The interval [−m, m] for m = the largest |t| over t in `bound`, at the precision of `like`.
Interval symmetric(const Interval& bound, unsigned bits) {
    Real m(0, digits_for_bits(bits));
    mpfi_mag(m.backend().data(), raw(bound));
    Real minus = -m;
    Interval r = interval_at_bits(bits);
    mpfi_interv_fr(raw(r), minus.backend().data(), m.backend().data());
    return r;
}

double upper_double(const Interval& x) {
    Real m(0, 20);
    mpfi_mag(m.backend().data(), raw(x));
    return m.convert_to<double>();
}

Interval euler_gamma(unsigned bits) {
    Interval r = interval_at_bits(bits);
    mpfi_const_euler(raw(r));
    return r;
}

Interval zeta3(unsigned bits) {
    Real lo(0, digits_for_bits(bits)), hi(0, digits_for_bits(bits));
    mpfr_zeta_ui(lo.backend().data(), 3, MPFR_RNDD);
    mpfr_zeta_ui(hi.backend().data(), 3, MPFR_RNDU);
    Interval r = interval_at_bits(bits);
    mpfi_interv_fr(raw(r), lo.backend().data(), hi.backend().data());
    return r;
}

Interval with_bits(const Interval& x, unsigned bits) {
    Interval r = interval_at_bits(bits);
    mpfi_set(raw(r), raw(x));
    return r;
}

// P_r(t) = [s^r] exp((t − γ)s + ζ(2)s²/2 − ζ(3)s³/3 + …), the log-gamma expansion of Γ(1+s).
Interval log_polynomial(int r, const Interval& t, unsigned bits) {
    const Interval u = t - euler_gamma(bits);
    if (r == 1) return u;
    const Interval pi = pi_interval(digits_for_bits(bits));
    const Interval zeta2 = pi * pi / 6;
    if (r == 2) return u * u / 2 + zeta2 / 2;
    return u * u * u / 6 + u * zeta2 / 2 - zeta3(bits) / 3;
}

// x0 = 2π/(scale·√N) as an enclosure.
Interval series_step(const Integer& conductor, const Interval& scale, unsigned bits) {
    Interval n = make_interval(conductor, digits_for_bits(bits));
    Interval root = sqrt(n);
    return 2 * pi_interval(digits_for_bits(bits)) / (scale * root);
}

Interval series_step(const Integer& conductor, unsigned bits) {
    return series_step(conductor, make_interval(1L, digits_for_bits(bits)), bits);
}

// Σ_{begin <= n < end} coefficient(n) · q^n with q = e^{−step}: one exponential per chunk,
// then the recurrence q^{n+1} = q^n·q.
template <class Coefficient>
Interval geometric_sum(const Interval& step, std::uint64_t terms, unsigned bits, unsigned threads,
                       Coefficient coefficient) {
    auto body = [&] {
        return tbb::parallel_reduce(
            tbb::blocked_range<std::uint64_t>(1, terms + 1, 4096), interval_at_bits(bits),
            [&](const tbb::blocked_range<std::uint64_t>& range, Interval sum) {
                Interval q = interval_at_bits(bits), power = interval_at_bits(bits);
                mpfi_neg(raw(q), raw(step));
                mpfi_exp(raw(q), raw(q));
                Interval start = interval_at_bits(bits);
                mpfi_mul_ui(raw(start), raw(step), static_cast<unsigned long>(range.begin()));
                mpfi_neg(raw(start), raw(start));
                mpfi_exp(raw(power), raw(start));
                Interval c = interval_at_bits(bits);
                for (std::uint64_t n = range.begin(); n != range.end(); ++n) {
                    coefficient(n, c);
                    mpfi_mul(raw(c), raw(c), raw(power));
                    mpfi_add(raw(sum), raw(sum), raw(c));
                    mpfi_mul(raw(power), raw(power), raw(q));
                }
                return sum;
            },
            [](const Interval& x, const Interval& y) { return Interval(x + y); });
    };
    return run_with_threads(threads, body);
}

std::uint64_t terms_for_decay(double step, unsigned digits, double polynomial_weight) {
    // Smallest M with (polynomial factor) e^{−M step} below 10^{−digits−2}.
    double m = ((digits + 2) * ln10 + std::log(2.0 / step)) / step;
    for (int i = 0; i < 4; ++i) {
        m = ((digits + 2) * ln10 + std::log(2.0 / step) +
             polynomial_weight * std::log(std::max(2.0, m / (1 - std::exp(-step))))) /
            step;
    }
    return static_cast<std::uint64_t>(std::ceil(m)) + 16;
}

}  // namespace

Interval incomplete_gamma_family(int r, const Interval& x, unsigned bits) {
    if (r < 0 || r > 3) throw std::invalid_argument("incomplete_gamma_family: order in [0, 3]");
    if (!(mpfi_is_strictly_pos(raw(x)) > 0))
        throw std::invalid_argument("incomplete_gamma_family: x must be positive");
    if (r == 0) {
        Interval y = with_bits(x, bits + 8);
        mpfi_neg(raw(y), raw(y));
        mpfi_exp(raw(y), raw(y));
        return with_bits(y, bits);
    }
    const double x_upper = upper_double(x);
    const double target = -(static_cast<double>(bits) + 4) * ln2;
    if (r == 1 && x_upper > 4) {
        // Enveloping asymptotic series: usable when some K <= x makes K!/x^K e^{−x}/x tiny.
        double log_size = -x_upper - std::log(x_upper);
        int terms = 0;
        while (terms < x_upper && log_size > target) {
            ++terms;
            log_size += std::log(terms / x_upper);
        }
        if (log_size <= target) {
            const unsigned work = bits + 12;
            const Interval X = with_bits(x, work);
            Interval sum = interval_at_bits(work), term = interval_at_bits(work);
            mpfi_set_si(raw(term), 1);
            for (int k = 0; k < terms; ++k) {
                mpfi_add(raw(sum), raw(sum), raw(term));
                mpfi_mul_si(raw(term), raw(term), -(k + 1));
                mpfi_div(raw(term), raw(term), raw(X));
            }
            sum += symmetric(term, work);  // |remainder| <= first omitted term
            Interval scale = interval_at_bits(work);
            mpfi_neg(raw(scale), raw(X));
            mpfi_exp(raw(scale), raw(scale));
            mpfi_div(raw(scale), raw(scale), raw(X));
            return with_bits(Interval(scale * sum), bits);
        }
    }
    // Power series, with 1.45x extra bits for the cancellation between terms of size e^x.
    const unsigned work = bits + static_cast<unsigned>(1.45 * x_upper) + 16;
    const Interval X = with_bits(x, work);
    Interval minus_log = interval_at_bits(work);
    mpfi_log(raw(minus_log), raw(X));
    mpfi_neg(raw(minus_log), raw(minus_log));
    Interval result = log_polynomial(r, minus_log, work);
    Interval power = interval_at_bits(work), term = interval_at_bits(work);
    mpfi_set_si(raw(power), 1);
    const double stop = -(static_cast<double>(work) - 1.45 * x_upper) * ln2;
    for (unsigned long n = 1;; ++n) {
        mpfi_mul(raw(power), raw(power), raw(X));
        mpfi_div_ui(raw(power), raw(power), n);  // x^n / n!
        mpfi_set(raw(term), raw(power));
        for (int k = 0; k < r; ++k) mpfi_div_ui(raw(term), raw(term), n);
        if (((n - static_cast<unsigned long>(r)) & 1) == 0) {
            mpfi_add(raw(result), raw(result), raw(term));
        } else {
            mpfi_sub(raw(result), raw(result), raw(term));
        }
        if (n + 2 > 2 * x_upper + 2) {
            const double log_next = std::log(upper_double(term)) + std::log(x_upper / (n + 1));
            if (log_next < stop || n > 100000) {
                // Σ_{m>n} x^m/(m^r m!) <= T_{n+1} / (1 − x/(n+2)), T_{n+1} <= term·x/(n+1).
                Interval bound = term * X / (n + 1);
                Interval ratio = 1 - X / (n + 2);
                bound /= ratio;
                result += symmetric(bound, work);
                break;
            }
        }
    }
    return with_bits(result, bits);
}

std::uint64_t special_value_terms(const Integer& conductor, unsigned digits) {
    const double step = 2 * M_PI / std::sqrt(conductor.get_d());
    return terms_for_decay(step, digits, 0);
}

std::uint64_t functional_equation_terms(const Integer& conductor, unsigned digits) {
    const double step = 2 * M_PI / (1.7 * std::sqrt(conductor.get_d()));
    return terms_for_decay(step, digits + 2, 2);
}

Interval special_value(const Integer& conductor, const std::vector<std::int32_t>& a, int order,
                       unsigned digits, unsigned threads) {
    if (order < 0 || order > 3) throw std::invalid_argument("special_value: order in [0, 3]");
    const std::uint64_t terms = special_value_terms(conductor, digits);
    if (a.size() <= terms) throw std::logic_error("special_value: too few coefficients");
    const unsigned bits = static_cast<unsigned>(digits * 3.33 + 2 * std::log2(terms + 1.0)) + 24;
    const Interval step = series_step(conductor, bits);
    Interval sum = interval_at_bits(bits);
    if (order == 0) {
        sum = geometric_sum(step, terms, bits, threads, [&](std::uint64_t n, Interval& c) {
            mpfi_set_si(raw(c), a[n]);
            mpfi_div_ui(raw(c), raw(c), static_cast<unsigned long>(n));
        });
    } else {
        auto body = [&] {
            return tbb::parallel_reduce(
                tbb::blocked_range<std::uint64_t>(1, terms + 1, 256), interval_at_bits(bits),
                [&](const tbb::blocked_range<std::uint64_t>& range, Interval partial) {
                    Interval x = interval_at_bits(bits), c = interval_at_bits(bits);
                    for (std::uint64_t n = range.begin(); n != range.end(); ++n) {
                        if (a[n] == 0) continue;
                        mpfi_mul_ui(raw(x), raw(step), static_cast<unsigned long>(n));
                        Interval g = incomplete_gamma_family(order, x, bits);
                        mpfi_mul_si(raw(c), raw(g), a[n]);
                        mpfi_div_ui(raw(c), raw(c), static_cast<unsigned long>(n));
                        mpfi_add(raw(partial), raw(partial), raw(c));
                    }
                    return partial;
                },
                [](const Interval& x, const Interval& y) { return Interval(x + y); });
        };
        sum = run_with_threads(threads, body);
    }
    // Tail: 2 Σ_{n>M} e^{−n x0} (r = 0) or 2 Σ_{n>M} e^{−n x0}/(n x0) (r >= 1).
    Interval decay = interval_at_bits(bits);
    mpfi_mul_ui(raw(decay), raw(step), static_cast<unsigned long>(terms + 1));
    Interval tail = exp(-decay) * 2 / (1 - exp(-step));
    if (order >= 1) tail /= decay;
    sum += symmetric(tail, bits);
    long factorial = 1;
    for (int k = 2; k <= order; ++k) factorial *= k;
    return sum * (2 * factorial);
}

std::optional<int> functional_equation_sign(const Integer& conductor,
                                            const std::vector<std::int32_t>& a, unsigned digits,
                                            unsigned threads) {
    const std::uint64_t terms = functional_equation_terms(conductor, digits);
    if (a.size() <= terms) throw std::logic_error("functional_equation_sign: too few coefficients");
    const unsigned bits = static_cast<unsigned>(digits * 3.33 + 2 * std::log2(terms + 1.0)) + 24;
    auto theta = [&](const Interval& scale) {
        // Σ a_n e^{−2πn/(scale√N)} + tail bound 2 Σ_{n>M} n q^n, the slowest side for scale 1.7.
        const Interval step = series_step(conductor, scale, bits);
        Interval sum = geometric_sum(step, terms, bits, threads, [&](std::uint64_t n, Interval& c) {
            mpfi_set_si(raw(c), a[n]);
        });
        const Interval q = exp(-step);
        Interval decay = interval_at_bits(bits);
        mpfi_mul_ui(raw(decay), raw(step), static_cast<unsigned long>(terms + 1));
        const Interval first = exp(-decay);
        Interval tail = 2 * first * ((terms + 1) / (1 - q) + q / ((1 - q) * (1 - q)));
        sum += symmetric(tail, bits);
        return sum;
    };
    for (double lambda : {1.1, 1.25, 1.4, 1.7}) {
        // y = 1/(λ√N): f(i/(Ny)) = θ at 2π·λ/√N, i.e. scale 1/λ; N y² f(iy) = λ^{−2}·θ(scale λ).
        Interval lambda_interval = interval_at_bits(bits);
        mpfi_set_d(raw(lambda_interval), lambda);  // exact: λ is a double
        const Interval lhs = theta(Interval(1 / lambda_interval));
        const Interval rhs = theta(lambda_interval) / (lambda_interval * lambda_interval);
        const bool differ = !contains_zero(Interval(lhs - rhs));
        const bool opposite = !contains_zero(Interval(lhs + rhs));
        if (differ && !opposite) return -1;
        if (opposite && !differ) return 1;
        if (differ && opposite) {
            throw std::runtime_error(
                "functional equation fails for both signs: conductor or a_n inconsistent");
        }
    }
    return std::nullopt;
}

int kronecker(long discriminant, std::uint64_t n) {
    if (n == 0) return std::labs(discriminant) == 1 ? 1 : 0;
    int result = 1;
    while ((n & 1) == 0) {
        n >>= 1;
        const long r = ((discriminant % 8) + 8) % 8;
        if (r % 2 == 0) return 0;
        if (r == 3 || r == 5) result = -result;
    }
    if (n == 1) return result;
    const long modulus = static_cast<long>(n);
    const auto residue = static_cast<std::uint64_t>(((discriminant % modulus) + modulus) % modulus);
    return result * jacobi_symbol(residue, n);
}

Interval twisted_central_value(const Integer& conductor, long discriminant,
                               const std::vector<std::int32_t>& a, unsigned digits,
                               unsigned threads) {
    const Integer twisted = conductor * discriminant * discriminant;
    const std::uint64_t terms = special_value_terms(twisted, digits);
    if (a.size() <= terms) throw std::logic_error("twisted_central_value: too few coefficients");
    const unsigned bits = static_cast<unsigned>(digits * 3.33 + 2 * std::log2(terms + 1.0)) + 24;
    const Interval step = series_step(twisted, bits);
    Interval sum = geometric_sum(step, terms, bits, threads, [&](std::uint64_t n, Interval& c) {
        mpfi_set_si(raw(c), a[n] * kronecker(discriminant, n));
        mpfi_div_ui(raw(c), raw(c), static_cast<unsigned long>(n));
    });
    Interval decay = interval_at_bits(bits);
    mpfi_mul_ui(raw(decay), raw(step), static_cast<unsigned long>(terms + 1));
    const Interval tail = exp(-decay) * 2 / (1 - exp(-step));
    sum += symmetric(tail, bits);
    return sum * 2;
}

bool contains_zero(const Interval& x) {
    return mpfi_has_zero(raw(x)) > 0;
}

std::string format_enclosure(const Interval& x, int significant) {
    Real lo(0, 40), hi(0, 40);
    mpfi_get_left(lo.backend().data(), raw(x));
    mpfi_get_right(hi.backend().data(), raw(x));
    std::ostringstream out;
    out.precision(significant);
    out << "[" << lo << ", " << hi << "]";
    return out.str();
}

}  // namespace arcsieve::lseries
