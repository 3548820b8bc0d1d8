// Fingerprints of solutions too large to write: exact digit counts and leading digits of the
// (a, b, c) of n·P + T from the height decomposition 2·log W = ĥ − λ_∞ − Σ c_p (DESIGN.md §2),
// the real point by an interval chain and the bad-prime data by p-adic chains.
#pragma once

#include <array>
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <vector>

#include "arith/factor.hpp"
#include "curve/point.hpp"
#include "exact/enclosure.hpp"
#include "exact/multiple.hpp"
#include "exact/padic.hpp"

namespace arcsieve::exact {

// The local picture of Q at one correction prime.
struct LocalPicture {
    Integer prime;
    PadicPoint point;      // Q over Q_p (with the digits that survived the chain)
    Enclosure correction;  // c_p(Q) = λ_p(Q) − 2 v_p(W) log p
};

// Everything about Q's size on an integral a1 = a3 = 0 model, without Q's digits:
// x(Q) = X / W² in lowest terms.
struct PointFingerprint {
    Enclosure canonical_height;  // ĥ(Q) = index² ĥ(P)
    Enclosure archimedean;       // λ_∞(Q)
    Enclosure log_denominator;   // log W
    Enclosure x, y;              // the real point
    std::vector<LocalPicture> local;
    long bits = 0;  // working precision of the attempt
};

// Throws EnclosureTooWide / PadicPrecisionExhausted when `bits` does not suffice.
PointFingerprint point_fingerprint(const JacobianCurve& curve, const Multiple& q,
                                   const std::vector<Integer>& correction_primes, long bits);

// Primes where the ratio-sum curve E_N needs a local correction (primes of 6(N+3)(2N+5)(2N−3)
// dividing the duplication resultant).
std::vector<Integer> ratio_sum_correction_primes(const Integer& N);

struct NumberFingerprint {
    std::size_t digits = 0;  // exact decimal digit count of |value| (when certain)
    bool digits_certain = false;
    std::string lead;  // certified leading digits (up to the number requested)
    int sign = 0;      // sign of the value in the normalised triple
};

struct FingerprintOptions {
    unsigned lead_digits = 30;
    long max_bits = 4096;  // give up raising precision beyond this
    // When the height method cannot decide (a coordinate exactly 0, or digits after the lead
    // exactly at a boundary such as ...000) and the solution is at most this many digits, it
    // is materialised and read off exactly; the record then says so ("method": "exact").
    double exact_fallback_digits = 1e5;
};

struct RatioSumFingerprint {
    std::array<NumberFingerprint, 3> numbers;  // a, b, c of the coprime triple, a + b + c > 0
    std::vector<PrimePower> gcd;               // the common factor removed, prime by prime
    bool positive = false;                     // all three > 0 (certain when `certain`)
    bool certain = false;                      // every field above is certified
    double log10_size = 0;                     // log10 of the largest |a|, |b|, |c| (rough)
    long bits = 0;                             // precision of the successful attempt
    std::string method = "height";             // "height", or "exact" after the fallback
    std::vector<std::string> notes;            // what could not be decided, and why
};

// Fingerprint of the solution (a : b : c) that Q on E_N maps to. Raises precision until
// everything is certified or options.max_bits is reached (then `certain` is false and the
// notes say which digits are in doubt).
RatioSumFingerprint ratio_sum_fingerprint(const Integer& N, const Multiple& q,
                                          const FingerprintOptions& options = {});

// {"digits": [...], "lead": [...], "gcd": {"2": 3, ...}, "certain": ..., "notes": [...]}
// with null entries for what is not certified.
nlohmann::json to_json(const RatioSumFingerprint& fingerprint);

}  // namespace arcsieve::exact
