// End-to-end measurement for issue 11: even N from 2 to 200 from N alone. For each N the
// basis layer runs with its defaults (search, 2-isogeny descent, then the lseries proven
// ranks); the program prints whether lower = upper and, if not, why; for proven rank 1
// without a generator it prints the Heegner plan (D, digits, terms, estimate) and, with
// --heegner SECONDS, runs the construction within that limit. Usage:
//   e2e_lseries_survey [first last [--heegner SECONDS]]
#include <fmt/format.h>

#include <chrono>
#include <cstdlib>
#include <cstring>
#include <iostream>

#include "basis/mordell_weil.hpp"
#include "family/ratio_sum.hpp"
#include "lseries/heegner.hpp"

using namespace arcsieve;

int main(int argc, char** argv) {
    int first = 2, last = 200;
    double heegner_seconds = 0;
    if (argc >= 3) {
        first = std::atoi(argv[1]);
        last = std::atoi(argv[2]);
    }
    if (argc >= 5 && std::strcmp(argv[3], "--heegner") == 0) heegner_seconds = std::atof(argv[4]);
    int proven = 0, total = 0;
    std::vector<std::string> open;
    for (int N = first; N <= last; N += 2) {
        const auto start = std::chrono::steady_clock::now();
        BasisOptions options = BasisOptions::with_effort(1);
        options.heegner_time_limit_seconds = heegner_seconds;
        const Curve e = family::ratio_sum_curve(Integer(N));
        const auto b = mordell_weil_basis(e, options);
        const double seconds =
            std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
        ++total;
        std::string how = b.analytic && b.analytic->rank.proven_rank
                              ? (b.analytic->rank.proof == lseries::RankProof::rank_zero_kolyvagin
                                     ? "L(E,1) != 0"
                                     : "L'(E,1) != 0")
                              : "descent";
        std::string sources;
        for (const auto& s : b.generator_sources) sources += (sources.empty() ? "" : "+") + s;
        std::cout << fmt::format("N = {:3d}: rank {} .. {} ({}) generators {} [{}] {:.2f} s", N,
                                 b.rank.lower, b.rank.upper ? std::to_string(*b.rank.upper) : "?",
                                 b.rank.known() ? "proven by " + how : "open", b.generators.size(),
                                 sources, seconds);
        if (b.rank.known())
            ++proven;
        else
            open.push_back(std::to_string(N));
        if (b.rank.known() && b.rank.lower == 1 && b.generators.empty() && b.analytic) {
            try {
                lseries::HeegnerOptions h;
                const auto plan = lseries::plan_heegner(
                    lseries::lseries_curve(e), *lseries::first_derivative(b.analytic->rank), h);
                std::cout << fmt::format(
                    "; Heegner plan D = {}, predicted ĥ = {:.6g}, index {:.3g}, {} digits, {} "
                    "terms, {:.3g} core-hours",
                    plan.discriminant, plan.predicted_generator_height, plan.predicted_index,
                    plan.digits, plan.total_terms, plan.core_hours);
            } catch (const std::exception& error) {
                std::cout << "; Heegner plan: " << error.what();
            }
        }
        std::cout << "\n";
        if (!b.rank.known()) {
            for (const auto& note : b.notes) std::cout << "    note: " << note << "\n";
        }
        std::cout.flush();
    }
    std::cout << fmt::format("{} of {} even N have lower = upper; open:", proven, total);
    for (const auto& n : open) std::cout << " " << n;
    std::cout << "\n";
}
