#include "survey/report.hpp"

#include <fmt/format.h>

namespace arcsieve::survey {
namespace {

std::string text_of(const nlohmann::json& value) {
    if (value.is_null()) return "unknown";
    if (value.is_string()) return value.get<std::string>();
    if (value.is_boolean()) return value.get<bool>() ? "yes" : "no";
    return value.dump();
}

std::string point_text(const nlohmann::json& point) {
    if (point.is_null()) return "O (the point at infinity)";
    if (point.is_array() && point.size() == 2) {
        return "(" + text_of(point[0]) + ", " + text_of(point[1]) + ")";
    }
    return text_of(point);
}

std::string shortened(const std::string& digits, std::size_t keep = 60) {
    if (digits.size() <= keep) return digits;
    return digits.substr(0, keep) + fmt::format("... ({} digits)", digits.size());
}

void line(std::string& out, const std::string& label, const std::string& value) {
    out += fmt::format("{:<18}{}\n", label, value);
}

}  // namespace

bool settled_completely(const nlohmann::json& r) {
    // A proof that no positive solution exists settles the problem whatever else is open.
    if (r.value("no_solution_proven", false)) return true;
    const auto rank = r.value("rank", nlohmann::json());
    if (!rank.is_object() ||
        rank.value("lower", nlohmann::json()) != rank.value("upper", nlohmann::json()) ||
        rank.value("upper", nlohmann::json()).is_null()) {
        return false;
    }
    // The generators and torsion proven to generate E(Q) (rank proven, full rank, saturated).
    if (!r.value("basis_complete", false)) return false;
    if (!r.value("hit_certified", false)) return false;
    return r.value("verified", false) || r.value("digits_certified", false);
}

std::string readable_report(const nlohmann::json& r) {
    std::string out;
    if (r.contains("family")) {
        line(out, "problem", fmt::format("{}, N = {}", text_of(r["family"]), text_of(r["N"])));
        if (r["family"] == "ratio-sum") {
            line(out, "",
                 fmt::format("a/(b+c) + b/(c+a) + c/(a+b) = {} in positive integers",
                             text_of(r["N"])));
        }
    }
    if (r.contains("curve")) line(out, "curve", text_of(r["curve"]) + "  (a-invariants)");
    if (r.contains("discriminant")) line(out, "discriminant", text_of(r["discriminant"]));
    if (r.contains("conductor")) line(out, "conductor", text_of(r["conductor"]));
    if (r.contains("torsion_structure")) {
        std::string group = "trivial";
        const auto& s = r["torsion_structure"];
        if (s.size() == 1) group = fmt::format("Z/{}", s[0].dump());
        if (s.size() == 2) group = fmt::format("Z/{} x Z/{}", s[0].dump(), s[1].dump());
        std::string points;
        for (const auto& p : r.value("torsion", nlohmann::json::array())) {
            points += (points.empty() ? "" : ", ") + point_text(p);
        }
        line(out, "torsion", group + (points.empty() ? "" : ": " + points));
    }
    if (r.contains("rank")) {
        const auto& rank = r["rank"];
        const std::string upper = text_of(rank.value("upper", nlohmann::json()));
        line(out, "rank",
             rank.value("lower", nlohmann::json()) == rank.value("upper", nlohmann::json())
                 ? text_of(rank["lower"]) + " (lower and upper bound agree)"
                 : fmt::format("between {} and {}", text_of(rank["lower"]), upper));
    }
    if (r.contains("generators")) {
        const auto& gens = r["generators"];
        const auto heights = r.value("generator_heights", nlohmann::json::array());
        for (std::size_t i = 0; i < gens.size(); ++i) {
            std::string h = i < heights.size() ? "  height " + text_of(heights[i]) : "";
            line(out, i == 0 ? "generators" : "",
                 fmt::format("P{} = {}{}", i + 1, point_text(gens[i]), h));
        }
        if (gens.empty()) line(out, "generators", "none found");
    }
    if (r.contains("regulator")) line(out, "regulator", text_of(r["regulator"]));
    if (r.contains("saturated_up_to")) {
        line(out, "saturation",
             r.value("basis_complete", false) ? "proved: the generators and torsion generate E(Q)"
             : r.value("saturation_complete", false)
                 ? "proved: the generators and torsion span a saturated subgroup (E(Q) itself "
                   "only if the rank equals the number of generators, not proven)"
                 : fmt::format("proved at every prime <= {}; beyond that not proved",
                               text_of(r["saturated_up_to"])));
    }
    if (r.contains("region")) {
        const auto& arcs = r["region"].value("arcs", nlohmann::json::array());
        for (std::size_t i = 0; i < arcs.size(); ++i) {
            line(out, i == 0 ? "target region" : "", text_of(arcs[i]));
        }
        if (arcs.empty())
            line(out, "target region", "empty: no real point satisfies the conditions");
    }
    if (r.contains("hit")) {
        const auto& hit = r["hit"];
        if (hit.is_null()) {
            line(out, "first hit", "none found");
        } else {
            std::string combination;
            const auto coeffs = hit.value("coeffs", nlohmann::json::array());
            for (std::size_t i = 0; i < coeffs.size(); ++i) {
                combination += fmt::format("{}{}*P{}", i ? " + " : "", text_of(coeffs[i]), i + 1);
            }
            const auto translate = hit.value("translate", nlohmann::json());
            bool torsion_only = true;
            for (const auto& c : coeffs) torsion_only = torsion_only && text_of(c) == "0";
            combination = torsion_only ? "T = " + point_text(translate) + " (a torsion point)"
                                       : combination + " + T, T = " + point_text(translate);
            line(out, "first hit", combination);
        }
    }
    if (r.contains("canonical_height")) {
        line(out, "canonical height", text_of(r["canonical_height"]) + "  (of the hit)");
    }
    if (r.contains("digits") && r["digits"].is_array()) {
        std::string digits;
        const char* names[] = {"a", "b", "c"};
        for (std::size_t i = 0; i < r["digits"].size() && i < 3; ++i) {
            digits += fmt::format("{}{}: {}", i ? ", " : "", names[i], text_of(r["digits"][i]));
        }
        line(out, "digits", digits);
    }
    if (r.contains("lead") && r["lead"].is_array()) {
        const char* names[] = {"a", "b", "c"};
        for (std::size_t i = 0; i < r["lead"].size() && i < 3; ++i) {
            line(out, i == 0 ? "leading digits" : "",
                 fmt::format("{}: {}...", names[i], text_of(r["lead"][i])));
        }
    }
    if (r.contains("solution") && r["solution"].is_array()) {
        const char* names[] = {"a", "b", "c"};
        for (std::size_t i = 0; i < r["solution"].size() && i < 3; ++i) {
            line(out, i == 0 ? "solution" : "",
                 fmt::format("{} = {}", names[i], shortened(text_of(r["solution"][i]), 200)));
        }
    }
    if (r.contains("solution_file")) line(out, "solution file", text_of(r["solution_file"]));
    if (r.contains("verified")) {
        line(out, "verified",
             r["verified"].is_boolean() && r["verified"].get<bool>()
                 ? "yes: the integers satisfy the equation exactly"
                 : text_of(r["verified"]));
    }
    if (r.contains("proven") && r["proven"].is_array()) {
        for (std::size_t i = 0; i < r["proven"].size(); ++i) {
            line(out, i == 0 ? "proven" : "", text_of(r["proven"][i]));
        }
    }
    if (r.contains("conditional") && r["conditional"].is_array()) {
        for (std::size_t i = 0; i < r["conditional"].size(); ++i) {
            line(out, i == 0 ? "not proven" : "", text_of(r["conditional"][i]));
        }
    }
    line(out, "settled", settled_completely(r) ? "yes" : "no");
    if (r.contains("error")) line(out, "error", text_of(r["error"]));
    if (r.contains("notes") && r["notes"].is_array()) {
        for (std::size_t i = 0; i < r["notes"].size(); ++i) {
            line(out, i == 0 ? "notes" : "", text_of(r["notes"][i]));
        }
    }
    if (r.contains("seconds") && r["seconds"].is_number()) {
        line(out, "time", fmt::format("{:.3f} s", r["seconds"].get<double>()));
    }
    return out;
}

}  // namespace arcsieve::survey
