#include "optimize/run_polars.h"

#include <cmath>

namespace fulmar::optimize {

std::vector<PolarCondition> polar_conditions(const Case& c) {
  std::vector<PolarCondition> out;
  const TransitionScenario& s = c.scenarios.front();
  for (const auto& p : c.points) {
    bool seen = false;
    for (const auto& o : out)
      if (std::abs(o.flow.reynolds - p.reynolds) <= 1e-6 * p.reynolds &&
          std::abs(o.flow.mach - p.mach) < 1e-6)
        seen = true;
    if (!seen)
      out.push_back(
          {p.name, FlowCondition{p.reynolds, p.mach, s.ncrit, s.trip_upper, s.trip_lower}, false});
  }
  if (c.landing.present)
    out.push_back(
        {"landing",
         FlowCondition{c.landing.reynolds, c.landing.mach, s.ncrit, s.trip_upper, s.trip_lower},
         true});
  return out;
}

std::vector<double> polar_angles(const AnalysisOptions& a) {
  std::vector<double> alphas;
  const int n =
      int(std::floor((a.polar_alpha_max - a.polar_alpha_min) / a.polar_alpha_step + 1e-9));
  for (int i = 0; i <= n; ++i) alphas.push_back(a.polar_alpha_min + i * a.polar_alpha_step);
  return alphas;
}

}  // namespace fulmar::optimize
