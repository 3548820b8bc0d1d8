#include "basis/analytic_rank_zero.hpp"

#include <cmath>
#include <vector>

#include "basis/reduction_mod_prime.hpp"
#include "curve/minimal_model.hpp"
#include "curve/point.hpp"
#include "curve/tate.hpp"

namespace arcsieve::basis {

namespace {

// #E(F_p) by listing every (x, y) on the long Weierstrass form: for p = 2, 3 only.
long count_points_directly(const Curve& e, long p) {
    auto r = [&](const Rational& a) {
        return static_cast<long>(mpz_fdiv_ui(a.get_num_mpz_t(), static_cast<unsigned long>(p)));
    };
    const long a1 = r(e.a1), a2 = r(e.a2), a3 = r(e.a3), a4 = r(e.a4), a6 = r(e.a6);
    long count = 1;
    for (long x = 0; x < p; ++x) {
        for (long y = 0; y < p; ++y) {
            const long lhs = (y * y + a1 * x * y + a3 * y) % p;
            const long rhs = (x * x * x + a2 * x * x + a4 * x + a6) % p;
            if (lhs == rhs) ++count;
        }
    }
    return count;
}

}  // namespace

std::optional<CentralValue> central_value(const Curve& curve, const Integer& max_conductor) {
    const ModelWithChange minimal = minimal_model(curve);
    const Curve& e = minimal.curve;
    CentralValue result;
    result.conductor = conductor(e);
    if (result.conductor > max_conductor) return std::nullopt;
    const double N = result.conductor.get_d();
    const double sqrt_N = std::sqrt(N);
    // Terms decay like e^{−2πn/(1.2√N)} at worst (the second evaluation point): enough terms
    // for 10^-25 of the leading one.
    const long terms = static_cast<long>(std::ceil(1.2 * sqrt_N * 60.0 / (2 * M_PI))) + 10;
    const auto bad = bad_reduction(e);
    const Curve short_model = apply(e, a1_a3_free_change(e));  // integral, a1 = a3 = 0
    // a_n by multiplicativity (Silverman AEC, Cremona §2.10; common practice).
    std::vector<long> smallest_factor(static_cast<std::size_t>(terms + 1), 0);
    for (long i = 2; i <= terms; ++i) {
        if (smallest_factor[static_cast<std::size_t>(i)] != 0) continue;
        for (long j = i; j <= terms; j += i) {
            if (smallest_factor[static_cast<std::size_t>(j)] == 0)
                smallest_factor[static_cast<std::size_t>(j)] = i;
        }
    }
    std::vector<double> a(static_cast<std::size_t>(terms + 1), 0);
    a[1] = 1;
    for (long n = 2; n <= terms; ++n) {
        const long p = smallest_factor[static_cast<std::size_t>(n)];
        long m = n, power = 1;
        while (m % p == 0) {
            m /= p;
            power *= p;
        }
        if (m > 1) {
            a[static_cast<std::size_t>(n)] =
                a[static_cast<std::size_t>(m)] * a[static_cast<std::size_t>(power)];
            continue;
        }
        // n = p^k
        if (n == p) {
            const LocalReduction* local = nullptr;
            for (const auto& l : bad) {
                if (l.prime == p) local = &l;
            }
            if (local != nullptr) {
                a[static_cast<std::size_t>(n)] =
                    local->kind == ReductionKind::split_multiplicative      ? 1
                    : local->kind == ReductionKind::nonsplit_multiplicative ? -1
                                                                            : 0;
            } else if (p <= 3) {
                a[static_cast<std::size_t>(n)] =
                    static_cast<double>(p + 1 - count_points_directly(e, p));
            } else {
                const auto reduced = reduce_curve(short_model, static_cast<std::uint64_t>(p));
                if (!reduced) return std::nullopt;  // inconsistent with the bad primes found
                a[static_cast<std::size_t>(n)] =
                    static_cast<double>(p + 1) - static_cast<double>(group_order(*reduced));
            }
        } else {
            const long previous = n / p;
            const bool good = N == 0 || std::fmod(N, static_cast<double>(p)) != 0;
            a[static_cast<std::size_t>(n)] =
                good ? a[static_cast<std::size_t>(p)] * a[static_cast<std::size_t>(previous)] -
                           static_cast<double>(p) * a[static_cast<std::size_t>(previous / p)]
                     : a[static_cast<std::size_t>(p)] * a[static_cast<std::size_t>(previous)];
        }
    }
    // Fricke relation for f(τ) = Σ a_n q^n: f(i/(N y)) = w N y² f(i y) (Cremona §2.13).
    auto theta = [&](double y) {
        double sum = 0;
        for (long n = 1; n <= terms; ++n)
            sum += a[static_cast<std::size_t>(n)] * std::exp(-2 * M_PI * n * y);
        return sum;
    };
    int confirmed = 0;
    for (int w : {1, -1}) {
        bool all = true;
        for (double t : {1.1, 1.2}) {
            const double y = t / sqrt_N;
            const double lhs = theta(1 / (N * y)), rhs = w * N * y * y * theta(y);
            const double scale = std::fabs(lhs) + std::fabs(rhs) + 1e-300;
            if (std::fabs(lhs - rhs) > 1e-8 * scale) all = false;
        }
        if (all) confirmed = confirmed == 0 ? w : 2;
    }
    if (confirmed != 1 && confirmed != -1) return std::nullopt;
    result.root_number = confirmed;
    double sum = 0;
    for (long n = 1; n <= terms; ++n) {
        sum += a[static_cast<std::size_t>(n)] / static_cast<double>(n) *
               std::exp(-2 * M_PI * n / sqrt_N);
    }
    result.value = (1 + result.root_number) * sum;
    // |a_n| <= d(n)√n <= 2n (Hasse; common practice): tail <= 2 Σ_{n>M} e^{−2πn/√N}.
    const double ratio = std::exp(-2 * M_PI / sqrt_N);
    const double tail = 2 * 2 * std::pow(ratio, static_cast<double>(terms + 1)) / (1 - ratio);
    result.error_bound = tail + 1e-13 * (1 + std::fabs(sum)) * static_cast<double>(terms);
    return result;
}

}  // namespace arcsieve::basis
