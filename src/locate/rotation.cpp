#include "locate/rotation.hpp"

#include <tbb/parallel_for.h>

#include <algorithm>
#include <atomic>
#include <limits>
#include <stdexcept>

#include "region/interval_ops.hpp"

namespace arcsieve::locate {
namespace {

Integer mod(const Integer& a, const Integer& m) {
    Integer r;
    mpz_fdiv_r(r.get_mpz_t(), a.get_mpz_t(), m.get_mpz_t());
    return r;
}

Integer ceil_div(const Integer& a, const Integer& b) {
    Integer q;
    mpz_cdiv_q(q.get_mpz_t(), a.get_mpz_t(), b.get_mpz_t());
    return q;
}

// Least x >= 0 with low <= (a·x + b) mod m <= high, for 0 <= low <= high < m, 0 <= a, b < m.
std::optional<Integer> first_in_range(const Integer& a, const Integer& b, const Integer& m,
                                      const Integer& low, const Integer& high) {
    if (low <= b && b <= high) return Integer(0);
    if (a == 0) return std::nullopt;
    const Integer span = high - low;
    // y = number of wraps before the hit; y >= 1 when b is already past the window.
    const Integer y0 = b < low ? Integer(0) : Integer(1);
    auto x_of = [&](const Integer& y) -> Integer { return ceil_div(low + m * y - b, a); };
    if (span >= a - 1) return x_of(y0);
    // y works iff (−(low + m·y − b)) mod a <= span, i.e. (a'·y + b') mod a in [0, span].
    Integer a1 = mod(-m, a);
    Integer b1 = mod(b - low + a1 * y0, a);
    // Reflection v ↦ (span − v) mod a keeps the window [0, span] and takes a1 to a − a1.
    if (2 * a1 > a) {
        a1 = a - a1;
        b1 = mod(span - b1, a);
    }
    const auto z = first_in_range(a1, b1, a, Integer(0), span);
    if (!z) return std::nullopt;
    return x_of(y0 + *z);
}

}  // namespace

std::optional<Integer> first_in_window(const Integer& step, const Integer& offset,
                                       const Integer& modulus, const ResidueWindow& window) {
    if (modulus < 1 || step < 0 || step >= modulus || offset < 0 || offset >= modulus ||
        window.low < 0 || window.low >= modulus || window.high < 0 || window.high >= modulus) {
        throw std::invalid_argument("first_in_window: arguments out of range");
    }
    if (window.low <= window.high) {
        return first_in_range(step, offset, modulus, window.low, window.high);
    }
    auto first = first_in_range(step, offset, modulus, window.low, modulus - 1);
    auto second = first_in_range(step, offset, modulus, Integer(0), window.high);
    if (!first) return second;
    if (!second) return first;
    return std::min(*first, *second);
}

std::optional<std::uint64_t> linear_first_in_window(std::uint64_t step, std::uint64_t offset,
                                                    std::uint64_t low, std::uint64_t high,
                                                    std::uint64_t count) {
    const bool wrapped = low > high;
    auto in_window = [=](std::uint64_t v) {
        return wrapped ? (v >= low || v <= high) : (v >= low && v <= high);
    };
    constexpr std::uint64_t chunk = 1u << 16;
    constexpr std::uint64_t chunks_per_block = 64;
    for (std::uint64_t block_start = 0; block_start < count;
         block_start += chunk * chunks_per_block) {
        const std::uint64_t block_end = std::min(count, block_start + chunk * chunks_per_block);
        std::atomic<std::uint64_t> best{std::numeric_limits<std::uint64_t>::max()};
        tbb::parallel_for(block_start, block_end, chunk, [&](std::uint64_t start) {
            const std::uint64_t end = std::min(block_end, start + chunk);
            std::uint64_t value = step * start + offset;  // wraps modulo 2^64 by design
            for (std::uint64_t x = start; x < end; ++x, value += step) {
                if (in_window(value)) {
                    std::uint64_t seen = best.load();
                    while (x < seen && !best.compare_exchange_weak(seen, x)) {
                    }
                    return;
                }
            }
        });
        if (best.load() != std::numeric_limits<std::uint64_t>::max()) return best.load();
    }
    return std::nullopt;
}

namespace {

Integer floor_scaled(const mpfr_t x, unsigned bits) {
    mpfr_t y;
    mpfr_init2(y, mpfr_get_prec(x) + 8);
    mpfr_mul_2ui(y, x, bits, MPFR_RNDD);
    Integer r;
    mpfr_get_z(r.get_mpz_t(), y, MPFR_RNDD);
    mpfr_clear(y);
    return r;
}

Integer ceil_scaled(const mpfr_t x, unsigned bits) {
    mpfr_t y;
    mpfr_init2(y, mpfr_get_prec(x) + 8);
    mpfr_mul_2ui(y, x, bits, MPFR_RNDU);
    Integer r;
    mpfr_get_z(r.get_mpz_t(), y, MPFR_RNDU);
    mpfr_clear(y);
    return r;
}

std::uint64_t to_u64(const Integer& n) {
    return mpz_get_ui(n.get_mpz_t());
}

}  // namespace

RotationOutcome first_rotation_hit(const RotationSearch& search,
                                   const std::function<CandidateVerdict(const Integer&)>& verify) {
    static_assert(sizeof(unsigned long) == 8, "64-bit unsigned long expected");
    RotationOutcome outcome;
    const unsigned bits = search.linear ? 64u : region::precision_bits(search.step) + 16;
    Integer modulus(1);
    mpz_mul_2exp(modulus.get_mpz_t(), modulus.get_mpz_t(), bits);
    const Real step_mid = region::midpoint_real(search.step);
    const Real offset_mid = region::midpoint_real(search.offset);
    const Integer A = mod(floor_scaled(step_mid.backend().data(), bits), modulus);
    const Integer B = mod(floor_scaled(offset_mid.backend().data(), bits), modulus);
    // Every true hit m <= max_index lies within δ of the arc in fixed point:
    // |m·step + offset − (A m + B)/M| <= max_index·(|step − A/M|) + |offset − B/M|, and
    // |step − A/M| <= width(step) + 2^-bits.
    mpfr_t delta, term;
    mpfr_init2(delta, 128);
    mpfr_init2(term, 128);
    mpfr_set_ui(delta, 0, MPFR_RNDU);
    mpfi_diam_abs(term, search.step.backend().data());
    mpfr_mul_z(term, term, search.max_index.get_mpz_t(), MPFR_RNDU);
    mpfr_add(delta, delta, term, MPFR_RNDU);
    mpfi_diam_abs(term, search.offset.backend().data());
    mpfr_add(delta, delta, term, MPFR_RNDU);
    mpfr_set_ui(term, 1, MPFR_RNDU);
    mpfr_div_2ui(term, term, bits, MPFR_RNDU);
    mpfr_mul_z(term, term, Integer(search.max_index + 2).get_mpz_t(), MPFR_RNDU);
    mpfr_add(delta, delta, term, MPFR_RNDU);
    const Integer delta_fixed = ceil_scaled(delta, bits) + 2;
    mpfr_clears(delta, term, (mpfr_ptr)0);
    const Integer low = floor_scaled(&search.arc_start.backend().data()->left, bits) - delta_fixed;
    const Integer high = ceil_scaled(&search.arc_end.backend().data()->right, bits) + delta_fixed;
    const bool everything = search.whole_circle || high - low + 1 >= modulus;
    const ResidueWindow window{mod(low, modulus), mod(high, modulus)};
    const Integer scan_cap("1099511627776");  // 2^40
    Integer m_start(0);
    while (m_start <= search.max_index) {
        std::optional<Integer> x;
        const Integer offset_now = mod(A * m_start + B, modulus);
        if (everything) {
            x = Integer(0);
        } else if (search.linear) {
            const Integer count = std::min(Integer(search.max_index - m_start + 1), scan_cap);
            const auto found =
                linear_first_in_window(to_u64(A), to_u64(offset_now), to_u64(window.low),
                                       to_u64(window.high), to_u64(count));
            if (found) {
                x = Integer(0);
                mpz_set_ui(x->get_mpz_t(), *found);
            }
        } else {
            x = first_in_window(A, offset_now, modulus, window);
        }
        if (!x || m_start + *x > search.max_index) return outcome;
        const Integer m = m_start + *x;
        ++outcome.candidates;
        const CandidateVerdict v = verify(m);
        if (v == CandidateVerdict::inside) {
            outcome.hit = m;
            return outcome;
        }
        if (v == CandidateVerdict::undecided) {
            outcome.undecided = m;
            return outcome;
        }
        m_start = m + 1;
    }
    return outcome;
}

CandidateVerdict in_open_arc(const Interval& t, const Interval& start, const Interval& end) {
    // Shift t by the integer k that puts its midpoint in [start, start + 1).
    const double k = std::floor(region::midpoint_double(t) - region::midpoint_double(start));
    const Interval shifted = region::minus(
        t, region::interval_of(Rational(static_cast<long>(k)), region::precision_bits(t)));
    for (long extra : {0L, 1L}) {
        const Interval u =
            region::minus(shifted, region::interval_of(Rational(extra), region::precision_bits(t)));
        if (region::certainly_less(start, u) && region::certainly_less(u, end)) {
            return CandidateVerdict::inside;
        }
    }
    // Outside when t is certainly in [end, start + 1] after the shift.
    const Interval next_start =
        region::plus(start, region::interval_of(Rational(1), region::precision_bits(start)));
    for (long extra : {0L, 1L, -1L}) {
        const Interval u =
            region::plus(shifted, region::interval_of(Rational(extra), region::precision_bits(t)));
        if (region::certainly_less(end, u) && region::certainly_less(u, next_start)) {
            return CandidateVerdict::outside;
        }
    }
    return CandidateVerdict::undecided;
}

}  // namespace arcsieve::locate
