// Analytic part of `arcsieve inspect` (owned by the analytic layer): the period lattice and the
// number of real components of the curve, and for every given point its real component, its
// elliptic-log coordinate t ∈ [0, 1) and its canonical height, to the requested digits.
#include <string>

#include "analytic/height.hpp"
#include "cli/commands.hpp"

namespace arcsieve::cli {
namespace {

// `digits` significant digits; a quantity known only to be below 10^-digits in absolute value
// (the height of a torsion point, say) is printed as 0.
std::string decimal(const Real& value, unsigned digits) {
    if (abs(value) < pow(make_real(10, digits + 5), -static_cast<int>(digits))) return "0";
    return value.str(static_cast<std::streamsize>(digits));
}

}  // namespace

void inspect_analytic(const Curve& curve, const std::vector<Point>& points, unsigned digits,
                      nlohmann::json& record, std::ostream& text) {
    auto line = [&text](const std::string& label, const std::string& value) {
        text << label << std::string(label.size() < 22 ? 22 - label.size() : 1, ' ') << value
             << "\n";
    };
    const RealStructure real = real_structure(curve, digits);
    const std::string omega1 = decimal(real.real_period, digits);
    record["real_period"] = omega1;
    record["components"] = real.components;
    record["real_period_times_components"] =
        decimal(Real(real.real_period * real.components), digits);
    record["second_period"] = {decimal(real.imaginary_period_re, digits),
                               decimal(real.imaginary_period_im, digits)};
    line("real components", std::to_string(real.components) +
                                (real.components == 2 ? " (discriminant > 0: identity and egg)"
                                                      : " (discriminant < 0)"));
    line("real period", omega1 + " (least positive, of dx/(2y + a1 x + a3))");
    line("  times components", decimal(Real(real.real_period * real.components), digits));
    line("second period", decimal(real.imaginary_period_re, digits) + " + " +
                              decimal(real.imaginary_period_im, digits) + " i");

    auto analytic_points = nlohmann::json::array();
    for (std::size_t i = 0; i < points.size(); ++i) {
        const Point& p = points[i];
        const EllipticLog log = elliptic_log(curve, p, digits);
        const Real height = canonical_height(curve, p, digits);
        const std::string t_text = p.at_infinity ? "0" : decimal(log.t, digits);
        const std::string height_text = decimal(height, digits);
        analytic_points.push_back({{"component", log.component},
                                   {"elliptic_log", t_text},
                                   {"canonical_height", height_text}});
        line("point " + std::to_string(i + 1) + " analytic",
             std::string(log.component == 0 ? "identity component" : "egg") + ", t = " + t_text);
        line("  canonical height", height_text);
    }
    record["points"] = analytic_points;
}

}  // namespace arcsieve::cli
