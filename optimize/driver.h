#pragma once
// The search: NLopt over a bounded design vector with an objective and inequality constraints
// (feasible when every scaled constraint value is <= 0) that come from one evaluation of a design.
// Evaluations are cached on the exact design vector, so NLopt's separate objective and constraint
// calls and the finite-difference points cost one analysis each. A checkpoint of every evaluation
// is written atomically after each iteration; resuming replays the checkpoint in the same order, so
// the deterministic search walks the same path and continues to the same result.
#include <atomic>
#include <filesystem>
#include <functional>
#include <iosfwd>
#include <stdexcept>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "optimize/evaluation_record.h"
#include "optimize/search_options.h"

namespace fulmar::optimize {

// The outcome of analysing one design. A failed analysis is a normal result (ok = false) with a
// finite, unattractive objective and violated constraints, so the search steers away.
struct Evaluation {
  std::vector<double> x;
  double objective = 0;
  std::vector<double> constraints;  // scaled; <= 0 is met
  bool ok = false;
  std::string status;       // "ok" or what failed
  EvaluationRecord detail;  // per-point results etc., kept for history and summary
};
nlohmann::json to_json(const Evaluation& e);
// Throws InputError naming `where` and the key for a missing or mistyped key.
Evaluation evaluation_from_json(const nlohmann::json& j, const std::string& where);

// Thrown by an evaluate function for a numerical failure of one design's analysis (the solver
// broke down on it): the search records it as a failed evaluation (ok = false, the message in
// the status) and goes on. Anything else an evaluate function throws (InputError, a program error)
// ends the search and propagates out of run_search.
struct AnalysisFailure : std::runtime_error {
  using std::runtime_error::runtime_error;
};

// The largest scaled constraint value (<= 0: all met); -inf when there are none.
double worst_constraint(const Evaluation& e);

struct SearchProblem {
  std::vector<double> lower, upper;  // bounds, #variables each
  std::vector<double> start;         // the baseline design, within the bounds
  // Further starts of the local algorithms (slsqp, mma, cobyla), each within the bounds: the
  // search from `start` and one from each of these share the evaluation budget equally (the last
  // takes what is left), in this order.
  std::vector<std::vector<double>> extra_starts;
  std::vector<std::string> constraint_names;
  // Stable ids of the constraints (EvaluationRecord's ConstraintRecord::id), in the same order;
  // they complete the records of a version-1 checkpoint, which had none. May be empty.
  std::vector<std::string> constraint_ids;
  // Must be thread-safe and deterministic (depends on x only).
  std::function<Evaluation(const std::vector<double>& x)> evaluate;
};

struct SearchResult {
  std::vector<Evaluation> history;  // every distinct design analysed, in order
  int best = -1;                    // index of the best feasible design in history, -1: none
  int best_any = -1;                // the least infeasible (or best feasible) design
  bool converged = false;           // NLopt met its tolerance (not stopped by a limit)
  std::string stop_reason;          // "converged: ...", "evaluation budget", "time limit", ...
  bool interrupted = false;         // stopped by a signal
  int iterations = 0;
  double elapsed_s = 0;  // wall time summed over resumed runs
  int replayed = 0;      // evaluations taken from the checkpoint on resume
};

struct SearchSettings {
  OptimizerOptions options;
  std::filesystem::path checkpoint;  // written after every iteration; empty: none
  std::string fingerprint;           // identifies the case; a checkpoint of another case is refused
  bool resume = false;               // replay `checkpoint` first
  int threads = 0;                   // 0: all cores
  const std::atomic<bool>* stop = nullptr;  // set by a signal handler to stop cleanly
  std::ostream* progress = nullptr;         // one line per iteration
};

// Runs the search. Throws InputError when resuming from a missing checkpoint or one of another
// case, and passes on what an evaluate function throws other than AnalysisFailure; everything
// else (failed analyses, limits, signals) ends in the result.
SearchResult run_search(const SearchProblem& problem, const SearchSettings& settings);

// Index of the best feasible evaluation (lowest objective, earliest on ties), -1 when none.
int best_feasible(const std::vector<Evaluation>& history, double tolerance);

}  // namespace fulmar::optimize
