#include "basis/saturation.hpp"

#include <fmt/format.h>

#include <stdexcept>

#include "basis/division.hpp"
#include "basis/reduction_mod_prime.hpp"

namespace arcsieve::basis {

namespace {

bool is_small_prime(int n) {
    if (n < 2) return false;
    for (int d = 2; d * d <= n; ++d) {
        if (n % d == 0) return false;
    }
    return true;
}

long mod_positive(long a, long m) {
    const long r = a % m;
    return r < 0 ? r + m : r;
}

long inverse_mod_small(long a, long m) {
    for (long t = 1; t < m; ++t) {
        if (mod_positive(a * t, m) == 1) return t;
    }
    throw std::logic_error("inverse_mod_small: not invertible");
}

// Row echelon over F_ℓ, kept reduced; rank and a kernel basis on demand.
struct ModularRows {
    long ell;
    std::size_t columns;
    std::vector<std::vector<long>> rows;  // reduced, pivot columns distinct
    std::vector<std::size_t> pivots;

    bool add(std::vector<long> row) {
        for (std::size_t k = 0; k < rows.size(); ++k) {
            const long factor = row[pivots[k]];
            if (factor == 0) continue;
            for (std::size_t j = 0; j < columns; ++j) {
                row[j] = mod_positive(row[j] - factor * rows[k][j], ell);
            }
        }
        std::size_t pivot = 0;
        while (pivot < columns && row[pivot] == 0) ++pivot;
        if (pivot == columns) return false;
        const long inverse = inverse_mod_small(row[pivot], ell);
        for (auto& v : row) v = mod_positive(v * inverse, ell);
        for (std::size_t k = 0; k < rows.size(); ++k) {
            const long factor = rows[k][pivot];
            if (factor == 0) continue;
            for (std::size_t j = 0; j < columns; ++j) {
                rows[k][j] = mod_positive(rows[k][j] - factor * row[j], ell);
            }
        }
        rows.push_back(std::move(row));
        pivots.push_back(pivot);
        return true;
    }

