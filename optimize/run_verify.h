#pragma once
// Verification of a search's result: fresh analyses at the case's verify_panels of the baseline,
// the search's best designs and the start, and the choice of the optimum among them.
#include <iosfwd>
#include <vector>

#include <nlohmann/json.hpp>

#include "optimize/case_file.h"
#include "optimize/driver.h"
#include "optimize/section_problem.h"

namespace fulmar::optimize {

// Search-feasible designs re-verified, best first, until one verifies feasible.
inline constexpr std::size_t kVerifyCandidates = 5;

struct VerifiedOptimum {
  Evaluation baseline;    // the baseline (the design space's start) as verified
  Evaluation optimum;     // the chosen design as verified
  std::vector<double> x;  // the chosen design vector
  // One entry per design verified, in order: {evaluation (1-based index in the history, 0: the
  // baseline), search_objective, verified_objective (null when failed), feasible, status}.
  nlohmann::json candidates = nlohmann::json::array();
  bool kept_start = false;  // the start verified feasible and better than every candidate
  bool feasible = false;    // the optimum verified meets every constraint
};

// `search_start` is where the search started (the baseline, or a given start design); `progress`
// (may be null) gets one line per verification.
VerifiedOptimum verify_optimum(const Case& c, const SectionProblem& problem, const SearchResult& r,
                               const std::vector<double>& search_start, std::ostream* progress);

}  // namespace fulmar::optimize
