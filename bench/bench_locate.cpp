// First hit of a rank-one rotation: the Euclid-like descent (locate/rotation.hpp) against the
// TBB linear scan baseline, on synthetic rotations with a planted hit at index 10^3 … 10^8.
// BM_DescentVersusLinearScan times both in the same run and reports linear/descent as "ratio".
#include <benchmark/benchmark.h>

#include <chrono>
#include <random>

#include "locate/rotation.hpp"
#include "region/interval_ops.hpp"

namespace {

using namespace arcsieve;
using namespace arcsieve::locate;

struct Problem {
    RotationSearch search;
};

// α, β random with 200-bit denominators; the arc of width 1/(10·index) centred on
// {index·α + β}, so the first hit is at `index` or (rarely) a little before.
Problem planted_problem(long index, unsigned seed) {
    std::mt19937_64 random(seed);
    Integer den(1);
    mpz_mul_2exp(den.get_mpz_t(), den.get_mpz_t(), 200);
    auto uniform = [&]() {
        Integer num;
        for (int i = 0; i < 4; ++i) {
            num = num * Integer("1125899906842624") + Integer(std::to_string(random() >> 14));
        }
        Rational q(Integer(num % den), den);
        q.canonicalize();
        return q;
    };
    const Rational alpha = uniform(), beta = uniform();
    const Rational centre = Integer(index) * alpha + beta;
    Integer whole;
    mpz_fdiv_q(whole.get_mpz_t(), centre.get_num_mpz_t(), centre.get_den_mpz_t());
    const Rational c = centre - whole;
    const Rational half_width(Integer(1), Integer(20) * Integer(index));
    Problem p;
    p.search.step = region::interval_of(alpha, 256);
    p.search.offset = region::interval_of(beta, 256);
    p.search.arc_start = region::interval_of(Rational(c - half_width), 256);
    p.search.arc_end = region::interval_of(Rational(c + half_width), 256);
    p.search.max_index = Integer(10) * Integer(index);
    return p;
}

RotationOutcome solve(const Problem& p, bool linear) {
    RotationSearch search = p.search;
    search.linear = linear;
    return first_rotation_hit(search, [&](const Integer& m) {
        const Interval t = region::plus(region::times_integer(search.step, m), search.offset);
        return in_open_arc(t, search.arc_start, search.arc_end);
    });
}

long index_for(const benchmark::State& state) {
    long index = 1;
    for (int i = 0; i < state.range(0); ++i) index *= 10;
    return index;
}

void BM_Descent(benchmark::State& state) {
    const Problem p = planted_problem(index_for(state), 1);
    for (auto _ : state) benchmark::DoNotOptimize(solve(p, false));
}

void BM_LinearScan(benchmark::State& state) {
    const Problem p = planted_problem(index_for(state), 1);
    for (auto _ : state) benchmark::DoNotOptimize(solve(p, true));
}

void BM_DescentVersusLinearScan(benchmark::State& state) {
    const Problem p = planted_problem(index_for(state), 1);
    double descent_seconds = 0, linear_seconds = 0;
    long first_hit = -1;
    for (auto _ : state) {
        const auto t0 = std::chrono::steady_clock::now();
        const RotationOutcome a = solve(p, false);
        const auto t1 = std::chrono::steady_clock::now();
        const RotationOutcome b = solve(p, true);
        const auto t2 = std::chrono::steady_clock::now();
        descent_seconds += std::chrono::duration<double>(t1 - t0).count();
        linear_seconds += std::chrono::duration<double>(t2 - t1).count();
        if (!a.hit || !b.hit || *a.hit != *b.hit) {
            state.SkipWithError("the descent and the linear scan disagree");
            return;
        }
        first_hit = a.hit->get_si();
    }
    state.counters["first_hit"] = static_cast<double>(first_hit);
    state.counters["descent_us"] = 1e6 * descent_seconds / static_cast<double>(state.iterations());
    state.counters["linear_us"] = 1e6 * linear_seconds / static_cast<double>(state.iterations());
    state.counters["ratio"] = linear_seconds / descent_seconds;
}

BENCHMARK(BM_Descent)->DenseRange(3, 8)->Unit(benchmark::kMicrosecond);
BENCHMARK(BM_LinearScan)->DenseRange(3, 8)->Unit(benchmark::kMicrosecond);
BENCHMARK(BM_DescentVersusLinearScan)->DenseRange(3, 8)->Unit(benchmark::kMillisecond);

}  // namespace

BENCHMARK_MAIN();
