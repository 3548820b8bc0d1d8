#include <gtest/gtest.h>

#include "basis/analytic_rank_zero.hpp"

namespace arcsieve::basis {
namespace {

TEST(CentralValue, MatchesLmfdbForRankZeroCurve37b2) {
    // LMFDB 37.b2 (REFERENCE-VALUES.md): L(E,1) = 0.72568106193615278233620554103, rank 0.
    const auto c = central_value(parse_curve("[0,1,1,-23,-50]"), Integer(1000000));
    ASSERT_TRUE(c.has_value());
    EXPECT_EQ(c->conductor, 37);
    EXPECT_EQ(c->root_number, 1);
    EXPECT_NEAR(c->value, 0.72568106193615278, 1e-9);
    EXPECT_TRUE(c->proves_rank_zero());
}

TEST(CentralValue, RankOneCurvesHaveRootNumberMinusOne) {
    // LMFDB rank-1 curves 117a1 and 441.a2 (REFERENCE-VALUES.md; 117a1 lists L'(E,1) ≠ 0, so
    // L(E,1) = 0 and the sign of the functional equation is −1): nothing may be proved.
    for (const char* text : {"[1,-1,1,4,6]", "[0,0,1,-21,40]"}) {
        const auto c = central_value(parse_curve(text), Integer(1000000));
        ASSERT_TRUE(c.has_value()) << text;
        EXPECT_EQ(c->root_number, -1) << text;
        EXPECT_FALSE(c->proves_rank_zero()) << text;
    }
    const auto c117 = central_value(parse_curve("[1,-1,1,4,6]"), Integer(1000000));
    EXPECT_EQ(c117->conductor, 117);  // the Cremona label's conductor
}

TEST(CentralValue, RefusesLargeConductors) {
    EXPECT_FALSE(central_value(parse_curve("[0,0,1,-21,40]"), Integer(100)).has_value());
}

}  // namespace
}  // namespace arcsieve::basis
