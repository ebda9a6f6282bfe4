#include "optimize/run_verify.h"

#include <algorithm>
#include <ostream>

namespace fulmar::optimize {

using nlohmann::json;

VerifiedOptimum verify_optimum(const Case& c, const SectionProblem& problem, const SearchResult& r,
                               const std::vector<double>& search_start, std::ostream* progress) {
  const DesignSpace& space = problem.space();
  const double tol = c.optimizer.constraint_tol;
  // Re-verification: fresh analyses with finer panels of the baseline and the chosen design.
  // A verification that does not converge at verify_panels is repeated with a few more panels
  // (a different discretisation of the same section); the panel count used is in the summary.
  auto verify = [&](const std::vector<double>& x) {
    Evaluation e = problem.evaluate(x, c.analysis.verify_panels);
    for (int extra : {8, 16, 24, 40}) {
      if (e.ok) break;
      e = problem.evaluate(x, c.analysis.verify_panels + extra);
    }
    return e;
  };
  // The search's best feasible design usually sits on a constraint boundary (cl_max, most
  // often), where the finer verification can land just outside it. So the search-feasible designs
  // are verified in order of objective, up to kVerifyCandidates of them, and the first that the
  // verification finds feasible is the optimum; when none is, the best one is reported as it
  // verified (infeasible). Deterministic in the history, so a resumed run chooses the same.
  std::vector<int> candidates;
  for (int i = 0; i < static_cast<int>(r.history.size()); ++i)
    if (r.history[size_t(i)].ok && worst_constraint(r.history[size_t(i)]) <= tol)
      candidates.push_back(i);
  std::stable_sort(candidates.begin(), candidates.end(), [&](int a, int b) {
    return r.history[size_t(a)].objective < r.history[size_t(b)].objective;
  });
  if (candidates.size() > kVerifyCandidates) candidates.resize(kVerifyCandidates);
  if (candidates.empty()) candidates.push_back(r.best_any);  // -1: the baseline
  const Evaluation base_v = verify(space.start);
  std::vector<double> x_opt;
  Evaluation opt_v;
  json verified = json::array();
  for (size_t k = 0; k < candidates.size(); ++k) {
    const int i = candidates[k];
    const std::vector<double> x = i >= 0 ? r.history[size_t(i)].x : space.start;
    if (progress)
      *progress << "verifying " << (k == 0 ? "the optimum" : "the next-best design")
                << " (evaluation " << i + 1 << ") with " << c.analysis.verify_panels << " panels\n"
                << std::flush;
    Evaluation e = verify(x);
    const bool ok = e.ok && worst_constraint(e) <= tol;
    verified.push_back(
        {{"evaluation", i + 1},
         {"search_objective", i >= 0 ? json(r.history[size_t(i)].objective) : json(nullptr)},
         {"verified_objective", e.ok ? json(e.objective) : json(nullptr)},
         {"feasible", ok},
         {"status", e.status}});
    if (k == 0 || ok) {
      x_opt = x;
      opt_v = std::move(e);
    }
    if (ok) break;
  }
  // Never worse than the start: a search whose gains at the search panels do not survive the
  // verification (or whose candidates all fail it) keeps a start that verifies feasible and
  // better. In a study, where each point starts from a neighbour's optimum that also meets this
  // point's constraints, that makes the swept cd follow the constraint monotonically.
  bool kept_start = false;
  {
    const bool same = search_start == space.start;
    const Evaluation start_v = same ? base_v : verify(search_start);
    const bool start_ok = start_v.ok && worst_constraint(start_v) <= tol;
    const bool opt_ok = opt_v.ok && worst_constraint(opt_v) <= tol;
    if (start_ok && (!opt_ok || start_v.objective < opt_v.objective)) {
      kept_start = true;
      x_opt = search_start;
      opt_v = start_v;
      if (progress)
        *progress << "the start design verifies feasible and better than the search's "
                     "candidates: it is kept as the optimum\n"
                  << std::flush;
    }
  }
  VerifiedOptimum out;
  out.baseline = base_v;
  out.feasible = opt_v.ok && worst_constraint(opt_v) <= tol;
  out.optimum = std::move(opt_v);
  out.x = std::move(x_opt);
  out.candidates = std::move(verified);
  out.kept_start = kept_start;
  return out;
}

}  // namespace fulmar::optimize
