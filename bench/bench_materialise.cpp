// Materialising a D-digit ratio-sum solution, measured as a ratio to one GMP multiplication of
// two D-digit integers timed in the same run (issue 5 aims for a ratio under 40), D = 10^4..10^7.
// The solution is n·P + (0,0) on E_4 with P = (−100, 260), n chosen so that max(a,b,c) has
// about D digits.
#include <benchmark/benchmark.h>

#include <chrono>
#include <cmath>

#include "exact/materialise.hpp"

namespace {

using arcsieve::Integer;
using arcsieve::Point;
using arcsieve::Rational;

double seconds_per_multiplication(long digits) {
    gmp_randclass random(gmp_randinit_default);
    random.seed(12345);
    const auto bits = static_cast<unsigned long>(digits * 3.321928);
    const Integer x = random.get_z_bits(bits), y = random.get_z_bits(bits);
    Integer product;
    int repeats = 0;
    const auto start = std::chrono::steady_clock::now();
    double elapsed = 0;
    do {
        mpz_mul(product.get_mpz_t(), x.get_mpz_t(), y.get_mpz_t());
        ++repeats;
        elapsed = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    } while (elapsed < 0.3 && repeats < 1000);
    benchmark::DoNotOptimize(product);
    return elapsed / repeats;
}

// n with (3/2) n² ĥ(P) / ln 10 ≈ digits; ĥ(P) ≈ 1.5187 (computed by the exact layer's tests).
Integer index_for(long digits) {
    return Integer(static_cast<long>(std::sqrt(digits * std::log(10.0) / (1.5 * 1.5187))));
}

void run(benchmark::State& state, bool check_coprime) {
    const long digits = state.range(0);
    const Integer N(4);
    const arcsieve::exact::Multiple q{Point{Rational(-100), Rational(260), false},
                                      index_for(digits), Point{Rational(0), Rational(0), false}};
    arcsieve::exact::MaterialiseOptions options;
    options.check_coprime = check_coprime;
    const double multiplication = seconds_per_multiplication(digits);
    double total = 0;
    std::size_t produced = 0;
    for (auto _ : state) {
        const auto start = std::chrono::steady_clock::now();
        const auto solution = arcsieve::exact::materialise_ratio_sum(N, q, options);
        total += std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
        produced = solution.digits[0];
        benchmark::DoNotOptimize(solution.verified);
    }
    state.counters["digits"] = static_cast<double>(produced);
    state.counters["multiplication_ms"] = 1e3 * multiplication;
    state.counters["ratio_to_multiplication"] =
        total / static_cast<double>(state.iterations()) / multiplication;
}

void BM_MaterialiseVerified(benchmark::State& state) {
    run(state, false);
}
void BM_MaterialiseVerifiedWithGcdCheck(benchmark::State& state) {
    run(state, true);
}

BENCHMARK(BM_MaterialiseVerified)
    ->Arg(10'000)
    ->Arg(100'000)
    ->Arg(1'000'000)
    ->Arg(10'000'000)
    ->Unit(benchmark::kMillisecond)
    ->Iterations(1);
BENCHMARK(BM_MaterialiseVerifiedWithGcdCheck)
    ->Arg(10'000)
    ->Arg(100'000)
    ->Arg(1'000'000)
    ->Unit(benchmark::kMillisecond)
    ->Iterations(1);

}  // namespace

BENCHMARK_MAIN();
