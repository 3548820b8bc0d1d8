#include <gtest/gtest.h>

#include "basis/height_lattice.hpp"

namespace arcsieve::basis {
namespace {

GramMatrix gram_of(const std::vector<std::vector<long>>& vectors, unsigned digits) {
    GramMatrix g(vectors.size(), std::vector<Real>(vectors.size(), Real(0, digits)));
    for (std::size_t i = 0; i < vectors.size(); ++i) {
        for (std::size_t j = 0; j < vectors.size(); ++j) {
            long dot = 0;
            for (std::size_t k = 0; k < vectors[i].size(); ++k)
                dot += vectors[i][k] * vectors[j][k];
            g[i][j] = Real(dot, digits);
        }
    }
    return g;
}

TEST(HeightLattice, LllFindsTheShortBasisOfASkewedLattice) {
    // Z^3 given by a skewed basis (rows of a unimodular matrix of our own): LLL must return
    // vectors of squared length 1 (the lattice minimum, common practice) with det preserved.
    const GramMatrix g = gram_of({{1, 0, 0}, {7, 1, 0}, {23, 5, 1}}, 40);
    const auto u = lll_transform(g);
    const GramMatrix reduced = transform_gram(g, u);
    for (std::size_t i = 0; i < 3; ++i) EXPECT_NEAR(reduced[i][i].convert_to<double>(), 1.0, 1e-20);
    EXPECT_NEAR(determinant(reduced).convert_to<double>(), determinant(g).convert_to<double>(),
                1e-20);
    EXPECT_NEAR(
        std::fabs(
            determinant(gram_of({{1, 0, 0}, {7, 1, 0}, {23, 5, 1}}, 40)).convert_to<double>()),
        1.0, 1e-20);
}

TEST(HeightLattice, RelationOfAPointInTheRationalSpan) {
    // P = (3/2)·b1 − (1/2)·b2 in a lattice of our own: residual 0, relation d = 2, m = (3, −1).
    const GramMatrix g = gram_of({{2, 0}, {1, 3}}, 40);
    const std::vector<long> p{(3 * 2 - 1), (0 - 3)};  // 2P = 3 b1 − b2 = (5, −3)
    // pairings <b_i, P> = <b_i, (5, −3)>/2
    std::vector<Real> pairings{Real(10, 40) / 2, Real(5 - 9, 40) / 2};
    const Real height = Real(25 + 9, 40) / 4;
    EXPECT_LT(abs(residual_height(g, pairings, height)).convert_to<double>(), 1e-30);
    const auto relation = find_relation(g, pairings, Real(1e-20, 40), 100);
    ASSERT_TRUE(relation.has_value());
    EXPECT_EQ(relation->denominator, 2);
    EXPECT_EQ(relation->numerators, (std::vector<Integer>{3, -1}));
    (void)p;
    // An independent vector has a positive residual.
    std::vector<Real> other{Real(0, 40), Real(0, 40)};
    EXPECT_GT(residual_height(g, other, Real(1, 40)).convert_to<double>(), 0.5);
}

}  // namespace
}  // namespace arcsieve::basis
