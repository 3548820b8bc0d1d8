// Benchmarks for the lseries layer, each reported against a baseline measured in the same run:
// a_p by baby-step giant-step against the Legendre-sum baseline (primes near 10^5 and 10^6),
// the Heegner sum's cost per term against one MPFR multiplication at the same precision, and
// the a_p table for p <= 10^6 on 1 thread against 2.
#include <benchmark/benchmark.h>

#include <map>

#include "family/ratio_sum.hpp"
#include "lseries/coefficients.hpp"
#include "lseries/heegner.hpp"

namespace {

using namespace arcsieve;
using namespace arcsieve::lseries;

const std::vector<std::uint32_t>& primes_near(std::uint32_t center) {
    static std::map<std::uint32_t, std::vector<std::uint32_t>> cache;
    auto& list = cache[center];
    if (list.empty()) {
        for (std::uint32_t p : primes_up_to(center + 20000)) {
            if (p >= center && list.size() < 64) list.push_back(p);
        }
    }
    return list;
}

void BM_TraceLegendreSum(benchmark::State& state) {
    const auto& primes = primes_near(static_cast<std::uint32_t>(state.range(0)));
    std::size_t i = 0;
    for (auto _ : state) {
        const std::uint64_t p = primes[i++ % primes.size()];
        benchmark::DoNotOptimize(trace_by_legendre_sum(17 % p, 23 % p, p));
    }
}
BENCHMARK(BM_TraceLegendreSum)->Arg(100000)->Arg(1000000)->Unit(benchmark::kMicrosecond);

void BM_TraceBabyGiant(benchmark::State& state) {
    const auto& primes = primes_near(static_cast<std::uint32_t>(state.range(0)));
    std::size_t i = 0;
    for (auto _ : state) {
        const std::uint64_t p = primes[i++ % primes.size()];
        benchmark::DoNotOptimize(trace_by_baby_giant(17 % p, 23 % p, p));
    }
}
BENCHMARK(BM_TraceBabyGiant)
    ->Arg(100000)
    ->Arg(1000000)
    ->Arg(10000000)
    ->Unit(benchmark::kMicrosecond);

void BM_PrimeTracesUpTo1e6(benchmark::State& state) {
    const auto curve = lseries_curve(family::ratio_sum_curve(Integer(178)));
    for (auto _ : state) {
        benchmark::DoNotOptimize(
            prime_traces(curve, 1000000, static_cast<unsigned>(state.range(0))));
    }
}
BENCHMARK(BM_PrimeTracesUpTo1e6)->Arg(1)->Arg(2)->Unit(benchmark::kMillisecond)->UseRealTime();

// The Heegner sum of 637.d1 raised to `digits` digits; per-term time over the range.
void BM_HeegnerTerms(benchmark::State& state) {
    const Curve e = parse_curve("[1,-1,0,-5252,-145223]");
    const auto lcurve = lseries_curve(e);
    const auto rank = analytic_rank(e, AnalyticOptions{});
    HeegnerOptions options;
    options.extra_digits = static_cast<unsigned>(state.range(0));
    const auto plan = plan_heegner(lcurve, *first_derivative(rank), options);
    const auto a = dirichlet_coefficients(lcurve, static_cast<std::uint32_t>(plan.max_terms + 1));
    for (auto _ : state) {
        benchmark::DoNotOptimize(heegner_partial_sum(plan, a, 1, plan.max_terms + 1, 1));
    }
    state.counters["terms"] = static_cast<double>(plan.total_terms);
    state.counters["digits"] = plan.digits;
    state.counters["ns_per_term"] = benchmark::Counter(
        static_cast<double>(plan.total_terms),
        benchmark::Counter::kIsIterationInvariantRate | benchmark::Counter::kInvert);
}
BENCHMARK(BM_HeegnerTerms)->Arg(40)->Arg(280)->Unit(benchmark::kMillisecond);

// One MPFR multiplication at the precision of the Heegner sums above (digits ≈ 20 + extra).
void BM_MpfrMultiply(benchmark::State& state) {
    const auto bits = static_cast<mpfr_prec_t>(state.range(0) * 3.33);
    mpfr_t x, y, z;
    mpfr_inits2(bits, x, y, z, static_cast<mpfr_ptr>(nullptr));
    mpfr_const_pi(x, MPFR_RNDN);
    mpfr_sqrt_ui(y, 2, MPFR_RNDN);
    for (auto _ : state) {
        mpfr_mul(z, x, y, MPFR_RNDN);
        benchmark::DoNotOptimize(z);
    }
    mpfr_clears(x, y, z, static_cast<mpfr_ptr>(nullptr));
}
BENCHMARK(BM_MpfrMultiply)->Arg(60)->Arg(300)->Unit(benchmark::kNanosecond);

}  // namespace

BENCHMARK_MAIN();
