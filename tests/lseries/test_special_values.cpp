#include <gtest/gtest.h>

#include "curve/curve.hpp"
#include "lseries/analytic_rank.hpp"
#include "lseries/special_values.hpp"

namespace arcsieve::lseries {
namespace {

double mid(const Interval& x) {
    return median(x).convert_to<double>();
}

TEST(SpecialValues, Eleven) {
    const auto r = analytic_rank(parse_curve("[0,-1,1,-10,-20]"), AnalyticOptions{});
    ASSERT_TRUE(r.root_number);
    EXPECT_EQ(*r.root_number, 1);
    EXPECT_NEAR(mid(r.values[0].value), 0.253841860855911, 1e-12);
    std::cout << format_enclosure(r.values[0].value) << "\n";
}

TEST(SpecialValues, ThirtySeven) {
    const auto r = analytic_rank(parse_curve("[0,0,1,-1,0]"), AnalyticOptions{});
    EXPECT_EQ(*r.root_number, -1);
    EXPECT_NEAR(mid(r.values[0].value), 0.305999773834052, 1e-12);
    std::cout << format_enclosure(r.values[0].value) << "\n";
}

TEST(SpecialValues, HigherOrders) {
    const auto r = analytic_rank(parse_curve("[0,1,1,-2,0]"), AnalyticOptions{});
    ASSERT_EQ(r.values.size(), 2u);
    EXPECT_NEAR(mid(r.values[1].value), 0.759316500288427, 1e-12);
    const auto s = analytic_rank(parse_curve("[0,0,1,-7,6]"), AnalyticOptions{});
    ASSERT_EQ(s.values.size(), 2u);
    EXPECT_NEAR(mid(s.values[1].value), 1.73184990011930, 1e-12);
}

}  // namespace
}  // namespace arcsieve::lseries
