#pragma once
// The polars of an optimization run: the flow conditions they are run at (every distinct design
// Reynolds and Mach number, and the landing) and the angles, from the case.
#include <string>
#include <vector>

#include "optimize/case_file.h"
#include "optimize/section_evaluator.h"

namespace fulmar::optimize {

struct PolarCondition {
  std::string name;  // the first design point at these conditions, or "landing"
  FlowCondition flow;
  bool landing = false;
};

// The conditions in the order of the case's design points, the landing last (when present).
std::vector<PolarCondition> polar_conditions(const Case& c);

// polar_alpha_min, min + step, ... up to polar_alpha_max (degrees).
std::vector<double> polar_angles(const AnalysisOptions& a);

// One polar per condition, in the order of polar_conditions: per_condition[k][i] at angle i.
struct SectionPolars {
  std::vector<std::vector<PointResult>> per_condition;
};

// The polars as the polar CSV of fulmar polar (solvers/viscous/polar_csv.h): one row per condition
// and angle, the section named in each row.
std::string polar_csv(const std::vector<PolarCondition>& conds, const SectionPolars& polars,
                      const std::string& section_name);

}  // namespace fulmar::optimize
