#include "optimize/viscous_evaluator.h"

namespace fulmar::optimize {

// The viscous solver (solvers/viscous) does not yet offer the coupled solve at a target cl, the
// polar sweep and cl_max that the optimizer needs; no drag is estimated without it.
std::unique_ptr<SectionEvaluator> make_viscous_evaluator() {
  return nullptr;
}

std::string viscous_unavailable_reason() {
  return "the viscous-inviscid analysis is not available in this build of fulmar (the coupled "
         "boundary-layer solver is not finished), so no section drag can be computed and no "
         "optimization is run; the case file was read and is valid";
}

}  // namespace fulmar::optimize
