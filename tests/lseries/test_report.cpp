#include <gtest/gtest.h>

#include "curve/curve.hpp"
#include "lseries/report.hpp"

namespace arcsieve::lseries {
namespace {

TEST(AnalyticReport, LinesAndJsonCarryTheProofAndTheEnclosures) {
    // 37a1 (LMFDB, REFERENCE-VALUES.md): rank 1, L'(E,1) ≈ 0.305999773834052, generator (0,0).
    const Curve e = parse_curve("[0,0,1,-1,0]");
    AnalyticReport report;
    report.rank = analytic_rank(e, AnalyticOptions{});
    report.predicted_generator_height = 0.0511114082399688;
    HeegnerOptions options;
    options.discriminant = -7;
    report.heegner = heegner_point(e, report.rank, options);
    ASSERT_TRUE(report.heegner.has_value());
    const auto lines = report_lines(report);
    std::string all;
    for (const auto& line : lines) all += line + "\n";
    EXPECT_NE(all.find("root number       -1"), std::string::npos) << all;
    EXPECT_NE(all.find("L'(E,1)           [0.30599977383405"), std::string::npos) << all;
    EXPECT_NE(all.find("1 proven: w = −1 and L'(E,1) != 0"), std::string::npos) << all;
    EXPECT_NE(all.find("conditional on BSD"), std::string::npos) << all;
    EXPECT_NE(all.find("D = -7, index 1"), std::string::npos) << all;
    const auto json = to_json(report);
    EXPECT_EQ(json["proven_rank"], 1);
    EXPECT_EQ(json["root_number"], -1);
    EXPECT_EQ(json["rank_theorem"], "gross-zagier-kolyvagin-rank-one");
    EXPECT_EQ(json["conductor"], "37");
    EXPECT_EQ(json["central_values"][0]["derivative_order"], 1);
    const double lower = std::stod(json["central_values"][0]["lower"].get<std::string>());
    const double upper = std::stod(json["central_values"][0]["upper"].get<std::string>());
    EXPECT_LE(lower, 0.305999773834052 + 1e-14);
    EXPECT_GE(upper, 0.305999773834052 - 1e-14);
    EXPECT_EQ(json["heegner"]["discriminant"], -7);
    EXPECT_TRUE(json["bsd_height_is_conditional"].get<bool>());
}

}  // namespace
}  // namespace arcsieve::lseries
