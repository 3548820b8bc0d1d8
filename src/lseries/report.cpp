#include "lseries/report.hpp"

#include <fmt/format.h>

#include "lseries/special_values.hpp"

namespace arcsieve::lseries {

namespace {

std::string line(const std::string& label, const std::string& text) {
    return fmt::format("{:<18}{}", label, text);
}

std::string endpoint(const Interval& x, bool upper) {
    Real r(0, 40);
    if (upper)
        mpfi_get_right(r.backend().data(), x.backend().data());
    else
        mpfi_get_left(r.backend().data(), x.backend().data());
    return r.str(20, std::ios_base::scientific);
}

std::string value_name(const SpecialValue& v) {
    switch (v.order) {
        case 0:
            return "L(E,1)";
        case 1:
            return "L'(E,1)";
        case 2:
            return "L''(E,1)/2";
        default:
            return "L'''(E,1)/6";
    }
}

const char* proof_key(RankProof proof) {
    switch (proof) {
        case RankProof::rank_zero_kolyvagin:
            return "kolyvagin-rank-zero";
        case RankProof::rank_one_gross_zagier_kolyvagin:
            return "gross-zagier-kolyvagin-rank-one";
        case RankProof::none:
            break;
    }
    return "none";
}

}  // namespace

std::vector<std::string> report_lines(const AnalyticReport& report) {
    std::vector<std::string> lines;
    const AnalyticRank& r = report.rank;
    lines.push_back(line("root number", r.root_number ? fmt::format("{:+d} ({})", *r.root_number,
                                                                    r.root_number_reason)
                                                      : "unknown (" + r.root_number_reason + ")"));
    for (const auto& v : r.values) {
        lines.push_back(line(value_name(v), format_enclosure(v.value, 18) +
                                                (v.condition.empty() ? "" : "  " + v.condition)));
    }
    if (r.proven_rank) {
        lines.push_back(
            line("analytic rank", fmt::format("{} proven: {}", *r.proven_rank, r.proof_reason)));
    } else if (r.root_number) {
        lines.push_back(line("analytic rank",
                             fmt::format(">= {} only (the enclosure at the order used contains "
                                         "0; not claimed)",
                                         r.analytic_rank_lower)));
    }
    if (report.predicted_generator_height) {
        lines.push_back(
            line("predicted height", fmt::format("ĥ(P)·|Sha| = {:.10g} (conditional on BSD)",
                                                 *report.predicted_generator_height)));
    }
    if (report.heegner) {
        lines.push_back(line(
            "Heegner point",
            fmt::format("D = {}, index {}, {} digits, {} terms, {:.1f} s; "
                        "verified exactly on the curve",
                        report.heegner->discriminant, report.heegner->index, report.heegner->digits,
                        report.heegner->terms, report.heegner->seconds)));
    }
    for (const auto& note : report.notes) lines.push_back(line("analytic note", note));
    for (const auto& note : r.notes) lines.push_back(line("analytic note", note));
    return lines;
}

nlohmann::json to_json(const AnalyticReport& report) {
    const AnalyticRank& r = report.rank;
    nlohmann::json j;
    j["conductor"] = to_string(r.conductor);
    j["root_number"] = r.root_number ? nlohmann::json(*r.root_number) : nlohmann::json(nullptr);
    j["root_number_from"] = r.root_number_reason;
    nlohmann::json local = nlohmann::json::array();
    for (const auto& l : r.local_root_numbers) {
        local.push_back({{"prime", l.prime},
                         {"sign", l.value ? nlohmann::json(*l.value) : nlohmann::json(nullptr)},
                         {"rule", l.rule}});
    }
    j["local_signs"] = local;
    nlohmann::json values = nlohmann::json::array();
    for (const auto& v : r.values) {
        values.push_back({{"derivative_order", v.order},
                          {"divided_by_factorial", true},
                          {"lower", endpoint(v.value, false)},
                          {"upper", endpoint(v.value, true)},
                          {"assumes", v.condition.empty() ? nlohmann::json(nullptr)
                                                          : nlohmann::json(v.condition)}});
    }
    j["central_values"] = values;
    j["proven_rank"] = r.proven_rank ? nlohmann::json(*r.proven_rank) : nlohmann::json(nullptr);
    j["rank_theorem"] = proof_key(r.proof);
    j["rank_reason"] = r.proof_reason;
    j["vanishing_order_at_least"] = r.analytic_rank_lower;
    j["series_terms"] = r.terms;
    if (report.predicted_generator_height) {
        j["bsd_height_times_sha"] = *report.predicted_generator_height;
        j["bsd_height_is_conditional"] = true;
    }
    if (report.heegner) {
        j["heegner"] = {
            {"discriminant", report.heegner->discriminant},
            {"index", report.heegner->index},
            {"lattice_multiplier", report.heegner->multiplier},
            {"digits", report.heegner->digits},
            {"terms", report.heegner->terms},
            {"seconds", report.heegner->seconds},
            {"point", {to_string(report.heegner->point.x), to_string(report.heegner->point.y)}}};
    }
    nlohmann::json notes = nlohmann::json::array();
    for (const auto& n : report.notes) notes.push_back(n);
    for (const auto& n : r.notes) notes.push_back(n);
    j["notes"] = notes;
    return j;
}

}  // namespace arcsieve::lseries
