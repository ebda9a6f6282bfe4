#pragma once
// The section design problem: a design vector (the CST coefficients of both surfaces; the
// trailing-edge heights held fixed) -> geometry measures and aerodynamic results -> the drag
// objective and the scaled constraints the search sees.
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "geometry/cst.h"
#include "geometry/cst_measures.h"
#include "optimize/case_file.h"
#include "optimize/driver.h"
#include "optimize/section_evaluator.h"

namespace fulmar::optimize {

// The baseline as a CST shape of the case's orders.
struct BaselineShape {
  std::string name;          // e.g. "NACA 2412"
  CstShape shape;            // fitted (or given) at the parameterization's orders
  double fit_deviation = 0;  // largest distance of the source points from the fit, chord fractions
};
// Builds the baseline. Throws InputError naming /baseline/... for a file or CST JSON that cannot be
// read, or /parameterization/te_gap when the gap cannot be applied.
BaselineShape resolve_baseline(const Case& c);
// The same for another design given like the baseline (e.g. the case's second_start).
BaselineShape resolve_shape(const Case& c, const Baseline& b);

// The design vector: [upper a_0..a_n, lower a_0..a_m]; the trailing-edge heights stay those of
// `layout`.
struct DesignSpace {
  CstShape layout;
  std::vector<double> lower, upper, start;  // bounds and the baseline, #variables each
  CstShape shape(const std::vector<double>& x) const;
};
// Bounds: the baseline +- margin, cut to the absolute bounds given. Throws InputError naming
// /parameterization/bounds when the baseline lies outside the absolute bounds.
DesignSpace design_space(const Case& c, const CstShape& baseline);

// Geometry of a CST shape (geometry/cst_measures.h), with the case's spar stations.
using GeometryMeasures = CstMeasures;
// `allowed_upper` / `allowed_lower`: curvature reversals tolerated on each surface.
GeometryMeasures measure_geometry(const CstShape& shape, const std::vector<SparLimit>& spars,
                                  int allowed_upper = 0, int allowed_lower = 1);

// Objective of a design whose analysis failed: 100 x cd = 5 is cd 0.05, worse than any attached
// flow section at these conditions, finite so the search can move away.
inline constexpr double kFailedObjective = 5.0;
// Display name of the maximum-lift constraint (its id: kClMaxId).
inline constexpr const char* kClMaxConstraint = "cl_max at landing";

class SectionProblem {
 public:
  SectionProblem(const Case& c, const SectionEvaluator& evaluator, DesignSpace space);
  const DesignSpace& space() const { return space_; }
  const std::vector<std::string>& constraint_names() const { return names_; }
  // The analysis of one design at `panels`: objective 100 x the weighted cd over design points and
  // transition scenarios, constraints scaled to about 1 per unit of violation (<= 0 met). The
  // detail holds the geometry, every point result, cl_max and the unscaled constraint table.
  Evaluation evaluate(const std::vector<double>& x, int panels) const;
  // The search problem (panels of the case's search resolution).
  SearchProblem search_problem() const;
  // Stable ids of the constraints (ConstraintRecord::id), in the order of constraint_names.
  const std::vector<std::string>& constraint_ids() const { return ids_; }
  // The unscaled constraint table of an evaluation of this problem.
  static const std::vector<ConstraintRecord>& constraint_table(const Evaluation& e);

 private:
  struct Limit {
    std::string id;  // stable (ConstraintRecord::id)
    std::string name;
    bool is_min = true;
    double limit = 0;
    double scale = 1;
  };
  const Case& case_;
  const SectionEvaluator& evaluator_;
  DesignSpace space_;
  std::vector<Limit> limits_;
  std::vector<std::string> names_;
  std::vector<std::string> ids_;
};

}  // namespace fulmar::optimize
