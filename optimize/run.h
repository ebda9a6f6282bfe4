#pragma once
// One optimization from a validated case to the files in the output directory: baseline, search,
// re-verification of the optimum with finer panels, then coordinates, CST JSON, polars, history,
// summary, plots and report.
#include <atomic>
#include <filesystem>
#include <iosfwd>
#include <optional>
#include <string>

#include <nlohmann/json.hpp>

#include "geometry/cst.h"
#include "optimize/case_file.h"
#include "optimize/run_summary.h"
#include "optimize/run_verify.h"
#include "optimize/section_evaluator.h"

namespace fulmar::optimize {

struct RunOptions {
  std::filesystem::path output_dir;         // created if missing (its parent must exist)
  bool resume = false;                      // continue from output_dir/checkpoint.json
  std::ostream* progress = nullptr;         // one line per iteration
  const std::atomic<bool>* stop = nullptr;  // a signal handler sets it: stop, write the best
  int threads = 0;                          // finite-difference threads; 0: all cores
  std::string caution;                      // printed in the report
  // Where the search starts, when not at the baseline (e.g. the neighbour's optimum in a trade
  // study). Same orders as the case's parameterization; clamped into the bounds, which stay
  // those around the baseline. The baseline remains the reference of the comparison.
  std::optional<CstShape> start_shape;
};

struct RunOutcome {
  bool interrupted = false;
  bool converged = false;
  bool feasible = false;  // the verified optimum meets every constraint
  RunSummary summary;     // as written to summary.json (with its files)
};

// Names of the files written into the output directory.
inline constexpr const char* kCheckpointFile = "checkpoint.json";
inline constexpr const char* kSummaryFile = "summary.json";

// Checks that `dir` can hold the results (exists and is writable, or can be created: its parent
// exists and is writable) without creating anything. Throws InputError naming the directory.
void require_output_dir(const std::filesystem::path& dir);

// Runs the case with `evaluator`. Throws InputError (before anything is written) for a baseline
// that cannot be built, bounds that exclude it, or a missing or foreign checkpoint on resume.
RunOutcome run_optimization(const Case& c, const SectionEvaluator& evaluator,
                            const RunOptions& options);

}  // namespace fulmar::optimize
