#include <gtest/gtest.h>

#include "basis/reduction_mod_prime.hpp"

namespace arcsieve::basis {
namespace {

TEST(ReductionModPrime, GroupOrderMatchesCountingAllPairs) {
    // Independent method (brute force): count (x, y) in F_q^2 on the curve, plus infinity.
    const Curve e = parse_curve("[0,109,0,224,0]");  // E_4
    for (std::uint64_t q : {3u, 5u, 11u, 13u, 17u, 101u, 211u}) {
        const auto c = reduce_curve(e, q);
        if (!c) continue;  // bad reduction
        std::uint64_t count = 1;
        for (std::uint64_t x = 0; x < q; ++x) {
            for (std::uint64_t y = 0; y < q; ++y) {
                if ((y * y) % q == (((x + c->a2) * x % q + c->a4) * x % q + c->a6) % q) ++count;
            }
        }
        EXPECT_EQ(group_order(*c), count) << "q = " << q;
    }
}

TEST(ReductionModPrime, ReductionIsAHomomorphismAndOrderKills) {
    // Identities: red(P + Q) = red(P) + red(Q) and #E(F_q)·red(P) = O, on E_4 with (−100, 260)
    // (MathOverflow question 227713).
    const Curve e = parse_curve("[0,109,0,224,0]");
    const Point p = parse_point(e, "-100,260");
    const Point p2 = multiply(e, p, std::int64_t{2}), p3 = multiply(e, p, std::int64_t{3});
    for (std::uint64_t q : {13u, 17u, 101u, 1009u, 65537u}) {
        const auto c = reduce_curve(e, q);
        if (!c) continue;
        EXPECT_EQ(add(*c, reduce_point(*c, p), reduce_point(*c, p2)), reduce_point(*c, p3)) << q;
        EXPECT_TRUE(multiply(*c, reduce_point(*c, p), group_order(*c)).at_infinity) << q;
        const auto r = point_from_x_at_least(*c, 5);
        ASSERT_FALSE(r.at_infinity);
        EXPECT_EQ((r.y * r.y) % q, (((r.x + c->a2) * r.x % q + c->a4) * r.x % q + c->a6) % q);
    }
    EXPECT_FALSE(reduce_curve(e, 2).has_value());  // even q refused
}

}  // namespace
}  // namespace arcsieve::basis
