// Survey scaling: problems per second of the real job over a fixed set of ratio-sum problems at
// 1 and 2 problems at once (child process per problem, as `arcsieve survey` runs them). The
// ratio of the two rates, both measured in the same run, is the scaling figure.
#include <benchmark/benchmark.h>

#include <chrono>
#include <filesystem>

#include "survey/runner.hpp"

namespace {

void survey_rate(benchmark::State& state) {
    using namespace arcsieve;
    const auto problems = survey::problems_from_range("ratio-sum", "2..24", Integer(2));
    std::size_t runs = 0;
    for (auto _ : state) {
        const auto dir =
            std::filesystem::temp_directory_path() /
            ("bench-survey-" + std::to_string(state.range(0)) + "-" + std::to_string(runs++) + "-" +
             std::to_string(std::chrono::steady_clock::now().time_since_epoch().count()));
        survey::SurveyOptions options;
        options.out_dir = dir.string();
        options.threads = static_cast<unsigned>(state.range(0));
        options.progress = survey::ProgressStyle::quiet;
        options.job.materialise = false;
        const auto report = survey::run_survey(problems, options, run_problem);
        benchmark::DoNotOptimize(report.ran);
        std::filesystem::remove_all(dir);
    }
    state.SetItemsProcessed(static_cast<std::int64_t>(state.iterations() * problems.size()));
    state.SetLabel("problems/s in items_per_second");
}

BENCHMARK(survey_rate)->Arg(1)->Arg(2)->Iterations(2)->Unit(benchmark::kSecond)->UseRealTime();

}  // namespace

BENCHMARK_MAIN();
