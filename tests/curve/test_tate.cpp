// Tate's algorithm: published reduction data (conductors read off LMFDB/Cremona labels,
// Tamagawa products from REFERENCE-VALUES.md), the p >= 5 table of v(Δ) per Kodaira type,
// split/nonsplit/additive against brute-force point counts mod p, invariance under random
// changes of variables, Ogg's formula, and the component group law for I_n.
#include <gtest/gtest.h>

#include <cstdlib>
#include <map>
#include <random>
#include <string>

#include "arith/factor.hpp"
#include "curve/tate.hpp"

namespace arcsieve {
namespace {

int scaled(int full) {
    const char* scale = std::getenv("ARCSIEVE_TEST_SCALE");
    return scale != nullptr && std::string(scale) == "sanitize" ? std::max(1, full / 10) : full;
}

std::map<long, LocalReduction> by_prime(const Curve& e) {
    std::map<long, LocalReduction> out;
    for (auto& local : bad_reduction(e)) out[local.prime.get_si()] = local;
    return out;
}

int tamagawa_product(const Curve& e) {
    int product = 1;
    for (const auto& local : bad_reduction(e)) product *= local.tamagawa;
    return product;
}

// Number of components m of the special fibre from the Kodaira symbol (Silverman, Advanced
// Topics IV.9, Table 4.1; common practice).
int component_count(const std::string& symbol) {
    if (symbol == "II") return 1;
    if (symbol == "III") return 2;
    if (symbol == "IV") return 3;
    if (symbol == "IV*") return 7;
    if (symbol == "III*") return 8;
    if (symbol == "II*") return 9;
    if (symbol.back() == '*') return std::stoi(symbol.substr(1, symbol.size() - 2)) + 5;
    return std::max(1, std::stoi(symbol.substr(1)));
}

// a_p = p + 1 - #E(F_p) by counting every solution mod p of the minimal model (singular point
// included), p small: an independent check of the reduction kind (a_p = 1 split, -1 nonsplit,
// 0 additive; Silverman AEC VII.5 / common practice).
long brute_force_trace(const Curve& minimal, long p) {
    auto residue = [p](const Rational& q) {
        Integer r = Integer(q.get_num()) % p;
        return (r.get_si() % p + p) % p;
    };
    const long a1 = residue(minimal.a1), a2 = residue(minimal.a2), a3 = residue(minimal.a3),
               a4 = residue(minimal.a4), a6 = residue(minimal.a6);
    long count = 1;
    for (long x = 0; x < p; ++x) {
        for (long y = 0; y < p; ++y) {
            const long lhs = (y * y + a1 * x * y + a3 * y) % p;
            const long rhs = (((x + a2) * x + a4) % p * x + a6) % p;
            if (lhs == rhs) ++count;
        }
    }
    return p + 1 - count;
}

TEST(TateTest, ConductorsMatchPublishedLabels) {
    // The number in an LMFDB/Cremona label is the conductor (LMFDB; curves and labels from
    // REFERENCE-VALUES.md). 11a1, 37a1 from Cremona's tables (from memory); y^2 = x^3 - x has
    // conductor 32, y^2 = x^3 + x conductor 64, y^2 = x^3 + 1 conductor 36 (from memory).
    const std::pair<const char*, long> published[] = {
        {"[1,-1,1,4,6]", 117},
        {"[0,1,1,-23,-50]", 37},
        {"[0,0,1,-21,40]", 441},
        {"[1,1,0,-3,-3]", 210},
        {"[1,1,0,3,9]", 930},
        {"[0,-1,0,-10,17]", 460},
        {"[1,-1,0,-5252,-145223]", 637},
        {"[1,0,0,534,-14004]", 10830},
        {"[0,0,0,13524,-400624]", 28224},
        {"[0,-1,1,-10,-20]", 11},
        {"[0,0,1,-1,0]", 37},
        {"[0,0,0,-1,0]", 32},
        {"[0,0,0,1,0]", 64},
        {"[0,0,0,0,1]", 36},
    };
    for (const auto& [text, expected] : published) {
        EXPECT_EQ(conductor(parse_curve(text)), expected) << text;
    }
}

TEST(TateTest, PublishedTamagawaProductsAndTypes) {
    // 117a1: Tamagawa product 4 (LMFDB, REFERENCE-VALUES.md).
    EXPECT_EQ(tamagawa_product(parse_curve("[1,-1,1,4,6]")), 4);
    // 37.b2: Δ = 37^3, Tamagawa product 3 (LMFDB), hence split I3 at 37.
    const auto b2 = by_prime(parse_curve("[0,1,1,-23,-50]"));
    ASSERT_EQ(b2.size(), 1u);
    EXPECT_EQ(b2.at(37).kodaira, "I3");
    EXPECT_EQ(b2.at(37).discriminant_valuation, 3);
    EXPECT_EQ(b2.at(37).tamagawa, 3);
    EXPECT_EQ(b2.at(37).kind, ReductionKind::split_multiplicative);
    // 11a1: Δ = -11^5, split I5, c = 5 (Cremona's tables, from memory).
    const auto a1 = by_prime(parse_curve("[0,-1,1,-10,-20]"));
    EXPECT_EQ(a1.at(11).kodaira, "I5");
    EXPECT_EQ(a1.at(11).tamagawa, 5);
    // 14a1 = [1,0,1,4,-6]: c_2 = 2, c_7 = 3 (Cremona's tables, from memory); it is also the
    // minimal model of E_1 (see test_minimal_model.cpp).
    const auto fourteen = by_prime(parse_curve("[1,0,1,4,-6]"));
    EXPECT_EQ(fourteen.at(2).tamagawa, 2);
    EXPECT_EQ(fourteen.at(7).tamagawa, 3);
    // 37a1: Δ = 37, I1 (from memory).
    EXPECT_EQ(by_prime(parse_curve("[0,0,1,-1,0]")).at(37).kodaira, "I1");
}

TEST(TateTest, AdditiveTypesAtLargePrimesFollowTheDiscriminantTable) {
    // For p >= 5 the Kodaira type is read off v(Δ) on a minimal model with v(j) >= 0:
    // II 2, III 3, IV 4, I0* 6, IV* 8, III* 9, II* 10, and f = 2 (Silverman, Advanced Topics
    // IV.9 Table 4.1, from memory; common practice). Tamagawa numbers: IV, IV* have c = 3 when
    // the quadratic Y^2 - a6/p^k splits (here a6 = p^k, so always); I0* has c = 1 + #roots of the
    // cubic mod p (for y^2 = x^3 + p^3: roots of T^3 + 1; for y^2 = x^3 + p^2 x: of T^3 + T).
    for (long p : {5L, 7L, 11L, 13L, 17L, 19L, 23L}) {
        const Integer P(p);
        struct Case {
            std::array<Integer, 2> a4_a6;
            const char* symbol;
            int v_delta;
            int tamagawa;
        };
        const int cubic_t3_plus_1 = p % 3 == 1 ? 4 : 2;
        const int cubic_t3_plus_t = p % 4 == 1 ? 4 : 2;
        const Case cases[] = {
            {{0, P}, "II", 2, 1},
            {{P, 0}, "III", 3, 2},
            {{0, P * P}, "IV", 4, 3},
            {{0, P * P * P}, "I0*", 6, cubic_t3_plus_1},
            {{P * P, 0}, "I0*", 6, cubic_t3_plus_t},
            {{0, P * P * P * P}, "IV*", 8, 3},
            {{P * P * P, 0}, "III*", 9, 2},
            {{0, P * P * P * P * P}, "II*", 10, 1},
        };
        for (const auto& c : cases) {
            const Curve e = make_curve({0, 0, 0, Rational(c.a4_a6[0]), Rational(c.a4_a6[1])});
            const LocalReduction local = tate_local(e, P);
            EXPECT_EQ(local.kodaira, c.symbol) << to_string(e) << " p = " << p;
            EXPECT_EQ(local.discriminant_valuation, c.v_delta) << to_string(e);
            EXPECT_EQ(local.conductor_exponent, 2) << to_string(e);
            EXPECT_EQ(local.tamagawa, c.tamagawa) << to_string(e) << " p = " << p;
            EXPECT_EQ(local.kind, ReductionKind::additive);
        }
    }
}

TEST(TateTest, QuadraticTwistByBadMultiplicativePrimeGivesInStar) {
    // Twisting a curve with I_n at p >= 5 by p gives I_n* (Silverman, Advanced Topics IV.9,
    // exercise; common practice): 11a1 twisted by 11, 37.b2 by 37 (short models
    // y^2 = x^3 - 27 c4 d^2 x - 54 c6 d^3).
    for (const auto& [text, p, n] :
         {std::tuple{"[0,-1,1,-10,-20]", 11L, 5}, std::tuple{"[0,1,1,-23,-50]", 37L, 3}}) {
        const Curve e = parse_curve(text);
        const Rational d(p);
        const Curve twist = make_curve({0, 0, 0, -27 * c4(e) * d * d, -54 * c6(e) * d * d * d});
        const LocalReduction local = tate_local(twist, Integer(p));
        EXPECT_EQ(local.kodaira, "I" + std::to_string(n) + "*") << text;
        EXPECT_EQ(local.conductor_exponent, 2);
        EXPECT_TRUE(local.tamagawa == 2 || local.tamagawa == 4);
    }
}

// Random integral curves. mode 0: small coefficients; mode 1: each a_i times a random power
// of 2 or 3; mode 2: a_i times p^(floor(w_i λ) + 0 or 1) for p in {2, 3, 5, 7}, weights
// w = (1, 2, 3, 4, 6) and λ in {1/3, 1/2, 2/3, 5/6, 1}, which reaches the deep additive types.
Curve random_curve(std::mt19937_64& rng, int mode) {
    static const int weights[] = {1, 2, 3, 4, 6};
    for (;;) {
        std::array<Rational, 5> a;
        const int prime = std::array{2, 3, 5, 7}[rng() % 4];
        const int lambda_sixths = std::array{2, 3, 4, 5, 6}[rng() % 5];
        for (int i = 0; i < 5; ++i) {
            Integer value(static_cast<long>(rng() % 61) - 30);
            int exponent = 0;
            if (mode == 1) exponent = static_cast<int>(rng() % 7);
            if (mode == 2) {
                exponent = weights[i] * lambda_sixths / 6 + static_cast<int>(rng() % 2);
            }
            for (int k = 0; k < exponent; ++k) value *= (mode == 1 ? (i % 2 ? 2 : 3) : prime);
            a[i] = Rational(value);
        }
        Curve e{a[0], a[1], a[2], a[3], a[4]};
        if (!is_singular(e)) return e;
    }
}

TEST(TateTest, OggFormulaAndTraceAgreeOnRandomCurves) {
    // Ogg's formula v(Δ) = f + m - 1 (Ogg 1967; Saito 1988 at p = 2) and a_p from brute-force
    // point counts (1 split, -1 nonsplit, 0 additive) for every bad prime below 200; bounds
    // f <= 8 at 2, f <= 5 at 3, f = 2 for additive p >= 5 (Brumer–Kramer; common practice).
    std::mt19937_64 rng(17);
    std::map<std::string, int> seen;
    for (int k = 0; k < scaled(600); ++k) {
        const Curve e = random_curve(rng, k % 3);
        for (const auto& local : bad_reduction(e)) {
            const std::string where = to_string(e) + " at p = " + to_string(local.prime);
            seen[local.kodaira.back() == '*' && local.kodaira != "II*" && local.kodaira != "III*" &&
                         local.kodaira != "IV*"
                     ? "In*"
                     : (local.kodaira[0] == 'I' && local.kodaira[1] != 'I' &&
                                local.kodaira[1] != 'V'
                            ? "In"
                            : local.kodaira)]++;
            EXPECT_EQ(local.discriminant_valuation,
                      local.conductor_exponent + component_count(local.kodaira) - 1)
                << where << " " << local.kodaira;
            if (local.prime < 200) {
                const long p = local.prime.get_si();
                const long trace = brute_force_trace(local.minimal_at_p.curve, p);
                const long expected = local.kind == ReductionKind::split_multiplicative      ? 1
                                      : local.kind == ReductionKind::nonsplit_multiplicative ? -1
                                                                                             : 0;
                EXPECT_EQ(trace, expected) << where << " " << local.kodaira;
            }
            EXPECT_LE(local.conductor_exponent, local.prime == 2 ? 8 : (local.prime == 3 ? 5 : 2))
                << where;
            if (local.kind == ReductionKind::additive) {
                EXPECT_GE(local.conductor_exponent, 2) << where;
                if (local.prime > 3) {
                    EXPECT_EQ(local.conductor_exponent, 2) << where;
                }
            } else {
                EXPECT_EQ(local.conductor_exponent, 1) << where;
            }
            // Tamagawa numbers allowed per type (Silverman, Advanced Topics IV.9 Table 4.1; common
            // practice): the component group's rational points.
            const std::string& symbol = local.kodaira;
            const int c = local.tamagawa;
            if (symbol == "II" || symbol == "II*") {
                EXPECT_EQ(c, 1) << where;
            } else if (symbol == "III" || symbol == "III*") {
                EXPECT_EQ(c, 2) << where;
            } else if (symbol == "IV" || symbol == "IV*") {
                EXPECT_TRUE(c == 1 || c == 3) << where << " c = " << c;
            } else if (symbol == "I0*") {
                EXPECT_TRUE(c == 1 || c == 2 || c == 4) << where << " c = " << c;
            } else if (symbol.back() == '*') {
                EXPECT_TRUE(c == 2 || c == 4) << where << " c = " << c;
            } else if (local.kind == ReductionKind::split_multiplicative) {
                EXPECT_EQ(c, local.kodaira_n) << where;
            } else {
                EXPECT_EQ(c, local.kodaira_n % 2 == 0 ? 2 : 1) << where;
            }
        }
    }
    // The random families must have reached every Kodaira type, or the test proves little.
    for (const char* symbol : {"In", "II", "III", "IV", "In*", "IV*", "III*", "II*"}) {
        EXPECT_GT(seen[symbol], 0) << "no random curve of type " << symbol;
    }
    for (const auto& [symbol, count] : seen) std::printf("%s: %d  ", symbol.c_str(), count);
    std::printf("\n");
}

TEST(TateTest, QuadraticTwistByLargePrimeSwapsKodairaTypes) {
    // At p >= 5, twisting by p (short model y^2 = x^3 - 27 c4 p^2 x - 54 c6 p^3) swaps
    // I0 <-> I0*, I_n <-> I_n*, II <-> IV*, III <-> III*, IV <-> II* (Silverman, Advanced Topics
    // IV.9, Table 4.1: v(Δ) moves by 6 mod 12 and the model stays minimal; common practice).
    const std::map<std::string, std::string> partner = {
        {"II", "IV*"}, {"IV*", "II"}, {"III", "III*"}, {"III*", "III"},
        {"IV", "II*"}, {"II*", "IV"}, {"I0", "I0*"},   {"I0*", "I0"}};
    std::mt19937_64 rng(29);
    int checked = 0;
    std::map<std::string, int> types_seen;
    // Not scaled down under sanitizers: fewer curves would miss some types (~1 s there).
    for (int k = 0; k < 200; ++k) {
        const Curve e = random_curve(rng, 2);
        for (long p : {5L, 7L, 11L}) {
            const LocalReduction here = tate_local(e, Integer(p));
            const Rational d(p);
            const Curve twist = make_curve({0, 0, 0, -27 * c4(e) * d * d, -54 * c6(e) * d * d * d});
            const LocalReduction there = tate_local(twist, Integer(p));
            std::string expected;
            if (partner.count(here.kodaira)) {
                expected = partner.at(here.kodaira);
            } else if (here.kodaira.back() == '*') {
                expected = here.kodaira.substr(0, here.kodaira.size() - 1);
            } else {
                expected = here.kodaira + "*";
            }
            EXPECT_EQ(there.kodaira, expected) << to_string(e) << " twisted by " << p;
            ++checked;
            types_seen[here.kodaira.size() > 1 && here.kodaira[1] >= '1' && here.kodaira[1] <= '9'
                           ? (here.kodaira.back() == '*' ? "In*" : "In")
                           : here.kodaira]++;
        }
    }
    EXPECT_GT(checked, 0);
    // The twist pairs must all be exercised (from either side) for the test to mean much.
    for (const char* symbol : {"I0", "In", "II", "III", "IV"}) {
        EXPECT_GT(
            types_seen[symbol] +
                types_seen[partner.count(symbol) ? partner.at(symbol) : std::string(symbol) + "*"],
            0)
            << symbol;
    }
}

TEST(TateTest, ReductionDataIsInvariantUnderRandomChangesOfVariables) {
    std::mt19937_64 rng(23);
    for (int k = 0; k < scaled(150); ++k) {
        const Curve e = random_curve(rng, k % 3);
        Rational u(1 + static_cast<long>(rng() % 4), 1 + static_cast<long>(rng() % 4));
        u.canonicalize();
        if (rng() % 2) u = -u;
        Rational r(static_cast<long>(rng() % 21) - 10, 1 + static_cast<long>(rng() % 3));
        Rational s(static_cast<long>(rng() % 21) - 10, 1 + static_cast<long>(rng() % 3));
        Rational t(static_cast<long>(rng() % 21) - 10, 1 + static_cast<long>(rng() % 5));
        r.canonicalize();
        s.canonicalize();
        t.canonicalize();
        const Curve other = apply(e, ModelChange{u, r, s, t});
        const auto original = bad_reduction(e);
        const auto moved = bad_reduction(other);
        ASSERT_EQ(original.size(), moved.size()) << to_string(e) << " vs " << to_string(other);
        for (std::size_t i = 0; i < original.size(); ++i) {
            EXPECT_EQ(original[i].prime, moved[i].prime);
            EXPECT_EQ(original[i].kodaira, moved[i].kodaira)
                << to_string(e) << " vs " << to_string(other);
            EXPECT_EQ(original[i].conductor_exponent, moved[i].conductor_exponent);
            EXPECT_EQ(original[i].tamagawa, moved[i].tamagawa)
                << to_string(e) << " vs " << to_string(other);
            EXPECT_EQ(original[i].discriminant_valuation, moved[i].discriminant_valuation);
            EXPECT_EQ(apply(other, moved[i].minimal_at_p.change), moved[i].minimal_at_p.curve);
        }
    }
}

TEST(TateTest, ComponentIndexFollowsTheGroupLawOnMultiplicativeFibres) {
    // On I_n the component group is cyclic of order n and the index is ±i, so the index of 2Q
    // is that of ±2i mod n, and that of P + Q that of i(P) ± i(Q) (Silverman, Advanced Topics
    // IV.9; common practice). Curves E_N (N = 4, 29, 122: N + 3 = 7, 2^5, 5^3 give I_n with
    // n up to 12), points: P = (-100, 260) on E_4 (REFERENCE-VALUES.md) and the points
    // (0,0), (4, 8N+20), (8(N+3), 8(N+3)(2N+5)) of E_N.
    int checked = 0, nontrivial = 0;
    for (long n_value : {4L, 29L, 122L}) {
        const Integer N(n_value);
        const Curve e =
            make_curve({0, Rational(4 * N * N + 12 * N - 3), 0, Rational(32 * (N + 3)), 0});
        std::vector<Point> points = {
            Point{0, 0, false}, Point{4, Rational(8 * N + 20), false},
            Point{Rational(8 * (N + 3)), Rational(8 * (N + 3) * (2 * N + 5)), false}};
        if (n_value == 4) points.push_back(parse_point(e, "-100,260"));
        for (const Point& q : points) ASSERT_TRUE(on_curve(e, q)) << to_string(q);
        for (const auto& local : bad_reduction(e)) {
            if (local.kind == ReductionKind::additive) continue;
            const int n = local.kodaira_n;
            auto fold = [n](int i) {
                i = ((i % n) + n) % n;
                return std::min(i, n - i);
            };
            for (const Point& q : points) {
                for (const Point& r : points) {
                    const int i = reduction_component(e, local, q).index;
                    const int j = reduction_component(e, local, r).index;
                    const int sum = reduction_component(e, local, add(e, q, r)).index;
                    EXPECT_LE(i, n / 2);
                    EXPECT_TRUE(sum == fold(i + j) || sum == fold(i - j))
                        << "N = " << n_value << " p = " << to_string(local.prime) << " I" << n
                        << ": " << i << " + " << j << " -> " << sum;
                    EXPECT_EQ(reduction_component(e, local, doubled(e, q)).index, fold(2 * i));
                    ++checked;
                    if (i > 1) ++nontrivial;
                }
            }
        }
    }
    EXPECT_GT(checked, 50);
    EXPECT_GT(nontrivial, 0);
}

TEST(TateTest, ComponentsAreInvariantUnderChangesOfVariables) {
    const Curve e = parse_curve("[0,109,0,224,0]");
    const Point p = parse_point(e, "-100,260");
    const ModelChange change{Rational(3, 2), Rational(5), Rational(-1, 2), Rational(7, 3)};
    const Curve other = apply(e, change);
    const auto here = bad_reduction(e);
    const auto there = bad_reduction(other);
    ASSERT_EQ(here.size(), there.size());
    for (std::size_t i = 0; i < here.size(); ++i) {
        for (int k = 1; k <= 4; ++k) {
            const Point q = multiply(e, p, std::int64_t{k});
            EXPECT_EQ(reduction_component(e, here[i], q).index,
                      reduction_component(other, there[i], to_new_model(change, q)).index);
        }
    }
}

TEST(TateTest, NonPrimeIsRejected) {
    EXPECT_THROW(tate_local(parse_curve("[0,0,1,-1,0]"), Integer(35)), std::invalid_argument);
}

}  // namespace
}  // namespace arcsieve
