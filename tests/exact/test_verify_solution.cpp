// Checking claimed solutions: the published N = 4 triple holds; a wrong digit, a truncated file,
// a non-solution, a degenerate triple and malformed text are each reported for what they are.
#include <gtest/gtest.h>

#include "exact/fingerprint.hpp"
#include "exact/verify_solution.hpp"
#include "support.hpp"

namespace arcsieve::exact {
namespace {

const Integer four(4);
// MathOverflow question 227713 (REFERENCE-VALUES.md), in one of its published orders.
const std::string a4 =
    "154476802108746166441951315019919837485664325669565431700026634898253202035277999";
const std::string b4 =
    "36875131794129999827197811565225474825492979968971970996283137471637224634055579";
const std::string c4 =
    "4373612677928697257861252602371390152816537558161613618621437993378423467772036";

std::string file_of(const std::string& a, const std::string& b, const std::string& c) {
    return a + "\n" + b + "\n" + c + "\n";
}

TEST(VerifySolutionTest, PublishedNEquals4SolutionHolds) {
    const auto report = verify_solution_text(four, file_of(a4, b4, c4));
    EXPECT_TRUE(report.holds);
    EXPECT_TRUE(report.problems.empty());
    EXPECT_TRUE(report.remarks.empty());
}

TEST(VerifySolutionTest, ReportsTheWrongDigitAndWhere) {
    for (const std::size_t position : {0ul, 16ul, 40ul, 78ul}) {
        std::string b = b4;
        b[position] = b[position] == '7' ? '3' : '7';
        const auto report = verify_solution_text(four, file_of(a4, b, c4));
        EXPECT_FALSE(report.holds);
        ASSERT_FALSE(report.problems.empty());
        const std::string expected = "b has a wrong digit: digit " + std::to_string(position + 1);
        EXPECT_EQ(report.problems[0].substr(0, expected.size()), expected) << report.problems[0];
    }
}

TEST(VerifySolutionTest, ReportsTruncation) {
    const std::string whole = file_of(a4, b4, c4);
    // Cut inside c: no final newline.
    auto report = verify_solution_text(four, whole.substr(0, whole.size() - 6));
    EXPECT_FALSE(report.holds);
    ASSERT_FALSE(report.problems.empty());
    EXPECT_NE(report.problems[0].find("truncated"), std::string::npos) << report.problems[0];
    // Only two numbers.
    report = verify_solution_text(four, a4 + "\n" + b4 + "\n");
    EXPECT_FALSE(report.holds);
    ASSERT_FALSE(report.problems.empty());
    EXPECT_NE(report.problems[0].find("truncated"), std::string::npos);
}

TEST(VerifySolutionTest, ReportsNonSolutionsAndDegenerateTriples) {
    auto report = verify_solution_text(four, "1\n2\n3\n");
    EXPECT_FALSE(report.holds);
    ASSERT_FALSE(report.problems.empty());
    EXPECT_NE(report.problems.back().find("not a solution"), std::string::npos);
    report = verify_solution_text(four, "1\n-1\n5\n");
    EXPECT_FALSE(report.holds);
    ASSERT_FALSE(report.problems.empty());
    EXPECT_NE(report.problems[0].find("degenerate"), std::string::npos);
    // A solution in integers that is not positive: (4, -1, 11) for N = 4 (common practice:
    // the image of the generator (-100, 260), see tests/family).
    report = verify_solution_text(four, "11\n-1\n4\n");
    EXPECT_TRUE(report.holds);
    EXPECT_FALSE(report.remarks.empty());
}

TEST(VerifySolutionTest, MalformedTextIsAnInputError) {
    EXPECT_THROW(verify_solution_text(four, "12x\n3\n4\n"), InputError);
    EXPECT_THROW(verify_solution_text(four, "1\n2\n3\n4\n"), InputError);
    EXPECT_THROW(verify_solution_text(four, "1\n\n3\n"), InputError);
}

TEST(VerifySolutionTest, FingerprintRecordIsRecomputedAndCompared) {
    const Point p{Rational(-100), Rational(260), false};
    const auto hit = testing::first_positive(four, p, 20);
    ASSERT_TRUE(hit.has_value());
    const RatioSumFingerprint f =
        ratio_sum_fingerprint(four, Multiple{p, Integer(9), hit->translate});
    nlohmann::json record = to_json(f);
    record["N"] = "4";
    record["generators"] = nlohmann::json::array({nlohmann::json::array({"-100", "260"})});
    record["hit"] = {
        {"coeffs", {9}},
        {"translate", hit->translate.at_infinity ? nlohmann::json(nullptr)
                                                 : nlohmann::json{to_string(hit->translate.x),
                                                                  to_string(hit->translate.y)}}};
    EXPECT_TRUE(verify_fingerprint_record(four, record).holds);
    std::string lead = record["lead"][1];
    lead[5] = lead[5] == '1' ? '2' : '1';
    record["lead"][1] = lead;
    const auto report = verify_fingerprint_record(four, record);
    EXPECT_FALSE(report.holds);
    ASSERT_FALSE(report.problems.empty());
    EXPECT_NE(report.problems[0].find("leading digit 6"), std::string::npos) << report.problems[0];
    record["N"] = "6";
    EXPECT_THROW(verify_fingerprint_record(four, record), InputError);
}

}  // namespace
}  // namespace arcsieve::exact
