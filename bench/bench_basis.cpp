// Benchmarks of the Mordell–Weil basis layer: the sieve-assisted point search, the 2-isogeny
// descent, and the whole basis for every even N <= 200 of the ratio-sum family (total time
// and the share of N settled completely: rank bounds equal and saturation proved complete).
#include <benchmark/benchmark.h>

#include "basis/mordell_weil.hpp"
#include "basis/point_search.hpp"
#include "basis/two_isogeny_descent.hpp"
#include "family/ratio_sum.hpp"

namespace {

using namespace arcsieve;

void BM_PointSearchE4(benchmark::State& state) {
    const Curve e = family::ratio_sum_curve(Integer(4));
    PointSearchOptions options;
    options.height_bound = state.range(0);
    std::size_t found = 0;
    for (auto _ : state) {
        found = search_points(e, options).size();
        benchmark::DoNotOptimize(found);
    }
    state.counters["points"] = static_cast<double>(found);
}
BENCHMARK(BM_PointSearchE4)->Arg(10000)->Arg(100000)->Arg(1000000)->Unit(benchmark::kMillisecond);

void BM_DescentEvenN(benchmark::State& state) {
    basis::DescentOptions options;
    options.quartic_bound = state.range(0);
    for (auto _ : state) {
        for (int N = 2; N <= 200; N += 2) {
            const Curve e = family::ratio_sum_curve(Integer(N));
            const auto model = basis::two_torsion_model(e);
            benchmark::DoNotOptimize(basis::two_isogeny_descent(e, *model, options).rank_upper);
        }
    }
}
BENCHMARK(BM_DescentEvenN)->Arg(400)->Unit(benchmark::kMillisecond)->Iterations(1);

void BM_BasisEvenNUpTo200(benchmark::State& state) {
    const BasisOptions options = BasisOptions::with_effort(static_cast<int>(state.range(0)));
    int settled = 0, rank_known = 0, total = 0;
    for (auto _ : state) {
        settled = rank_known = total = 0;
        for (int N = 2; N <= 200; N += 2) {
            const auto b = mordell_weil_basis(family::ratio_sum_curve(Integer(N)), options);
            ++total;
            if (b.rank.known()) ++rank_known;
            if (b.settled()) ++settled;
        }
    }
    state.counters["curves"] = total;
    state.counters["rank_known_share"] = static_cast<double>(rank_known) / total;
    state.counters["settled_share"] = static_cast<double>(settled) / total;
}
BENCHMARK(BM_BasisEvenNUpTo200)->Arg(0)->Arg(1)->Unit(benchmark::kSecond)->Iterations(1);

}  // namespace

BENCHMARK_MAIN();
