#pragma once
// The polar CSV file: one schema for every polar fulmar writes (`fulmar polar -o` and the
// polar_baseline.csv / polar_optimized.csv of `fulmar optimize`), so one reader serves all.
#include <string>
#include <vector>

#include "solvers/viscous/viscous_solver.h"

namespace fulmar::viscous {

// One point of a polar as written. Angles in degrees, coefficients on the chord, cm about the
// quarter chord (nose-up positive), transition in x/c.
struct PolarCsvRow {
  double re = 0.0, mach = 0.0;
  double alpha = 0.0, cl = 0.0, cd = 0.0, cd_friction = 0.0, cd_pressure = 0.0, cm = 0.0;
  double transition_upper = 1.0, transition_lower = 1.0;
  bool converged = false;  // false: the numbers are the last iterate, not a solution
  int iterations = 0;      // Newton iterations, failed attempts included
  std::string section;     // the section's name ("" when not given)
  std::string condition;   // the flow condition's name, e.g. "cruise" ("" when not given)
};

// The row of a solver result under Reynolds number `re` and Mach number `mach`.
PolarCsvRow polar_csv_row(const ViscousResult& r, double re, double mach);

// The header line
//   re,mach,alpha,cl,cd,cd_friction,cd_pressure,cm,transition_upper,transition_lower,converged,
//   iterations,section,condition
// and one line per row, in order. Numbers with 10 significant digits; a non-finite number is an
// empty field (never NaN); converged is 1 or 0; the names are quoted when they hold a comma, a
// quote or a line break (quotes doubled). Columns may be added at the end, never renamed.
std::string polar_csv(const std::vector<PolarCsvRow>& rows);

}  // namespace fulmar::viscous
