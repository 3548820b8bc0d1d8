// `arcsieve inspect`: curve data for a family problem or a bare curve (text or --json): the
// model and its invariants, the minimal model with the change of variables, the discriminant
// and its factorisation, conductor, torsion, reduction per bad prime, and the given points.
#include <algorithm>
#include <iostream>
#include <nlohmann/json.hpp>
#include <sstream>

#include "arith/factor.hpp"
#include "cli/commands.hpp"
#include "curve/minimal_model.hpp"
#include "curve/tate.hpp"
#include "curve/torsion.hpp"

namespace arcsieve::cli {
namespace {

// Largest --digits accepted: the analytic part's precision grows with it.
constexpr long max_digits = 100000;

nlohmann::json coefficients(const Curve& e) {
    return nlohmann::json::array(
        {to_string(e.a1), to_string(e.a2), to_string(e.a3), to_string(e.a4), to_string(e.a6)});
}

nlohmann::json point_json(const Point& p) {
    if (p.at_infinity) return "infinity";
    return nlohmann::json::array({to_string(p.x), to_string(p.y)});
}

std::string point_text(const Point& p) {
    return p.at_infinity ? "O" : "(" + to_string(p) + ")";
}

// Prime factorisation of a nonzero rational: denominator primes get negative exponents.
struct SignedFactor {
    Integer prime;
    int exponent;
};
std::vector<SignedFactor> factor_rational(const Rational& q) {
    std::vector<SignedFactor> out;
    for (const auto& pp : factor(Integer(q.get_num()))) out.push_back({pp.prime, pp.exponent});
    for (const auto& pp : factor(Integer(q.get_den()))) out.push_back({pp.prime, -pp.exponent});
    std::sort(out.begin(), out.end(),
              [](const SignedFactor& a, const SignedFactor& b) { return a.prime < b.prime; });
    return out;
}

nlohmann::json factors_json(const std::vector<SignedFactor>& factors) {
    auto out = nlohmann::json::array();
    for (const auto& f : factors)
        out.push_back({{"prime", to_string(f.prime)}, {"exponent", f.exponent}});
    return out;
}

std::string factors_text(const Rational& q, const std::vector<SignedFactor>& factors) {
    std::string out = q < 0 ? "-" : "";
    if (factors.empty()) return out + "1";
    for (std::size_t i = 0; i < factors.size(); ++i) {
        if (i > 0) out += " * ";
        out += to_string(factors[i].prime);
        if (factors[i].exponent != 1) out += "^" + std::to_string(factors[i].exponent);
    }
    return out;
}

std::string kind_word(ReductionKind kind) {
    switch (kind) {
        case ReductionKind::good:
            return "good";
        case ReductionKind::split_multiplicative:
            return "split";
        case ReductionKind::nonsplit_multiplicative:
            return "nonsplit";
        case ReductionKind::additive:
            return "additive";
    }
    return "unknown";
}

std::string structure_text(const std::vector<int>& structure) {
    if (structure.empty()) return "trivial";
    std::string out;
    for (std::size_t i = 0; i < structure.size(); ++i) {
        if (i > 0) out += " x ";
        out += "Z/" + std::to_string(structure[i]);
    }
    return out;
}

std::string change_text(const ModelChange& c) {
    return "u = " + to_string(c.u) + ", r = " + to_string(c.r) + ", s = " + to_string(c.s) +
           ", t = " + to_string(c.t);
}

void report(const Problem& problem, const std::vector<std::string>& point_texts, long digits,
            bool json) {
    if (digits < 1 || digits > max_digits) {
        throw InputError("--digits must be between 1 and " + std::to_string(max_digits) + ", got " +
                         std::to_string(digits));
    }
    const Curve& e = problem.curve;
    std::vector<Point> points;
    for (const auto& text : point_texts) points.push_back(parse_point(e, text));

    const BInvariants b = b_invariants(e);
    const Rational delta = discriminant(e);
    const auto delta_factors = factor_rational(delta);
    const ModelWithChange minimal = minimal_model(e);
    const Rational minimal_delta = discriminant(minimal.curve);
    const auto minimal_factors = factor_rational(minimal_delta);
    const std::vector<LocalReduction> locals = bad_reduction(e);
    Integer conductor_value = 1;
    int tamagawa_product = 1;
    for (const auto& local : locals) {
        Integer power;
        mpz_pow_ui(power.get_mpz_t(), local.prime.get_mpz_t(),
                   static_cast<unsigned long>(local.conductor_exponent));
        conductor_value *= power;
        tamagawa_product *= local.tamagawa;
    }
    const TorsionGroup torsion = torsion_subgroup(e);

    nlohmann::json record;
    std::ostringstream text;
    auto line = [&text](const std::string& label, const std::string& value) {
        text << label << std::string(label.size() < 22 ? 22 - label.size() : 1, ' ') << value
             << "\n";
    };
    if (!problem.family.empty()) {
        record["family"] = problem.family;
        record["N"] = to_string(*problem.N);
        line("problem", problem.family + ", N = " + to_string(*problem.N));
    }
    record["curve"] = coefficients(e);
    line("curve", to_string(e));
    record["invariants"] = {{"b2", to_string(b.b2)},  {"b4", to_string(b.b4)},
                            {"b6", to_string(b.b6)},  {"b8", to_string(b.b8)},
                            {"c4", to_string(c4(e))}, {"c6", to_string(c6(e))}};
    line("b2 b4 b6 b8", to_string(b.b2) + "  " + to_string(b.b4) + "  " + to_string(b.b6) + "  " +
                            to_string(b.b8));
    line("c4 c6", to_string(c4(e)) + "  " + to_string(c6(e)));
    record["discriminant"] = to_string(delta);
    record["discriminant_factors"] = factors_json(delta_factors);
    line("discriminant", to_string(delta) + " = " + factors_text(delta, delta_factors));
    record["j_invariant"] = to_string(j_invariant(e));
    line("j-invariant", to_string(j_invariant(e)));
    record["minimal"] = {{"curve", coefficients(minimal.curve)},
                         {"change",
                          {{"u", to_string(minimal.change.u)},
                           {"r", to_string(minimal.change.r)},
                           {"s", to_string(minimal.change.s)},
                           {"t", to_string(minimal.change.t)}}},
                         {"discriminant", to_string(minimal_delta)},
                         {"discriminant_factors", factors_json(minimal_factors)}};
    line("minimal model", to_string(minimal.curve));
    line("  change", change_text(minimal.change) + "  (x = u^2 x' + r, y = u^3 y' + s u^2 x' + t)");
    line("  discriminant",
         to_string(minimal_delta) + " = " + factors_text(minimal_delta, minimal_factors));
    record["conductor"] = to_string(conductor_value);
    line("conductor", to_string(conductor_value));

    auto reductions = nlohmann::json::array();
    for (const auto& local : locals) {
        reductions.push_back({{"prime", to_string(local.prime)},
                              {"kodaira", local.kodaira},
                              {"kind", kind_word(local.kind)},
                              {"discriminant_valuation", local.discriminant_valuation},
                              {"conductor_exponent", local.conductor_exponent},
                              {"tamagawa", local.tamagawa}});
        line("reduction at " + to_string(local.prime),
             local.kodaira + ", " + kind_word(local.kind) +
                 ", v(disc) = " + std::to_string(local.discriminant_valuation) +
                 ", conductor exponent " + std::to_string(local.conductor_exponent) +
                 ", Tamagawa " + std::to_string(local.tamagawa));
    }
    record["reduction"] = reductions;
    record["tamagawa_product"] = tamagawa_product;
    line("Tamagawa product", std::to_string(tamagawa_product));

    auto torsion_points = nlohmann::json::array();
    std::string torsion_list;
    for (const Point& p : torsion.points) {
        torsion_points.push_back(point_json(p));
        torsion_list += (torsion_list.empty() ? "" : " ") + point_text(p);
    }
    auto torsion_generators = nlohmann::json::array();
    std::string generator_list;
    for (const Point& p : torsion.generators) {
        torsion_generators.push_back(point_json(p));
        generator_list += (generator_list.empty() ? "" : " ") + point_text(p);
    }
    record["torsion"] = {{"structure", torsion.structure},
                         {"order", torsion.points.size()},
                         {"points", torsion_points},
                         {"generators", torsion_generators}};
    line("torsion", structure_text(torsion.structure) +
                        (generator_list.empty() ? "" : ", generated by " + generator_list));
    line("  points", torsion_list);

    auto given = nlohmann::json::array();
    for (std::size_t i = 0; i < points.size(); ++i) {
        const Point& p = points[i];
        const auto order = torsion_order(e, p);
        nlohmann::json components = nlohmann::json::object();
        std::string component_list;
        for (const auto& local : locals) {
            const int index = reduction_component(e, local, p).index;
            components[to_string(local.prime)] = index;
            component_list += (component_list.empty() ? "" : ", ") + to_string(local.prime) + ": " +
                              std::to_string(index);
        }
        given.push_back({{"point", point_json(p)},
                         {"minimal", point_json(to_new_model(minimal.change, p))},
                         {"order", order ? nlohmann::json(*order) : nlohmann::json(nullptr)},
                         {"components", components}});
        line("point " + std::to_string(i + 1),
             point_text(p) + ", " +
                 (order ? "order " + std::to_string(*order) : std::string("infinite order")));
        line("  on minimal model", point_text(to_new_model(minimal.change, p)));
        line("  components", component_list.empty() ? "(no bad primes)" : component_list);
    }
    record["given_points"] = given;

    inspect_analytic(e, points, static_cast<unsigned>(digits), record, text);
    if (json) {
        std::cout << record.dump() << "\n";
    } else {
        std::cout << text.str();
    }
}

}  // namespace

void register_inspect(CLI::App& app, Context& context) {
    auto* command = app.add_subcommand("inspect",
                                       "print the curve's model, invariants, minimal model, "
                                       "conductor, torsion and reduction types");
    auto options = std::make_shared<ProblemOptions>();
    auto json = std::make_shared<bool>(false);
    auto points = std::make_shared<std::vector<std::string>>();
    auto digits = std::make_shared<long>(30);
    add_problem_options(*command, *options);
    command->add_flag("--json", *json, "print one JSON object");
    command
        ->add_option("--point", *points,
                     "a point on the given model, x,y or (X:Y:Z); repeat for more (write "
                     "--point=-1,2 when x is negative)")
        ->take_all()
        ->expected(1);
    command->add_option("--digits", *digits,
                        "significant digits of the analytic data (default 30)");
    command->callback([options, json, points, digits, &context]() {
        report(resolve_problem(*options), *points, *digits, *json);
        context.exit_code = 0;
    });
}

}  // namespace arcsieve::cli
