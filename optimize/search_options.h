#pragma once
// What the search driver (driver.h) is told: the NLopt algorithm and its stopping rules. Read from
// the case file's "optimizer" object (case_file.cpp, which also defines the functions declared
// here), but owned by the driver, so that the driver does not depend on the case schema.
#include <string>

namespace fulmar::optimize {

enum class Algorithm { slsqp, mma, cobyla, isres, multistart };
std::string to_string(Algorithm a);
// Throws InputError naming `where` for an unknown name.
Algorithm algorithm_from_string(const std::string& name, const std::string& where);

// Stopping rules: the search stops at the first of: NLopt's relative tolerance on the design
// (xtol_rel) or on the objective (ftol_rel) met, `max_evaluations` distinct section analyses done,
// `time_limit_s` of wall time spent (summed over resumed runs), or a stop signal.
struct OptimizerOptions {
  Algorithm algorithm = Algorithm::slsqp;
  int max_evaluations = 400;     // distinct designs analysed (finite-difference points count)
  double xtol_rel = 1e-4;        // NLopt relative tolerance on the design vector
  double ftol_rel = 1e-6;        // NLopt relative tolerance on the objective
  double time_limit_s = 3600;    // wall-clock seconds
  unsigned seed = 1;             // for isres and multistart
  int starts = 4;                // local searches of multistart (the first from the baseline)
  double fd_step = 1e-4;         // forward-difference step on each CST coefficient (absolute)
  double constraint_tol = 1e-6;  // a design is feasible when every scaled constraint <= this
  void Validate() const;         // throws InputError naming the field
};

}  // namespace fulmar::optimize
