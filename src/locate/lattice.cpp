#include "locate/lattice.hpp"

#include <algorithm>
#include <cmath>

#include "arith/rational.hpp"

namespace arcsieve::locate {
namespace {

using Matrix = std::vector<std::vector<double>>;
using IntegerMatrix = std::vector<std::vector<std::int64_t>>;

void check_gram(const GramMatrix& g) {
    const std::size_t r = g.size();
    if (r == 0) throw InputError("the height matrix is empty");
    for (const auto& row : g) {
        if (row.size() != r) throw InputError("the height matrix is not square");
        for (double v : row) {
            if (!std::isfinite(v)) throw InputError("the height matrix has a non-finite entry");
        }
    }
    for (std::size_t i = 0; i < r; ++i) {
        for (std::size_t j = 0; j < r; ++j) {
            if (std::abs(g[i][j] - g[j][i]) > 1e-9 * (std::abs(g[i][j]) + std::abs(g[j][i]) + 1)) {
                throw InputError("the height matrix is not symmetric");
            }
        }
    }
}

// Cholesky-type decomposition Q(x) = Σ_i q_ii (x_i + Σ_{j>i} q_ij x_j)² (Fincke–Pohst, eq. 2.3;
// Cohen GTM 138 Algorithm 2.7.6). Throws InputError when G is not positive definite.
Matrix quadratic_decomposition(const Matrix& g) {
    const std::size_t r = g.size();
    Matrix q = g;
    for (std::size_t i = 0; i < r; ++i) {
        if (!(q[i][i] > 0)) throw InputError("the height matrix is not positive definite");
        for (std::size_t j = i + 1; j < r; ++j) {
            q[j][i] = q[i][j];
            q[i][j] /= q[i][i];
        }
        for (std::size_t k = i + 1; k < r; ++k) {
            for (std::size_t l = k; l < r; ++l) q[k][l] -= q[k][i] * q[i][l];
        }
    }
    return q;
}

Matrix transform(const IntegerMatrix& u, const Matrix& g) {
    const std::size_t r = g.size();
    Matrix out(r, std::vector<double>(r, 0.0));
    for (std::size_t i = 0; i < r; ++i)
        for (std::size_t j = 0; j < r; ++j) {
            double s = 0;
            for (std::size_t k = 0; k < r; ++k)
                for (std::size_t l = 0; l < r; ++l)
                    s += static_cast<double>(u[i][k]) * g[k][l] * static_cast<double>(u[j][l]);
            out[i][j] = s;
        }
    return out;
}

double norm_of(const Matrix& g, const std::vector<std::int64_t>& v) {
    double s = 0;
    for (std::size_t i = 0; i < g.size(); ++i)
        for (std::size_t j = 0; j < g.size(); ++j)
            s += static_cast<double>(v[i]) * g[i][j] * static_cast<double>(v[j]);
    return s;
}

}  // namespace

std::vector<std::vector<std::int64_t>> lll_reduce_gram(const GramMatrix& gram) {
    check_gram(gram);
    quadratic_decomposition(gram);  // positive definiteness
    const std::size_t r = gram.size();
    IntegerMatrix u(r, std::vector<std::int64_t>(r, 0));
    for (std::size_t i = 0; i < r; ++i) u[i][i] = 1;
    // Textbook LLL on the Gram matrix (Cohen GTM 138 Algorithm 2.6.7 in spirit), recomputing
    // the Gram–Schmidt data after each change: r is tiny (the rank), so clarity wins.
    auto gram_schmidt = [&](Matrix& mu, std::vector<double>& b) {
        const Matrix g = transform(u, gram);
        mu.assign(r, std::vector<double>(r, 0.0));
        b.assign(r, 0.0);
        for (std::size_t i = 0; i < r; ++i) {
            for (std::size_t j = 0; j < i; ++j) {
                double s = g[i][j];
                for (std::size_t k = 0; k < j; ++k) s -= mu[j][k] * mu[i][k] * b[k];
                mu[i][j] = s / b[j];
            }
            double s = g[i][i];
            for (std::size_t k = 0; k < i; ++k) s -= mu[i][k] * mu[i][k] * b[k];
            b[i] = s;
        }
    };
    Matrix mu;
    std::vector<double> b;
    std::size_t k = 1;
    int guard = 0;
    while (k < r && guard++ < 100000) {
        gram_schmidt(mu, b);
        for (std::size_t j = k; j-- > 0;) {
            const double q = std::round(mu[k][j]);
            if (q != 0) {
                for (std::size_t c = 0; c < r; ++c)
                    u[k][c] -= static_cast<std::int64_t>(q) * u[j][c];
                gram_schmidt(mu, b);
            }
        }
        if (b[k] >= (0.99 - mu[k][k - 1] * mu[k][k - 1]) * b[k - 1]) {
            ++k;
        } else {
            std::swap(u[k], u[k - 1]);
            k = std::max<std::size_t>(k - 1, 1);
        }
    }
    return u;
}

std::vector<LatticeVector> vectors_up_to(const GramMatrix& gram, double bound) {
    const auto u = lll_reduce_gram(gram);
    const Matrix reduced = transform(u, gram);
    const Matrix q = quadratic_decomposition(reduced);
    const std::size_t r = gram.size();
    const double limit = bound * (1 + 1e-9) + 1e-300;
    std::vector<LatticeVector> out;
    std::vector<std::int64_t> x(r, 0);
    // Depth-first Fincke–Pohst: fix x_{r-1}, …, x_i from the top; the remaining budget bounds
    // x_i around its centre −Σ_{j>i} q_ij x_j.
    auto recurse = [&](auto&& self, std::size_t level, double remaining) -> void {
        double centre = 0;
        for (std::size_t j = level + 1; j < r; ++j)
            centre -= q[level][j] * static_cast<double>(x[j]);
        const double radius = std::sqrt(std::max(0.0, remaining) / q[level][level]);
        const auto low = static_cast<std::int64_t>(std::ceil(centre - radius - 1e-12));
        const auto high = static_cast<std::int64_t>(std::floor(centre + radius + 1e-12));
        for (std::int64_t v = low; v <= high; ++v) {
            const double d = static_cast<double>(v) - centre;
            const double left = remaining - q[level][level] * d * d;
            if (left < -1e-12 * limit) continue;
            x[level] = v;
            if (level == 0) {
                bool zero = true;
                for (auto c : x) zero &= c == 0;
                if (zero) continue;
                LatticeVector vec;
                vec.coefficients.assign(r, 0);
                for (std::size_t i = 0; i < r; ++i)
                    for (std::size_t j = 0; j < r; ++j) vec.coefficients[j] += x[i] * u[i][j];
                vec.norm = norm_of(gram, vec.coefficients);
                if (vec.norm <= limit) out.push_back(std::move(vec));
            } else {
                self(self, level - 1, left);
            }
        }
        x[level] = 0;
    };
    recurse(recurse, r - 1, limit);
    std::sort(out.begin(), out.end(), [](const LatticeVector& a, const LatticeVector& b) {
        if (a.norm != b.norm) return a.norm < b.norm;
        return a.coefficients < b.coefficients;
    });
    return out;
}

}  // namespace arcsieve::locate