    std::vector<std::vector<long>> kernel() const {
        std::vector<std::vector<long>> basis;
        for (std::size_t free = 0; free < columns; ++free) {
            if (std::find(pivots.begin(), pivots.end(), free) != pivots.end()) continue;
            std::vector<long> v(columns, 0);
            v[free] = 1;
            for (std::size_t k = 0; k < rows.size(); ++k)
                v[pivots[k]] = mod_positive(-rows[k][free], ell);
            basis.push_back(std::move(v));
        }
        return basis;
    }
};

struct AuxiliaryPrime {
    CurveModPrime curve;
    std::uint64_t order;
};

}  // namespace

Point combination(const Curve& curve, const std::vector<Point>& points,
                  const std::vector<Integer>& coefficients) {
    Point sum = Point::infinity();
    for (std::size_t i = 0; i < points.size(); ++i) {
        if (coefficients[i] != 0)
            sum = add(curve, sum, multiply(curve, points[i], coefficients[i]));
    }
    return sum;
}

void enlarge_by_quotient(const Curve& curve, std::vector<Point>& generators,
                         const std::vector<Integer>& coefficients, const Point& quotient, int ell) {
    // With t = c_j^{-1} mod ℓ and c'_i = t c_i mod ℓ, Q' = tR − Σ ((t c_i − c'_i)/ℓ) P_i has
    // ℓQ' = Σ c'_i P_i + (torsion) with c'_j = 1, so P_j lies in the span of Q' and the others.
    const Integer L(ell);
    std::size_t j = 0;
    while (j < generators.size() && coefficients[j] % L == 0) ++j;
    if (j == generators.size())
        throw std::logic_error("enlarge_by_quotient: all coefficients divisible");
    Integer cj = coefficients[j] % L;
    if (cj < 0) cj += L;
    const Integer t(inverse_mod_small(cj.get_si(), ell));
    std::vector<Integer> shift(generators.size());
    for (std::size_t i = 0; i < generators.size(); ++i) {
        Integer reduced = (t * coefficients[i]) % L;
        if (reduced < 0) reduced += L;
        shift[i] = -((t * coefficients[i] - reduced) / L);
    }
    const Point replacement =
        add(curve, multiply(curve, quotient, t), combination(curve, generators, shift));
    generators[j] = replacement;
}

SaturationOutcome saturate(const Curve& curve, std::vector<Point> generators,
                           const std::vector<Point>& torsion_generators,
                           const std::vector<int>& torsion_orders,
                           const SaturationOptions& options) {
    SaturationOutcome outcome;
    if (generators.empty()) {
        outcome.generators = generators;
        outcome.saturated_up_to = options.prime_bound;
        return outcome;
    }
    std::vector<AuxiliaryPrime> auxiliary;
    std::uint64_t next_candidate = 3;
    auto auxiliary_at = [&](std::size_t index) -> const AuxiliaryPrime* {
        while (auxiliary.size() <= index) {
            bool added = false;
            while (!added) {
                if (next_candidate > options.max_auxiliary_prime) return nullptr;
                const std::uint64_t q = next_candidate;
                next_candidate += 2;
                if (!is_small_prime(static_cast<int>(q))) continue;
                if (auto reduced = reduce_curve(curve, q)) {
                    auxiliary.push_back({*reduced, group_order(*reduced)});
                    added = true;
                }
            }
        }
        return &auxiliary[index];
    };
    for (int ell = 2; ell <= options.prime_bound; ++ell) {
        if (!is_small_prime(ell)) {
            outcome.saturated_up_to = ell;
            continue;
        }
        bool proved = false;
        for (int attempt = 0; attempt < 64 && !proved; ++attempt) {
            std::vector<Point> columns = generators;
            for (std::size_t k = 0; k < torsion_generators.size(); ++k) {
                if (torsion_orders[k] % ell == 0) columns.push_back(torsion_generators[k]);
            }
            ModularRows rows{ell, columns.size(), {}, {}};
            std::size_t useful = 0;
            const std::uint64_t L = static_cast<std::uint64_t>(ell);
            // About ℓ·(columns + 12) primes q give ℓ | #E(F_q); scanning far beyond that only
            // happens when the maps cannot see a combination (e.g. x(P) a square and ℓ = 2),
            // which the exact division below settles.
            const std::size_t scan_limit =
                static_cast<std::size_t>(ell) * (columns.size() + 14) + 60;
            for (std::size_t index = 0; index < scan_limit; ++index) {
                const AuxiliaryPrime* aux = auxiliary_at(index);
                if (aux == nullptr) break;
                if (aux->curve.q == L || aux->order % L != 0) continue;
                // ℓ^k ∥ n = #E(F_q), m = n/ℓ^k: m·E(F_q) is the ℓ-Sylow subgroup S. Only q
                // where S is shown cyclic (an element of order ℓ^k exists) are used; then
                // s ↦ ℓ^(k−1)·s is an isomorphism S/ℓS → S[ℓ] ≅ Z/ℓ, so P ↦ ℓ^(k−1)·m·P is
                // a map E(Q) → Z/ℓ that kills ℓE(Q) (Siksek 1995).
                std::uint64_t m = aux->order, ell_power = 1;
                int k = 0;
                while (m % L == 0) {
                    m /= L;
                    ell_power *= L;
                    ++k;
                }
                const std::uint64_t to_socle = ell_power / L;
                PointModPrime socle_generator;
                for (std::uint64_t trial = 0; trial < 12 && socle_generator.at_infinity; ++trial) {
                    const PointModPrime r = multiply(
                        aux->curve, point_from_x_at_least(aux->curve, 1 + 7919 * trial), m);
                    const PointModPrime s = multiply(aux->curve, r, to_socle);
                    if (!s.at_infinity) socle_generator = s;  // r has order ℓ^k: S cyclic
                }
                if (socle_generator.at_infinity) continue;
                std::vector<long> row(columns.size(), 0);
                bool nonzero = false;
                for (std::size_t i = 0; i < columns.size(); ++i) {
                    const PointModPrime image =
                        multiply(aux->curve, reduce_point(aux->curve, columns[i]), m * to_socle);
                    PointModPrime multiple;
                    bool found = false;
                    for (long j = 0; j < ell; ++j) {
                        if (multiple == image) {
                            row[i] = j;
                            found = true;
                            break;
                        }
                        multiple = add(aux->curve, multiple, socle_generator);
                    }
                    if (!found) throw std::logic_error("saturation: image outside the ℓ-socle");
                    if (row[i] != 0) nonzero = true;
                }
                if (!nonzero) continue;
                rows.add(row);
                ++useful;
                if (rows.rows.size() == columns.size()) break;
                if (useful > columns.size() + 12) break;
            }
            if (rows.rows.size() == columns.size()) {
                proved = true;
                break;
            }
            // Combinations surviving every map: test each (up to scalars) by exact division.
            const auto kernel = rows.kernel();
            double combinations = 1;
            for (std::size_t i = 0; i < kernel.size(); ++i) combinations *= ell;
            if (ell > options.max_division_prime || combinations > 4000) {
                outcome.notes.push_back(fmt::format(
                    "saturation at {}: {} combinations survived {} reduction maps; exact "
                    "division by {} not attempted",
                    ell, combinations - 1, useful, ell));
                break;
            }
            bool divided = false;
            std::vector<long> digits_of_combination(kernel.size(), 0);
            for (long count = 1; count < static_cast<long>(combinations) && !divided; ++count) {
                // count in base ℓ gives the coefficients on the kernel basis; skip those whose
                // leading nonzero digit is not 1 (scalar multiples of another).
                long rest = count;
                for (auto& digit : digits_of_combination) {
                    digit = rest % ell;
                    rest /= ell;
                }
                std::size_t lead = digits_of_combination.size();
                while (lead-- > 0 && digits_of_combination[lead] == 0) {
                }
                if (digits_of_combination[lead] != 1) continue;
                std::vector<Integer> all(columns.size(), 0);
                for (std::size_t b = 0; b < kernel.size(); ++b) {
                    for (std::size_t i = 0; i < columns.size(); ++i) {
                        all[i] += Integer(digits_of_combination[b] * kernel[b][i]);
                    }
                }
                std::vector<Integer> coefficients(generators.size());
                bool touches_generators = false;
                for (std::size_t i = 0; i < columns.size(); ++i) {
                    all[i] %= ell;
                    if (i < generators.size()) {
                        coefficients[i] = all[i];
                        if (all[i] != 0) touches_generators = true;
                    }
                }
                if (!touches_generators) continue;
                const Point q = combination(curve, columns, all);
                if (q.at_infinity) continue;
                if (auto r = divide_point(curve, q, ell)) {
                    enlarge_by_quotient(curve, generators, coefficients, *r, ell);
                    outcome.divided_by.push_back(ell);
                    divided = true;
                }
            }
            // No surviving combination is divisible: ℓ-saturation proved by exact division.
            if (!divided) proved = true;
        }
        if (!proved) break;
        outcome.saturated_up_to = ell;
    }
    outcome.generators = std::move(generators);
    return outcome;
}

}  // namespace arcsieve::basis
