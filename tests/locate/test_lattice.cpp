// Fincke–Pohst enumeration after LLL against brute force over a box (an independent method),
// and the agreement of the region layer's certified elliptic logs with the analytic layer's.
#include <gtest/gtest.h>

#include <cmath>
#include <random>

#include "analytic/periods.hpp"
#include "locate/lattice.hpp"
#include "region/arc_log.hpp"
#include "region/interval_ops.hpp"

namespace arcsieve::locate {
namespace {

TEST(LatticeTest, EnumerationMatchesBruteForce) {
    std::mt19937_64 random(3);
    for (int trial = 0; trial < 20; ++trial) {
        const std::size_t r = 2 + trial % 3;
        // G = BᵀB + small diagonal: positive definite, sometimes badly skewed.
        std::vector<std::vector<double>> b(r, std::vector<double>(r));
        for (auto& row : b)
            for (double& v : row) v = static_cast<double>(random() % 2001) / 1000.0 - 1.0;
        GramMatrix g(r, std::vector<double>(r, 0.0));
        for (std::size_t i = 0; i < r; ++i)
            for (std::size_t j = 0; j < r; ++j) {
                for (std::size_t k = 0; k < r; ++k) g[i][j] += b[k][i] * b[k][j];
                if (i == j) g[i][j] += 0.05;
            }
        const double bound = 4.0;
        const auto vectors = vectors_up_to(g, bound);
        // Brute force: |v_i| <= sqrt(bound · (G^-1)_ii) bounds the box; 12 is ample here
        // (checked by the count staying below the box size).
        std::size_t count = 0;
        std::vector<std::int64_t> v(r, -12);
        while (true) {
            double q = 0;
            bool zero = true;
            for (std::size_t i = 0; i < r; ++i) {
                zero &= v[i] == 0;
                for (std::size_t j = 0; j < r; ++j) q += v[i] * g[i][j] * v[j];
            }
            if (!zero && q <= bound * (1 - 1e-9)) ++count;
            std::size_t i = 0;
            while (i < r && ++v[i] > 12) v[i++] = -12;
            if (i == r) break;
        }
        std::size_t strictly_inside = 0;
        for (const auto& vec : vectors) strictly_inside += vec.norm <= bound * (1 - 1e-9);
        EXPECT_EQ(strictly_inside, count) << "trial " << trial;
        for (std::size_t k = 1; k < vectors.size(); ++k) {
            EXPECT_LE(vectors[k - 1].norm, vectors[k].norm);
        }
    }
}

TEST(LatticeTest, RejectsIndefiniteForms) {
    EXPECT_THROW(vectors_up_to(GramMatrix{{1, 2}, {2, 1}}, 1), InputError);
    EXPECT_THROW(vectors_up_to(GramMatrix{{1, 0}, {0.5, 1}}, 1), InputError);
    EXPECT_THROW(vectors_up_to(GramMatrix{}, 1), InputError);
}

TEST(LatticeTest, CertifiedLogsAgreeWithTheAnalyticLayer) {
    // Two implementations of t(P): Carlson's R_F with intervals (region/arc_log.hpp) and the
    // analytic layer's AGM elliptic logarithm (analytic/periods.hpp).
    const Curve e = parse_curve("[0,109,0,224,0]");
    const Point p{Rational(-100), Rational(260), false};
    const region::ArcModel model = region::arc_model(e, 30);
    for (int k = 1; k <= 4; ++k) {
        const Point q = multiply(e, p, std::int64_t{k});
        const region::LogEnclosure mine = region::log_enclosure(model, q);
        const EllipticLog theirs = elliptic_log(e, q, 25);
        EXPECT_EQ(mine.component, theirs.component) << "k=" << k;
        double difference = region::midpoint_double(mine.t) - static_cast<double>(theirs.t);
        difference -= std::round(difference);
        EXPECT_LT(std::abs(difference), 1e-14)
            << "k=" << k << " region t " << region::midpoint_double(mine.t) << " analytic t "
            << static_cast<double>(theirs.t);
    }
}

}  // namespace
}  // namespace arcsieve::locate
