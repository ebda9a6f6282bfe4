#include "optimize/run_report.h"

#include <cmath>
#include <sstream>
#include <utility>
#include <vector>

#include "optimize/run_text.h"

namespace fulmar::optimize {
namespace {

using run_text::fixed;
using run_text::g6;

}  // namespace

std::string report_markdown(const Case& c, const RunSummary& summary, const SearchResult& r,
                            const VerifiedOptimum& v, const std::string& baseline_name,
                            const std::string& evaluator_description, const std::string& caution) {
  const int failed = summary.search.failed_evaluations;
  const double cd0 = summary.baseline.weighted_cd;
  const double cd1 = summary.optimized.weighted_cd;
  std::ostringstream m;
  m << "# " << c.name << ": section design report\n\n";
  if (!caution.empty()) m << "> **" << caution << "**\n\n";
  if (!c.description.empty()) m << c.description << "\n\n";
  m << "## Airplane and design conditions\n\n";
  if (c.airplane)
    m << "Mass " << fixed(c.airplane->mass, 1) << " kg, wing area "
      << fixed(c.airplane->wing_area, 2) << " m², mean chord " << fixed(c.airplane->chord, 3)
      << " m.\n\n";
  m << "| point | cl | Re | M | weight | flight |\n|---|---|---|---|---|---|\n";
  for (const auto& p : c.points)
    m << "| " << p.name << " | " << fixed(p.cl, 3) << " | " << g6(p.reynolds, 3) << " | "
      << fixed(p.mach, 3) << " | " << g6(p.weight, 3) << " | "
      << (p.from_airplane ? fixed(p.speed, 1) + " m/s at " + fixed(p.altitude, 0) + " m"
                          : std::string("given"))
      << " |\n";
  if (c.landing.present)
    m << "\nLanding: Re " << g6(c.landing.reynolds, 3) << ", M " << fixed(c.landing.mach, 3)
      << (std::isnan(c.landing.stall_speed)
              ? std::string("")
              : ", stall speed " + fixed(c.landing.stall_speed, 1) + " m/s")
      << "; section cl_max required " << fixed(c.constraints.cl_max_min, 3) << ".\n";
  m << "\nTransition scenarios:";
  for (const auto& s : c.scenarios)
    m << " " << s.name << " (N " << g6(s.ncrit, 3) << ", trips " << g6(s.trip_upper, 3) << "/"
      << g6(s.trip_lower, 3) << ", weight " << g6(s.weight, 3) << ");";
  m << "\n\n## Result\n\n";
  m << (v.feasible ? "The optimized section meets every constraint in the verification analysis."
                   : "**The optimized section does NOT meet every constraint in the verification "
                     "analysis.**")
    << " Search: " << to_string(c.optimizer.algorithm) << ", " << r.history.size() << " analyses ("
    << failed << " failed), " << r.reason << (r.interrupted ? " (interrupted)" : "")
    << ". Verification with " << c.analysis.verify_panels
    << " panels (search: " << c.analysis.panels << "). Analysis: " << evaluator_description << ".";
  if (v.kept_start)
    m << " No design of the search verified feasible and better than the start, which is "
         "therefore the result.";
  else if (v.candidates.size() > 1 && v.feasible)
    m << " The " << v.candidates.size() - 1
      << " better design(s) of the search did not meet every constraint when verified; the "
         "result is the best one that did.";
  else if (v.candidates.size() > 1)
    m << " None of the " << v.candidates.size()
      << " best designs of the search met every constraint when verified; the best is shown.";
  m << "\n\n";
  m << "| point | section | alpha (deg) | cl | cd | cm c/4 | transition up / low "
       "|\n|---|---|---|---|---|---|---|\n";
  for (int k = 0; k < 2; ++k) {
    for (const auto& p : (k == 0 ? v.baseline : v.optimum).detail.points) {
      const PointResult& q = p.result;
      m << "| " << p.point;
      if (c.scenarios.size() > 1) m << "/" << p.scenario;
      m << " | " << (k == 0 ? "baseline" : "optimized") << " | " << fixed(q.alpha_deg, 2) << " | "
        << fixed(q.cl, 3) << " | " << fixed(q.cd, 5) << " | " << fixed(q.cm, 4) << " | "
        << fixed(q.transition_upper, 3) << " / " << fixed(q.transition_lower, 3) << " |\n";
    }
  }
  m << "\nWeighted cd: baseline " << fixed(cd0, 5) << ", optimized " << fixed(cd1, 5);
  if (std::isfinite(cd0) && std::isfinite(cd1) && cd0 > 0)
    m << " (" << fixed(100 * (1 - cd1 / cd0), 1) << " % less)";
  m << ".\n\nGeometry: baseline " << baseline_name << " t/c "
    << fixed(summary.baseline.geometry.thickness, 4) << "; optimized t/c "
    << fixed(summary.optimized.geometry.thickness, 4) << " at x/c "
    << fixed(summary.optimized.geometry.thickness_x, 3) << ", camber "
    << fixed(summary.optimized.geometry.camber, 4) << ".\n\n";
  m << "## Constraints (verification)\n\n| constraint | value | limit | met "
       "|\n|---|---|---|---|\n";
  for (const ConstraintRecord& k : summary.constraints)
    m << "| " << k.name << " | "
      << (std::isfinite(k.value) ? g6(k.value, 5) : std::string("(analysis failed)")) << " | "
      << (k.is_min ? ">= " : "<= ") << g6(k.limit, 5) << " | " << (k.satisfied ? "yes" : "**no**")
      << " |\n";
  if (c.outputs.plots) {
    m << "\n## Plots\n\n";
    for (const auto& [file, title] : std::vector<std::pair<std::string, std::string>>{
             {"sections.svg", "Sections, thickness and camber"},
             {"polars.svg", "Drag polars"},
             {"lift_moment.svg", "Lift and moment"},
             {"cp_cruise.svg", "Pressure at the first design point"},
             {"convergence.svg", "Convergence"}})
      m << "![" << title << "](" << file << ")\n\n";
  }
  m << "## Files\n\nCoordinates for CAD: `optimized.dat` (plain text) and `optimized.csv`, "
    << c.outputs.points
    << " points; CST description: `optimized_cst.json`; polars: `polar_baseline.csv`, "
       "`polar_optimized.csv`; "
       "every analysis: `history.csv`; all figures: `summary.json`.\n\n";
  m << "## Cautions\n\nThese are two-dimensional section estimates from a numerical model (panel "
       "method with an "
       "integral boundary layer). Three-dimensional effects, surface quality, contamination and "
       "manufacturing "
       "tolerances change the real drag and maximum lift.\n";
  if (!caution.empty()) m << "\n" << caution << "\n";
  return m.str();
}

}  // namespace fulmar::optimize
