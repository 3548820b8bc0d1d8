#include "exact/real_multiple.hpp"

#include <optional>

namespace arcsieve::exact {

namespace {

struct Coefficients {
    Enclosure a2, a4;
};

// x3 = λ² − a2 − x1 − x2, y3 = λ(x1 − x3) − y1 (Silverman AEC III.2.3 with a1 = a3 = 0).
RealPointEnclosure chord_result(const Coefficients& c, const Enclosure& lambda,
                                const RealPointEnclosure& p, const Enclosure& x2) {
    Enclosure x3 = square(lambda) - c.a2 - p.x - x2;
    Enclosure y3 = lambda * (p.x - x3) - p.y;
    return RealPointEnclosure{std::move(x3), std::move(y3)};
}

RealPointEnclosure tangent(const Coefficients& c, const RealPointEnclosure& p) {
    const Enclosure two_y = 2L * p.y;
    if (two_y.contains_zero()) throw EnclosureTooWide("real tangent: 2y encloses 0");
    const Enclosure slope = 3L * square(p.x) + 2L * (c.a2 * p.x) + c.a4;
    return chord_result(c, slope / two_y, p, p.x);
}

RealPointEnclosure chord(const Coefficients& c, const RealPointEnclosure& p,
                         const RealPointEnclosure& q) {
    const Enclosure dx = q.x - p.x;
    if (dx.contains_zero()) throw EnclosureTooWide("real chord: x2 − x1 encloses 0");
    return chord_result(c, (q.y - p.y) / dx, p, q.x);
}

}  // namespace

RealPointEnclosure real_multiple(const JacobianCurve& curve, const Point& p, const Integer& n,
                                 const Point& translate, long bits) {
    if (n < 1) throw std::invalid_argument("real_multiple needs n >= 1");
    if (p.at_infinity) throw std::invalid_argument("real_multiple needs a finite point");
    const Coefficients c{enclose(curve.a2, bits), enclose(curve.a4, bits)};
    const RealPointEnclosure base{enclose(p.x, bits), enclose(p.y, bits)};
    RealPointEnclosure result = base;
    const long top = static_cast<long>(mpz_sizeinbase(n.get_mpz_t(), 2)) - 1;
    for (long bit = top - 1; bit >= 0; --bit) {
        result = tangent(c, result);
        if (mpz_tstbit(n.get_mpz_t(), static_cast<mp_bitcnt_t>(bit))) {
            result = chord(c, result, base);
        }
    }
    if (!translate.at_infinity) {
        result = chord(c, result,
                       RealPointEnclosure{enclose(translate.x, bits), enclose(translate.y, bits)});
    }
    return result;
}

}  // namespace arcsieve::exact
