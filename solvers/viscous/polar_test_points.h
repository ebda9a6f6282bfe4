#pragma once
// Synthetic viscous results and angle grids for the tests of the polar sweep and summary.
#include "solvers/viscous/polar.h"
#include "solvers/viscous/viscous_solver.h"

namespace fulmar::viscous::testing {

// A converged synthetic point.
inline ViscousResult point(double alpha, double cl, double cd, double cm, bool converged = true) {
  ViscousResult r;
  r.alpha = alpha;
  r.cl = cl;
  r.cd = cd;
  r.cm = cm;
  r.status = converged ? SolveStatus::kConverged : SolveStatus::kNotConverged;
  return r;
}

// Polar options for the angle grid from_deg..to_deg in step_deg steps, other options default.
inline PolarOptions angle_grid(double from_deg, double to_deg, double step_deg) {
  PolarOptions o;
  o.alpha_from = from_deg;
  o.alpha_to = to_deg;
  o.alpha_step = step_deg;
  return o;
}

}  // namespace fulmar::viscous::testing
