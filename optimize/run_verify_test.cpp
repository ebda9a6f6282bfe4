// Tests of the verification of a search's result (run_verify.h), with the analytic stand-in.
#include "optimize/run_verify.h"

#include <gtest/gtest.h>

#include "optimize/testing/analytic_evaluator.h"

namespace fulmar::optimize {
namespace {

using nlohmann::json;

Case small_case() {
  json j = json::parse(R"({
    "schema_version": 1, "name": "verify",
    "design_points": [{"name": "cruise", "cl": 0.4, "reynolds": 2e6}],
    "landing": {"reynolds": 1.5e6},
    "constraints": {"cl_max": {"min": 1.2}, "thickness": {"min": 0.12}},
    "parameterization": {"order_upper": 3, "order_lower": 3},
    "analysis": {"panels": 120, "verify_panels": 180},
    "baseline": {"naca": "0015"}
  })");
  return parse_case(j.dump(), "test.json", ".");
}

// A history of `n` search-feasible designs near the start, objective falling with the index.
SearchResult history_of(const SectionProblem& p, int n, double worst) {
  SearchResult r;
  for (int i = 0; i < n; ++i) {
    Evaluation e;
    e.x = p.space().start;
    e.x[1] += 1e-3 * i;  // small moves: the designs stay valid sections
    e.ok = true;
    e.objective = 1.0 - 0.01 * i;
    e.constraints = {worst};
    r.history.push_back(e);
  }
  r.best_any = n - 1;
  return r;
}

// The best search candidate is verified first, at verify_panels, and when it verifies feasible
// it is the optimum without verifying the others.
TEST(RunVerify, TheBestCandidateFirstAtTheVerificationPanels) {
  const Case c = small_case();
  testing::AnalyticEvaluator ev;
  const SectionProblem p(c, ev, design_space(c, resolve_baseline(c).shape));
  const SearchResult r = history_of(p, 7, -1.0);
  const VerifiedOptimum v = verify_optimum(c, p, r, p.space().start, nullptr);
  ASSERT_TRUE(v.optimum.ok) << v.optimum.status;
  EXPECT_EQ(v.baseline.detail.panels, c.analysis.verify_panels);
  EXPECT_EQ(v.optimum.detail.panels, c.analysis.verify_panels);
  ASSERT_GE(v.candidates.size(), 1u);
  EXPECT_EQ(v.candidates[0].at("evaluation"), 7);  // the lowest search objective
  EXPECT_EQ(v.feasible, v.optimum.ok && worst_constraint(v.optimum) <= c.optimizer.constraint_tol);
  if (v.feasible) {
    EXPECT_EQ(v.candidates.size(), 1u);
  } else {
    EXPECT_LE(v.candidates.size(), kVerifyCandidates);
  }
}

// Without a search-feasible design the least infeasible one is verified; with none at all (-1),
// the baseline (evaluation 0).
TEST(RunVerify, WithoutFeasibleCandidatesTheLeastInfeasibleOrTheBaseline) {
  const Case c = small_case();
  testing::AnalyticEvaluator ev;
  const SectionProblem p(c, ev, design_space(c, resolve_baseline(c).shape));
  SearchResult r = history_of(p, 3, 1.0);
  r.best_any = 1;
  VerifiedOptimum v = verify_optimum(c, p, r, p.space().start, nullptr);
  ASSERT_EQ(v.candidates.size(), 1u);
  EXPECT_EQ(v.candidates[0].at("evaluation"), 2);
  r.best_any = -1;
  v = verify_optimum(c, p, r, p.space().start, nullptr);
  ASSERT_EQ(v.candidates.size(), 1u);
  EXPECT_EQ(v.candidates[0].at("evaluation"), 0);
  EXPECT_TRUE(v.candidates[0].at("search_objective").is_null());
  EXPECT_EQ(v.x, p.space().start);
}

}  // namespace
}  // namespace fulmar::optimize
