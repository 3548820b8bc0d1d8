#include "locate/first_hit.hpp"

#include <fmt/format.h>
#include <tbb/parallel_for.h>

#include <algorithm>
#include <cmath>
#include <set>
#include <sstream>

#include "locate/rotation.hpp"
#include "region/interval_ops.hpp"

namespace arcsieve::locate {

using arcsieve::to_string;  // not hidden by to_string(SearchOutcome)

namespace {

using region::Membership;

struct LogData {
    region::Region region;
    std::vector<region::LogEnclosure> generators;  // t(P_i)
    std::vector<region::LogEnclosure> torsion;     // t(T_j)
};

LogData log_data(const family::Target& target, const std::vector<Point>& generators,
                 const std::vector<Point>& torsion, unsigned digits) {
    LogData data{region::target_region(target, digits), {}, {}};
    for (const Point& p : generators)
        data.generators.push_back(log_enclosure(data.region.model, p));
    for (const Point& t : torsion) data.torsion.push_back(log_enclosure(data.region.model, t));
    return data;
}

unsigned decimal_digits_of(const Integer& n) {
    return static_cast<unsigned>(decimal_digits(n));
}

struct Verdict {
    Membership membership = Membership::undecided;
    bool exactly = false;
    int component = 0;
    Interval t;
};

// Membership of Σ n_i P_i + T_j: certified enclosure first, exact arithmetic as the fallback.
Verdict verify(const LogData& data, const family::Target& target,
               const std::vector<Point>& generators, const std::vector<Point>& torsion,
               const std::vector<Integer>& n, std::size_t j, unsigned max_exact_index) {
    Verdict v;
    Interval t = data.torsion[j].t;
    int component = data.torsion[j].component;
    for (std::size_t i = 0; i < n.size(); ++i) {
        t = region::plus(t, region::times_integer(data.generators[i].t, n[i]));
        const Integer parity = abs(n[i]) % 2;
        if (parity != 0) component ^= data.generators[i].component;
    }
    v.component = component % 2;
    v.t = t;
    v.membership = region::classify(data.region, v.component, t);
    if (v.membership != Membership::undecided) return v;
    Integer largest(0);
    for (const Integer& c : n) largest = std::max(largest, Integer(abs(c)));
    if (largest > max_exact_index) return v;
    Point q = torsion[j];
    for (std::size_t i = 0; i < n.size(); ++i) {
        q = add(target.curve, q, multiply(target.curve, generators[i], n[i]));
    }
    v.membership = family::satisfies_exactly(target, q) ? Membership::inside : Membership::outside;
    v.exactly = true;
    return v;
}

// Rank one, one progression n = n0 + s·m (m >= 0, m <= m_max) with sign σ and translate j, one
// arc: the least m whose verified point is inside, or the first undecided m.
struct ProgressionResult {
    std::optional<Integer> hit, undecided;
    Verdict verdict;
};

ProgressionResult search_progression(const LogData& data, const family::Target& target,
                                     const std::vector<Point>& generators,
                                     const std::vector<Point>& torsion, int sigma, std::size_t j,
                                     const Integer& n0, const Integer& s, const Integer& m_max,
                                     const region::Arc& arc, const FirstHitOptions& options,
                                     std::size_t& candidates) {
    ProgressionResult result;
    const Interval& alpha = data.generators[0].t;
    RotationSearch search;
    search.step = region::times_integer(alpha, Integer(sigma * s));
    search.offset =
        region::plus(region::times_integer(alpha, Integer(sigma * n0)), data.torsion[j].t);
    search.arc_start = arc.start;
    search.arc_end = arc.end;
    search.whole_circle = arc.whole_component;
    search.max_index = m_max;
    search.linear = options.method == RankOneMethod::linear_scan;
    const RotationOutcome outcome = first_rotation_hit(search, [&](const Integer& m) {
        const Integer n = n0 + s * m;
        const Verdict v = verify(data, target, generators, torsion, {Integer(sigma * n)}, j,
                                 options.max_exact_index);
        if (v.membership == Membership::inside) {
            result.verdict = v;
            return CandidateVerdict::inside;
        }
        return v.membership == Membership::outside ? CandidateVerdict::outside
                                                   : CandidateVerdict::undecided;
    });
    candidates += outcome.candidates;
    if (outcome.hit) result.hit = n0 + s * *outcome.hit;
    if (outcome.undecided) result.undecided = n0 + s * *outcome.undecided;
    return result;
}

Hit make_hit(const std::vector<Integer>& n, std::size_t j, const std::vector<Point>& torsion,
             const Verdict& v, const FirstHitOptions& options) {
    Hit hit;
    hit.coefficients = n;
    hit.translate_index = j;
    hit.translate = torsion[j];
    hit.component = v.component;
    const double mid = region::midpoint_double(v.t);
    const long shift = static_cast<long>(std::floor(mid));
    hit.t = region::minus(v.t, region::interval_of(Rational(shift), region::precision_bits(v.t)));
    hit.t_approx = region::midpoint_double(hit.t);
    hit.decided_exactly = v.exactly;
    if (options.height_matrix) {
        const auto& h = *options.height_matrix;
        double value = 0;
        for (std::size_t a = 0; a < n.size(); ++a)
            for (std::size_t b = 0; b < n.size(); ++b)
                value += n[a].get_d() * h[a][b] * n[b].get_d();
        hit.canonical_height = value;
    }
    return hit;
}

std::string component_list(const std::set<int>& components) {
    std::string s;
    for (int c : components) s += (s.empty() ? "" : " and ") + std::to_string(c);
    return s;
}

// The component argument (DESIGN.md §2): the component of Σ n_i P_i + T is Σ n_i c(P_i) + c(T)
// mod 2, so only the components in `reachable` can ever be hit.
std::optional<FirstHitResult> component_argument(const LogData& data,
                                                 const FirstHitOptions& options) {
    FirstHitResult result;
    if (data.region.arcs.empty()) {
        result.outcome = SearchOutcome::no_region;
        result.notes.push_back(
            "no solution exists: no real point of the curve satisfies the conditions (the sign "
            "pattern was decided exactly on every stretch between boundary points)");
        return result;
    }
    bool generator_on_egg = false;
    for (const auto& g : data.generators) generator_on_egg |= g.component == 1;
    std::set<int> reachable;
    for (const auto& t : data.torsion) {
        reachable.insert(t.component);
        if (generator_on_egg) reachable.insert(1 - t.component);
    }
    std::set<int> needed;
    for (const auto& arc : data.region.arcs) needed.insert(arc.component);
    for (int c : needed) {
        if (reachable.count(c)) return std::nullopt;
    }
    result.outcome = SearchOutcome::unreachable;
    result.notes.push_back(
        "no solution in the subgroup generated by the given points: all of them lie on real "
        "component " +
        component_list(reachable) +
        " (0 = identity component, 1 = egg), so every "
        "combination does, while the region lies on component " +
        component_list(needed));
    result.notes.push_back(
        options.points_generate_modulo_2
            ? "the points generate E(Q)/2E(Q), so no solution exists at all (proof)"
            : "this proves that no solution exists only if the points generate E(Q) modulo "
              "2E(Q) (not established: it needs the rank proven, as many generators as the "
              "rank, and saturation at 2)");
    return result;
}

void check_inputs(const family::Target& target, const std::vector<Point>& generators,
                  std::vector<Point>& torsion, const FirstHitOptions& options) {
    for (const Point& p : generators) {
        if (!on_curve(target.curve, p)) {
            throw InputError("the generator " + to_string(p) + " is not on " +
                             to_string(target.curve));
        }
        Point q = p;
        for (int k = 1; k <= 12; ++k, q = add(target.curve, q, p)) {
            if (q.at_infinity) {
                throw InputError("the generator " + to_string(p) + " is a torsion point (order " +
                                 std::to_string(k) + ")");
            }
        }
    }
    for (const Point& t : torsion) {
        if (!on_curve(target.curve, t)) {
            throw InputError("the torsion point " + to_string(t) + " is not on the curve");
        }
        Point q = t;
        bool finite = false;
        for (int k = 1; k <= 12 && !finite; ++k, q = add(target.curve, q, t))
            finite = q.at_infinity;
        if (!finite) throw InputError("the translate " + to_string(t) + " is not a torsion point");
    }
    if (std::find(torsion.begin(), torsion.end(), Point::infinity()) == torsion.end()) {
        torsion.insert(torsion.begin(), Point::infinity());
    }
    if (options.index_bound < 1) throw InputError("the index bound must be at least 1");
    if (options.method == RankOneMethod::linear_scan &&
        options.index_bound > Integer("1099511627776")) {
        throw InputError("the linear scan is limited to index bounds up to 2^40");
    }
    if (options.height_matrix) {
        if (options.height_matrix->size() != generators.size()) {
            throw InputError("the height matrix does not match the number of generators");
        }
        lll_reduce_gram(*options.height_matrix);  // validates
    } else if (generators.size() > 1) {
        throw InputError("rank >= 2 needs the height matrix of the generators");
    }
}

// Torsion hits (n = 0) have height 0 and come before everything else.
std::vector<Hit> torsion_hits(const LogData& data, const family::Target& target,
                              const std::vector<Point>& torsion, std::size_t rank,
                              const FirstHitOptions& options) {
    std::vector<Hit> hits;
    for (std::size_t j = 0; j < torsion.size(); ++j) {
        if (!family::satisfies_exactly(target, torsion[j])) continue;
        Verdict v;
        v.membership = Membership::inside;
        v.exactly = true;
        v.component = data.torsion[j].component;
        v.t = data.torsion[j].t;
        hits.push_back(make_hit(std::vector<Integer>(rank, Integer(0)), j, torsion, v, options));
        hits.back().canonical_height = 0.0;  // exactly: ĥ vanishes on torsion points
    }
    return hits;
}

FirstHitResult rank_one(const family::Target& target, const std::vector<Point>& generators,
                        const std::vector<Point>& torsion, const FirstHitOptions& options) {
    FirstHitResult result;
    result.method = options.method == RankOneMethod::rotation ? "rotation" : "linear-scan";
    result.index_bound = options.index_bound;
    const unsigned base = options.digits + decimal_digits_of(options.index_bound) + 5;
    std::optional<Integer> pending;
    for (unsigned pass = 0; pass < 3; ++pass) {
        const unsigned digits = base << pass;
        const LogData data = log_data(target, generators, torsion, digits);
        result.digits = data.region.digits;
        if (auto why = component_argument(data, options)) {
            why->method = result.method;
            why->index_bound = options.index_bound;
            why->digits = result.digits;
            return *why;
        }
        if (auto hits = torsion_hits(data, target, torsion, 1, options); !hits.empty()) {
            result.outcome = SearchOutcome::found;
            result.hits = std::move(hits);
            return result;
        }
        std::optional<Integer> best, undecided;
        const int c_p = data.generators[0].component;
        for (int sigma : {1, -1}) {
            for (std::size_t j = 0; j < torsion.size(); ++j) {
                for (const region::Arc& arc : data.region.arcs) {
                    Integer n0(1), s(1);
                    if (c_p == 1) {
                        s = 2;
                        n0 = ((arc.component - data.torsion[j].component) % 2 + 2) % 2 == 1 ? 1 : 2;
                    } else if (arc.component != data.torsion[j].component) {
                        continue;
                    }
                    Integer limit = options.index_bound;
                    if (best) limit = std::min(limit, *best);
                    if (undecided) limit = std::min(limit, *undecided);
                    if (limit < n0) continue;
                    const Integer m_max = (limit - n0) / s;
                    const ProgressionResult r =
                        search_progression(data, target, generators, torsion, sigma, j, n0, s,
                                           m_max, arc, options, result.candidates);
                    if (r.hit && (!best || *r.hit < *best)) best = r.hit;
                    if (r.undecided && (!undecided || *r.undecided < *undecided)) {
                        undecided = r.undecided;
                    }
                }
            }
        }
        if (undecided && (!best || *undecided < *best)) {
            pending = undecided;
            continue;  // re-decide with twice the digits
        }
        if (!best) {
            result.outcome = SearchOutcome::none_within_bound;
            result.notes.push_back("no hit with |n| <= " + to_string(options.index_bound));
            return result;
        }
        // The least |n| and every (sign, translate) reaching the region with it: companions.
        for (int sigma : {1, -1}) {
            for (std::size_t j = 0; j < torsion.size(); ++j) {
                const std::vector<Integer> n{Integer(sigma * *best)};
                const Verdict v =
                    verify(data, target, generators, torsion, n, j, options.max_exact_index);
                ++result.candidates;
                if (v.membership == Membership::inside) {
                    result.hits.push_back(make_hit(n, j, torsion, v, options));
                } else if (v.membership == Membership::undecided) {
                    result.notes.push_back("companion n = " + to_string(n[0]) + " with translate " +
                                           to_string(torsion[j]) + " could not be decided");
                }
            }
        }
        result.outcome = SearchOutcome::found;
        return result;
    }
    result.outcome = SearchOutcome::undecided;
    result.notes.push_back("the candidate n = " + to_string(*pending) +
                           " lies on a region boundary to " + std::to_string(result.digits) +
                           " digits and is too large to decide exactly");
    return result;
}

FirstHitResult higher_rank(const family::Target& target, const std::vector<Point>& generators,
                           const std::vector<Point>& torsion, const FirstHitOptions& options) {
    FirstHitResult result;
    result.method = "lattice";
    const GramMatrix& gram = *options.height_matrix;
    double largest_diagonal = 0;
    for (std::size_t i = 0; i < gram.size(); ++i)
        largest_diagonal = std::max(largest_diagonal, gram[i][i]);
    const double bound = options.height_bound > 0 ? options.height_bound : 50 * largest_diagonal;
    result.height_bound = bound;
    for (unsigned pass = 0; pass < 3; ++pass) {
        const LogData data = log_data(target, generators, torsion, (options.digits + 10) << pass);
        result.digits = data.region.digits;
        if (auto why = component_argument(data, options)) {
            why->method = result.method;
            why->height_bound = bound;
            return *why;
        }
        if (auto hits = torsion_hits(data, target, torsion, generators.size(), options);
            !hits.empty()) {
            result.outcome = SearchOutcome::found;
            result.hits = std::move(hits);
            return result;
        }
        // Shells (previous, current] of the height form, each enumerated, tested in parallel
        // (TBB) and scanned in increasing height.
        double previous = 0;
        double shell = std::min(bound, std::max(largest_diagonal, 1e-12) * 1.0001);
        bool undecided_below = false;
        while (true) {
            std::vector<LatticeVector> vectors;
            for (LatticeVector& v : vectors_up_to(gram, shell)) {
                if (v.norm > previous * (1 + 1e-9) || previous == 0)
                    vectors.push_back(std::move(v));
            }
            const std::size_t per_vector = torsion.size();
            std::vector<Verdict> verdicts(vectors.size() * per_vector);
            tbb::parallel_for(std::size_t{0}, verdicts.size(), [&](std::size_t k) {
                const auto& v = vectors[k / per_vector];
                std::vector<Integer> n;
                for (auto c : v.coefficients) n.push_back(Integer(static_cast<long>(c)));
                verdicts[k] = verify(data, target, generators, torsion, n, k % per_vector,
                                     options.max_exact_index);
            });
            result.candidates += verdicts.size();
            std::optional<double> first_height;
            for (std::size_t k = 0; k < verdicts.size(); ++k) {
                const double h = vectors[k / per_vector].norm;
                if (first_height && h > *first_height * (1 + 1e-9)) break;
                if (verdicts[k].membership == Membership::undecided) {
                    undecided_below = true;
                    break;
                }
                if (verdicts[k].membership != Membership::inside) continue;
                first_height = first_height.value_or(h);
                std::vector<Integer> n;
                for (auto c : vectors[k / per_vector].coefficients)
                    n.push_back(Integer(static_cast<long>(c)));
                result.hits.push_back(make_hit(n, k % per_vector, torsion, verdicts[k], options));
            }
            if (undecided_below || !result.hits.empty() || shell >= bound) break;
            previous = shell;
            shell = std::min(bound, shell * 2);
        }
        if (undecided_below) {
            result.hits.clear();
            continue;
        }
        if (!result.hits.empty()) {
            result.outcome = SearchOutcome::found;
            result.notes.push_back("companions: hits whose heights agree to 1e-9 relative");
            return result;
        }
        result.outcome = SearchOutcome::none_within_bound;
        std::ostringstream note;
        note << "no hit with canonical height <= " << bound;
        result.notes.push_back(note.str());
        return result;
    }
    result.outcome = SearchOutcome::undecided;
    result.notes.push_back("a candidate lies on a region boundary to " +
                           std::to_string(result.digits) + " digits and could not be decided");
    return result;
}

// No generators: the subgroup is the torsion list, finite, and each point is decided exactly
// (satisfies_exactly evaluates the target's forms in exact rationals); nothing is skipped.
FirstHitResult torsion_only(const family::Target& target, const std::vector<Point>& torsion,
                            const FirstHitOptions& options) {
    FirstHitResult result;
    result.method = "torsion";
    const LogData data = log_data(target, {}, torsion, options.digits + 10);
    result.digits = data.region.digits;
    result.candidates = torsion.size();
    if (data.region.arcs.empty()) {
        result.outcome = SearchOutcome::no_region;
        result.notes.push_back(
            "no solution exists: no real point of the curve satisfies the conditions");
        return result;
    }
    result.hits = torsion_hits(data, target, torsion, 0, options);
    result.outcome = result.hits.empty() ? SearchOutcome::none_in_torsion : SearchOutcome::found;
    result.notes.push_back(
        fmt::format("all {} torsion points tested exactly; {} satisfy the "
                    "conditions",
                    torsion.size(), result.hits.size()));
    return result;
}

}  // namespace

std::string to_string(SearchOutcome outcome) {
    switch (outcome) {
        case SearchOutcome::found:
            return "found";
        case SearchOutcome::none_within_bound:
            return "none-within-bound";
        case SearchOutcome::none_in_torsion:
            return "none-in-torsion";
        case SearchOutcome::unreachable:
            return "unreachable";
        case SearchOutcome::no_region:
            return "no-region";
        case SearchOutcome::undecided:
            return "undecided";
    }
    return "unknown";
}

FirstHitResult first_hit(const family::Target& target, const std::vector<Point>& generators,
                         const std::vector<Point>& torsion_in, const FirstHitOptions& options) {
    std::vector<Point> torsion = torsion_in;
    check_inputs(target, generators, torsion, options);
    if (generators.empty()) return torsion_only(target, torsion, options);
    if (generators.size() == 1) return rank_one(target, generators, torsion, options);
    return higher_rank(target, generators, torsion, options);
}

}  // namespace arcsieve::locate
