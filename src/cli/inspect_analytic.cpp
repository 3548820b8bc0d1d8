// Placeholder until the analytic layer lands: adds nothing. (Owned by the analytic layer.)
#include "cli/commands.hpp"

namespace arcsieve::cli {

void inspect_analytic(const Curve&, const std::vector<Point>&, unsigned, nlohmann::json&,
                      std::ostream&) {}

}  // namespace arcsieve::cli
