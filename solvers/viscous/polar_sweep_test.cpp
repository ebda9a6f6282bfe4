// The polar continuation and its fallbacks, with stand-in point solvers whose answers are known.
#include "solvers/viscous/polar.h"

#include <gtest/gtest.h>

#include <cmath>
#include <functional>
#include <set>
#include <utility>
#include <vector>

#include "solvers/viscous/polar_test_points.h"

namespace fulmar::viscous {
namespace {

using testing::angle_grid;
using testing::point;

// A converged stand-in result (cd 0.01, cm 0) whose state remembers its angle (in
// stations[0].c), so a stand-in solver can see which state warm-started it.
ViscousResult remembered_point(double alpha, double cl) {
  ViscousResult r = point(alpha, cl, 0.01, 0.0);
  r.state.stagnation_node = 0;
  r.state.stations = {StationState{alpha, 1e-4, 2e-4, 1.0}};
  return r;
}

// A stand-in point solver: cl, cd, cm given as functions of alpha; its state remembers the angle
// it belongs to (in stations[0].c) so the tests can see which state warm-started a solve.
struct StandIn {
  std::function<bool(double alpha, const ViscousState* warm)> converges;
  std::function<double(double)> cl = [](double a) { return 0.1 * a; };
  std::vector<std::pair<double, double>> calls;  // (alpha, warm alpha or NaN)

