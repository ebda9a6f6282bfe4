// Polar sweep and summary: the summary logic on synthetic polars with exact answers, the
// continuation and its fallbacks with stand-in point solvers, and a real NACA 0012 polar against
// wind-tunnel data.
#include "solvers/viscous/polar.h"

#include <gtest/gtest.h>

#include <string>
#include <utility>

#include <cmath>
#include <functional>
#include <set>

#include "common/error.h"
#include "geometry/naca.h"
#include "geometry/panelling.h"

namespace fulmar::viscous {
namespace {

// A converged synthetic point.
ViscousResult point(double alpha, double cl, double cd, double cm, bool converged = true) {
  ViscousResult r;
  r.alpha = alpha;
  r.cl = cl;
  r.cd = cd;
  r.cm = cm;
  r.status = converged ? SolveStatus::kConverged : SolveStatus::kNotConverged;
  return r;
}

std::vector<ViscousResult> synthetic(double from, double to, double step,
                                     const std::function<ViscousResult(double)>& f) {
  std::vector<ViscousResult> v;
  for (double a = from; a <= to + 1e-9; a += step) v.push_back(f(a));
  return v;
}

// Exact: for cl = 0.1 (alpha + 1.5) linear interpolation and least squares reproduce the line,
// so the zero-lift angle is -1.5 and the slope 0.1 per deg to round-off; cm = -0.05 + 0.02 cl
// gives dcm/dcl = 0.02, x_ac = 0.25 - 0.02 = 0.23 and cm at zero lift -0.05.
TEST(SummarizePolar, LinearLiftAndMomentAreExact) {
  const auto pts = synthetic(-4.0, 8.0, 1.0, [](double a) {
    const double cl = 0.1 * (a + 1.5);
    return point(a, cl, 0.01 + 0.01 * cl * cl, -0.05 + 0.02 * cl);
  });
  const PolarSummary s = summarize_polar(pts);
  ASSERT_TRUE(s.has_zero_lift);
  ASSERT_TRUE(s.has_linear_range);
  EXPECT_NEAR(s.alpha_zero_lift, -1.5, 1e-12);
  EXPECT_NEAR(s.lift_slope_per_deg, 0.1, 1e-12);
  EXPECT_NEAR(s.x_ac, 0.23, 1e-12);
  EXPECT_NEAR(s.cm_zero_lift, -0.05, 1e-12);
  // Linear to the end: no maximum, stated in the note, null in JSON.
  EXPECT_FALSE(s.has_cl_max);
  EXPECT_NE(s.note.find("still rises"), std::string::npos) << s.note;
  const nlohmann::json j = s.to_json();
  EXPECT_TRUE(j["cl_max"].is_null());
  EXPECT_FALSE(j["has_cl_max"].get<bool>());
  EXPECT_NEAR(j["x_ac"].get<double>(), 0.23, 1e-12);
}

// Exact: the vertex of cd = 0.006 + 0.02 (cl - 0.33)^2 lies between grid points (cl step 0.1),
// and the parabola through three of its points is the function itself.
TEST(SummarizePolar, ParabolicDragMinimumIsExact) {
  const auto pts = synthetic(-4.0, 8.0, 1.0, [](double a) {
    const double cl = 0.1 * a;
    return point(a, cl, 0.006 + 0.02 * (cl - 0.33) * (cl - 0.33), 0.0);
  });
  const PolarSummary s = summarize_polar(pts);
  ASSERT_TRUE(s.has_cd_min);
  EXPECT_NEAR(s.cd_min, 0.006, 1e-14);
  EXPECT_NEAR(s.cl_at_cd_min, 0.33, 1e-12);
  // Exact: cd = 1.1 cd_min where 0.02 (cl - 0.33)^2 = 0.0006, cl = 0.33 -+ 0.1732; between grid
  // points the chord of the parabola is used, so the edges are close but not exact (the chord
  // error is at most step^2/8 * 0.04 / slope, about 1e-2 in cl here).
  ASSERT_TRUE(s.has_bucket);
  EXPECT_NEAR(s.bucket_cl_lower, 0.33 - std::sqrt(0.03), 0.01);
  EXPECT_NEAR(s.bucket_cl_upper, 0.33 + std::sqrt(0.03), 0.01);
}

// Exact: a flat bucket cd = 0.005 for |cl - 0.4| <= 0.3 with linear walls (slope 0.05): the walls
// cross 1.1 cd_min = 0.0055 at |cl - 0.4| = 0.31, and the grid neighbours around each edge lie on
// one wall, so linear interpolation is exact. The three lowest points are equal: no parabola.
TEST(SummarizePolar, FlatBucketEdgesAreExact) {
  const auto pts = synthetic(-5.0, 13.0, 1.0, [](double a) {
    const double cl = 0.1 * a;
    const double cd = 0.005 + 0.05 * std::max(0.0, std::abs(cl - 0.4) - 0.3);
    return point(a, cl, cd, 0.0);
  });
  const PolarSummary s = summarize_polar(pts);
  EXPECT_NEAR(s.cd_min, 0.005, 1e-15);
  ASSERT_TRUE(s.has_bucket);
  EXPECT_NEAR(s.bucket_cl_lower, 0.09, 1e-12);
  EXPECT_NEAR(s.bucket_cl_upper, 0.71, 1e-12);
  const nlohmann::json b = s.to_json()["bucket"];
  EXPECT_NEAR(b["cl_upper"].get<double>(), 0.71, 1e-12);
}

// Point order does not matter; non-converged points are ignored (their numbers are garbage).
TEST(SummarizePolar, IgnoresOrderAndFailedPoints) {
  auto pts = synthetic(-4.0, 8.0, 1.0, [](double a) {
    const double cl = 0.1 * (a + 1.5);
    return point(a, cl, 0.01 + 0.01 * cl * cl, -0.05 + 0.02 * cl);
  });
  pts[3] = point(-1.0, 55.0, -3.0, 9.0, false);
  std::reverse(pts.begin(), pts.end());
  const PolarSummary s = summarize_polar(pts);
  EXPECT_NEAR(s.alpha_zero_lift, -1.5, 1e-12);
  EXPECT_NEAR(s.lift_slope_per_deg, 0.1, 1e-12);
  EXPECT_NEAR(s.cd_min, 0.01, 1e-12);
  EXPECT_FALSE(s.has_cl_max);
}

// Exact: a line whose zero lies half a step below the first point (no sign change among the
// points) is extrapolated to its zero; one that lies 3 steps below is not.
TEST(SummarizePolar, ZeroLiftJustOutsideTheRangeIsExtrapolated) {
  auto line = [](double a0) {
    return synthetic(0.0, 6.0, 1.0, [a0](double a) { return point(a, 0.1 * (a - a0), 0.01, 0.0); });
  };
  const PolarSummary near = summarize_polar(line(-0.5));
  ASSERT_TRUE(near.has_zero_lift);
  EXPECT_NEAR(near.alpha_zero_lift, -0.5, 1e-12);
  EXPECT_NEAR(near.lift_slope_per_deg, 0.1, 1e-12);
  EXPECT_NE(near.note.find("extrapolated"), std::string::npos);
  EXPECT_FALSE(summarize_polar(line(-3.0)).has_zero_lift);
}

TEST(SummarizePolar, NothingConvergedGivesNulls) {
  const auto pts = synthetic(0.0, 3.0, 1.0, [](double a) { return point(a, 1, 1, 1, false); });
  const nlohmann::json j = summarize_polar(pts).to_json();
  for (const char* key : {"cl_max", "alpha_cl_max", "alpha_zero_lift", "lift_slope_per_deg",
                          "cd_min", "cl_at_cd_min", "cm_zero_lift", "x_ac", "bucket"}) {
    EXPECT_TRUE(j[key].is_null()) << key;
  }
  EXPECT_FALSE(j["note"].get<std::string>().empty());
}

// cl falls after the maximum at converged angles: bracketed.
TEST(SummarizePolar, InteriorPeakIsBracketed) {
  const auto pts = synthetic(0.0, 16.0, 1.0, [](double a) {
    return point(a, 1.5 - 0.01 * (a - 12.3) * (a - 12.3), 0.01, 0.0);
  });
  const PolarSummary s = summarize_polar(pts);
  ASSERT_TRUE(s.has_cl_max);
  EXPECT_TRUE(s.cl_max_bracketed);
  EXPECT_DOUBLE_EQ(s.alpha_cl_max, 12.0);
}

// Converged up to 12 deg, failures beyond: a maximum, not bracketed, a lower bound by the note.
TEST(SummarizePolar, FailuresBeyondTheMaximumAreNotBracketed) {
  const auto pts = synthetic(
      0.0, 16.0, 1.0, [](double a) { return point(a, 0.1 * a, 0.01, 0.0, a <= 12.0 + 1e-9); });
  const PolarSummary s = summarize_polar(pts);
  ASSERT_TRUE(s.has_cl_max);
  EXPECT_FALSE(s.cl_max_bracketed);
  EXPECT_DOUBLE_EQ(s.cl_max, 1.2);
  EXPECT_NE(s.note.find("lower bound"), std::string::npos) << s.note;
}

// Extra samples count for cl_max only: a sub-step beyond the last converged point that lies
// higher moves the maximum; one beyond it that lies lower brackets it.
TEST(SummarizePolar, ExtraSamplesCountForTheMaximumOnly) {
  const auto pts = synthetic(
      0.0, 16.0, 1.0, [](double a) { return point(a, 0.1 * a, 0.01, 0.0, a <= 12.0 + 1e-9); });
  const std::vector<ViscousResult> higher = {point(12.5, 1.25, 0.5, 0.0)};
  const PolarSummary h = summarize_polar(pts, &higher);
  EXPECT_DOUBLE_EQ(h.cl_max, 1.25);
  EXPECT_FALSE(h.cl_max_bracketed);
  EXPECT_NEAR(h.cd_min, 0.01, 1e-15);  // the extra sample's drag does not count
  const std::vector<ViscousResult> lower = {point(12.25, 1.1, 0.01, 0.0)};
  const PolarSummary l = summarize_polar(pts, &lower);
  EXPECT_DOUBLE_EQ(l.alpha_cl_max, 12.0);
  EXPECT_TRUE(l.cl_max_bracketed);
}

// Post-stall rise: cl peaks at 1.2 (10 deg), falls to 1.0 at 14 deg, then rises to 1.4 at 18.
// The stall (cl more than 0.05 below the maximum so far: at 12 deg) ends the search, so cl_max is
// the first peak, bracketed, and the note says why the later rise is left out.
TEST(SummarizePolar, PostStallRiseIsNotTheMaximum) {
  const auto pts = synthetic(0.0, 20.0, 1.0, [](double a) {
    double cl = 0.12 * a;
    if (a > 10.0) cl = a <= 14.0 ? 1.2 - 0.05 * (a - 10.0) : 1.0 + 0.1 * std::min(a - 14.0, 4.0);
    return point(a, cl, 0.02, 0.0);
  });
  const PolarSummary s = summarize_polar(pts);
  EXPECT_TRUE(s.cl_max_bracketed);
  EXPECT_NEAR(s.cl_max, 1.2, 1e-12);
  EXPECT_DOUBLE_EQ(s.alpha_cl_max, 10.0);
  EXPECT_NE(s.note.find("post-stall"), std::string::npos) << s.note;
  // A fall smaller than kStallLiftDrop (0.04 at 6 deg) before a higher value is not a stall.
  const auto wiggle = synthetic(
      0.0, 12.0, 1.0, [](double a) { return point(a, a == 6.0 ? 0.46 : 0.1 * a, 0.02, 0.0); });
  const PolarSummary w = summarize_polar(wiggle);
  EXPECT_NEAR(w.cl_max, 1.2, 1e-12);
}

// Polar options for the angle grid from_deg..to_deg in step_deg steps, other options default.
PolarOptions angle_grid(double from_deg, double to_deg, double step_deg) {
  PolarOptions o;
  o.alpha_from = from_deg;
  o.alpha_to = to_deg;
  o.alpha_step = step_deg;
  return o;
}

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

TEST(PolarOptions, ValidateNamesTheField) {
  auto message = [](PolarOptions o) {
    try {
      o.Validate();
    } catch (const InputError& e) {
      return std::string(e.what());
    }
    return std::string();
  };
  PolarOptions o;
  EXPECT_EQ(message(o), "");
  o.alpha_step = 0;
  EXPECT_NE(message(o).find("alpha_step"), std::string::npos);
  o = PolarOptions{};
  o.alpha_from = 5;
  o.alpha_to = 1;
  EXPECT_NE(message(o).find("alpha_to"), std::string::npos);
  o = PolarOptions{};
  o.alpha_to = 75;
  EXPECT_NE(message(o).find("alpha_to"), std::string::npos);
  o = PolarOptions{};
  o.alpha_step = 1e-4;
  EXPECT_NE(message(o).find("2001"), std::string::npos);
}

// A viscous solver for a NACA section at chord Reynolds number `re`, free transition (N 9),
// 160 panels: the set-up of every real-section sweep below.
ViscousSolver section_solver(const std::string& naca, double re) {
  PanellingOptions po;
  po.panels = 160;
  ViscousOptions vo;
  vo.reynolds = re;
  return ViscousSolver(panel_nodes(naca_section(naca), po), vo);
}

// The number of converged points of a polar.
int converged_points(const Polar& p) {
  int n = 0;
  for (const ViscousResult& r : p.points) n += r.converged();
  return n;
}

// Real polar: NACA 0012, Re 6e6, free transition (N 9), 160 panels, -2 .. 8 deg.
TEST(SweepPolar, Naca0012AtSixMillion) {
  const ViscousSolver solver = section_solver("0012", 6.0e6);
  const Polar p = sweep_polar(solver, angle_grid(-2, 8, 1));
  const int converged = converged_points(p);
  // All of -2..8 deg is well below stall (about 16 deg at this Re; Abbott & von Doenhoff 1959,
  // from memory) and the solver converges there from cold starts: every point must converge.
  EXPECT_EQ(converged, 11);
  const PolarSummary& s = p.summary;
  ASSERT_TRUE(s.has_zero_lift);
  ASSERT_TRUE(s.has_linear_range);
  // Exact by symmetry: a symmetric section has zero lift at zero incidence; the panelling is
  // symmetric, so only convergence tolerance and round-off move it (0.05 deg allowed, the
  // refinement width used elsewhere).
  EXPECT_NEAR(s.alpha_zero_lift, 0.0, 0.05);
  // Ladson, NASA TM 4074 (1988): lift slope about 0.108 per deg at Re 6e6 with fixed transition;
  // Abbott & von Doenhoff (1959): about 0.11 per deg (both from memory). +-0.01 (about 9 %)
  // covers the spread between the two references, free versus fixed transition and the
  // panel-method lift slope, which is a few per cent above the measured one.
  EXPECT_GT(s.lift_slope_per_deg, 0.098);
  EXPECT_LT(s.lift_slope_per_deg, 0.118);
  // Common practice: the aerodynamic centre of a subsonic section lies at 0.23..0.27 chord.
  EXPECT_GT(s.x_ac, 0.23);
  EXPECT_LT(s.x_ac, 0.27);
  // cl still rises at 8 deg: no maximum.
  EXPECT_FALSE(s.has_cl_max);
  // Symmetric: minimum drag at zero lift (within the parabola's resolution, 0.02 in cl) and
  // cd_min about 0.0054 at Re 6e6 with free transition (Abbott & von Doenhoff 1959, smooth
  // NACA 0012, from memory); 20 % allowed for transition sensitivity.
  EXPECT_NEAR(s.cl_at_cd_min, 0.0, 0.02);
  EXPECT_NEAR(s.cd_min, 0.0054, 0.2 * 0.0054);
  std::printf(
      "NACA 0012 Re 6e6: alpha_L0 %.4f, slope %.5f /deg, x_ac %.4f, cd_min %.5f at cl "
      "%.4f, %d solves\n",
      s.alpha_zero_lift, s.lift_slope_per_deg, s.x_ac, s.cd_min, s.cl_at_cd_min, p.solves);
}

// The stall range of a NACA section at Re 6e6, free transition, 160 panels: 12..21 deg in 1-deg
// steps (reached by the lead-in march from zero lift); `options` receives the grid used.
Polar stall_polar(const std::string& naca, PolarOptions& options) {
  const ViscousSolver solver = section_solver(naca, 6.0e6);
  options.alpha_from = 12;
  options.alpha_to = 21;
  options.alpha_step = 1;
  return sweep_polar(solver, options);
}

// Real stall: NACA 0012, Re 6e6, free transition, 160 panels, 12..21 deg (reached by the lead-in
// march from zero lift). Exact invariants of the refinement: the refined cl_max is at least the
// largest grid cl and lies within one step of the grid peak. Against experiment, cl_max of the
// smooth NACA 0012 near Re 6e6 is about 1.6 (Abbott & von Doenhoff 1959) to about 1.75 (Ladson,
// NASA TM 4074, 1988), both from memory; 1.45..1.95 allows 0.15 beyond either, since the
// integral boundary layer's trailing-edge separation near stall is its least certain part.
TEST(SweepPolar, Naca0012MaximumLiftAtSixMillion) {
  PolarOptions o;
  const Polar p = stall_polar("0012", o);
  const PolarSummary& s = p.summary;
  ASSERT_TRUE(s.has_cl_max) << s.note;
  ASSERT_TRUE(s.cl_max_bracketed) << s.note;
  double grid_max = -1.0, grid_alpha = 0.0;
  for (const ViscousResult& r : p.points) {
    if (r.converged() && r.cl > grid_max) {
      grid_max = r.cl;
      grid_alpha = r.alpha;
    }
  }
  EXPECT_GE(s.cl_max, grid_max);
  EXPECT_LE(std::abs(s.alpha_cl_max - grid_alpha), o.alpha_step + 1e-9);
  EXPECT_GT(s.cl_max, 1.45);
  EXPECT_LT(s.cl_max, 1.95);
  std::printf("NACA 0012 Re 6e6: cl_max %.4f at %.2f deg (%d solves): %s\n", s.cl_max,
              s.alpha_cl_max, p.solves, s.note.c_str());
}

// NACA 2412 and 4412, Re 6e6, free transition, 160 panels: cl_max against Abbott & von Doenhoff
// 1959 (Appendix IV, smooth sections near Re 5.9e6: about 1.7 and about 1.67, both from memory),
// within the 0.15 the issue allows for an integral boundary layer near stall (its trailing-edge
// separation is the least certain part of the model). Measured 1.762 at 17.2 deg and 1.782 at
// 16.0 deg, both high (1.800 and 1.834 when the lift was the circulation of the edge speed).
class MaximumLiftOfCamberedSection
    : public ::testing::TestWithParam<std::pair<const char*, double>> {};

TEST_P(MaximumLiftOfCamberedSection, WithinHandbookAllowanceAtSixMillion) {
  const auto [naca, handbook] = GetParam();
  PolarOptions o;
  const Polar p = stall_polar(naca, o);
  const PolarSummary& s = p.summary;
  ASSERT_TRUE(s.has_cl_max) << s.note;
  ASSERT_TRUE(s.cl_max_bracketed) << s.note;
  EXPECT_NEAR(s.cl_max, handbook, 0.15) << s.note;
  std::printf("NACA %s Re 6e6: cl_max %.4f at %.2f deg (%d solves): %s\n", naca, s.cl_max,
              s.alpha_cl_max, p.solves, s.note.c_str());
}

INSTANTIATE_TEST_SUITE_P(SweepPolar, MaximumLiftOfCamberedSection,
                         ::testing::Values(std::pair<const char*, double>{"2412", 1.7},
                                           std::pair<const char*, double>{"4412", 1.67}));

// Robustness at low Reynolds number, where laminar separation bubbles move the transition by an
// interval or two per half degree: NACA 4415, Re 2e5, free transition, 160 panels, -4..14 deg in
// 0.5-deg steps (below stall, which is near 16-19 deg at this Re in the model). Every point of
// this range is an attached or bubble flow that the integral method is meant to handle, so the
// sweep must converge nearly everywhere; the allowance of 3 of 37 is the bench's failure rate
// over its whole set (5 %, bench/bench_polar), rounded up. Measured 37 of 37 (36 when the
// allowance was set); 14 of 37 when a
// transition moving upstream replaced the crossed station's shape factor by the downstream one.
TEST(SweepPolar, Naca4415AtLowReynoldsNumberConvergesBelowStall) {
  const ViscousSolver solver = section_solver("4415", 2.0e5);
  PolarOptions o = angle_grid(-4, 14, 0.5);
  o.refine_cl_max = false;
  const Polar p = sweep_polar(solver, o);
  ASSERT_EQ(p.points.size(), 37u);
  EXPECT_GE(converged_points(p), 34);
}

// Near stall at low Reynolds number the coupled equations have more than one solution: on NACA
// 0012 at Re 2e5 (free transition, 160 panels) a 1-deg warm start from 12 deg once converged, in
// 24 Newton iterations, on a branch with cl 1.279 at 13 deg where a march in 0.25-deg steps gives
// 1.137 (and from 15 to 16 deg on one with 1.324 against 1.153), a spike that cl_max refinement
// then took for the maximum. With the lift-jump check a 1-deg polar from 10 to 16 deg lies on the
// branch of the 0.25-deg march: the same solutions of the same equations, so they agree to the
// Newton tolerance; 1e-3 leaves room for a different sequence of transition-interval moves and is
// a hundredth of the jumps seen.
TEST(SweepPolar, CoarseStepsFollowTheFineStepBranchNearStall) {
  const ViscousSolver solver = section_solver("0012", 2.0e5);
  PolarOptions coarse = angle_grid(10, 16, 1);
  PolarOptions fine = angle_grid(10, 16, 0.25);
  coarse.refine_cl_max = fine.refine_cl_max = false;
  const Polar pc = sweep_polar(solver, coarse);
  const Polar pf = sweep_polar(solver, fine);
  ASSERT_EQ(pc.points.size(), 7u);
  ASSERT_EQ(pf.points.size(), 25u);
  for (int i = 0; i < 7; ++i) {
    const ViscousResult& c = pc.points[static_cast<std::size_t>(i)];
    const ViscousResult& f = pf.points[static_cast<std::size_t>(4 * i)];
    ASSERT_TRUE(c.converged() && f.converged()) << c.alpha;
    EXPECT_NEAR(c.cl, f.cl, 1e-3) << c.alpha << " deg";
  }
}

}  // namespace
}  // namespace fulmar::viscous
