// The continuation march with stand-in point solvers (exact answers for the stall, failure, jump
// and creep rules) and one real march.
#include "solvers/viscous/continuation.h"

#include <gtest/gtest.h>

#include <cmath>
#include <string>

#include "common/error.h"
#include "geometry/naca.h"
#include "geometry/panelling.h"

namespace fulmar::viscous {
namespace {

// A converged stand-in result whose state remembers its angle (in stations[0].c), so a stand-in
// solver can see which state warm-started it.
ViscousResult at(double alpha, double cl, bool converged = true) {
  ViscousResult r;
  r.alpha = alpha;
  r.cl = cl;
  r.converged = converged;
  r.status = converged ? SolveStatus::kConverged : SolveStatus::kNotConverged;
  r.state.stagnation_node = 0;
  r.state.stations = {StationState{alpha, 1e-4, 2e-4, 1.0}};
  return r;
}

// The optimizer's kind of march: 2-deg steps up from 4 deg that end at the first fall.
ContinuationOptions coarse_upward() {
  ContinuationOptions o;
  o.alpha_from = 4;
  o.alpha_to = 26;
  o.alpha_step = 2;
  o.march_down = false;
  o.lead_in = ContinuationOptions::LeadIn::kColdFailure;
  o.lead_in_step = 4;
  o.jump_check = JumpCheck::kUpward;
  o.recover_failures = false;
  o.sub_steps_after_failure = true;
  o.keep_unconfirmed_jump = false;
  o.stop_at_lift_drop = 0;
  o.stop_after_failures = 2;
  o.back_fill = false;
  o.creep_step = 0.5;
  return o;
}

TEST(StallIndex, FirstFallBelowTheHighestSoFar) {
  EXPECT_EQ(stall_index({1.0, 1.2, 1.3, 1.26, 1.2}, 0.05, 1), 4);  // 1.2 < 1.3 - 0.05
  EXPECT_EQ(stall_index({1.0, 1.2, 1.3, 1.26, 1.2}, 0.0, 1), 3);
  // From the third value on, against the highest from the second on: a fall between the first
  // two is not a stall, nor is a value between them.
  EXPECT_EQ(stall_index({1.0, 0.8, 0.9, 0.95}, 0.0, 2), -1);
  EXPECT_EQ(stall_index({1.0, 0.8, 0.9, 0.85}, 0.0, 2), 3);
  EXPECT_EQ(stall_index({1.0}, 0.0, 1), -1);
}

// cl = 1.5 - 0.01 (alpha - 13)^2: the march up in 2-deg steps stops at the first fall (16 deg,
// below 14), leaves the angles above unsolved, and warm-starts each step from the one before.
TEST(March, StopsAtTheStall) {
  int calls = 0;
  const PointSolver solve = [&](double a, const ViscousState* w) {
    ++calls;
    if (a > 4.0) {
      EXPECT_TRUE(w && std::abs(w->stations[0].c - (a - 2.0)) < 1e-12) << a;
    }
    return at(a, 1.5 - 0.01 * (a - 13) * (a - 13));
  };
  const Continuation c = march(solve, solve, 0.0, coarse_upward());
  EXPECT_EQ(c.stop, Continuation::Stop::kStall);
  EXPECT_EQ(c.last_up, 6);  // 16 deg
  EXPECT_EQ(c.solves, 7);
  EXPECT_EQ(calls, 7);
  for (int i = 7; i < static_cast<int>(c.points.size()); ++i) {
    EXPECT_FALSE(c.points[i].converged);
    EXPECT_NE(c.points[i].reason.find("stall"), std::string::npos);
  }
}

// Nothing converges above 11 deg: the march stops after two failures in a row, and the creep goes
// on from 10 deg in 0.5-deg single attempts (with the `attempt` solver) while cl rises: 10.5, 11.
TEST(March, StopsAfterFailuresAndCreepsOn) {
  const PointSolver solve = [](double a, const ViscousState*) { return at(a, 0.1 * a, a <= 11); };
  int attempts = 0;
  const PointSolver attempt = [&](double a, const ViscousState* w) {
    ++attempts;
    return solve(a, w);
  };
  const Continuation c = march(solve, attempt, 0.0, coarse_upward());
  EXPECT_EQ(c.stop, Continuation::Stop::kFailures);
  EXPECT_EQ(c.last_up, 5);  // 12 and 14 deg failed
  ASSERT_EQ(c.creep.size(), 2u);
  EXPECT_DOUBLE_EQ(c.creep.back().alpha, 11.0);
  EXPECT_EQ(attempts, 3);  // 10.5, 11, and 11.5 that fails
}

// A jump up that the sub-steps do not find again: cl = 0.1 alpha, but a warm start over 2 deg
// from 8 lands 0.2 higher and every sub-step from 8 fails. The optimizer's march counts the
// angle as failed; the polar's keeps the jumped result.
TEST(March, AnUnconfirmedJumpIsAFailureOrKept) {
  const PointSolver solve = [](double a, const ViscousState* w) {
    const double from = w ? w->stations[0].c : a;
    return at(a, 0.1 * a + (a == 10.0 && from == 8.0 ? 0.2 : 0.0));
  };
  const PointSolver attempt = [&](double a, const ViscousState* w) {
    return at(a, 0.1 * a, !(w && w->stations[0].c == 8.0));
  };
  ContinuationOptions o = coarse_upward();
  o.alpha_to = 12;
  const Continuation strict = march(solve, attempt, 0.0, o);
  EXPECT_FALSE(strict.points[3].converged);
  EXPECT_NE(strict.points[3].reason.find("lift jumped"), std::string::npos);
  o.keep_unconfirmed_jump = true;
  const Continuation kept = march(solve, attempt, 0.0, o);
  ASSERT_TRUE(kept.points[3].converged);
  EXPECT_NEAR(kept.points[3].cl, 1.2, 1e-12);
}

// A cold start at the first angle that fails is replaced by a lead-in from the start angle.
TEST(March, LeadInAfterAFailedColdStart) {
  const PointSolver solve = [](double a, const ViscousState* w) {
    return at(a, 0.1 * a, w != nullptr || a == 0.0);
  };
  ContinuationOptions o = coarse_upward();
  o.alpha_to = 8;
  const Continuation c = march(solve, solve, 0.0, o);
  EXPECT_TRUE(c.points[0].converged);
  EXPECT_EQ(c.solves, 5);  // cold 4, cold 0, warm 4, 6, 8
}

TEST(ContinuationOptions, ValidateNamesTheField) {
  ContinuationOptions o = coarse_upward();
  o.creep_step = 3;
  try {
    o.Validate();
    FAIL() << "no error";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("creep_step = 3"), std::string::npos) << e.what();
  }
  o = ContinuationOptions{};
  o.stop_after_failures = -1;
  EXPECT_THROW(o.Validate(), InputError);
}

// Exact: golden-section refinement of cl = 1.5 - 0.01 (alpha - 12.3)^2 from 2-deg samples finds
// the vertex to within the final bracket (0.05 deg), so cl_max within 0.01 * 0.05^2.
TEST(RefineLiftMaximum, FindsTheVertex) {
  const PointSolver solve = [](double a, const ViscousState*) {
    return at(a, 1.5 - 0.01 * (a - 12.3) * (a - 12.3));
  };
  std::vector<ViscousResult> known;
  for (double a : {8.0, 10.0, 12.0, 14.0}) known.push_back(solve(a, nullptr));
  const LiftMaximum m = refine_lift_maximum(known, solve);
  ASSERT_TRUE(m.refined);
  EXPECT_NEAR(m.alpha, 12.3, kClMaxRefineWidth);
  EXPECT_NEAR(m.cl_max, 1.5, 0.01 * kClMaxRefineWidth * kClMaxRefineWidth);
  EXPECT_LT(m.bracket, kClMaxRefineWidth);
  known.pop_back();  // the maximum sample at the end: nothing to bracket
  EXPECT_FALSE(refine_lift_maximum(known, solve).refined);
}

// A real march: NACA 0012 at Re 1e6, the coarse upward march with ViscousSolver::solve_alpha as
// the point solver stops at the stall between 14 and 18 deg (the section stalls near 15-16 deg at
// this Reynolds number, Abbott & von Doenhoff, from memory), every angle below converged.
TEST(March, Naca0012AtOneMillion) {
  PanellingOptions po;
  ViscousOptions vo;
  vo.reynolds = 1e6;
  const ViscousSolver solver(panel_nodes(naca_section("0012"), po), vo);
  const Continuation c =
      march([&](double a, const ViscousState* w) { return solver.solve_alpha(a, w); },
            [&](double a, const ViscousState* w) { return solver.solve_from(a, w); }, 0.0,
            coarse_upward());
  EXPECT_EQ(c.stop, Continuation::Stop::kStall);
  ASSERT_GE(c.last_up, 5);
  EXPECT_LE(c.last_up, 7);
  for (int i = 0; i <= c.last_up; ++i) EXPECT_TRUE(c.points[i].converged) << c.points[i].alpha;
}

}  // namespace
}  // namespace fulmar::viscous
