#include "lseries/root_number.hpp"

#include <fmt/format.h>

#include <numeric>

namespace arcsieve::lseries {

namespace {

// (−1/p), (−2/p), (−3/p) for an odd prime p >= 5 (quadratic reciprocity; common practice).
int minus_one_symbol(std::uint64_t p) {
    return p % 4 == 1 ? 1 : -1;
}
int minus_two_symbol(std::uint64_t p) {
    return (p % 8 == 1 || p % 8 == 3) ? 1 : -1;
}
int minus_three_symbol(std::uint64_t p) {
    return p % 3 == 1 ? 1 : -1;
}

}  // namespace

std::vector<LocalRootNumber> local_root_numbers(const LSeriesCurve& curve) {
    std::vector<LocalRootNumber> result;
    for (const auto& local : curve.bad_primes) {
        LocalRootNumber entry;
        entry.prime = local.prime.get_ui();
        const std::uint64_t p = entry.prime;
        switch (local.kind) {
            case ReductionKind::split_multiplicative:
                entry.value = -1;
                entry.rule = "split multiplicative: −a_p";
                break;
            case ReductionKind::nonsplit_multiplicative:
                entry.value = 1;
                entry.rule = "non-split multiplicative: −a_p";
                break;
            case ReductionKind::good:
                entry.value = 1;
                entry.rule = "good";
                break;
            case ReductionKind::additive: {
                if (p < 5) {
                    entry.rule =
                        fmt::format("additive at {}: Halberstadt/Rizzo tables not implemented", p);
                    break;
                }
                const int v_delta = local.discriminant_valuation;
                const int v_c4 = curve.c4 == 0 ? 1000 : valuation(curve.c4, local.prime);
                if (3 * v_c4 < v_delta) {  // v(j) < 0: potentially multiplicative
                    entry.value = minus_one_symbol(p);
                    entry.rule = "additive, potentially multiplicative: (−1/p)";
                    break;
                }
                const int e = 12 / std::gcd(12, v_delta);
                if (e == 2 || e == 6) {
                    entry.value = minus_one_symbol(p);
                    entry.rule = fmt::format("additive, potentially good, e = {}: (−1/p)", e);
                } else if (e == 3) {
                    entry.value = minus_three_symbol(p);
                    entry.rule = "additive, potentially good, e = 3: (−3/p)";
                } else if (e == 4) {
                    entry.value = minus_two_symbol(p);
                    entry.rule = "additive, potentially good, e = 4: (−2/p)";
                } else {
                    entry.rule = fmt::format("additive with e = {}: unexpected", e);
                }
                break;
            }
        }
        result.push_back(entry);
    }
    return result;
}

std::optional<int> root_number_from_local(const std::vector<LocalRootNumber>& local) {
    int w = -1;
    for (const auto& entry : local) {
        if (!entry.value) return std::nullopt;
        w *= *entry.value;
    }
    return w;
}

}  // namespace arcsieve::lseries
