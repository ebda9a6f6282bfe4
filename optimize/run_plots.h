#pragma once
// The SVG plots of an optimization run, each a whole document: the sections with their thickness
// and camber, the drag polars, lift and moment, the pressure at the first design point, and the
// search's convergence. Baseline dashed, optimum solid (svg_plot.h colours).
#include <string>
#include <vector>

#include "geometry/cst.h"
#include "optimize/case_file.h"
#include "optimize/driver.h"
#include "optimize/run_polars.h"
#include "optimize/section_evaluator.h"

namespace fulmar::optimize {

// sections.svg: the two sections, their thickness and their camber distributions.
std::string sections_plot(const CstShape& baseline, const CstShape& optimized);

struct PolarPlots {
  std::string polars;       // polars.svg: cd-cl per condition, with the verified design points
  std::string lift_moment;  // lift_moment.svg: alpha-cl and alpha-cm per condition
};
// `conds`, `base_p`, `opt_p` as from polar_conditions and the evaluator's polars; `base_v`,
// `opt_v` the verified evaluations, whose design points are marked.
PolarPlots polar_plots(const Case& c, const std::vector<PolarCondition>& conds,
                       const SectionPolars& base_p, const SectionPolars& opt_p,
                       const Evaluation& base_v, const Evaluation& opt_v);

// cp_cruise.svg: Cp of both sections at the first design point (its cl, nominal transition),
// analysed with `evaluator` at verify_panels.
std::string cp_plot(const Case& c, const SectionEvaluator& evaluator, const CstShape& baseline,
                    const CstShape& optimized);

// convergence.svg: every analysis's objective, the best feasible so far and the worst constraint.
std::string convergence_plot(const SearchResult& r, double tol);

}  // namespace fulmar::optimize
