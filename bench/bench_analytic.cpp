// Google Benchmark for the analytic layer: the elliptic logarithm and the canonical height at
// 50, 200 and 1000 digits, on E_4 (Δ > 0, the egg point (−100, 260)) and 117a1 (Δ < 0).
#include <benchmark/benchmark.h>

#include "analytic/height.hpp"
#include "family/ratio_sum.hpp"

namespace {

using namespace arcsieve;

const Point egg_point{Rational(-100), Rational(260), false};

void elliptic_log_with_periods(benchmark::State& state) {
    const unsigned digits = static_cast<unsigned>(state.range(0));
    const Curve curve = family::ratio_sum_curve(Integer(4));
    for (auto _ : state) {
        EllipticLog log = elliptic_log(curve, egg_point, digits);
        benchmark::DoNotOptimize(log);
    }
}
BENCHMARK(elliptic_log_with_periods)->Arg(50)->Arg(200)->Arg(1000)->Unit(benchmark::kMicrosecond);

// The locate layer's pattern: periods once, then many logarithms.
void elliptic_log_given_periods(benchmark::State& state) {
    const unsigned digits = static_cast<unsigned>(state.range(0));
    const Curve curve = family::ratio_sum_curve(Integer(4));
    const RealStructure real = real_structure(curve, digits);
    for (auto _ : state) {
        EllipticLog log = elliptic_log(curve, real, egg_point);
        benchmark::DoNotOptimize(log);
    }
}
BENCHMARK(elliptic_log_given_periods)->Arg(50)->Arg(200)->Arg(1000)->Unit(benchmark::kMicrosecond);

void point_from_log_given_periods(benchmark::State& state) {
    const unsigned digits = static_cast<unsigned>(state.range(0));
    const Curve curve = family::ratio_sum_curve(Integer(4));
    const RealStructure real = real_structure(curve, digits);
    const Real t = make_real(3, digits) / 7;
    for (auto _ : state) {
        RealPoint p = point_from_log(curve, real, 1, t);
        benchmark::DoNotOptimize(p);
    }
}
BENCHMARK(point_from_log_given_periods)
    ->Arg(50)
    ->Arg(200)
    ->Arg(1000)
    ->Unit(benchmark::kMicrosecond);

void canonical_height_ratio_sum(benchmark::State& state) {
    const unsigned digits = static_cast<unsigned>(state.range(0));
    const Curve curve = family::ratio_sum_curve(Integer(4));
    for (auto _ : state) {
        Real h = canonical_height(curve, egg_point, digits);
        benchmark::DoNotOptimize(h);
    }
}
BENCHMARK(canonical_height_ratio_sum)->Arg(50)->Arg(200)->Arg(1000)->Unit(benchmark::kMicrosecond);

void canonical_height_negative_discriminant(benchmark::State& state) {
    const unsigned digits = static_cast<unsigned>(state.range(0));
    const Curve curve = parse_curve("[1,-1,1,4,6]");
    const Point p{Rational(0), Rational(2), false};
    for (auto _ : state) {
        Real h = canonical_height(curve, p, digits);
        benchmark::DoNotOptimize(h);
    }
}
BENCHMARK(canonical_height_negative_discriminant)
    ->Arg(50)
    ->Arg(200)
    ->Arg(1000)
    ->Unit(benchmark::kMicrosecond);

void archimedean_height_at_log(benchmark::State& state) {
    const unsigned digits = static_cast<unsigned>(state.range(0));
    const Curve curve = family::ratio_sum_curve(Integer(4));
    const RealStructure real = real_structure(curve, digits);
    const Real t = make_real(3, digits) / 7;
    for (auto _ : state) {
        Real h = archimedean_local_height_at_log(curve, real, 1, t);
        benchmark::DoNotOptimize(h);
    }
}
BENCHMARK(archimedean_height_at_log)->Arg(50)->Arg(200)->Arg(1000)->Unit(benchmark::kMicrosecond);

void canonical_height_enclosure_ratio_sum(benchmark::State& state) {
    const unsigned digits = static_cast<unsigned>(state.range(0));
    const Curve curve = family::ratio_sum_curve(Integer(4));
    for (auto _ : state) {
        Interval h = canonical_height_enclosure(curve, egg_point, digits);
        benchmark::DoNotOptimize(h);
    }
}
BENCHMARK(canonical_height_enclosure_ratio_sum)
    ->Arg(50)
    ->Arg(200)
    ->Arg(1000)
    ->Unit(benchmark::kMicrosecond);

}  // namespace

BENCHMARK_MAIN();
