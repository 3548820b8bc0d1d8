#include "survey/plot.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <stdexcept>

namespace arcsieve::survey {
namespace {

constexpr double width = 860, height = 600;
constexpr double left = 90, right = 230, top = 60, bottom = 70;  // legend on the right

std::string escape(const std::string& text) {
    std::string out;
    for (char ch : text) {
        switch (ch) {
            case '&':
                out += "&amp;";
                break;
            case '<':
                out += "&lt;";
                break;
            case '>':
                out += "&gt;";
                break;
            case '"':
                out += "&quot;";
                break;
            default:
                out += ch;
        }
    }
    return out;
}

// Maps data coordinates to the plot rectangle [x0, x1] × [y0, y1] in pixels.
struct Frame {
    double x_min, x_max, y_min, y_max;
    double px0, px1, py0, py1;  // pixel rectangle (py0 top)
    double px(double x) const { return px0 + (x - x_min) / (x_max - x_min) * (px1 - px0); }
    double py(double y) const { return py1 - (y - y_min) / (y_max - y_min) * (py1 - py0); }
    bool contains(double x, double y) const {
        return x >= x_min && x <= x_max && y >= y_min && y <= y_max;
    }
};

double nice_step(double span, int wanted) {
    const double raw = span / wanted;
    const double power = std::pow(10.0, std::floor(std::log10(raw)));
    for (double m : {1.0, 2.0, 5.0, 10.0}) {
        if (m * power >= raw) return m * power;
    }
    return 10 * power;
}

std::string number_label(double v) {
    if (v == 0) return "0";
    if (std::fabs(v) >= 1e5 || std::fabs(v) < 1e-3) return fmt::format("{:.1e}", v);
    return fmt::format("{:g}", v);
}

std::string header(const std::string& title) {
    return fmt::format(
        "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
        "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{0}\" height=\"{1}\" "
        "viewBox=\"0 0 {0} {1}\" font-family=\"Helvetica, Arial, sans-serif\">\n"
        "<title>{2}</title>\n"
        "<rect x=\"0\" y=\"0\" width=\"{0}\" height=\"{1}\" fill=\"white\"/>\n"
        "<text x=\"{3}\" y=\"32\" font-size=\"18\" text-anchor=\"middle\">{2}</text>\n",
        width, height, escape(title), width / 2);
}

// Axes with ticks; `log_y` labels ticks as powers of ten of the (log10) data coordinate.
std::string axes(const Frame& f, const std::string& x_label, const std::string& y_label,
                 bool log_y = false, bool log_x = false) {
    std::string out = "<g class=\"axes\" stroke=\"#333\" stroke-width=\"1\" fill=\"none\">\n";
    out += fmt::format("<rect x=\"{:.1f}\" y=\"{:.1f}\" width=\"{:.1f}\" height=\"{:.1f}\"/>\n",
                       f.px0, f.py0, f.px1 - f.px0, f.py1 - f.py0);
    out += "</g>\n<g class=\"ticks\" font-size=\"11\" fill=\"#333\">\n";
    auto ticks = [](double lo, double hi, bool log_scale) {
        std::vector<double> t;
        const double step =
            log_scale ? std::max(1.0, std::ceil((hi - lo) / 8)) : nice_step(hi - lo, 8);
        for (double v = std::ceil(lo / step) * step; v <= hi + 1e-9 * step; v += step)
            t.push_back(v);
        return t;
    };
    for (double v : ticks(f.x_min, f.x_max, log_x)) {
        const double x = f.px(v);
        out += fmt::format(
            "<line x1=\"{0:.1f}\" y1=\"{1:.1f}\" x2=\"{0:.1f}\" y2=\"{2:.1f}\" stroke=\"#333\"/>"
            "<text x=\"{0:.1f}\" y=\"{3:.1f}\" text-anchor=\"middle\">{4}</text>\n",
            x, f.py1, f.py1 + 5, f.py1 + 18,
            log_x ? fmt::format("1e{}", static_cast<long>(std::lround(v))) : number_label(v));
    }
    for (double v : ticks(f.y_min, f.y_max, log_y)) {
        const double y = f.py(v);
        out += fmt::format(
            "<line x1=\"{0:.1f}\" y1=\"{1:.1f}\" x2=\"{2:.1f}\" y2=\"{1:.1f}\" stroke=\"#333\"/>"
            "<text x=\"{3:.1f}\" y=\"{4:.1f}\" text-anchor=\"end\">{5}</text>\n",
            f.px0 - 5, y, f.px0, f.px0 - 8, y + 4,
            log_y ? fmt::format("1e{}", static_cast<long>(std::lround(v))) : number_label(v));
    }
    out += "</g>\n";
    out += fmt::format(
        "<text class=\"x-label\" x=\"{:.1f}\" y=\"{:.1f}\" font-size=\"14\" "
        "text-anchor=\"middle\">{}</text>\n",
        (f.px0 + f.px1) / 2, f.py1 + 44, escape(x_label));
    out += fmt::format(
        "<text class=\"y-label\" x=\"{0:.1f}\" y=\"{1:.1f}\" font-size=\"14\" "
        "text-anchor=\"middle\" transform=\"rotate(-90 {0:.1f} {1:.1f})\">{2}</text>\n",
        f.px0 - 62, (f.py0 + f.py1) / 2, escape(y_label));
    return out;
}

struct LegendEntry {
    std::string kind;  // "line", "thick", "dot", "star", "bar"
    std::string colour;
    std::string text;
};

std::string legend(const std::vector<LegendEntry>& entries, double x, double y) {
    std::string out = "<g class=\"legend\" font-size=\"12\">\n";
    out += fmt::format(
        "<rect x=\"{:.1f}\" y=\"{:.1f}\" width=\"{}\" height=\"{:.1f}\" fill=\"white\" "
        "stroke=\"#999\"/>\n",
        x, y, right - 20, 12 + 20.0 * entries.size());
    for (std::size_t i = 0; i < entries.size(); ++i) {
        const double ey = y + 18 + 20.0 * i;
        const auto& e = entries[i];
        if (e.kind == "line" || e.kind == "thick") {
            out += fmt::format(
                "<line x1=\"{:.1f}\" y1=\"{:.1f}\" x2=\"{:.1f}\" y2=\"{:.1f}\" stroke=\"{}\" "
                "stroke-width=\"{}\"/>\n",
                x + 8, ey - 4, x + 30, ey - 4, e.colour, e.kind == "thick" ? 5 : 1.5);
        } else if (e.kind == "bar") {
            out += fmt::format(
                "<rect x=\"{:.1f}\" y=\"{:.1f}\" width=\"22\" height=\"10\" "
                "fill=\"{}\"/>\n",
                x + 8, ey - 9, e.colour);
        } else if (e.kind == "dot" || e.kind == "star") {
            out += fmt::format(
                "<circle cx=\"{:.1f}\" cy=\"{:.1f}\" r=\"{}\" fill=\"{}\" "
                "stroke=\"black\" stroke-width=\"0.5\"/>\n",
                x + 19, ey - 4, e.kind == "star" ? 6 : 3.5, e.colour);
        }
        out +=
            fmt::format("<text x=\"{:.1f}\" y=\"{:.1f}\">{}</text>\n", x + 38, ey, escape(e.text));
    }
    return out + "</g>\n";
}

double to_double(const Rational& q) {
    return q.get_d();
}

// Cubic f(x) = x^3 + a2 x^2 + a4 x + a6 (a1 = a3 = 0) and its real roots, decreasing.
struct RealCubic {
    double a2, a4, a6;
    double operator()(double x) const { return ((x + a2) * x + a4) * x + a6; }
    std::vector<double> roots() const {
        // Bracket by the critical points, then bisect: robust for a picture.
        std::vector<double> out;
        const double disc = a2 * a2 - 3 * a4;
        std::vector<double> cuts;
        const double bound = 1 + std::max({std::fabs(a2), std::fabs(a4), std::fabs(a6)});
        cuts.push_back(-bound * 2);
        if (disc > 0) {
            cuts.push_back((-a2 - std::sqrt(disc)) / 3);
            cuts.push_back((-a2 + std::sqrt(disc)) / 3);
        }
        cuts.push_back(bound * 2);
        for (std::size_t i = 0; i + 1 < cuts.size(); ++i) {
            double lo = cuts[i], hi = cuts[i + 1];
            if ((*this)(lo) * (*this)(hi) > 0) continue;
            for (int k = 0; k < 200; ++k) {
                const double mid = (lo + hi) / 2;
                ((*this)(lo) * (*this)(mid) <= 0 ? hi : lo) = mid;
            }
            out.push_back((lo + hi) / 2);
        }
        std::sort(out.rbegin(), out.rend());
        return out;
    }
};

bool inside_target(const family::Target& target, double x, double y) {
    auto holds = [&](double sign) {
        for (const auto& c : target.conditions) {
            const double v =
                sign * (to_double(c.form.coefficient_x) * x + to_double(c.form.coefficient_y) * y +
                        to_double(c.form.coefficient_z));
            if (c.strict ? !(v > 0) : !(v >= 0)) return false;
        }
        return true;
    };
    return holds(1) || (target.projective && holds(-1));
}

}  // namespace

std::vector<Point> multiples_with_translate(const Curve& curve, const Point& p, const Point& t,
                                            std::size_t count) {
    std::vector<Point> out;
    Point multiple = Point::infinity();
    for (std::size_t n = 1; n <= count; ++n) {
        multiple = add(curve, multiple, p);
        out.push_back(add(curve, multiple, t));
    }
    return out;
}

std::string locus_svg(const LocusPicture& picture) {
    const Curve& e = picture.curve;
    if (e.a1 != 0 || e.a3 != 0) {
        throw std::invalid_argument("the locus picture needs a model with a1 = a3 = 0");
    }
    const RealCubic f{to_double(e.a2), to_double(e.a4), to_double(e.a6)};
    const auto roots = f.roots();
    if (roots.empty()) throw std::invalid_argument("the cubic has no real root");
    const double e1 = roots.front(), e3 = roots.back();
    const double span = std::max(1.0, e1 - e3);
    const double x_min = e3 - 0.08 * span;
    const double x_max = e1 + (roots.size() == 3 ? 0.35 * span : 2.0 * span);
    // Components sampled densely near the roots (where y changes fast).
    struct Sample {
        double x, y;
    };
    std::vector<std::vector<Sample>> branches;  // each a closed or open polyline
    auto sample_segment = [&](double a, double b, int count) {
        std::vector<double> xs;
        for (int i = 0; i <= count; ++i) {
            const double s = static_cast<double>(i) / count;
            const double w = (1 - std::cos(M_PI * s)) / 2;  // clusters at both ends
            xs.push_back(a + (b - a) * w);
        }
        return xs;
    };
    double y_extent = 1;
    // Each component as one polyline through both branches (y >= 0 out, y <= 0 back).
    auto component_polyline = [&](double a, double b, int count, bool closed) {
        std::vector<Sample> upper, lower;
        for (double x : sample_segment(a, b, count)) {
            const double y = std::sqrt(std::max(0.0, f(x)));
            upper.push_back({x, y});
            lower.push_back({x, -y});
            if (closed) y_extent = std::max(y_extent, y);
        }
        if (closed) {
            std::reverse(lower.begin(), lower.end());
            upper.insert(upper.end(), lower.begin() + 1, lower.end());
            return upper;
        }
        std::reverse(lower.begin(), lower.end());
        lower.insert(lower.end(), upper.begin() + 1, upper.end());
        return lower;
    };
    // The drawn locus needs few samples; the target test needs many, because arcs can be tiny
    // on this scale (they are drawn with round caps so that even a short one shows).
    branches.push_back(component_polyline(e1, x_max, 400, false));
    std::vector<std::vector<Sample>> dense{component_polyline(e1, x_max, 20000, false)};
    if (roots.size() == 3) {
        branches.push_back(component_polyline(e3, roots[1], 400, true));
        dense.push_back(component_polyline(e3, roots[1], 20000, true));
    }
    y_extent = std::max(y_extent, std::sqrt(std::max(0.0, f(x_max))) * 0.6);
    const Frame frame{x_min,         x_max, -1.15 * y_extent, 1.15 * y_extent, left,
                      width - right, top,   height - bottom};
    std::string out = header(picture.title);
    out += fmt::format(
        "<clipPath id=\"plot-area\"><rect x=\"{:.1f}\" y=\"{:.1f}\" width=\"{:.1f}\" "
        "height=\"{:.1f}\"/></clipPath>\n",
        frame.px0, frame.py0, frame.px1 - frame.px0, frame.py1 - frame.py0);
    out += axes(frame, "x", "y");
    std::size_t arc_pieces = 0, outside = 0;
    bool hit_drawn = false;
    // Draws locus, target arcs, multiples and the hit into `f`; the main view also counts.
    auto draw = [&](const Frame& f, const std::string& clip,
                    const std::vector<std::vector<Sample>>& locus, bool main_view) {
        std::string g = std::string("<g class=\"") + (main_view ? "main-view" : "zoom-view") +
                        "\" clip-path=\"url(#" + clip + ")\">\n";
        for (const auto& branch : locus) {
            std::string d;
            bool open = false;
            for (const auto& s : branch) {
                // Samples far outside the frame are dropped (the inset would get huge paths).
                const bool near =
                    s.x >= f.x_min - (f.x_max - f.x_min) && s.x <= f.x_max + (f.x_max - f.x_min);
                if (!near) {
                    open = false;
                    continue;
                }
                d += fmt::format("{}{:.2f},{:.2f} ", open ? "L" : "M", f.px(s.x), f.py(s.y));
                open = true;
            }
            g += "<path class=\"locus\" d=\"" + d + "\" fill=\"none\" stroke=\"#1f4e9c\" " +
                 "stroke-width=\"1.5\"/>\n";
        }
        if (picture.target) {
            for (const auto& branch : dense) {
                std::string d;
                bool open = false;
                std::string last;
                for (const auto& s : branch) {
                    if (inside_target(*picture.target, s.x, s.y)) {
                        const std::string here = fmt::format("{:.2f},{:.2f}", f.px(s.x), f.py(s.y));
                        if (!open) {
                            d += "M" + here + " L" + here + " ";  // a dot even for one sample
                            if (main_view) ++arc_pieces;
                        } else if (here != last) {
                            d += "L" + here + " ";
                        }
                        last = here;
                        open = true;
                    } else {
                        open = false;
                    }
                }
                if (!d.empty()) {
                    g += "<path class=\"target-arc\" d=\"" + d + "\" fill=\"none\" " +
                         "stroke=\"#e8590c\" stroke-width=\"5\" stroke-linecap=\"round\" " +
                         "opacity=\"0.85\"/>\n";
                }
            }
        }
        for (std::size_t i = 0; i < picture.marked.size(); ++i) {
            const Point& p = picture.marked[i];
            if (p.at_infinity) continue;
            const double x = to_double(p.x), y = to_double(p.y);
            if (!f.contains(x, y)) {
                if (main_view) ++outside;
                continue;
            }
            g += fmt::format(
                "<circle class=\"multiple\" cx=\"{:.2f}\" cy=\"{:.2f}\" r=\"3.5\" "
                "fill=\"#2b8a3e\" stroke=\"black\" stroke-width=\"0.5\"><title>n = "
                "{}</title></circle>\n",
                f.px(x), f.py(y), i + 1);
            if (picture.marked.size() <= 30 || !main_view) {
                g += fmt::format("<text x=\"{:.2f}\" y=\"{:.2f}\" font-size=\"10\">{}</text>\n",
                                 f.px(x) + 5, f.py(y) - 5, i + 1);
            }
        }
        if (picture.hit && !picture.hit->at_infinity) {
            const double x = to_double(picture.hit->x), y = to_double(picture.hit->y);
            if (f.contains(x, y)) {
                if (main_view) hit_drawn = true;
                g += fmt::format(
                    "<circle class=\"hit\" cx=\"{:.2f}\" cy=\"{:.2f}\" r=\"7\" fill=\"#c92a2a\" "
                    "stroke=\"black\" stroke-width=\"1\"><title>first hit</title></circle>\n",
                    f.px(x), f.py(y));
            }
        }
        return g + "</g>\n";
    };
    out += draw(frame, "plot-area", branches, true);
    // A zoom around the first hit: on this scale the hit and its arc can be a few pixels wide.
    if (hit_drawn) {
        const double hx = to_double(picture.hit->x), hy = to_double(picture.hit->y);
        double nearest = span;
        for (double r : roots) nearest = std::min(nearest, std::fabs(hx - r));
        const double dx = std::max({4 * nearest, 1e-9 * span, 1e-12});
        double dy = std::fabs(hy) * 2;
        for (const auto& branch : dense) {
            for (const auto& s : branch) {
                if (std::fabs(s.x - hx) <= dx) dy = std::max(dy, std::fabs(s.y - hy) * 1.1);
            }
        }
        dy = std::max(dy, 1e-12);
        const Frame zoom{hx - dx,
                         hx + dx,
                         hy - dy,
                         hy + dy,
                         width - right + 10,
                         width - 10,
                         height - bottom - 220,
                         height - bottom};
        if (zoom.x_max - zoom.x_min < 0.1 * (frame.x_max - frame.x_min)) {
            out += fmt::format(
                "<rect class=\"zoom-window\" x=\"{:.2f}\" y=\"{:.2f}\" width=\"{:.2f}\" "
                "height=\"{:.2f}\" fill=\"none\" stroke=\"#555\" stroke-dasharray=\"3,2\"/>\n",
                frame.px(zoom.x_min) - 4, frame.py(std::min(zoom.y_max, frame.y_max)) - 4,
                frame.px(zoom.x_max) - frame.px(zoom.x_min) + 8,
                frame.py(std::max(zoom.y_min, frame.y_min)) -
                    frame.py(std::min(zoom.y_max, frame.y_max)) + 8);
            out += fmt::format(
                "<clipPath id=\"zoom-area\"><rect x=\"{:.1f}\" y=\"{:.1f}\" width=\"{:.1f}\" "
                "height=\"{:.1f}\"/></clipPath>\n<rect class=\"zoom\" x=\"{:.1f}\" y=\"{:.1f}\" "
                "width=\"{:.1f}\" height=\"{:.1f}\" fill=\"white\" stroke=\"#333\"/>\n",
                zoom.px0, zoom.py0, zoom.px1 - zoom.px0, zoom.py1 - zoom.py0, zoom.px0, zoom.py0,
                zoom.px1 - zoom.px0, zoom.py1 - zoom.py0);
            out += draw(zoom, "zoom-area", dense, false);
            out += fmt::format(
                "<text x=\"{:.1f}\" y=\"{:.1f}\" font-size=\"11\">zoom: x in [{}, {}]</text>\n"
                "<text x=\"{:.1f}\" y=\"{:.1f}\" font-size=\"11\">y in [{}, {}]</text>\n",
                zoom.px0, zoom.py0 - 20, number_label(zoom.x_min), number_label(zoom.x_max),
                zoom.px0, zoom.py0 - 6, number_label(zoom.y_min), number_label(zoom.y_max));
        }
    }
    std::vector<LegendEntry> entries{{"line", "#1f4e9c", "real locus E(R)"}};
    if (picture.target) {
        entries.push_back({"thick", "#e8590c",
                           arc_pieces ? "target arc (solutions)" : "target arc: none in view"});
    }
    if (!picture.marked.empty()) {
        entries.push_back(
            {"dot", "#2b8a3e",
             fmt::format("{}, n = 1..{}", picture.marked_label, picture.marked.size())});
        if (outside)
            entries.push_back({"text", "white", fmt::format("  ({} outside the view)", outside)});
    }
    if (picture.hit) {
        entries.push_back({"star", "#c92a2a",
                           picture.hit_index
                               ? fmt::format("first hit, n = {}{}", picture.hit_index,
                                             hit_drawn ? "" : " (not drawn)")
                               : std::string(hit_drawn ? "first hit" : "first hit (not drawn)")});
    }
    out += legend(entries, width - right + 10, top);
    out += "</svg>\n";
    return out;
}

std::string survey_svg(const std::vector<nlohmann::json>& records, const std::string& title) {
    struct Row {
        double N, digits;
    };
    std::vector<Row> rows;
    std::vector<double> indices;
    std::size_t without_hit = 0, failed = 0;
    for (const auto& r : records) {
        if (r.value("status", "ok") != "ok") {
            ++failed;
            continue;
        }
        double N = 0;
        if (r.contains("N")) {
            N = r["N"].is_number() ? r["N"].get<double>() : std::stod(r["N"].get<std::string>());
        }
        const auto digits = r.value("digits", nlohmann::json());
        if (digits.is_array() && !digits.empty()) {
            double most = 0;
            for (const auto& d : digits) {
                if (d.is_number()) most = std::max(most, d.get<double>());
            }
            if (most > 0) rows.push_back({N, most});
        }
        const auto hit = r.value("hit", nlohmann::json());
        if (hit.is_object() && hit.contains("coeffs")) {
            double index = 0;
            for (const auto& c : hit["coeffs"]) {
                const double v = c.is_number() ? c.get<double>() : std::stod(c.get<std::string>());
                index = std::max(index, std::fabs(v));
            }
            if (index >= 1) indices.push_back(index);
        } else {
            ++without_hit;
        }
    }
    std::string out = header(title);
    // Left panel: digits against N.
    const double mid = left + (width - right - left) / 2;
    double n_min = 0, n_max = 1, d_max = 1;
    for (const auto& row : rows) {
        n_max = std::max(n_max, row.N);
        d_max = std::max(d_max, row.digits);
    }
    if (!rows.empty()) {
        n_min = rows.front().N;
        for (const auto& row : rows) n_min = std::min(n_min, row.N);
    }
    const Frame digits_frame{std::max(0.0, n_min - 2),
                             n_max + 2,
                             0,
                             std::max(1.0, std::ceil(std::log10(d_max) + 0.2)),
                             left,
                             mid - 40,
                             top,
                             height - bottom};
    out += axes(digits_frame, "N", "digits of the smallest solution", true);
    out += "<g class=\"digits-points\">\n";
    for (const auto& row : rows) {
        out += fmt::format(
            "<circle class=\"solution-digits\" cx=\"{:.2f}\" cy=\"{:.2f}\" r=\"3\" "
            "fill=\"#1f4e9c\"><title>N = {}: {} digits</title></circle>\n",
            digits_frame.px(row.N), digits_frame.py(std::log10(row.digits)), row.N, row.digits);
    }
    out += "</g>\n";
    // Right panel: histogram of first-hit indices in bins [2^k, 2^(k+1)).
    double index_max = 1;
    for (double i : indices) index_max = std::max(index_max, i);
    const int bins = std::max(1, static_cast<int>(std::floor(std::log2(index_max))) + 1);
    std::vector<int> counts(bins, 0);
    for (double i : indices) {
        counts[std::min(bins - 1, static_cast<int>(std::floor(std::log2(i))))]++;
    }
    const int most = std::max(1, *std::max_element(counts.begin(), counts.end()));
    const Frame index_frame{0,        std::log10(std::pow(2.0, bins)),
                            0,        most * 1.15,
                            mid + 60, width - right,
                            top,      height - bottom};
    out += axes(index_frame, "first-hit index (largest |coefficient|)", "problems", false, true);
    out += "<g class=\"index-bars\">\n";
    for (int k = 0; k < bins; ++k) {
        const double x0 = index_frame.px(k * std::log10(2.0));
        const double x1 = index_frame.px((k + 1) * std::log10(2.0));
        const double y = index_frame.py(counts[k]);
        out += fmt::format(
            "<rect class=\"index-bin\" x=\"{:.2f}\" y=\"{:.2f}\" width=\"{:.2f}\" "
            "height=\"{:.2f}\" fill=\"#e8590c\"><title>index {}..{}: {}</title></rect>\n",
            x0 + 1, y, std::max(0.5, x1 - x0 - 2), index_frame.py(0) - y, 1L << k,
            (1L << (k + 1)) - 1, counts[k]);
    }
    out += "</g>\n";
    std::vector<LegendEntry> entries{
        {"dot", "#1f4e9c", fmt::format("digits, {} problems", rows.size())},
        {"bar", "#e8590c", fmt::format("hit index, {} hits", indices.size())},
        {"text", "white", fmt::format("{} with no hit", without_hit)},
        {"text", "white", fmt::format("{} failed or timed out", failed)}};
    out += legend(entries, width - right + 10, top);
    out += "</svg>\n";
    return out;
}

}  // namespace arcsieve::survey
