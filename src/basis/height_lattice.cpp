#include "basis/height_lattice.hpp"

#include <cmath>
#include <stdexcept>

namespace arcsieve::basis {

namespace {

unsigned precision_of(const GramMatrix& g) {
    unsigned digits = 20;
    for (const auto& row : g) {
        for (const auto& v : row) digits = std::max(digits, digits_of(v));
    }
    return digits;
}

struct GramSchmidt {
    std::vector<std::vector<Real>> mu;
    std::vector<Real> squared_norms;
};

GramSchmidt gram_schmidt(const GramMatrix& g, unsigned digits) {
    const std::size_t n = g.size();
    GramSchmidt gs;
    gs.mu.assign(n, std::vector<Real>(n, Real(0, digits)));
    gs.squared_norms.assign(n, Real(0, digits));
    for (std::size_t i = 0; i < n; ++i) {
        for (std::size_t j = 0; j < i; ++j) {
            Real value = with_digits(g[i][j], digits);
            for (std::size_t l = 0; l < j; ++l)
                value -= gs.mu[j][l] * gs.mu[i][l] * gs.squared_norms[l];
            gs.mu[i][j] = value / gs.squared_norms[j];
        }
        Real norm = with_digits(g[i][i], digits);
        for (std::size_t l = 0; l < i; ++l) norm -= gs.mu[i][l] * gs.mu[i][l] * gs.squared_norms[l];
        gs.squared_norms[i] = norm;
    }
    return gs;
}

Integer nearest_integer(const Real& value) {
    const Real rounded = boost::multiprecision::round(value);
    Integer result;
    mpfr_get_z(result.get_mpz_t(), rounded.backend().data(), MPFR_RNDN);
    return result;
}

// b_k ← b_k − q b_j on the Gram matrix and the transform.
void subtract_multiple(GramMatrix& g, IntegerMatrix& u, std::size_t k, std::size_t j,
                       const Integer& q, unsigned digits) {
    const std::size_t n = g.size();
    const Real qr = make_real(q, digits);
    const Real gjj = g[j][j], gkj = g[k][j];
    for (std::size_t i = 0; i < n; ++i) {
        if (i == k) continue;
        g[k][i] -= qr * g[j][i];
        g[i][k] = g[k][i];
    }
    g[k][k] = g[k][k] - 2 * qr * gkj + qr * qr * gjj;
    for (std::size_t i = 0; i < n; ++i) u[k][i] -= q * u[j][i];
}

void swap_vectors(GramMatrix& g, IntegerMatrix& u, std::size_t a, std::size_t b) {
    std::swap(g[a], g[b]);
    for (auto& row : g) std::swap(row[a], row[b]);
    std::swap(u[a], u[b]);
}

std::vector<Real> solve(GramMatrix a, std::vector<Real> rhs, unsigned digits) {
    const std::size_t n = a.size();
    for (std::size_t c = 0; c < n; ++c) {
        std::size_t pivot = c;
        for (std::size_t r = c + 1; r < n; ++r) {
            if (abs(a[r][c]) > abs(a[pivot][c])) pivot = r;
        }
        std::swap(a[c], a[pivot]);
        std::swap(rhs[c], rhs[pivot]);
        if (a[c][c] == 0) throw std::domain_error("solve: singular Gram matrix");
        for (std::size_t r = c + 1; r < n; ++r) {
            const Real factor = a[r][c] / a[c][c];
            for (std::size_t k = c; k < n; ++k) a[r][k] -= factor * a[c][k];
            rhs[r] -= factor * rhs[c];
        }
    }
    std::vector<Real> x(n, Real(0, digits));
    for (std::size_t i = n; i-- > 0;) {
        Real value = rhs[i];
        for (std::size_t k = i + 1; k < n; ++k) value -= a[i][k] * x[k];
        x[i] = value / a[i][i];
    }
    return x;
}

}  // namespace

IntegerMatrix lll_transform(const GramMatrix& input) {
    const std::size_t n = input.size();
    const unsigned digits = precision_of(input);
    GramMatrix g = input;
    IntegerMatrix u(n, std::vector<Integer>(n, 0));
    for (std::size_t i = 0; i < n; ++i) u[i][i] = 1;
    if (n < 2) return u;
    const Real delta = Real(99, digits) / 100;
    std::size_t k = 1;
    for (int guard = 0; k < n && guard < 100000; ++guard) {
        for (std::size_t j = k; j-- > 0;) {
            const GramSchmidt gs = gram_schmidt(g, digits);
            const Integer q = nearest_integer(gs.mu[k][j]);
            if (q != 0) subtract_multiple(g, u, k, j, q, digits);
        }
        const GramSchmidt gs = gram_schmidt(g, digits);
        if (gs.squared_norms[k] <
            (delta - gs.mu[k][k - 1] * gs.mu[k][k - 1]) * gs.squared_norms[k - 1]) {
            swap_vectors(g, u, k, k - 1);
            k = std::max<std::size_t>(1, k - 1);
        } else {
            ++k;
        }
    }
    return u;
}

GramMatrix transform_gram(const GramMatrix& gram, const IntegerMatrix& t) {
    const unsigned digits = precision_of(gram);
    const std::size_t n = t.size(), m = gram.size();
    GramMatrix result(n, std::vector<Real>(n, Real(0, digits)));
    for (std::size_t a = 0; a < n; ++a) {
        for (std::size_t b = 0; b < n; ++b) {
            Real sum(0, digits);
            for (std::size_t i = 0; i < m; ++i) {
                if (t[a][i] == 0) continue;
                for (std::size_t j = 0; j < m; ++j) {
                    if (t[b][j] == 0) continue;
                    sum += make_real(Integer(t[a][i] * t[b][j]), digits) * gram[i][j];
                }
            }
            result[a][b] = sum;
        }
    }
    return result;
}

Real determinant(const GramMatrix& matrix) {
    const unsigned digits = precision_of(matrix);
    GramMatrix a = matrix;
    const std::size_t n = a.size();
    Real det(1, digits);
    for (std::size_t c = 0; c < n; ++c) {
        std::size_t pivot = c;
        for (std::size_t r = c + 1; r < n; ++r) {
            if (abs(a[r][c]) > abs(a[pivot][c])) pivot = r;
        }
        if (a[pivot][c] == 0) return Real(0, digits);
        if (pivot != c) {
            std::swap(a[c], a[pivot]);
            det = -det;
        }
        det *= a[c][c];
        for (std::size_t r = c + 1; r < n; ++r) {
            const Real factor = a[r][c] / a[c][c];
            for (std::size_t k = c; k < n; ++k) a[r][k] -= factor * a[c][k];
        }
    }
    return det;
}

Real residual_height(const GramMatrix& gram, const std::vector<Real>& pairings,
                     const Real& height) {
    if (gram.empty()) return height;
    const unsigned digits = std::max(precision_of(gram), digits_of(height));
    const auto c = solve(gram, pairings, digits);
    Real residual = with_digits(height, digits);
    for (std::size_t i = 0; i < c.size(); ++i) residual -= c[i] * pairings[i];
    return residual;
}

std::optional<RationalRelation> find_relation(const GramMatrix& gram,
                                              const std::vector<Real>& pairings,
                                              const Real& tolerance, long max_denominator) {
    const unsigned digits = precision_of(gram);
    const auto c = solve(gram, pairings, digits);
    for (long d = 1; d <= max_denominator; ++d) {
        RationalRelation relation;
        relation.denominator = d;
        bool all_close = true;
        for (const Real& ci : c) {
            const Real scaled = ci * d;
            const Integer nearest = nearest_integer(scaled);
            if (abs(scaled - make_real(nearest, digits)) > tolerance * d) {
                all_close = false;
                break;
            }
            relation.numerators.push_back(nearest);
        }
        if (all_close) return relation;
    }
    return std::nullopt;
}

double hermite_constant_power(int rank) {
    static constexpr double values[] = {1, 1, 4.0 / 3.0, 2, 4, 8, 64.0 / 3.0, 64, 256};
    if (rank < 1 || rank > 8) throw std::domain_error("hermite_constant_power: rank outside 1..8");
    return values[rank];
}

}  // namespace arcsieve::basis
