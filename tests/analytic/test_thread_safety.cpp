// Concurrency: heights and elliptic logs computed on several threads at different precisions
// equal the same values computed serially (the race Boost 1.74's shared default precision
// caused; we require Boost >= 1.81 whose default precision is thread-local).
#include <gtest/gtest.h>

#include <cstdlib>
#include <string>
#include <thread>
#include <vector>

#include "analytic/height.hpp"

namespace arcsieve {
namespace {

TEST(ThreadSafetyTest, ConcurrentHeightsAtDifferentPrecisionsEqualSerialOnes) {
    const bool sanitize = std::getenv("ARCSIEVE_TEST_SCALE") != nullptr &&
                          std::string(std::getenv("ARCSIEVE_TEST_SCALE")) == "sanitize";
    const int repeats = sanitize ? 3 : 25;
    const Curve e4 = parse_curve("[0,109,0,224,0]");  // E_4 of the ratio-sum family
    const Point p{Rational(-100), Rational(260), false};
    const Point q = multiply(e4, p, std::int64_t{3});
    const Real serial_high = canonical_height(e4, q, 300);
    const Real serial_low = canonical_height(e4, p, 20);
    const EllipticLog serial_log = elliptic_log(e4, q, 120);

    int wrong_high = 0, wrong_low = 0, wrong_log = 0;
    std::thread high([&] {
        for (int i = 0; i < repeats; ++i) {
            if (canonical_height(e4, q, 300) != serial_high) ++wrong_high;
        }
    });
    std::thread low([&] {
        for (int i = 0; i < repeats * 20; ++i) {
            if (canonical_height(e4, p, 20) != serial_low) ++wrong_low;
            if (elliptic_log(e4, q, 120).t != serial_log.t) ++wrong_log;
        }
    });
    high.join();
    low.join();
    EXPECT_EQ(wrong_high, 0) << "300-digit heights changed while another thread ran at 20 digits";
    EXPECT_EQ(wrong_low, 0);
    EXPECT_EQ(wrong_log, 0);
}

}  // namespace
}  // namespace arcsieve
