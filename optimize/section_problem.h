#pragma once
// The section design problem: a design vector (the CST coefficients of both surfaces; the
// trailing-edge heights held fixed) -> geometry measures and aerodynamic results -> the drag
// objective and the scaled constraints the search sees.
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "geometry/cst.h"
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

// Geometry of a CST shape, measured on the analytic surfaces (smooth in the coefficients, which
// the finite-difference gradients need). Lengths in chord fractions.
struct GeometryMeasures {
  double thickness = 0, thickness_x = 0;  // maximum of y_u - y_l and its x
  double camber = 0, camber_x = 0;        // (y_u + y_l)/2 of largest magnitude, signed, and its x
  std::vector<double> spar_thickness;     // thickness at each spar station of the case
  double te_gap = 0;
  double te_angle_deg = 0;   // wedge angle between the surface tangents at x = 1
  double le_radius = 0;      // the smaller of the two surfaces' nose radii a_0^2 / 2 (Kulfan 2008)
  double area = 0;           // integral of the thickness over the chord
  double min_shape_gap = 0;  // min over x of S_u(x) - S_l(x) (thickness / class function)
  int reversals_upper = 0, reversals_lower = 0;  // counted on the section (geometry/metrics.h)
  // Strength of the first curvature reversal beyond the allowed number on each surface: the
  // reversals between runs of one sign of y'' are ranked by min(peak |y''| before, after); this is
  // the (allowed + 1)-th largest, 0 when there are no more reversals than allowed. Unlike the
  // count it grows continuously from 0 as a wave appears, so the search can see it coming.
  double excess_reversal_upper = 0, excess_reversal_lower = 0;  // 1/chord
};
// `allowed_upper` / `allowed_lower`: curvature reversals tolerated on each surface.
GeometryMeasures measure_geometry(const CstShape& shape, const std::vector<SparLimit>& spars,
                                  int allowed_upper = 0, int allowed_lower = 1);

// A curvature reversal weaker than this (|y''| peak on the weaker side, 1/chord) is rounding,
// not a wave (about the curvature of a 0.5 % camber arc: common practice for smoothness checks).
inline constexpr double kFlatCurvature = 0.05;
nlohmann::json to_json(const GeometryMeasures& g);

// Thickness y_u(x) - y_l(x) of a CST shape at x in [0, 1].
double cst_thickness_at(const CstShape& shape, double x);

// Objective of a design whose analysis failed: 100 x cd = 5 is cd 0.05, worse than any attached
// flow section at these conditions, finite so the search can move away.
inline constexpr double kFailedObjective = 5.0;
// Name of the maximum-lift constraint in tables and history.
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
  // What each constraint is, for tables: [{name, value, limit, kind ("min"/"max"), satisfied}].
  static nlohmann::json constraint_table(const Evaluation& e);

 private:
  struct Limit {
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
};

}  // namespace fulmar::optimize
