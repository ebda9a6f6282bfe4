#pragma once
// The production SectionEvaluator: the viscous-inviscid analysis of solvers/viscous (target-cl
// solves by secant iteration on alpha, polars with warm starts, cl_max by an angle march).
#include <memory>
#include <string>

#include "optimize/section_evaluator.h"

namespace fulmar::optimize {

// The viscous evaluator, or nullptr when this build has none (see viscous_unavailable_reason).
std::unique_ptr<SectionEvaluator> make_viscous_evaluator();

// Why make_viscous_evaluator() returns nullptr (empty when it does not).
std::string viscous_unavailable_reason();

}  // namespace fulmar::optimize
