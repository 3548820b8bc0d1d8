// arcsieve-heegner-mpi: one Heegner-point computation spread over MPI ranks. Every rank builds
// the same plan from the same arguments (the choice of D and the precision are deterministic),
// sums the modular parametrisation over its own range of n (lseries/heegner.hpp partial sums,
// TBB threads inside the rank), and sends the serialised enclosure to rank 0, which merges the
// ranges exactly, divides by the index and recognises the rational point.
#include <fmt/format.h>
#include <mpi.h>

#include <CLI/CLI.hpp>
#include <chrono>
#include <iostream>

#include "family/ratio_sum.hpp"
#include "lseries/heegner.hpp"

namespace {

using namespace arcsieve;

struct Arguments {
    std::string curve;
    std::string N;
    unsigned threads = 0;
    double time_limit = 3600;
    std::uint64_t max_terms = 400'000'000;
    long discriminant = 0;
    bool print_sum = false;
};

std::vector<std::string> gather_lines(const std::string& mine, int rank, int size) {
    const int length = static_cast<int>(mine.size());
    std::vector<int> lengths(static_cast<std::size_t>(size));
    MPI_Gather(&length, 1, MPI_INT, lengths.data(), 1, MPI_INT, 0, MPI_COMM_WORLD);
    std::vector<int> offsets(static_cast<std::size_t>(size), 0);
    int total = 0;
    for (int r = 0; r < size; ++r) {
        offsets[static_cast<std::size_t>(r)] = total;
        total += lengths[static_cast<std::size_t>(r)];
    }
    std::string buffer(rank == 0 ? static_cast<std::size_t>(total) : 0, '\0');
    MPI_Gatherv(mine.data(), length, MPI_CHAR, buffer.data(), lengths.data(), offsets.data(),
                MPI_CHAR, 0, MPI_COMM_WORLD);
    std::vector<std::string> lines;
    if (rank == 0) {
        for (int r = 0; r < size; ++r) {
            lines.push_back(
                buffer.substr(static_cast<std::size_t>(offsets[static_cast<std::size_t>(r)]),
                              static_cast<std::size_t>(lengths[static_cast<std::size_t>(r)])));
        }
    }
    return lines;
}

int run(const Arguments& args, int rank, int size) {
    const auto start = std::chrono::steady_clock::now();
    if (args.curve.empty() == args.N.empty()) throw InputError("give either --curve or --N");
    Curve curve;
    if (!args.curve.empty()) {
        curve = parse_curve(args.curve);
    } else {
        const auto n = parse_integer(args.N);
        if (!n || *n < 1) throw InputError("--N must be a positive integer");
        curve = family::ratio_sum_curve(*n);
    }
    lseries::AnalyticOptions analytic_options;
    analytic_options.threads = args.threads;
    const auto analytic = lseries::analytic_rank(curve, analytic_options);
    const auto derivative = lseries::first_derivative(analytic);
    if (!derivative) {
        throw InputError("analytic rank 1 is not proven for this curve: no Heegner point");
    }
    lseries::HeegnerOptions options;
    options.threads = args.threads;
    options.max_terms = args.max_terms;
    options.discriminant = args.discriminant;
    options.time_limit_seconds = args.time_limit;
    const auto lcurve = lseries::lseries_curve(curve);
    const auto plan = lseries::plan_heegner(lcurve, *derivative, options);
    if (rank == 0) {
        std::cerr << fmt::format(
            "plan: D = {}, {} forms, {} digits, {} terms (a_n up to {}), {:.3g} core-hours in "
            "all, about {:.0f} s per rank on {} ranks\n",
            plan.discriminant, plan.forms.size(), plan.digits, plan.total_terms, plan.max_terms,
            plan.core_hours, plan.core_hours * 3600 / size, size);
    }
    if (plan.max_terms > args.max_terms) {
        throw InputError(fmt::format("the sum needs a_n up to {} (limit {}): raise --max-terms",
                                     plan.max_terms, args.max_terms));
    }
    const std::uint64_t total = plan.max_terms;
    const std::uint64_t begin = 1 + total * static_cast<std::uint64_t>(rank) / size;
    const std::uint64_t end = 1 + total * static_cast<std::uint64_t>(rank + 1) / size;
    const auto a =
        lseries::dirichlet_coefficients(lcurve, static_cast<std::uint32_t>(end), args.threads);
    const auto partial =
        lseries::heegner_partial_sum(plan, a, begin, end, args.threads, args.time_limit);
    const auto lines = gather_lines(lseries::serialise(partial), rank, size);
    if (rank != 0) return 0;
    lseries::HeegnerPartialSum sum = lseries::deserialise_partial_sum(lines.front());
    for (std::size_t r = 1; r < lines.size(); ++r) {
        sum = lseries::merge(sum, lseries::deserialise_partial_sum(lines[r]));
    }
    if (args.print_sum) std::cout << lseries::serialise(sum) << "\n";
    const auto trace = lseries::heegner_trace(plan, sum);
    const auto result = lseries::recover_heegner_point(lcurve, plan, trace);
    if (!result) {
        std::cout << "no rational point recognised at " << plan.digits << " digits\n";
        return 1;
    }
    const double seconds =
        std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    std::cout << fmt::format(
        "point {}\nheight {}\nD {} index {} digits {} terms {} ranks {} "
        "seconds {:.2f}\n",
        to_string(result->point), result->height.str(20), plan.discriminant, result->index,
        plan.digits, plan.total_terms, size, seconds);
    return 0;
}

}  // namespace

int main(int argc, char** argv) {
    MPI_Init(&argc, &argv);
    int rank = 0, size = 1;
    MPI_Comm_rank(MPI_COMM_WORLD, &rank);
    MPI_Comm_size(MPI_COMM_WORLD, &size);
    CLI::App app{"arcsieve-heegner-mpi: one Heegner-point sum spread over MPI ranks"};
    Arguments args;
    app.add_option("--curve", args.curve, "a-invariants \"[a1,a2,a3,a4,a6]\"");
    app.add_option("--N", args.N, "ratio-sum family: the curve E_N");
    app.add_option("--threads", args.threads, "TBB threads per rank (0: TBB decides)");
    app.add_option("--time-limit", args.time_limit, "seconds; the sum stops beyond it");
    app.add_option("--max-terms", args.max_terms, "refuse sums needing a_n beyond this");
    app.add_option("--discriminant", args.discriminant, "use this D (default: cheapest)");
    app.add_flag("--print-sum", args.print_sum, "print the merged partial sum (rank 0)");
    int code = 0;
    try {
        app.parse(argc, argv);
        code = run(args, rank, size);
    } catch (const CLI::ParseError& e) {
        code = app.exit(e);
    } catch (const InputError& e) {
        if (rank == 0) std::cerr << "error: " << e.what() << "\n";
        code = 2;
    } catch (const std::exception& e) {
        std::cerr << "error (rank " << rank << "): " << e.what() << "\n";
        code = 3;
    }
    MPI_Finalize();
    return code;
}
