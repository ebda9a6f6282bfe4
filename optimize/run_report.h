#pragma once
// report.md of an optimization run: the airplane and design conditions, the verified result
// against the baseline, the constraint table, the plots and the cautions.
#include <string>

#include "optimize/case_file.h"
#include "optimize/driver.h"
#include "optimize/run_summary.h"
#include "optimize/run_verify.h"

namespace fulmar::optimize {

// `summary` is the run's summary (run_summary.h: its section blocks give the geometry figures and
// its constraint table the constraints), `baseline_name` the baseline's name, `caution` is
// printed at the top and the end when not empty.
std::string report_markdown(const Case& c, const RunSummary& summary, const SearchResult& r,
                            const VerifiedOptimum& v, const std::string& baseline_name,
                            const std::string& evaluator_description, const std::string& caution);

}  // namespace fulmar::optimize
