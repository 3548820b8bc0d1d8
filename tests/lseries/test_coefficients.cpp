#include <gtest/gtest.h>

#include "curve/curve.hpp"
#include "lseries/coefficients.hpp"

namespace arcsieve::lseries {
namespace {

// 11a1's newform is η(τ)²η(11τ)² = q ∏ (1 − q^n)² (1 − q^{11n})² (a classical identity; e.g.
// Cremona, Algorithms, §2.10 / Diamond–Shurman Ex. 1.x; common practice): an independent
// computation of a_n by power-series multiplication.
TEST(Coefficients, ElevenA1MatchesEtaProduct) {
    const int count = 400;
    std::vector<long> series(count + 1, 0);
    series[1] = 1;  // q
    auto multiply_by = [&](int step) {  // (1 − q^step)
        for (int n = count; n >= step; --n) series[n] -= series[n - step];
    };
    for (int n = 1; n <= count; ++n) {
        multiply_by(n);
        multiply_by(n);
        if (11 * n <= count) {
            multiply_by(11 * n);
            multiply_by(11 * n);
        }
    }
    const auto curve = lseries_curve(parse_curve("[0,-1,1,-10,-20]"));
    EXPECT_EQ(curve.conductor, 11);
    const auto a = dirichlet_coefficients(curve, count);
    for (int n = 1; n <= count; ++n) EXPECT_EQ(a[n], series[n]) << "n = " << n;
}

}  // namespace
}  // namespace arcsieve::lseries
