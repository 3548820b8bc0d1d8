#include "exact/verify_solution.hpp"

#include <fstream>
#include <optional>
#include <sstream>

#include "exact/fingerprint.hpp"
#include "exact/materialise.hpp"

namespace arcsieve::exact {

namespace {

const char* variable_names[3] = {"a", "b", "c"};

// The cleared equation as a monic cubic in one variable t, the others fixed with sum u and
// product v: t³ + (1−N) u t² + ((1−N) u² + v) t + u³ − (N+2) u v (from s³ = (N+2) s p2 −
// (N+3) p3 with s = u + t, p2 = v + u t, p3 = v t).
struct CubicInOneVariable {
    Integer c2, c1, c0;
    Integer value(const Integer& t) const { return ((t + c2) * t + c1) * t + c0; }
    Integer slope(const Integer& t) const { return (3 * t + 2 * c2) * t + c1; }
};

CubicInOneVariable cubic_for(const Integer& N, const Integer& x, const Integer& y) {
    const Integer u = x + y, v = x * y;
    return CubicInOneVariable{(1 - N) * u, (1 - N) * u * u + v, u * u * u - (N + 2) * u * v};
}

// An integer root near `start` by Newton steps in exact integer arithmetic.
std::optional<Integer> integer_root_near(const CubicInOneVariable& f, const Integer& start) {
    Integer t = start;
    for (int step = 0; step < 200; ++step) {
        const Integer value = f.value(t);
        if (value == 0) return t;
        const Integer slope = f.slope(t);
        if (slope == 0) return std::nullopt;
        Integer delta;
        mpz_fdiv_q(delta.get_mpz_t(), value.get_mpz_t(), slope.get_mpz_t());
        if (delta == 0) {
            // Within one of a root: check the neighbours.
            for (const Integer& near : {Integer(t - 1), Integer(t + 1)}) {
                if (f.value(near) == 0) return near;
            }
            return std::nullopt;
        }
        t -= delta;
    }
    return std::nullopt;
}

std::string describe_difference(const std::string& name, const Integer& given,
                                const Integer& needed) {
    const std::string g = to_string(given), n = to_string(needed);
    if (g.size() == n.size()) {
        std::vector<std::size_t> positions;
        for (std::size_t i = 0; i < g.size(); ++i) {
            if (g[i] != n[i]) positions.push_back(i);
        }
        if (positions.size() == 1) {
            const std::size_t i = positions[0];
            return name + " has a wrong digit: digit " + std::to_string(i + 1) + " of " +
                   std::to_string(g.size()) + " (from the left) is " + g[i] +
                   ", the solution needs " + n[i];
        }
        return name + " differs from the value the other two require in " +
               std::to_string(positions.size()) + " of its " + std::to_string(g.size()) +
               " digits (first at digit " + std::to_string(positions[0] + 1) + ")";
    }
    if (n.size() > g.size() && n.compare(0, g.size(), g) == 0) {
        return name + " is truncated: it has " + std::to_string(g.size()) +
               " digits, the solution needs " + std::to_string(n.size());
    }
    return name + " has " + std::to_string(g.size()) +
           " digits, the value the other two require has " + std::to_string(n.size());
}

}  // namespace

VerificationReport verify_triple(const Integer& N, const family::Triple& t) {
    VerificationReport report;
    const std::array<const Integer*, 3> values = {&t.a, &t.b, &t.c};
    if (t.b + t.c == 0) report.problems.push_back("degenerate: b + c = 0");
    if (t.c + t.a == 0) report.problems.push_back("degenerate: c + a = 0");
    if (t.a + t.b == 0) report.problems.push_back("degenerate: a + b = 0");
    if (!report.problems.empty()) return report;
    if (satisfies_ratio_sum_fast(N, t)) {
        report.holds = true;
        for (int i = 0; i < 3; ++i) {
            if (*values[i] <= 0) {
                report.remarks.push_back(std::string(variable_names[i]) +
                                         " is not positive: a solution in integers, not a "
                                         "positive solution");
            }
        }
        Integer g;
        mpz_gcd(g.get_mpz_t(), t.a.get_mpz_t(), t.b.get_mpz_t());
        mpz_gcd(g.get_mpz_t(), g.get_mpz_t(), t.c.get_mpz_t());
        if (g != 1)
            report.remarks.push_back("not primitive: a, b, c share the factor " + to_string(g));
        return report;
    }
    // Which single variable, if any, is off? Solve for each given the other two.
    for (int i = 0; i < 3; ++i) {
        const Integer& x = *values[(i + 1) % 3];
        const Integer& y = *values[(i + 2) % 3];
        const auto root = integer_root_near(cubic_for(N, x, y), *values[i]);
        if (root && *root != *values[i] && x + *root != 0 && y + *root != 0) {
            report.problems.push_back(describe_difference(variable_names[i], *values[i], *root));
        }
    }
    if (report.problems.empty()) {
        report.problems.push_back(
            "not a solution: the cleared equation fails and no single variable can be changed "
            "to satisfy it");
    }
    return report;
}

VerificationReport verify_solution_text(const Integer& N, std::string_view text) {
    std::vector<std::string_view> lines;
    std::size_t start = 0;
    const bool ends_with_newline = !text.empty() && text.back() == '\n';
    while (start < text.size()) {
        std::size_t end = text.find('\n', start);
        if (end == std::string_view::npos) end = text.size();
        std::string_view line = text.substr(start, end - start);
        if (!line.empty() && line.back() == '\r') line.remove_suffix(1);
        lines.push_back(line);
        start = end + 1;
    }
    while (!lines.empty() && lines.back().empty()) lines.pop_back();
    std::vector<Integer> numbers;
    for (std::size_t i = 0; i < lines.size(); ++i) {
        const std::string_view line = lines[i];
        if (line.empty()) {
            throw InputError("line " + std::to_string(i + 1) + " is empty (expected an integer)");
        }
        for (std::size_t j = 0; j < line.size(); ++j) {
            const char ch = line[j];
            if ((ch < '0' || ch > '9') && !(j == 0 && ch == '-' && line.size() > 1)) {
                throw InputError("line " + std::to_string(i + 1) + " column " +
                                 std::to_string(j + 1) + ": '" + std::string(1, ch) +
                                 "' is not a digit");
            }
        }
        numbers.push_back(Integer(std::string(line), 10));
    }
    if (numbers.size() > 3) {
        throw InputError("expected three integers (a, b, c), found " +
                         std::to_string(numbers.size()));
    }
    VerificationReport report;
    if (numbers.size() < 3) {
        std::string why = "truncated file: only " + std::to_string(numbers.size()) +
                          " of the three numbers a, b, c are present";
        if (!numbers.empty() && !ends_with_newline) {
            why += std::string(" and ") + variable_names[numbers.size() - 1] +
                   " has no final newline (it may be cut short)";
        }
        report.problems.push_back(why);
        return report;
    }
    report = verify_triple(N, family::Triple{numbers[0], numbers[1], numbers[2]});
    if (!ends_with_newline) {
        report.problems.insert(report.problems.begin(),
                               "truncated file: no newline after the third number (c = " +
                                   short_form(numbers[2]) + " may be cut short)");
        report.holds = false;
    }
    return report;
}

VerificationReport verify_fingerprint_record(const Integer& N, const nlohmann::json& record) {
    auto fail = [](const std::string& why) { return InputError("fingerprint record: " + why); };
    if (!record.is_object()) throw fail("not a JSON object");
    if (record.contains("N")) {
        const auto& n = record["N"];
        const std::string text = n.is_string() ? n.get<std::string>() : n.dump();
        const auto value = parse_integer(text);
        if (!value) throw fail("\"N\" is not an integer");
        if (*value != N) throw fail("the record is for N = " + text + ", not " + to_string(N));
    }
    VerificationReport report;
    report.holds = true;
    if (record.contains("solution") && !record["solution"].is_null()) {
        const auto& s = record["solution"];
        if (!s.is_array() || s.size() != 3) throw fail("\"solution\" must list three integers");
        std::vector<Integer> v;
        for (const auto& entry : s) {
            if (!entry.is_string()) throw fail("\"solution\" entries must be strings of digits");
            const auto value = parse_integer(entry.get<std::string>());
            if (!value) throw fail("\"solution\" entry is not an integer");
            v.push_back(*value);
        }
        report = verify_triple(N, family::Triple{v[0], v[1], v[2]});
    }
    if (!record.contains("generators") || !record.contains("hit")) {
        if (!record.contains("solution"))
            throw fail("needs \"solution\" or \"generators\" and \"hit\"");
        return report;
    }
    const Curve curve = family::ratio_sum_curve(N);
    auto point_of = [&](const nlohmann::json& pair) {
        if (pair.is_null()) return Point::infinity();
        if (!pair.is_array() || pair.size() != 2 || !pair[0].is_string() || !pair[1].is_string()) {
            throw fail("a point must be [\"x\", \"y\"]");
        }
        return parse_point(curve, pair[0].get<std::string>() + "," + pair[1].get<std::string>());
    };
    const auto& generators = record["generators"];
    const auto& hit = record["hit"];
    if (!generators.is_array() || generators.size() != 1 || !hit.is_object() ||
        !hit.contains("coeffs") || !hit["coeffs"].is_array() || hit["coeffs"].size() != 1) {
        throw fail("only rank-one records (one generator, one coefficient) can be checked");
    }
    const auto& coefficient = hit["coeffs"][0];
    const auto index = parse_integer(coefficient.is_string() ? coefficient.get<std::string>()
                                                             : coefficient.dump());
    if (!index || *index < 1) throw fail("the hit coefficient must be a positive integer");
    const Multiple q{point_of(generators[0]), *index,
                     hit.contains("translate") ? point_of(hit["translate"]) : Point::infinity()};
    const RatioSumFingerprint f = ratio_sum_fingerprint(N, q);
    if (!f.certain) {
        report.holds = false;
        report.problems.push_back("the fingerprint could not be certified: " + to_json(f).dump());
        return report;
    }
    const auto& digits = record.value("digits", nlohmann::json());
    const auto& lead = record.value("lead", nlohmann::json());
    for (int i = 0; i < 3; ++i) {
        const std::string name = variable_names[i];
        if (digits.is_array() && digits.size() == 3 && !digits[i].is_null()) {
            if (!digits[i].is_number_unsigned()) throw fail("\"digits\" entries must be counts");
            const auto claimed = digits[i].get<std::size_t>();
            if (claimed != f.numbers[i].digits) {
                report.holds = false;
                report.problems.push_back(name + ": the record says " + std::to_string(claimed) +
                                          " digits, the point gives " +
                                          std::to_string(f.numbers[i].digits));
            }
        }
        if (lead.is_array() && lead.size() == 3 && lead[i].is_string()) {
            const std::string claimed = lead[i].get<std::string>();
            const std::string& actual = f.numbers[i].lead;
            const std::size_t n = std::min(claimed.size(), actual.size());
            for (std::size_t k = 0; k < n; ++k) {
                if (claimed[k] != actual[k]) {
                    report.holds = false;
                    report.problems.push_back(name + ": leading digit " + std::to_string(k + 1) +
                                              " is " + claimed[k] + " in the record, " + actual[k] +
                                              " for the point");
                    break;
                }
            }
        }
    }
    if (record.contains("solution") && record["solution"].is_array()) {
        // The written solution must also be the point's.
        for (int i = 0; i < 3; ++i) {
            const std::string text = record["solution"][i].get<std::string>();
            const std::string digits_only = text.empty() || text[0] != '-' ? text : text.substr(1);
            if (digits_only.size() != f.numbers[i].digits ||
                digits_only.compare(0, f.numbers[i].lead.size(), f.numbers[i].lead) != 0) {
                report.holds = false;
                report.problems.push_back(std::string(variable_names[i]) +
                                          ": the written solution does not match the point's "
                                          "fingerprint");
            }
        }
    }
    return report;
}

VerificationReport verify_solution_file(const Integer& N, const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    if (!in) throw InputError("cannot read '" + path + "'");
    std::ostringstream buffer;
    buffer << in.rdbuf();
    const std::string text = buffer.str();
    const auto first = text.find_first_not_of(" \t\r\n");
    if (first != std::string::npos && text[first] == '{') {
        nlohmann::json record;
        try {
            record = nlohmann::json::parse(text);
        } catch (const nlohmann::json::parse_error& e) {
            throw InputError("'" + path + "' is not valid JSON: " + e.what());
        }
        return verify_fingerprint_record(N, record);
    }
    return verify_solution_text(N, text);
}

}  // namespace arcsieve::exact
