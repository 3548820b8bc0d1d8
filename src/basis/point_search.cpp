#include "basis/point_search.hpp"

#include <algorithm>
#include <tuple>

#include "basis/square_sieve.hpp"

namespace arcsieve {

namespace {

Integer lcm_of_denominators(const std::vector<Rational>& values) {
    Integer l = 1;
    for (const Rational& v : values) mpz_lcm(l.get_mpz_t(), l.get_mpz_t(), v.get_den_mpz_t());
    return l;
}

}  // namespace

std::vector<Point> search_points(const Curve& curve, const PointSearchOptions& options) {
    // Integer bounds only: above 10^14 the search space (|u| · sqrt(bound) pairs) could never be
    // covered in reasonable time, so the request is refused instead of hanging.
    if (options.height_bound < 1 || options.height_bound > Integer("100000000000000")) {
        throw InputError("point search height bound must lie in [1, 10^14], got " +
                         to_string(options.height_bound));
    }
    const std::int64_t bound = options.height_bound.get_si();
    // A rational x is the x-coordinate of a rational point iff 4x^3 + b2 x^2 + 2 b4 x + b6 =
    // (2y + a1 x + a3)^2 is a rational square (Silverman AEC III.1). With x = u/w^2 and the
    // denominators L of the b_i cleared, L^2 w^6 (…) is a binary cubic in (u, t = w^2).
    const BInvariants b = b_invariants(curve);
    const Integer l = lcm_of_denominators({b.b2, b.b4, b.b6});
    const Integer l2 = l * l;
    basis::BinaryForm form;
    auto as_integer = [&](const Rational& q) {
        const Rational scaled = q * Rational(l2);
        return Integer(scaled.get_num() / scaled.get_den());
    };
    form.coefficients = {as_integer(b.b6), as_integer(2 * b.b4), as_integer(b.b2),
                         as_integer(Rational(4))};
    std::vector<basis::OuterValue> outer;
    for (std::int64_t w = 1; w * w <= bound; ++w) outer.push_back({w * w, w});
    const auto hits = basis::square_values(form, outer, -bound, bound, options.threads);

    struct Found {
        Integer naive_height;
        Point point;
    };
    std::vector<Found> found;
    found.reserve(hits.size());
    for (const auto& hit : hits) {
        Integer u, t;
        mpz_set_si(u.get_mpz_t(), static_cast<long>(hit.u));
        mpz_set_si(t.get_mpz_t(), static_cast<long>(hit.t));
        const Rational x(u, t);
        Integer w;
        mpz_sqrt(w.get_mpz_t(), t.get_mpz_t());
        const Rational s(hit.root, l * w * w * w);  // = 2y + a1 x + a3
        Point p{x, (s - curve.a1 * x - curve.a3) / 2, false};
        p.x.canonicalize();
        p.y.canonicalize();
        found.push_back({std::max(Integer(abs(u)), t), p});
    }
    std::sort(found.begin(), found.end(), [](const Found& a, const Found& b) {
        if (a.naive_height != b.naive_height) return a.naive_height < b.naive_height;
        return a.point.x < b.point.x;
    });
    std::vector<Point> points;
    points.reserve(found.size());
    for (auto& f : found) points.push_back(std::move(f.point));
    return points;
}

}  // namespace arcsieve
