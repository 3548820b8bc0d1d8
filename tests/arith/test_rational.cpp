// Parsing, printing, valuations and digit counts of the exact integer and rational helpers,
// checked against plain string/arithmetic facts (common practice) and brute force.
#include <gtest/gtest.h>

#include <random>
#include <string>

#include "arith/rational.hpp"

namespace arcsieve {
namespace {

TEST(RationalTest, ParsesIntegersAndFractionsAndRejectsGarbage) {
    EXPECT_EQ(parse_integer(" -17 "), Integer(-17));
    EXPECT_EQ(parse_integer("+5"), Integer(5));
    EXPECT_EQ(parse_rational("22/7"), Rational(22, 7));
    EXPECT_EQ(parse_rational("-6/4"), Rational(-3, 2));
    EXPECT_EQ(parse_rational("6/-4"), Rational(-3, 2));
    for (const char* bad : {"", "-", "1.5", "1/0", "abc", "1/2/3", "/3", "3/", "1e5", "0x10"}) {
        EXPECT_FALSE(parse_rational(bad).has_value()) << bad;
    }
    EXPECT_FALSE(parse_integer("2/3").has_value());
}

TEST(RationalTest, PrintingRoundTripsThroughParsing) {
    std::mt19937_64 rng(1);
    for (int k = 0; k < 500; ++k) {
        Rational q(static_cast<long>(rng() % 2000001) - 1000000,
                   1 + static_cast<long>(rng() % 999));
        q.canonicalize();
        EXPECT_EQ(parse_rational(to_string(q)), q) << to_string(q);
    }
}

TEST(RationalTest, ValuationMatchesRepeatedDivision) {
    for (long n = 1; n <= 3000; ++n) {
        for (long p : {2L, 3L, 5L, 7L, 97L}) {
            long m = n;
            int v = 0;
            while (m % p == 0) {
                m /= p;
                ++v;
            }
            ASSERT_EQ(valuation(Integer(n), Integer(p)), v) << n << " " << p;
            ASSERT_EQ(valuation(Integer(-n), Integer(p)), v);
        }
    }
    EXPECT_EQ(valuation(Rational(8, 9), Integer(3)), -2);
    EXPECT_EQ(valuation(Rational(8, 9), Integer(2)), 3);
    EXPECT_THROW(valuation(Integer(0), Integer(2)), std::domain_error);
    EXPECT_THROW(valuation(Integer(5), Integer(1)), std::domain_error);
}

TEST(RationalTest, DecimalDigitsCountsTheDigitsOfTheString) {
    std::mt19937_64 rng(2);
    Integer n = 1;
    for (int k = 0; k < 300; ++k) {
        n = n * 10 + static_cast<long>(rng() % 10);
        if (k % 7 == 0) n = n - 1;
        const std::string text = Integer(abs(n)).get_str();
        EXPECT_EQ(decimal_digits(n), text.size()) << text;
        EXPECT_EQ(decimal_digits(-n), text.size()) << text;
    }
    EXPECT_EQ(decimal_digits(Integer(0)), 1u);
    EXPECT_EQ(decimal_digits(Integer(9)), 1u);
    EXPECT_EQ(decimal_digits(Integer(10)), 2u);
    EXPECT_EQ(decimal_digits(Integer("99999999999999999999")), 20u);
    EXPECT_EQ(decimal_digits(Integer("100000000000000000000")), 21u);
}

}  // namespace
}  // namespace arcsieve
