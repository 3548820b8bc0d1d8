// Canonical height, local heights, pairing and regulator.
#include <gtest/gtest.h>

#include "analytic/height.hpp"
#include "curve/minimal_model.hpp"
#include "family/ratio_sum.hpp"
#include "test_support.hpp"

namespace arcsieve {
namespace {

using namespace testing_support;

struct PublishedHeight {
    const char* label;
    const char* curve;
    const char* x;
    const char* y;
    const char* height;
};

// LMFDB (lmfdb.org) generator heights in the LMFDB normalisation, the one arcsieve uses
// (values copied in ../shared/REFERENCE-VALUES.md). Δ < 0 for all but 210.d1.
const PublishedHeight lmfdb_heights[] = {
    {"117a1", "[1,-1,1,4,6]", "0", "2", "1.1303356261795510066487525099"},
    {"441.a2", "[0,0,1,-21,40]", "4", "4", "0.076270034394571012613674763318"},
    {"210.d1", "[1,1,0,-3,-3]", "2", "1", "0.53264658095574456192746745541"},
    {"930.c2", "[1,1,0,3,9]", "0", "3", "0.28467632522426411770903856556"},
    {"460.a1", "[0,-1,0,-10,17]", "4", "5", "0.068955432465054016033942507545"},
    {"637.d1", "[1,-1,0,-5252,-145223]", "4776/49", "158761/343", "8.8267466432495297542348194658"},
    {"10830.bb2", "[1,0,0,534,-14004]", "18", "30", "2.2694725574431332951688486008"},
    {"28224.cl3", "[0,0,0,13524,-400624]", "109", "1539", "3.0396882901275111915558861958"},
};

TEST(CanonicalHeight, MatchesLmfdbGeneratorHeights) {
    for (const PublishedHeight& published : lmfdb_heights) {
        const Curve curve = parse_curve(published.curve);
        const Point p = rational_point(published.x, published.y);
        const Real h = canonical_height(curve, p, 40);
        const Real expected(published.height, 40);
        EXPECT_LT(abs(h - expected), power_of_ten(-26, 40))
            << published.label << " computed " << show(h) << " LMFDB " << published.height;
    }
}

TEST(Regulator, OfOneGeneratorIsItsHeightFor441a2) {
    // LMFDB 441.a2: regulator 0.076270034394571012613674763318 (rank 1).
    const Curve curve = parse_curve("[0,0,1,-21,40]");
    const Real r = regulator(curve, {rational_point("4", "4")}, 40);
    EXPECT_LT(abs(r - Real("0.076270034394571012613674763318", 40)), power_of_ten(-26, 40));
}

// Lozano-Robledo, "Elliptic Curves, Modular Forms, and Their L-functions", Example 2.7.2:
// y^2 = x^3 + 877x with the Bremner–Cassels generator; ĥ = 47.9901859939… in the ½
// normalisation there, so 95.9803719878… in ours.
TEST(CanonicalHeight, MatchesLozanoRobledoExampleForCurve877) {
    const Curve curve = parse_curve("[0,0,0,877,0]");
    const Rational root("612776083187947368101/78841535860683900210");
    const Rational x = root * root;
    const Rational rhs = x * x * x + 877 * x;
    Integer num_root, den_root;
    mpz_sqrt(num_root.get_mpz_t(), rhs.get_num_mpz_t());
    mpz_sqrt(den_root.get_mpz_t(), rhs.get_den_mpz_t());
    const Rational y(num_root, den_root);
    ASSERT_EQ(y * y, rhs) << "the x-coordinate is not on the curve";
    const Real h = canonical_height(curve, Point{x, y, false}, 30);
    EXPECT_LT(abs(h / 2 - Real("47.9901859939", 30)), power_of_ten(-9, 30)) << show(h);
}

struct SamplePoint {
    const char* curve;
    const char* x;
    const char* y;
};

const SamplePoint infinite_order[] = {
    {"[0,109,0,224,0]", "-100", "260"},
    {"[1,-1,1,4,6]", "0", "2"},
    {"[1,1,0,-3,-3]", "2", "1"},
    {"[1,0,0,534,-14004]", "18", "30"},
    {"[0,0,0,13524,-400624]", "109", "1539"},
    {"[0,1,1,-2,0]", "0", "0"},
};

TEST(CanonicalHeight, ScalesQuadraticallyUnderMultiplicationTo100Digits) {
    for (const SamplePoint& sample : infinite_order) {
        const Curve curve = parse_curve(sample.curve);
        const Point p = rational_point(sample.x, sample.y);
        const Real h = canonical_height(curve, p, 100);
        for (int n : {2, 3, 5, 7}) {
            const Real hn = canonical_height(curve, multiply(curve, p, n), 100);
            EXPECT_LT(abs(hn - n * n * h), power_of_ten(-97, 110))
                << sample.curve << " n=" << n << " " << show(hn) << " vs " << show(n * n * h);
        }
    }
}

TEST(CanonicalHeight, IsInvariantUnderTorsionTranslationAndVanishesOnTorsion) {
    struct WithTorsion {
        const char* curve;
        const char* x;
        const char* y;
        const char* torsion_x;
        const char* torsion_y;
    };
    // Torsion points from the LMFDB data in ../shared/REFERENCE-VALUES.md, and (0,0) on E_4.
    const WithTorsion cases[] = {
        {"[1,-1,1,4,6]", "0", "2", "2", "3"},
        {"[1,1,0,-3,-3]", "2", "1", "-2", "1"},
        {"[1,0,0,534,-14004]", "18", "30", "30", "156"},
        {"[0,0,0,13524,-400624]", "109", "1539", "28", "0"},
        {"[0,109,0,224,0]", "-100", "260", "0", "0"},
    };
    for (const WithTorsion& c : cases) {
        const Curve curve = parse_curve(c.curve);
        const Point p = rational_point(c.x, c.y);
        const Point torsion = rational_point(c.torsion_x, c.torsion_y);
        const Real h = canonical_height(curve, p, 100);
        Point translate = torsion;
        for (int k = 1; k <= 4 && !translate.at_infinity; ++k) {
            EXPECT_LT(abs(canonical_height(curve, add(curve, p, translate), 100) - h),
                      power_of_ten(-98, 110))
                << c.curve << " k=" << k;
            EXPECT_LT(abs(canonical_height(curve, translate, 100)), power_of_ten(-98, 110))
                << c.curve << " torsion multiple " << k;
            translate = add(curve, translate, torsion);
        }
    }
}

// ĥ(P) = lim h(x(2^k P))/4^k (the definition; exact doublings), and 4^k times the gap is
// h − ĥ at 2^k P, which stays bounded (Silverman AEC VIII.9.3).
TEST(CanonicalHeight, IsTheLimitOfNaiveHeightsOfRepeatedDoubles) {
    for (const SamplePoint& sample : infinite_order) {
        const Curve curve = parse_curve(sample.curve);
        Point multiple = rational_point(sample.x, sample.y);
        const Real h = canonical_height(curve, multiple, 40);
        Real scale = make_real(1, 40);
        Real last_gap = make_real(0, 40);
        const int doublings = scaled(10) >= 10 ? 8 : 6;  // 6 under the sanitizers
        for (int k = 1; k <= doublings; ++k) {
            multiple = doubled(curve, multiple);
            scale *= 4;
            const Integer& num = multiple.x.get_num();
            const Integer& den = multiple.x.get_den();
            const Real naive =
                log(make_real(abs(num) > den ? Integer(abs(num)) : Integer(den), 40));
            last_gap = naive / scale - h;
            EXPECT_LT(abs(last_gap) * scale, 40) << sample.curve << " k=" << k;
        }
        EXPECT_LT(abs(last_gap), 0.01) << sample.curve;
    }
}

TEST(HeightPairing, SatisfiesTheParallelogramLawOnARankTwoCurve) {
    // y^2 + y = x^3 + x^2 − 2x with (0,0) and (1,0) (both checked on the curve here).
    const Curve curve = parse_curve("[0,1,1,-2,0]");
    const Point p = rational_point("0", "0"), q = rational_point("1", "0");
    ASSERT_TRUE(on_curve(curve, p) && on_curve(curve, q));
    const Real lhs = canonical_height(curve, add(curve, p, q), 80) +
                     canonical_height(curve, subtract(curve, p, q), 80);
    const Real rhs = 2 * canonical_height(curve, p, 80) + 2 * canonical_height(curve, q, 80);
    EXPECT_LT(abs(lhs - rhs), power_of_ten(-77, 90));
    // Bilinearity: <2P + Q, Q> = 2<P, Q> + <Q, Q>.
    const Real left = height_pairing(curve, add(curve, doubled(curve, p), q), q, 60);
    const Real right = 2 * height_pairing(curve, p, q, 60) + canonical_height(curve, q, 60);
    EXPECT_LT(abs(left - right), power_of_ten(-57, 70));
    // A basis modulo torsion has a positive regulator, and a dependent list has regulator 0.
    EXPECT_GT(regulator(curve, {p, q}, 30), 0.01);
    EXPECT_LT(abs(regulator(curve, {p, q, add(curve, p, q)}, 30)), power_of_ten(-25, 40));
}

// ĥ does not depend on the model: move the curve and the point by several changes of
// variables (non-integral, non-minimal ones included) and sum the local heights again.
TEST(CanonicalHeight, SumOfLocalHeightsIsTheSameOnSeveralModels) {
    const ModelChange changes[] = {
        {Rational(2), Rational(1), Rational(0), Rational(3)},
        {Rational(1, 2), Rational(-5), Rational(1), Rational(7)},
        {Rational(6), Rational(0), Rational(0), Rational(0)},
        {Rational(1, 3), Rational(2, 9), Rational(1, 3), Rational(4, 27)},
    };
    for (const SamplePoint& sample : infinite_order) {
        const Curve curve = parse_curve(sample.curve);
        const Point p = rational_point(sample.x, sample.y);
        const Real h = canonical_height(curve, p, 60);
        for (const ModelChange& change : changes) {
            const Curve other = apply(curve, change);
            const Point moved = to_new_model(change, p);
            ASSERT_TRUE(on_curve(other, moved));
            EXPECT_LT(abs(canonical_height(other, moved, 60) - h), power_of_ten(-57, 70))
                << sample.curve << " -> " << to_string(other);
        }
        const ModelWithChange minimal = minimal_model(curve);
        EXPECT_LT(abs(canonical_height(minimal.curve, to_new_model(minimal.change, p), 60) - h),
                  power_of_ten(-57, 70))
            << sample.curve << " minimal model";
    }
}

// Good primes contribute max(0, log|x|_p); on the integral model of E_4 (not minimal at 2)
// the 2-adic part is the only special one besides the factors of Δ.
TEST(LocalHeight, NonArchimedeanAtGoodPrimesIsLogOfDenominator) {
    const Curve curve = family::ratio_sum_curve(Integer(4));
    const Point p = multiply(curve, rational_point("-100", "260"), 3);
    for (long prime : {3L, 7L, 11L, 13L, 17L, 19L, 23L, 29L}) {
        const Integer q(prime);
        if (discriminant(curve).get_num() % q == 0) continue;
        const int v = valuation(p.x, q);
        const Rational expected(v < 0 ? -v : 0);
        EXPECT_EQ(nonarchimedean_local_height_coefficient(curve, p, q), expected) << prime;
    }
}

// An independent evaluation of λ_∞: Tate's doubling series in our normalisation,
// λ(P) = log|x0 − r0| + Σ_n 4^{−n−1} log|(φ(x_n) − r_{n+1} ψ(x_n)) / (x_n − r_n)^4|,
// x_{n+1} = φ(x_n)/ψ(x_n), φ = x^4 − b4 x^2 − 2 b6 x − b8, ψ = 4x^3 + b2 x^2 + 2 b4 x + b6,
// from λ(2P) = 4λ(P) − log|ψ(x)| and λ = log|x| + o(1) (Silverman AEC Exercise 6.4; the
// shifts r_n ∈ {0, 1} keep |x_n − r_n| ≥ 1/2, after Silverman, Math. Comp. 51 (1988) §4).
Real archimedean_by_doubling(const Curve& curve, const Point& p, unsigned digits) {
    const BInvariants b = b_invariants(curve);
    const Real b2 = make_real(b.b2, digits), b4 = make_real(b.b4, digits),
               b6 = make_real(b.b6, digits), b8 = make_real(b.b8, digits);
    auto shift_for = [&](const Real& x) {
        return abs(x) >= abs(x - 1) ? make_real(0, digits) : make_real(1, digits);
    };
    Real x = make_real(p.x, digits);
    Real r = shift_for(x);
    Real total = log(abs(x - r));
    Real weight = make_real(1, digits);
    const int terms = static_cast<int>(digits * 1.7) + 20;
    for (int n = 0; n < terms; ++n) {
        weight /= 4;
        const Real phi = x * x * x * x - b4 * x * x - 2 * b6 * x - b8;
        const Real psi = 4 * x * x * x + b2 * x * x + 2 * b4 * x + b6;
        const Real next_x = phi / psi;
        const Real next_r = shift_for(next_x);
        const Real ratio = (phi - next_r * psi) / pow(x - r, 4);
        total += weight * log(abs(ratio));
        x = next_x;
        r = next_r;
    }
    return total;
}

TEST(LocalHeight, ArchimedeanQSeriesAgreesWithTheDoublingSeries) {
    for (const SamplePoint& sample : infinite_order) {
        const Curve curve = parse_curve(sample.curve);
        const Point p = rational_point(sample.x, sample.y);
        const Real by_q_series = archimedean_local_height(curve, p, 50);
        const Real by_doubling = archimedean_by_doubling(curve, p, 80);
        EXPECT_LT(abs(by_q_series - by_doubling), power_of_ten(-45, 80))
            << sample.curve << " q-series " << show(by_q_series) << " doubling "
            << show(by_doubling);
    }
}

TEST(LocalHeight, ArchimedeanFromTheLogMatchesTheOneFromThePoint) {
    const Curve curve = family::ratio_sum_curve(Integer(4));
    const RealStructure real = real_structure(curve, 80);
    Point multiple = rational_point("-100", "260");
    for (int n = 1; n <= 9; ++n) {
        const EllipticLog log = elliptic_log(curve, real, multiple);
        const Real from_log = archimedean_local_height_at_log(curve, real, log.component, log.t);
        const Real from_point = archimedean_local_height(curve, multiple, 60);
        EXPECT_LT(abs(from_log - from_point), power_of_ten(-55, 80)) << "n=" << n;
        multiple = add(curve, multiple, rational_point("-100", "260"));
    }
}

// Far above Boost's default precision (50 digits), so that any value accidentally built at the
// default precision would show up as lost digits.
TEST(CanonicalHeight, KeepsSixHundredDigits) {
    const Curve curve = family::ratio_sum_curve(Integer(4));
    const Point p = rational_point("-100", "260");
    const Real h = canonical_height(curve, p, 600);
    const Real h3 = canonical_height(curve, multiply(curve, p, 3), 600);
    EXPECT_LT(abs(h3 - 9 * h), power_of_ten(-595, 620));
    const Interval enclosure = canonical_height_enclosure(curve, p, 600);
    const Real reference = canonical_height(curve, p, 650);  // h itself is only good to 600
    EXPECT_TRUE(lower(enclosure) <= reference && reference <= upper(enclosure));
    EXPECT_LT(abs(reference - h), power_of_ten(-600, 650));
    EXPECT_LT(Real(upper(enclosure) - lower(enclosure)), power_of_ten(-600, 620));
}

// The q-series picks the basis with the smaller |q|: both choices for Δ > 0 and the rhombic
// lattice for Δ < 0 must be exercised by the tests above (Im τ = Im ω2 / ω1 decides).
TEST(LocalHeight, SampleCurvesCoverEveryQSeriesBasis) {
    int rectangular_standard = 0, rectangular_swapped = 0, rhombic = 0;
    for (const SamplePoint& sample : infinite_order) {
        const RealStructure real = real_structure(parse_curve(sample.curve), 20);
        const Real s = real.imaginary_period_im / real.real_period;
        if (real.components == 1) {
            ++rhombic;
        } else if (s >= 1) {
            ++rectangular_standard;
        } else {
            ++rectangular_swapped;
        }
    }
    EXPECT_GT(rectangular_standard, 0);
    EXPECT_GT(rectangular_swapped, 0);
    EXPECT_GT(rhombic, 0);
}

// E_N for large N (Im τ ≈ 0.07 at N = 10^6, so |q| would be 0.6 in the standard basis): the
// 2-torsion point (0, 0) has height 0, and the enclosure must contain 0.
TEST(CanonicalHeightEnclosure, ContainsZeroForTorsionOfRatioSumCurvesWithLargeN) {
    for (const char* n : {"2", "1000", "1000000", "1000000000000"}) {
        const Curve curve = family::ratio_sum_curve(Integer(n));
        const Interval h = canonical_height_enclosure(curve, rational_point("0", "0"), 40);
        EXPECT_TRUE(lower(h) <= 0 && 0 <= upper(h)) << "N=" << n;
        EXPECT_LT(Real(upper(h) - lower(h)), power_of_ten(-40, 60)) << "N=" << n;
    }
}

TEST(CanonicalHeight, RejectsPointsOffTheCurve) {
    EXPECT_THROW(canonical_height(parse_curve("[0,0,0,877,0]"), rational_point("1", "1"), 20),
                 InputError);
}

}  // namespace
}  // namespace arcsieve
