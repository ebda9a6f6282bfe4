#include "optimize/run_polars.h"

#include <cmath>

#include "solvers/viscous/polar_csv.h"

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

std::string polar_csv(const std::vector<PolarCondition>& conds, const SectionPolars& polars,
                      const std::string& section_name) {
  std::vector<viscous::PolarCsvRow> rows;
  for (size_t k = 0; k < conds.size(); ++k) {
    for (const auto& p : polars.per_condition[k]) {
      viscous::PolarCsvRow r;
      r.re = conds[k].flow.reynolds;
      r.mach = conds[k].flow.mach;
      r.alpha = p.alpha_deg;
      r.cl = p.cl;
      r.cd = p.cd;
      r.cd_friction = p.cd_friction;
      r.cd_pressure = p.cd_pressure;
      r.cm = p.cm;
      r.transition_upper = p.transition_upper;
      r.transition_lower = p.transition_lower;
      r.converged = p.converged;
      r.iterations = p.iterations;
      r.section = section_name;
      r.condition = conds[k].name;
      rows.push_back(r);
    }
  }
  return viscous::polar_csv(rows);
}

}  // namespace fulmar::optimize
