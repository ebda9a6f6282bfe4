// Real polars: NACA sections swept by the full viscous solver against wind-tunnel data.
#include "solvers/viscous/polar.h"

#include <gtest/gtest.h>

#include <string>

#include "geometry/naca.h"
#include "geometry/panelling.h"
#include "solvers/viscous/polar_test_points.h"

namespace fulmar::viscous {
namespace {

using testing::angle_grid;

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
