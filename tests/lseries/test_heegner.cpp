#include <gtest/gtest.h>

#include <cstdio>
#include <cstdlib>
#include <memory>

#include "analytic/height.hpp"
#include "curve/curve.hpp"
#include "lseries/heegner.hpp"
#include "lseries/special_values.hpp"

namespace arcsieve::lseries {
namespace {

AnalyticRank rank_of(const Curve& e) {
    return analytic_rank(e, AnalyticOptions{});
}

double as_double(const Real& x) {
    return x.convert_to<double>();
}

TEST(Heegner, ThirtySevenA1IsAMultipleOfTheOrigin) {
    // REFERENCE-VALUES.md (from memory): the Heegner point of 37a1 for D = −7 is a multiple of
    // (0, 0), which generates E(Q) (LMFDB 37.a1, rank 1, trivial torsion).
    const Curve e = parse_curve("[0,0,1,-1,0]");
    const auto rank = rank_of(e);
    for (long D : {-7L, -11L, -40L, -47L, -67L, -83L}) {
        HeegnerOptions options;
        options.discriminant = D;
        const auto result = heegner_point(e, rank, options);
        ASSERT_TRUE(result.has_value()) << D;
        ASSERT_TRUE(on_curve(e, result->point)) << D;
        bool multiple = false;
        const Point origin{0, 0, false};
        for (int k = 1; k <= 12 && !multiple; ++k) {
            const Point kp = multiply(e, origin, std::int64_t{k});
            multiple = kp == result->point || negate(e, kp) == result->point;
        }
        EXPECT_TRUE(multiple) << D << ": " << to_string(result->point);
    }
}

TEST(Heegner, GrossZagierSizingPredictsTheIndex) {
    // Gross–Zagier (1986) with BSD: ĥ(y_K) / ĥ(P) must be the square of the index found by the
    // exact recovery (37a1: generator (0,0), ĥ = 0.0511114082399688 in REFERENCE-VALUES.md).
    const Curve e = parse_curve("[0,0,1,-1,0]");
    const auto rank = rank_of(e);
    const auto lcurve = lseries_curve(e);
    for (long D : {-7L, -40L, -67L}) {
        HeegnerOptions options;
        options.discriminant = D;
        const auto plan = plan_heegner(lcurve, *first_derivative(rank), options);
        EXPECT_NEAR(plan.predicted_generator_height, 0.0511114082399688, 1e-12);
        const auto result = heegner_point(e, rank, options);
        ASSERT_TRUE(result.has_value());
        EXPECT_NEAR(plan.predicted_index, result->index, 1e-6) << D;
    }
}

TEST(Heegner, Lmfdb637d1GeneratorRecovered) {
    // LMFDB 637.d1 (REFERENCE-VALUES.md): generator (4776/49, 158761/343), ĥ = 8.82674664324953.
    const Curve e = parse_curve("[1,-1,0,-5252,-145223]");
    const auto result = heegner_point(e, rank_of(e), HeegnerOptions{});
    ASSERT_TRUE(result.has_value());
    EXPECT_TRUE(on_curve(e, result->point));
    EXPECT_NEAR(as_double(result->height), 8.8267466432495297542, 1e-12);
    EXPECT_EQ(result->point.x, Rational(4776, 49));
}

TEST(Heegner, PartialSumsMergeSerialiseAndRefuseOverlap) {
    const Curve e = parse_curve("[1,-1,0,-5252,-145223]");
    const auto lcurve = lseries_curve(e);
    const auto plan = plan_heegner(lcurve, *first_derivative(rank_of(e)), HeegnerOptions{});
    const auto a = dirichlet_coefficients(lcurve, static_cast<std::uint32_t>(plan.max_terms + 1));
    const auto whole = heegner_partial_sum(plan, a, 1, plan.max_terms + 1, 1);
    // Random split points: the merged enclosure must meet the whole one and be as tight.
    std::uint64_t state = 12345;
    for (int trial = 0; trial < 8; ++trial) {
        state = state * 6364136223846793005ULL + 1442695040888963407ULL;
        const std::uint64_t cut = 2 + (state >> 33) % (plan.max_terms - 2);
        const auto left = heegner_partial_sum(plan, a, 1, cut, 1);
        const auto right = heegner_partial_sum(plan, a, cut, plan.max_terms + 1, 2);
        const auto merged = merge(deserialise_partial_sum(serialise(left)),
                                  deserialise_partial_sum(serialise(right)));
        const Interval difference_real = merged.real - whole.real;
        const Interval difference_imag = merged.imaginary - whole.imaginary;
        EXPECT_TRUE(contains_zero(difference_real)) << "cut " << cut;
        EXPECT_TRUE(contains_zero(difference_imag)) << "cut " << cut;
        EXPECT_LT(as_double(width(merged.real)), 1e-15);
        // The text form is exact: a round trip gives identical endpoints.
        const auto again = deserialise_partial_sum(serialise(left));
        EXPECT_EQ(serialise(again), serialise(left));
    }
    const auto left = heegner_partial_sum(plan, a, 1, 100, 1);
    const auto overlapping = heegner_partial_sum(plan, a, 50, 200, 1);
    EXPECT_THROW(merge(left, overlapping), std::invalid_argument);
    EXPECT_THROW(deserialise_partial_sum("heegner-partial-sum 1 2"), InputError);
}

TEST(Heegner, Curve877PredictionAndRefusal) {
    // Lozano-Robledo, Example 2.7.2 (Bremner–Cassels 1984), REFERENCE-VALUES.md: the generator
    // of y² = x³ + 877x has ĥ ≈ 95.98037199 in our normalisation; BSD (|Sha| = 1) predicts it.
    const Curve e = parse_curve("[0,0,0,877,0]");
    const auto rank = rank_of(e);
    ASSERT_EQ(rank.proof, RankProof::rank_one_gross_zagier_kolyvagin);
    const auto prediction =
        predicted_generator_height(lseries_curve(e), *first_derivative(rank), 30);
    EXPECT_NEAR(as_double(prediction.height_times_sha), 95.98037199, 1e-6);
    // Conductor 2^6·877²: the sum needs about 1.7·10^9 terms, above the default limit: a clear
    // refusal that names the cost and the limit to raise, nothing silently truncated.
    try {
        heegner_point(e, rank, HeegnerOptions{});
        FAIL() << "expected a refusal";
    } catch (const InputError& refusal) {
        const std::string text = refusal.what();
        EXPECT_NE(text.find("terms"), std::string::npos) << text;
        EXPECT_NE(text.find("raise"), std::string::npos) << text;
        EXPECT_NE(text.find("core-hours"), std::string::npos) << text;
    }
}

TEST(Heegner, DiscriminantsAndForms) {
    // Class numbers of imaginary quadratic fields (Cohen GTM 138, Table B.4; common practice).
    EXPECT_EQ(class_number(-7), 1);
    EXPECT_EQ(class_number(-15), 2);
    EXPECT_EQ(class_number(-23), 3);
    EXPECT_EQ(class_number(-47), 5);
    EXPECT_EQ(class_number(-71), 7);
    EXPECT_EQ(class_number(-163), 1);
    EXPECT_TRUE(is_fundamental_discriminant(-40));
    EXPECT_FALSE(is_fundamental_discriminant(-12 * 4));
    // Every form [A, B, C] has N | A, B ≡ β (mod 2N), B² − 4AC = D, one per class.
    const auto lcurve = lseries_curve(parse_curve("[0,0,1,-1,0]"));
    for (long D = -5; D > -400; --D) {
        if (!satisfies_heegner_hypothesis(lcurve, D)) continue;
        const auto beta = square_root_mod_4n(lcurve.conductor, lcurve.bad_primes, D);
        ASSERT_TRUE(beta.has_value()) << D;
        const auto forms = heegner_forms(lcurve.conductor, D, *beta);
        EXPECT_EQ(static_cast<int>(forms.size()), class_number(D)) << D;
        for (const auto& f : forms) {
            EXPECT_EQ(f.a % 37, 0);
            EXPECT_EQ(((f.b - *beta) % 74 + 74) % 74, 0);
            EXPECT_EQ(f.b * f.b - 4 * f.a * f.c, D);
        }
    }
}

#ifdef ARCSIEVE_HEEGNER_MPI
TEST(Heegner, MpiRanksGiveTheThreadedResult) {
    if (std::system("command -v mpirun > /dev/null 2>&1") != 0) GTEST_SKIP() << "no mpirun";
    const std::string command =
        std::string(
            "OMPI_ALLOW_RUN_AS_ROOT=1 OMPI_ALLOW_RUN_AS_ROOT_CONFIRM=1 mpirun -n 2 "
            "--oversubscribe ") +
        ARCSIEVE_HEEGNER_MPI + " --curve \"[1,-1,0,-5252,-145223]\" --threads 1 2>/dev/null";
    std::unique_ptr<FILE, int (*)(FILE*)> pipe(popen(command.c_str(), "r"), pclose);
    ASSERT_TRUE(pipe);
    std::string output;
    char buffer[512];
    while (fgets(buffer, sizeof buffer, pipe.get())) output += buffer;
    const Curve e = parse_curve("[1,-1,0,-5252,-145223]");
    const auto threaded = heegner_point(e, rank_of(e), HeegnerOptions{});
    ASSERT_TRUE(threaded.has_value());
    EXPECT_NE(output.find("point " + to_string(threaded->point)), std::string::npos) << output;
    EXPECT_NE(output.find("ranks 2"), std::string::npos) << output;
}
#endif

}  // namespace
}  // namespace arcsieve::lseries
