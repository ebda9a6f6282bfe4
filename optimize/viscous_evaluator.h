#pragma once
// The production SectionEvaluator: the viscous-inviscid analysis of solvers/viscous (target-cl
// solves by secant iteration on alpha, polars and cl_max by the continuation of
// solvers/viscous/continuation.h).
#include <memory>
#include <string>

#include "optimize/section_evaluator.h"

namespace fulmar::viscous {
class ViscousSolver;
}

namespace fulmar::optimize {

// cl_max of `solver`'s section, as the optimizer asks for it: the continuation of
// solvers/viscous/continuation.h in 2-deg steps up from 4 deg to the first fall of cl, the
// maximum refined by golden-section search (viscous::refine_lift_maximum) to a bracket of
// viscous::kClMaxRefineWidth deg, where cl is within about 1e-4 of the solver's own peak, so the
// value changes smoothly with the shape and the optimizer's finite differences see the shape's
// effect, not where the 2-deg grid falls. When the solutions stop converging beyond the best
// angle, the last converged value of the 0.5-deg creep beyond it is cl_max (a lower bound: stall
// and solver failure cannot be told apart); a cl still rising at 26 deg is not found (with the
// largest value seen). `solves` (may be null): point-solver calls made.
ClMaxResult find_cl_max(const viscous::ViscousSolver& solver, int* solves = nullptr);

// The viscous evaluator, or nullptr when this build has none (see viscous_unavailable_reason).
std::unique_ptr<SectionEvaluator> make_viscous_evaluator();

// Why make_viscous_evaluator() returns nullptr (empty when it does not).
std::string viscous_unavailable_reason();

}  // namespace fulmar::optimize
