#include "arith/rational.hpp"

#include <cctype>

namespace arcsieve {
namespace {

std::string_view trim(std::string_view text) {
    while (!text.empty() && std::isspace(static_cast<unsigned char>(text.front()))) {
        text.remove_prefix(1);
    }
    while (!text.empty() && std::isspace(static_cast<unsigned char>(text.back()))) {
        text.remove_suffix(1);
    }
    return text;
}

bool is_integer_literal(std::string_view text) {
    if (!text.empty() && (text.front() == '-' || text.front() == '+')) text.remove_prefix(1);
    if (text.empty()) return false;
    for (char ch : text) {
        if (!std::isdigit(static_cast<unsigned char>(ch))) return false;
    }
    return true;
}

}  // namespace

std::optional<Integer> parse_integer(std::string_view text) {
    text = trim(text);
    if (!is_integer_literal(text)) return std::nullopt;
    if (text.front() == '+') text.remove_prefix(1);
    return Integer(std::string(text), 10);
}

std::optional<Rational> parse_rational(std::string_view text) {
    text = trim(text);
    const auto slash = text.find('/');
    if (slash == std::string_view::npos) {
        auto n = parse_integer(text);
        if (!n) return std::nullopt;
        return Rational(*n);
    }
    auto num = parse_integer(text.substr(0, slash));
    auto den = parse_integer(text.substr(slash + 1));
    if (!num || !den || *den == 0) return std::nullopt;
    Rational q(*num, *den);
    q.canonicalize();
    return q;
}

std::string to_string(const Integer& n) { return n.get_str(10); }

std::string to_string(const Rational& q) { return q.get_str(10); }

int valuation(const Integer& n, const Integer& p) {
    if (n == 0) throw std::domain_error("valuation of zero");
    if (p < 2) throw std::domain_error("valuation needs p >= 2");
    Integer m = abs(n);
    int v = 0;
    if (p == 2) return static_cast<int>(mpz_scan1(m.get_mpz_t(), 0));
    while (mpz_divisible_p(m.get_mpz_t(), p.get_mpz_t())) {
        mpz_divexact(m.get_mpz_t(), m.get_mpz_t(), p.get_mpz_t());
        ++v;
    }
    return v;
}

int valuation(const Rational& q, const Integer& p) {
    return valuation(Integer(q.get_num()), p) - valuation(Integer(q.get_den()), p);
}

std::size_t decimal_digits(const Integer& n) {
    if (n == 0) return 1;
    // mpz_sizeinbase(.., 10) is exact or one too large; correct it with one comparison.
    std::size_t d = mpz_sizeinbase(n.get_mpz_t(), 10);
    Integer bound;
    mpz_ui_pow_ui(bound.get_mpz_t(), 10, d - 1);
    if (abs(n) < bound) --d;
    return d;
}

}  // namespace arcsieve
