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

#include "optimize/evaluation_record.h"
#include "optimize/search_options.h"

namespace fulmar::optimize {

// Thrown by an evaluate function for a numerical failure of one design's analysis (the solver
// broke down on it): the search records it as a failed evaluation (status kFailed, the message
// in the reason) and goes on. Anything else an evaluate function throws (InputError, a program
// error) ends the search and propagates out of run_search.
struct AnalysisFailure : std::runtime_error {
  using std::runtime_error::runtime_error;
};

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

// How the search ended (Outcome): converged when every local search met NLopt's tolerance;
// otherwise the status of the first one that did not: stopped by a limit (evaluation budget or
// its share of it, time limit) or a signal, not_converged when NLopt gave up (roundoff, another
// stop code), failed when NLopt failed. The reason lists what each local search ended on
// ("converged: ...", "evaluation budget of 400 analyses spent", "time limit of 60 s reached").
struct SearchResult : Outcome {
  bool converged() const { return status == Status::kConverged; }
  std::vector<Evaluation> history;  // every distinct design analysed, in order
  int best = -1;                    // index of the best feasible design in history, -1: none
  int best_any = -1;                // the least infeasible (or best feasible) design
  bool interrupted = false;         // stopped by a signal (status kStopped)
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

}  // namespace fulmar::optimize
