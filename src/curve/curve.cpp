#include "curve/curve.hpp"

#include <vector>

namespace arcsieve {

BInvariants b_invariants(const Curve& e) {
    BInvariants b;
    b.b2 = e.a1 * e.a1 + 4 * e.a2;
    b.b4 = 2 * e.a4 + e.a1 * e.a3;
    b.b6 = e.a3 * e.a3 + 4 * e.a6;
    b.b8 = e.a1 * e.a1 * e.a6 + 4 * e.a2 * e.a6 - e.a1 * e.a3 * e.a4 + e.a2 * e.a3 * e.a3 -
           e.a4 * e.a4;
    return b;
}

Rational c4(const Curve& e) {
    const auto b = b_invariants(e);
    return b.b2 * b.b2 - 24 * b.b4;
}

Rational c6(const Curve& e) {
    const auto b = b_invariants(e);
    return -b.b2 * b.b2 * b.b2 + 36 * b.b2 * b.b4 - 216 * b.b6;
}

Rational discriminant(const Curve& e) {
    const auto b = b_invariants(e);
    return -b.b2 * b.b2 * b.b8 - 8 * b.b4 * b.b4 * b.b4 - 27 * b.b6 * b.b6 +
           9 * b.b2 * b.b4 * b.b6;
}

bool is_singular(const Curve& e) { return discriminant(e) == 0; }

Rational j_invariant(const Curve& e) {
    const Rational delta = discriminant(e);
    if (delta == 0) throw std::domain_error("j-invariant of a singular curve");
    const Rational c = c4(e);
    return c * c * c / delta;
}

bool is_integral(const Curve& e) {
    for (const Rational* a : {&e.a1, &e.a2, &e.a3, &e.a4, &e.a6}) {
        if (a->get_den() != 1) return false;
    }
    return true;
}

Curve make_curve(const std::array<Rational, 5>& a) {
    Curve e{a[0], a[1], a[2], a[3], a[4]};
    if (is_singular(e)) {
        throw InputError("singular curve " + to_string(e) + ": its discriminant is 0");
    }
    return e;
}

Curve parse_curve(std::string_view text) {
    const std::string original(text);
    auto fail = [&](const std::string& why) -> InputError {
        return InputError("cannot read curve '" + original + "': " + why +
                          " (expected [a1,a2,a3,a4,a6] or [a4,a6] with integer or p/q entries)");
    };
    while (!text.empty() && text.front() == ' ') text.remove_prefix(1);
    while (!text.empty() && text.back() == ' ') text.remove_suffix(1);
    if (text.size() < 2 || text.front() != '[' || text.back() != ']') {
        throw fail("missing brackets");
    }
    text = text.substr(1, text.size() - 2);
    std::vector<Rational> entries;
    std::size_t start = 0;
    while (true) {
        const auto comma = text.find(',', start);
        const auto piece = text.substr(start, comma == std::string_view::npos
                                                   ? std::string_view::npos
                                                   : comma - start);
        auto value = parse_rational(piece);
        if (!value) throw fail("entry '" + std::string(piece) + "' is not a rational number");
        entries.push_back(*value);
        if (comma == std::string_view::npos) break;
        start = comma + 1;
    }
    if (entries.size() == 2) {
        return make_curve({Rational(0), Rational(0), Rational(0), entries[0], entries[1]});
    }
    if (entries.size() != 5) {
        throw fail("it has " + std::to_string(entries.size()) + " entries");
    }
    return make_curve({entries[0], entries[1], entries[2], entries[3], entries[4]});
}

std::string to_string(const Curve& e) {
    return "[" + to_string(e.a1) + "," + to_string(e.a2) + "," + to_string(e.a3) + "," +
           to_string(e.a4) + "," + to_string(e.a6) + "]";
}

Curve apply(const Curve& e, const ModelChange& c) {
    // Silverman, AEC, Table 3.1 (also Cremona, Algorithms, §3.1).
    const Rational& u = c.u;
    const Rational& r = c.r;
    const Rational& s = c.s;
    const Rational& t = c.t;
    const Rational u2 = u * u, u3 = u2 * u, u4 = u2 * u2, u6 = u3 * u3;
    Curve out;
    out.a1 = (e.a1 + 2 * s) / u;
    out.a2 = (e.a2 - s * e.a1 + 3 * r - s * s) / u2;
    out.a3 = (e.a3 + r * e.a1 + 2 * t) / u3;
    out.a4 = (e.a4 - s * e.a3 + 2 * r * e.a2 - (t + r * s) * e.a1 + 3 * r * r - 2 * s * t) / u4;
    out.a6 = (e.a6 + r * e.a4 + r * r * e.a2 + r * r * r - t * e.a3 - t * t - r * t * e.a1) / u6;
    return out;
}

ModelChange compose(const ModelChange& first, const ModelChange& then) {
    // x = u1^2 x' + r1 and x' = u2^2 x'' + r2, likewise for y; substitute and collect.
    const Rational& u1 = first.u;
    ModelChange out;
    out.u = u1 * then.u;
    out.r = u1 * u1 * then.r + first.r;
    out.s = first.s + u1 * then.s;
    out.t = first.t + u1 * u1 * first.s * then.r + u1 * u1 * u1 * then.t;
    return out;
}

ModelChange inverse(const ModelChange& c) {
    ModelChange out;
    out.u = 1 / c.u;
    out.r = -c.r / (c.u * c.u);
    out.s = -c.s / c.u;
    out.t = (c.r * c.s - c.t) / (c.u * c.u * c.u);
    return out;
}

}  // namespace arcsieve
