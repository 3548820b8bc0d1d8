#include "family/target.hpp"

#include <algorithm>
#include <cctype>

#include "family/ratio_sum.hpp"

namespace arcsieve::family {

LinearForm operator+(const LinearForm& f, const LinearForm& g) {
    return {f.coefficient_x + g.coefficient_x, f.coefficient_y + g.coefficient_y,
            f.coefficient_z + g.coefficient_z};
}

LinearForm operator-(const LinearForm& f, const LinearForm& g) {
    return {f.coefficient_x - g.coefficient_x, f.coefficient_y - g.coefficient_y,
            f.coefficient_z - g.coefficient_z};
}

LinearForm operator*(const Rational& scale, const LinearForm& f) {
    return {scale * f.coefficient_x, scale * f.coefficient_y, scale * f.coefficient_z};
}

bool is_zero(const LinearForm& f) {
    return f.coefficient_x == 0 && f.coefficient_y == 0 && f.coefficient_z == 0;
}

Rational evaluate(const LinearForm& f, const Point& p) {
    if (p.at_infinity) return f.coefficient_y;
    return f.coefficient_x * p.x + f.coefficient_y * p.y + f.coefficient_z;
}

namespace {

bool holds_with_sign(const Target& target, const Point& p, int sign) {
    for (const SignCondition& condition : target.conditions) {
        const Rational value = sign * evaluate(condition.form, p);
        if (condition.strict ? value <= 0 : value < 0) return false;
    }
    return true;
}

std::string trimmed(std::string_view text) {
    std::size_t begin = 0, end = text.size();
    while (begin < end && std::isspace(static_cast<unsigned char>(text[begin]))) ++begin;
    while (end > begin && std::isspace(static_cast<unsigned char>(text[end - 1]))) --end;
    return std::string(text.substr(begin, end - begin));
}

}  // namespace

bool satisfies_exactly(const Target& target, const Point& p) {
    if (holds_with_sign(target, p, 1)) return true;
    return target.projective && holds_with_sign(target, p, -1);
}

void add_ordering(Target& target, std::string_view ordering) {
    const std::string text = trimmed(ordering);
    if (text.empty()) return;
    std::vector<std::string> names;
    std::size_t start = 0;
    while (true) {
        const std::size_t at = text.find(">=", start);
        names.push_back(trimmed(std::string_view(text).substr(
            start, at == std::string::npos ? std::string::npos : at - start)));
        if (at == std::string::npos) break;
        start = at + 2;
    }
    if (names.size() < 2) {
        throw InputError("ordering '" + text + "' must look like \"a>=b\" or \"a>=b>=c\"");
    }
    std::vector<std::size_t> index;
    for (const std::string& name : names) {
        const auto it = std::find(target.variable_names.begin(), target.variable_names.end(), name);
        if (it == target.variable_names.end()) {
            std::string known;
            for (const std::string& v : target.variable_names)
                known += (known.empty() ? "" : ", ") + v;
            throw InputError("ordering '" + text + "' names '" + name +
                             "', which is not a variable of " + target.family + " (" + known + ")");
        }
        index.push_back(static_cast<std::size_t>(it - target.variable_names.begin()));
    }
    for (std::size_t i = 0; i + 1 < index.size(); ++i) {
        if (index[i] == index[i + 1]) {
            throw InputError("ordering '" + text + "' compares a variable with itself");
        }
        target.conditions.push_back(
            SignCondition{target.variables[index[i]] - target.variables[index[i + 1]], false,
                          names[i] + " >= " + names[i + 1]});
    }
}

Target ratio_sum_target(const Integer& N, std::string_view ordering) {
    check_ratio_sum_parameter(N);
    const Rational k(8 * (N + 3));
    Target target;
    target.family = "ratio-sum";
    target.parameter = N;
    target.curve = ratio_sum_curve(N);
    target.variable_names = {"a", "b", "c"};
    // The triple map of family/ratio_sum.hpp written as linear forms in (X : Y : Z).
    target.variables = {LinearForm{Rational(-1), Rational(1), k},
                        LinearForm{Rational(-1), Rational(-1), k},
                        LinearForm{Rational(-2 * (N + 2)), Rational(0), -k}};
    for (std::size_t i = 0; i < 3; ++i) {
        target.conditions.push_back(
            SignCondition{target.variables[i], true, target.variable_names[i] + " > 0"});
    }
    target.projective = true;
    add_ordering(target, ordering);
    return target;
}

}  // namespace arcsieve::family
