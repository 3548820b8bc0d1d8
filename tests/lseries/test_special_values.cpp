#include <gtest/gtest.h>

#include <cstdlib>

#include "curve/curve.hpp"
#include "lseries/analytic_rank.hpp"
#include "lseries/heegner.hpp"
#include "lseries/special_values.hpp"

namespace arcsieve::lseries {
namespace {

double mid(const Interval& x) {
    return median(x).convert_to<double>();
}

// Outside values: REFERENCE-VALUES.md, "L-series special values" (LMFDB curve pages, from
// memory) and the LMFDB table (37.b2, 117a1, with 29 digits).
TEST(SpecialValues, Eleven) {
    const auto r = analytic_rank(parse_curve("[0,-1,1,-10,-20]"), AnalyticOptions{});
    ASSERT_TRUE(r.root_number);
    EXPECT_EQ(*r.root_number, 1);
    EXPECT_NEAR(mid(r.values[0].value), 0.253841860855911, 1e-12);
}

TEST(SpecialValues, ThirtySeven) {
    const auto r = analytic_rank(parse_curve("[0,0,1,-1,0]"), AnalyticOptions{});
    EXPECT_EQ(*r.root_number, -1);
    EXPECT_NEAR(mid(r.values[0].value), 0.305999773834052, 1e-12);
}

TEST(SpecialValues, HigherOrders) {
    const auto r = analytic_rank(parse_curve("[0,1,1,-2,0]"), AnalyticOptions{});
    ASSERT_EQ(r.values.size(), 2u);
    EXPECT_NEAR(mid(r.values[1].value), 0.759316500288427, 1e-12);
    const auto s = analytic_rank(parse_curve("[0,0,1,-7,6]"), AnalyticOptions{});
    ASSERT_EQ(s.values.size(), 2u);
    EXPECT_NEAR(mid(s.values[1].value), 1.73184990011930, 1e-12);
}

bool within(const Interval& x, double value, double slack) {
    Real lo(0, 40), hi(0, 40);
    mpfi_get_left(lo.backend().data(), x.backend().data());
    mpfi_get_right(hi.backend().data(), x.backend().data());
    return lo.convert_to<double>() - slack <= value && value <= hi.convert_to<double>() + slack;
}

TEST(SpecialValues, Lmfdb37b2CentralValueInsideTheEnclosure) {
    // LMFDB 37.b2: L(E,1) = 0.72568106193615278233620554103, rank 0 (REFERENCE-VALUES.md).
    AnalyticOptions options;
    options.digits = 28;
    const auto r = analytic_rank(parse_curve("[0,1,1,-23,-50]"), options);
    EXPECT_EQ(r.proof, RankProof::rank_zero_kolyvagin);
    const Interval reference = make_interval(Rational(Integer("72568106193615278233620554103"),
                                                      Integer("100000000000000000000000000000")),
                                             40);
    const Interval difference = r.values[0].value - reference;
    EXPECT_LT(abs(median(difference)).convert_to<double>(), 1e-26);
    EXPECT_LT(width(r.values[0].value).convert_to<double>(), 1e-26);
}

TEST(SpecialValues, Bsd117a1Identity) {
    // REFERENCE-VALUES.md (LMFDB 117a1): Ω·ĥ·∏c_p/|T|² = L'(E,1) with L'(E,1) =
    // 0.74611338874647625453737083466, ĥ = 1.1303356261795510066, Ω = 2.6403251263283034696,
    // ∏c_p = 4, |T| = 4: the BSD prediction must give the published height, and Ω the LMFDB's.
    const Curve e = parse_curve("[1,-1,1,4,6]");
    const auto r = analytic_rank(e, AnalyticOptions{});
    ASSERT_EQ(r.proof, RankProof::rank_one_gross_zagier_kolyvagin);
    EXPECT_TRUE(within(*first_derivative(r), 0.74611338874647625453737083466, 1e-18));
    const auto prediction = predicted_generator_height(lseries_curve(e), *first_derivative(r), 30);
    EXPECT_NEAR(prediction.omega.convert_to<double>(), 2.6403251263283034696, 1e-15);
    EXPECT_EQ(prediction.tamagawa_product, 4);
    EXPECT_EQ(prediction.torsion_order, 4);
    EXPECT_NEAR(prediction.height_times_sha.convert_to<double>(), 1.1303356261795510066, 1e-15);
    // 37a1: Ω ≈ 5.98691729246392, Reg ≈ 0.0511114082399688 (REFERENCE-VALUES.md, from memory).
    const Curve e37 = parse_curve("[0,0,1,-1,0]");
    const auto r37 = analytic_rank(e37, AnalyticOptions{});
    const auto p37 = predicted_generator_height(lseries_curve(e37), *first_derivative(r37), 30);
    EXPECT_NEAR(p37.omega.convert_to<double>(), 5.98691729246392, 1e-12);
    EXPECT_NEAR(p37.height_times_sha.convert_to<double>(), 0.0511114082399688, 1e-13);
}

TEST(SpecialValues, ExponentialIntegralAgreesWithMpfr) {
    // G_1 = E_1 = −Ei(−x): MPFR's correctly rounded mpfr_eint is an independent method.
    std::uint64_t state = 5;
    for (int trial = 0; trial < 300; ++trial) {
        state = state * 6364136223846793005ULL + 1442695040888963407ULL;
        const double x = 0.001 + 80.0 * static_cast<double>(state >> 11) / 9007199254740992.0;
        const unsigned bits = 60 + static_cast<unsigned>((state >> 3) % 300);
        const Interval enclosure = incomplete_gamma_family(1, make_interval(Real(x, 30), 30), bits);
        Real reference(0, bits / 3 + 10), minus_x(-x, 30);
        mpfr_eint(reference.backend().data(), minus_x.backend().data(), MPFR_RNDN);
        reference = -reference;
        // Absolute accuracy about 2^-bits is the contract; the reference must lie inside.
        const Real error = abs(median(enclosure) - reference);
        EXPECT_LT(error.convert_to<double>(), std::ldexp(1.0, -static_cast<int>(bits) + 4))
            << "x = " << x << " bits = " << bits;
        const double reference_double = reference.convert_to<double>();
        EXPECT_TRUE(within(enclosure, reference_double, 1e-16 * reference_double)) << "x = " << x;
    }
}

TEST(SpecialValues, LargeConductorRefusedWithCost) {
    // E_896's curve has conductor 5 780 269 734; with a small term limit it must be refused
    // with the cost and the option to raise, never truncated.
    AnalyticOptions options;
    options.max_terms = 1000;
    try {
        analytic_rank(parse_curve("[0,3222013,0,28768,0]"), options);
        FAIL() << "expected a refusal";
    } catch (const InputError& refusal) {
        const std::string text = refusal.what();
        EXPECT_NE(text.find("raise"), std::string::npos) << text;
        EXPECT_NE(text.find("terms"), std::string::npos) << text;
    }
}

}  // namespace
}  // namespace arcsieve::lseries
