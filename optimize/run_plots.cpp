#include "optimize/run_plots.h"

#include <algorithm>
#include <cmath>
#include <numbers>

#include "optimize/run_text.h"
#include "optimize/svg_plot.h"

namespace fulmar::optimize {
namespace {

using nlohmann::json;
using run_text::fixed;
using run_text::g6;

Chart section_chart(const CstShape& base, const CstShape& opt) {
  Chart c;
  c.title = "Sections";
  c.x_label = "x/c";
  c.y_label = "y/c";
  c.equal_aspect = true;
  c.height = 260;
  for (int k = 0; k < 2; ++k) {
    const Section s = cst_section(k == 0 ? base : opt, 121);
    Series se;
    se.label = k == 0 ? "baseline" : "optimized";
    se.colour = k == 0 ? kBaselineColour : kOptimizedColour;
    se.dashed = k == 0;
    for (Eigen::Index i = 0; i < s.points.rows(); ++i)
      se.x.push_back(s.points(i, 0)), se.y.push_back(s.points(i, 1));
    c.series.push_back(se);
  }
  return c;
}

Chart distribution_chart(const CstShape& base, const CstShape& opt, bool thickness) {
  Chart c;
  c.title = thickness ? "Thickness distribution" : "Camber distribution";
  c.x_label = "x/c";
  c.y_label = thickness ? "t/c" : "camber / c";
  c.height = 220;
  for (int k = 0; k < 2; ++k) {
    const CstShape& s = k == 0 ? base : opt;
    Series se;
    se.label = k == 0 ? "baseline" : "optimized";
    se.colour = k == 0 ? kBaselineColour : kOptimizedColour;
    se.dashed = k == 0;
    for (int i = 0; i <= 120; ++i) {
      const double x = 0.5 * (1 - std::cos(std::numbers::pi * i / 120));
      se.x.push_back(x);
      se.y.push_back(thickness ? cst_upper_y(s, x) - cst_lower_y(s, x)
                               : 0.5 * (cst_upper_y(s, x) + cst_lower_y(s, x)));
    }
    c.series.push_back(se);
  }
  return c;
}

Series polar_series(const std::vector<PointResult>& p, bool optimized, int what) {
  // what: 0 cd-cl, 1 alpha-cl, 2 alpha-cm
  Series s;
  s.label = optimized ? "optimized" : "baseline";
  s.colour = optimized ? kOptimizedColour : kBaselineColour;
  s.dashed = !optimized;
  for (const auto& r : p) {
    const double nan = std::nan("");
    const bool ok = r.converged;
    s.x.push_back(what == 0 ? (ok ? r.cd : nan) : r.alpha_deg);
    s.y.push_back(!ok ? nan : (what == 2 ? r.cm : r.cl));
  }
  return s;
}

}  // namespace

std::string sections_plot(const CstShape& baseline, const CstShape& optimized) {
  return svg_document({section_chart(baseline, optimized),
                       distribution_chart(baseline, optimized, true),
                       distribution_chart(baseline, optimized, false)});
}

PolarPlots polar_plots(const Case& c, const std::vector<PolarCondition>& conds,
                       const SectionPolars& base_p, const SectionPolars& opt_p,
                       const Evaluation& base_v, const Evaluation& opt_v) {
  std::vector<Chart> polar_charts, lift_charts;
  for (size_t k = 0; k < conds.size(); ++k) {
    Chart pc;
    pc.title = "Drag polar, " + conds[k].name + " (Re " + g6(conds[k].flow.reynolds, 3) + ")";
    pc.x_label = "cd";
    pc.y_label = "cl";
    pc.series = {polar_series(base_p.per_condition[k], false, 0),
                 polar_series(opt_p.per_condition[k], true, 0)};
    if (conds[k].landing && !std::isnan(c.constraints.cl_max_min))
      pc.guides.push_back({"cl_max required " + fixed(c.constraints.cl_max_min, 2),
                           c.constraints.cl_max_min, true});
    // Design points at this Reynolds number, as verified.
    for (int which = 0; which < 2; ++which) {
      Series dp;
      dp.label = which == 0 ? "" : "design points";
      dp.line = false;
      dp.markers = true;
      dp.colour = which == 0 ? kBaselineColour : kOptimizedColour;
      for (const auto& p : (which == 0 ? base_v : opt_v).detail.points)
        if (std::abs(p.reynolds - conds[k].flow.reynolds) <= 1e-6 * conds[k].flow.reynolds &&
            p.result.converged)
          dp.x.push_back(p.result.cd), dp.y.push_back(p.result.cl);
      if (!dp.x.empty()) pc.series.push_back(dp);
    }
    polar_charts.push_back(pc);
    Chart la;
    la.title = "Lift, " + conds[k].name + " (Re " + g6(conds[k].flow.reynolds, 3) + ")";
    la.x_label = "alpha (deg)";
    la.y_label = "cl";
    la.height = 260;
    la.series = {polar_series(base_p.per_condition[k], false, 1),
                 polar_series(opt_p.per_condition[k], true, 1)};
    Chart ma = la;
    ma.title = "Pitching moment about c/4, " + conds[k].name;
    ma.y_label = "cm";
    ma.series = {polar_series(base_p.per_condition[k], false, 2),
                 polar_series(opt_p.per_condition[k], true, 2)};
    if (!conds[k].landing && !std::isnan(c.points.front().cm_min))
      ma.guides.push_back({"cm limit", c.points.front().cm_min, true});
    lift_charts.push_back(la);
    lift_charts.push_back(ma);
  }
  return {svg_document(polar_charts), svg_document(lift_charts)};
}

std::string cp_plot(const Case& c, const SectionEvaluator& evaluator, const CstShape& baseline,
                    const CstShape& optimized) {
  Chart cp;
  const DesignPoint& cruise = c.points.front();
  const TransitionScenario& s0 = c.scenarios.front();
  cp.title = "Pressure at " + cruise.name + " (cl " + fixed(cruise.cl, 3) + ", Re " +
             g6(cruise.reynolds, 3) + ")";
  cp.x_label = "x/c";
  cp.y_label = "Cp";
  cp.flip_y = true;
  const FlowCondition f0{cruise.reynolds, cruise.mach, s0.ncrit, s0.trip_upper, s0.trip_lower};
  for (int k = 0; k < 2; ++k) {
    const Points p = evaluator.pressure(cst_section(k == 0 ? baseline : optimized, 161), f0,
                                        cruise.cl, c.analysis.verify_panels);
    Series se;
    se.label = k == 0 ? "baseline" : "optimized";
    se.colour = k == 0 ? kBaselineColour : kOptimizedColour;
    se.dashed = k == 0;
    for (Eigen::Index i = 0; i < p.rows(); ++i) se.x.push_back(p(i, 0)), se.y.push_back(p(i, 1));
    cp.series.push_back(se);
  }
  return svg_document({cp});
}

std::string convergence_plot(const SearchResult& r, double tol) {
  Chart conv;
  conv.title = "Convergence";
  conv.x_label = "evaluation";
  conv.y_label = "100 x weighted cd";
  Series all, best;
  all.label = "each analysis";
  all.line = false;
  all.markers = true;
  all.colour = "#9db4c8";
  best.label = "best feasible so far";
  best.colour = kOptimizedColour;
  double best_so_far = std::nan("");
  for (size_t k = 0; k < r.history.size(); ++k) {
    const Evaluation& e = r.history[k];
    all.x.push_back(double(k + 1));
    all.y.push_back(e.ok ? e.objective : std::nan(""));
    if (e.ok && worst_constraint(e) <= tol && !(e.objective >= best_so_far))
      best_so_far = e.objective;
    best.x.push_back(double(k + 1));
    best.y.push_back(best_so_far);
  }
  conv.series = {all, best};
  Chart viol;
  viol.title = "Worst scaled constraint (<= 0 is met)";
  viol.x_label = "evaluation";
  viol.y_label = "worst constraint";
  viol.height = 240;
  Series w;
  w.colour = "#1f4e79";
  for (size_t k = 0; k < r.history.size(); ++k) {
    w.x.push_back(double(k + 1));
    w.y.push_back(r.history[k].ok ? std::clamp(worst_constraint(r.history[k]), -1.0, 1.0)
                                  : std::nan(""));
  }
  viol.series = {w};
  viol.guides.push_back({"feasible below", 0.0, true, "#2e8b57"});
  return svg_document({conv, viol});
}

}  // namespace fulmar::optimize