  ViscousResult operator()(double alpha, const ViscousState* warm) {
    calls.emplace_back(alpha, warm ? warm->stations[0].c : NAN);
    if (!converges(alpha, warm)) return point(alpha, cl(alpha), 0.01, 0.0, false);
    return remembered_point(alpha, cl(alpha));
  }
  PointSolver solver() {
    return [this](double a, const ViscousState* w) { return (*this)(a, w); };
  }
};

// The march starts (cold) at the grid angle nearest the given zero-lift angle and warm-starts
// each angle from its converged neighbour, outward both ways; points come back in grid order.
TEST(SweepPolar, MarchesOutwardFromZeroLiftWithWarmStarts) {
  StandIn s;
  s.converges = [](double, const ViscousState*) { return true; };
  PolarOptions o;
  o.alpha_from = -3;
  o.alpha_to = 4;
  o.alpha_step = 1;
  const Polar p = sweep_polar(s.solver(), -1.2, o);
  ASSERT_EQ(p.points.size(), 8u);
  for (int i = 0; i < 8; ++i) {
    EXPECT_DOUBLE_EQ(p.points[i].alpha, -3.0 + i);
    EXPECT_TRUE(p.points[i].converged());
  }
  ASSERT_EQ(s.calls.size(), 8u);
  EXPECT_DOUBLE_EQ(s.calls[0].first, -1.0);
  EXPECT_TRUE(std::isnan(s.calls[0].second));
  for (std::size_t k = 1; k < s.calls.size(); ++k) {
    EXPECT_NEAR(std::abs(s.calls[k].first - s.calls[k].second), 1.0, 1e-12) << k;
  }
  EXPECT_EQ(p.solves, 8);
}

// Warm starts over more than 0.3 deg fail and cold starts fail above 2 deg: every angle is still
// reached by halved sub-steps (1 -> 0.5 -> 0.25 deg), each from the last converged state.
TEST(SweepPolar, SubStepsRecoverFailedWarmStarts) {
  StandIn s;
  s.converges = [](double a, const ViscousState* w) {
    if (!w) return a <= 2.0;
    return std::abs(a - w->stations[0].c) <= 0.3 + 1e-9;
  };
  PolarOptions o;
  o.alpha_from = 0;
  o.alpha_to = 6;
  const Polar p = sweep_polar(s.solver(), 0.0, o);
  for (const ViscousResult& r : p.points) EXPECT_TRUE(r.converged()) << r.alpha;
  for (const auto& [a, w] : s.calls) {
    if (!std::isnan(w)) {
      EXPECT_LE(std::abs(a - w), 1.0 + 1e-12);
    }
  }
}

// Cold starts converge only near zero lift (|alpha| < 3) and warm starts over at most 1 deg: a
// grid from 8 to 12 deg is reached by the lead-in march from the zero-lift angle.
TEST(SweepPolar, LeadInFromZeroLiftWhenTheGridDoesNotReachIt) {
  StandIn s;
  s.converges = [](double a, const ViscousState* w) {
    if (!w) return std::abs(a) < 3.0;
    return std::abs(a - w->stations[0].c) <= 1.0 + 1e-9;
  };
  PolarOptions o;
  o.alpha_from = 8;
  o.alpha_to = 12;
  const Polar p = sweep_polar(s.solver(), 0.4, o);
  for (const ViscousResult& r : p.points) EXPECT_TRUE(r.converged()) << r.alpha;
  ASSERT_FALSE(s.calls.empty());
  EXPECT_DOUBLE_EQ(s.calls[0].first, 0.4);  // the lead-in starts cold at zero lift
  EXPECT_TRUE(std::isnan(s.calls[0].second));
  // The lead-in states stay out of the polar: still rising at 12 deg, no maximum.
  EXPECT_FALSE(p.summary.has_cl_max);
  EXPECT_EQ(p.points.size(), 5u);
}

// 8 deg cannot be reached from below (warm from a smaller angle, cold, or sub-steps), only
// warm-started from above: after the march the failed angle is retried from its converged
// neighbour on the far side (9 deg) and converges.
TEST(SweepPolar, FailedAngleIsRetriedFromTheFarSide) {
  StandIn s;
  s.converges = [](double a, const ViscousState* w) {
    if (std::abs(a - 8.0) > 0.3) return true;
    return w != nullptr && w->stations[0].c > a;
  };
  PolarOptions o;
  o.alpha_from = 5;
  o.alpha_to = 11;
  const Polar p = sweep_polar(s.solver(), 0.0, o);
  for (const ViscousResult& r : p.points) EXPECT_TRUE(r.converged()) << r.alpha;
  ASSERT_FALSE(s.calls.empty());
  EXPECT_DOUBLE_EQ(s.calls.back().first, 8.0);
  EXPECT_DOUBLE_EQ(s.calls.back().second, 9.0);
}

// The first (cold) angle fails but its neighbours converge: the back-fill solves it warm from
// one of them.
TEST(SweepPolar, FailedStartIsBackFilledFromANeighbour) {
  StandIn s;
  s.converges = [](double a, const ViscousState* w) { return w != nullptr || a != 0.0; };
  PolarOptions o;
  o.alpha_from = -2;
  o.alpha_to = 2;
  const Polar p = sweep_polar(s.solver(), 0.0, o);
  for (const ViscousResult& r : p.points) EXPECT_TRUE(r.converged()) << r.alpha;
  EXPECT_DOUBLE_EQ(s.calls.back().first, 0.0);
  EXPECT_FALSE(std::isnan(s.calls.back().second));
}

// A point solver with two solution branches: cl = 0.1 alpha, and above 4 deg a warm start over
// more than 0.6 deg lands on a second branch 0.2 higher (as a long Newton path can near stall).
// The lift jump from the line through the two converged angles before it sends each such step to
// halved sub-steps, which stay on the first branch: every grid point lies on it.
TEST(SweepPolar, AJumpToAnotherBranchIsCheckedBySubSteps) {
  int calls = 0;
  const PointSolver solve = [&calls](double a, const ViscousState* w) {
    ++calls;
    const double from = w ? w->stations[0].c : a;
    const double cl = 0.1 * a + ((w && a > 4.0 && std::abs(a - from) > 0.6) ? 0.2 : 0.0);
    return remembered_point(a, cl);
  };
  PolarOptions o = angle_grid(0, 8, 1);
  o.refine_cl_max = false;
  const Polar p = sweep_polar(solve, 0.0, o);
  for (const ViscousResult& r : p.points) {
    EXPECT_TRUE(r.converged()) << r.alpha;
    EXPECT_NEAR(r.cl, 0.1 * r.alpha, 1e-12) << r.alpha;
  }
  EXPECT_GT(calls, 9);  // the sub-steps were made
}

// A real jump is kept: cl falls by 0.3 above 6.2 deg on every path (a stall). The sub-steps find
// the same fall, and the points beyond it lie on the lower branch.
TEST(SweepPolar, ARealLiftJumpIsKept) {
  const PointSolver solve = [](double a, const ViscousState*) {
    return remembered_point(a, 0.1 * a - (a > 6.2 ? 0.3 : 0.0));
  };
  PolarOptions o = angle_grid(0, 9, 1);
  o.refine_cl_max = false;
  const Polar p = sweep_polar(solve, 0.0, o);
  for (const ViscousResult& r : p.points) {
    EXPECT_TRUE(r.converged()) << r.alpha;
    EXPECT_NEAR(r.cl, 0.1 * r.alpha - (r.alpha > 6.2 ? 0.3 : 0.0), 1e-12) << r.alpha;
  }
  EXPECT_TRUE(p.summary.cl_max_bracketed);
  EXPECT_NEAR(p.summary.alpha_cl_max, 6.2, 0.05 + 1e-9);  // the highest sub-step below the fall
}

// Stall stand-in: nothing converges above 10.4 deg. The points above fail (converged false, grid
// angles kept), the march goes on, and cl_max is the highest sub-step reached, a lower bound.
TEST(SweepPolar, StallBeyondAnAngleGivesAnUnbracketedMaximum) {
  StandIn s;
  s.converges = [](double a, const ViscousState*) { return a <= 10.4; };
  PolarOptions o;
  o.alpha_from = 6;
  o.alpha_to = 13;
  const Polar p = sweep_polar(s.solver(), 0.0, o);
  ASSERT_EQ(p.points.size(), 8u);
  for (const ViscousResult& r : p.points) EXPECT_EQ(r.converged(), r.alpha <= 10.0) << r.alpha;
  EXPECT_DOUBLE_EQ(p.points.back().alpha, 13.0);
  ASSERT_TRUE(p.summary.has_cl_max);
  EXPECT_FALSE(p.summary.cl_max_bracketed);
  // Sub-steps from 10: 10.5 fails, 10.25 converges, then 10.375 (step 0.125), 10.4375 fails, so
  // the last converged sub-step is 10.375 and the next step (0.03125) is below kMinSubStep.
  EXPECT_NEAR(p.summary.alpha_cl_max, 10.375, 1e-12);
  EXPECT_NEAR(p.summary.cl_max, 1.0375, 1e-12);
}

// Exact: golden-section refinement of cl = 1.5 - 0.01 (alpha - 12.3)^2 from a 1-deg grid finds
// the vertex to better than the final bracket (0.05 deg), so cl_max within 0.01 * 0.05^2.
TEST(SweepPolar, RefinesABracketedMaximum) {
  StandIn s;
  s.converges = [](double, const ViscousState*) { return true; };
  s.cl = [](double a) { return 1.5 - 0.01 * (a - 12.3) * (a - 12.3); };
  PolarOptions o;
  o.alpha_from = 8;
  o.alpha_to = 15;
  const Polar p = sweep_polar(s.solver(), 0.0, o);
  ASSERT_TRUE(p.summary.cl_max_bracketed);
  EXPECT_NEAR(p.summary.alpha_cl_max, 12.3, kClMaxRefineWidth);
  EXPECT_NEAR(p.summary.cl_max, 1.5, 0.01 * kClMaxRefineWidth * kClMaxRefineWidth);
  EXPECT_NE(p.summary.note.find("golden"), std::string::npos);
  // Refinement solves are warm-started from a converged state within the 2-deg bracket.
  for (std::size_t k = 8; k < s.calls.size(); ++k) {
    EXPECT_LE(std::abs(s.calls[k].first - s.calls[k].second), 1.0 + 1e-12);
  }
  o.refine_cl_max = false;
  EXPECT_DOUBLE_EQ(sweep_polar(s.solver(), 0.0, o).summary.alpha_cl_max, 12.0);
}

// Refinement on a two-branch stand-in: cl = 1.2 - 0.01 (alpha - 16.6)^2, and above 16.8 deg a
// warm start over more than 0.4 deg lands on a branch 0.3 higher (as NACA 0015 at Re 2e5 did
// from 16.47 to 17.06 deg). The golden-section search samples 17.06 from 16.47; that sample is
// far above the parabola through the bracket, so it is made again by checked sub-steps, which
// stay on the first branch: cl_max is its peak, 1.2 at 16.6 deg (to the bracket width).
TEST(RefineClMax, AJumpInsideTheBracketIsCheckedBySubSteps) {
  const auto branch = [](double a) { return 1.2 - 0.01 * (a - 16.6) * (a - 16.6); };
  const PointSolver solve = [&](double a, const ViscousState* w) {
    const double from = w ? w->stations[0].c : a;
    return remembered_point(a, branch(a) + (a > 16.8 && std::abs(a - from) > 0.4 ? 0.3 : 0.0));
  };
  std::vector<ViscousResult> known;
  for (double a : {14.0, 16.0, 18.0}) known.push_back(solve(a, nullptr));
  PolarSummary s = summarize_polar(known);
  ASSERT_TRUE(s.cl_max_bracketed);
  EXPECT_GT(refine_cl_max(known, solve, s), 0);
  EXPECT_NEAR(s.cl_max, 1.2, 0.01 * kClMaxRefineWidth * kClMaxRefineWidth);
  EXPECT_NEAR(s.alpha_cl_max, 16.6, kClMaxRefineWidth);
}

}  // namespace
}  // namespace fulmar::viscous
