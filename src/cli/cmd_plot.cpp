// `arcsieve plot`: SVG pictures of one problem (real locus, target arc, n·P + T up to the hit)
// or of a survey directory (digits against N, first-hit indices).
#include <fmt/format.h>

#include <fstream>
#include <iostream>
#include <memory>

#include "cli/commands.hpp"
#include "family/ratio_sum.hpp"
#include "survey/job.hpp"
#include "survey/journal.hpp"
#include "survey/plot.hpp"
#include "survey/runner.hpp"

namespace arcsieve::cli {
namespace {

struct PlotArguments {
    ProblemOptions problem;
    std::string survey_dir;
    std::string record_file;
    std::string out;
    std::size_t points = 60;
};

const char* plot_footer = R"(DESCRIPTION
  For one problem: the real locus of its curve, the target arc (where the positive solutions
  lie) drawn thick, the points n*P + T for n = 1, 2, ... up to the first hit (at most --points
  of them) and the hit itself. The job is run first unless --record gives a record written by
  `arcsieve solve --json`.
  For a survey directory: the digit count of the smallest solution against N on a log scale,
  and a histogram of the first-hit indices in bins [2^k, 2^(k+1)).

EXAMPLES
  The built-in problem (ratio-sum, N = 14):
    arcsieve plot --out n14.svg
  From a saved record:
    arcsieve solve --N 22 --json > n22.json
    arcsieve plot --N 22 --record n22.json --out n22.svg
  A survey:
    arcsieve survey --N 16..96 --step 2 --out runs/even-16-96
    arcsieve plot --survey runs/even-16-96 --out even-16-96.svg
)";

Point point_from_record(const Curve& curve, const nlohmann::json& value) {
    if (value.is_null()) return Point::infinity();
    if (!value.is_array() || value.size() != 2 || !value[0].is_string() || !value[1].is_string()) {
        throw InputError("a point in the record is not [\"x\",\"y\"]");
    }
    return parse_point(curve, value[0].get<std::string>() + "," + value[1].get<std::string>());
}

void write_text(const std::string& path, const std::string& text) {
    std::ofstream out(path, std::ios::binary);
    if (!out) throw InputError("cannot write '" + path + "'");
    out << text;
    if (!out.flush()) throw InputError("cannot write '" + path + "'");
}

}  // namespace

void register_plot(CLI::App& app, Context& context) {
    auto* command = app.add_subcommand("plot", "SVG pictures of a problem or of a survey");
    auto args = std::make_shared<PlotArguments>();
    add_problem_options(*command, args->problem);
    command->add_option("--survey", args->survey_dir, "a survey directory to summarise");
    command->add_option("--record", args->record_file, "a record from `solve --json`");
    command->add_option("--out", args->out, "the SVG file to write")->required();
    command->add_option("--points", args->points, "most multiples n*P + T drawn")
        ->capture_default_str();
    command->footer(plot_footer);
    command->callback([args, &context]() {
        if (!args->survey_dir.empty()) {
            if (!args->problem.family.empty() || !args->problem.N.empty() ||
                !args->problem.curve.empty() || !args->record_file.empty()) {
                throw InputError("--survey draws a whole survey: give no problem or record");
            }
            const std::string results = args->survey_dir + "/" + survey::results_file;
            const std::string journal = args->survey_dir + "/" + survey::journal_file;
            auto contents = survey::read_journal(results);
            if (contents.records.empty()) contents = survey::read_journal(journal);
            if (contents.records.empty()) {
                throw InputError("'" + args->survey_dir + "' holds no survey records");
            }
            write_text(args->out,
                       survey::survey_svg(contents.records, "Survey " + args->survey_dir));
            std::cout << fmt::format("wrote {} ({} records)\n", args->out, contents.records.size());
            context.exit_code = 0;
            return;
        }
        if (args->points > 2000) throw InputError("--points must be at most 2000");
        ProblemOptions options = args->problem;
        if (options.family.empty() && options.N.empty() && options.curve.empty()) {
            options.family = "ratio-sum";
            options.N = "14";
        } else if (options.family.empty() && !options.N.empty()) {
            options.family = "ratio-sum";
        }
        const Problem problem = resolve_problem(options);
        nlohmann::json record;
        if (!args->record_file.empty()) {
            try {
                record = nlohmann::json::parse(survey::read_file(args->record_file));
            } catch (const nlohmann::json::parse_error&) {
                throw InputError("'" + args->record_file + "' is not a JSON record");
            }
            if (record.value("curve", nlohmann::json()) != curve_record(problem.curve)) {
                throw InputError("the record in '" + args->record_file +
                                 "' is for another curve than the problem given");
            }
        } else {
            ProblemSpec spec;
            spec.family = problem.family;
            spec.N = problem.N;
            if (problem.family.empty()) spec.curve = problem.curve;
            JobOptions job;
            job.materialise = false;
            record = run_problem(spec, job);
        }
        survey::LocusPicture picture;
        const Curve& curve = problem.curve;
        picture.curve = curve;
        picture.title = problem.family.empty()
                            ? "E: " + to_string(curve)
                            : fmt::format("a/(b+c) + b/(c+a) + c/(a+b) = {}: the curve E_N",
                                          to_string(*problem.N));
        if (!problem.family.empty()) picture.target = family::ratio_sum_target(*problem.N);
        const auto generators = record.value("generators", nlohmann::json::array());
        const auto hit = record.value("hit", nlohmann::json());
        if (!generators.empty()) {
            const Point p = point_from_record(curve, generators[0]);
            Point translate = Point::infinity();
            std::size_t count = std::min<std::size_t>(args->points, 12);
            bool single_generator_hit = false;
            bool negative = false;
            if (hit.is_object() && hit.value("coeffs", nlohmann::json::array()).size() == 1) {
                translate = point_from_record(curve, hit.value("translate", nlohmann::json()));
                const auto n = hit["coeffs"][0];
                const long index = n.is_number() ? n.get<long>() : std::stol(n.get<std::string>());
                negative = index < 0;
                picture.hit_index = static_cast<std::size_t>(std::labs(index));
                count = std::min<std::size_t>(args->points, picture.hit_index);
                single_generator_hit = true;
            }
            const Point base = negative ? negate(curve, p) : p;
            picture.marked = survey::multiples_with_translate(curve, base, translate, count);
            picture.marked_label = translate.at_infinity ? "n·P" : "n·P + T";
            if (single_generator_hit && count == picture.hit_index && !picture.marked.empty()) {
                picture.hit = picture.marked.back();
            } else if (single_generator_hit) {
                picture.hit = Point::infinity();  // beyond the drawn multiples
            }
        }
        write_text(args->out, survey::locus_svg(picture));
        std::cout << fmt::format("wrote {}\n", args->out);
        context.exit_code = 0;
    });
}

}  // namespace arcsieve::cli
