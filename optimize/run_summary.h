#pragma once
// summary.json of an optimization run: the case's conditions, the baseline and the optimum as
// verified (section blocks), the constraint table and how the search went. Its keys are a
// contract with the programs that read it (trade studies, scripts): add, never rename.
#include <string>

#include <nlohmann/json.hpp>

#include "geometry/cst.h"
#include "optimize/case_file.h"
#include "optimize/driver.h"
#include "optimize/run_verify.h"

namespace fulmar::optimize {

// The summary without its "files" (run.cpp adds them once written).
nlohmann::json run_summary(const Case& c, const SearchResult& r, const VerifiedOptimum& v,
                           const std::string& baseline_name, const CstShape& baseline_shape,
                           double fit_deviation, const std::string& optimum_name,
                           const CstShape& optimum_shape, const std::string& evaluator_description);

}  // namespace fulmar::optimize
