// The coupled viscous-inviscid Newton solve: consistency of its Jacobian, convergence, and the
// physics against published experiments (each check names its source and why its tolerance).
#include "solvers/viscous/viscous_solver.h"

#include <gtest/gtest.h>

#include <cmath>
#include <string>
#include <tuple>
#include <vector>

#include "geometry/cst.h"
#include "geometry/naca.h"
#include "geometry/panelling.h"

namespace fulmar::viscous {
namespace {

Points naca_nodes(const std::string& digits, int panels) {
  PanellingOptions po;
  po.panels = panels;
  return panel_nodes(naca_section(digits), po);
}

ViscousOptions options_at(double reynolds, double trip = 1.0, double mach = 0.0) {
  ViscousOptions o;
  o.reynolds = reynolds;
  o.trip_upper = o.trip_lower = trip;
  o.mach = mach;
  return o;
}

// Zero-lift angle by linear interpolation between two converged solutions that bracket cl = 0.
double zero_lift_angle(const ViscousResult& a, const ViscousResult& b) {
  return a.alpha - a.cl * (b.alpha - a.alpha) / (b.cl - a.cl);
}

TEST(ViscousSolver, Naca0012ZeroIncidenceConvergesQuadratically) {
  const ViscousOptions o = options_at(6.0e6);
  const ViscousSolver solver(naca_nodes("0012", 160), o);
  const ViscousResult r = solver.solve_alpha(0.0);
  ASSERT_TRUE(r.converged) << r.reason;
  EXPECT_EQ(r.status, SolveStatus::kConverged);
  EXPECT_LT(r.residual, o.tolerance);
  // Newton with exact Jacobians: the last steps square the residual (r_k+1 <= C r_k^2, C = 20
  // allows for the problem's scaling).
  const auto& h = r.residual_history;
  ASSERT_GE(h.size(), 3u);
  for (std::size_t k = h.size() - 2; k < h.size(); ++k) EXPECT_LT(h[k], 20.0 * h[k - 1] * h[k - 1]);
  ASSERT_EQ(r.history.size() + 1, h.size());
  // Symmetric section at zero incidence: no lift, no moment, the same transition on both sides
  // (exact).
  EXPECT_NEAR(r.cl, 0.0, 1e-3);
  EXPECT_NEAR(r.cm, 0.0, 1e-3);
  EXPECT_NEAR(r.transition_upper, r.transition_lower, 0.01);
  // Abbott & von Doenhoff 1959 (Theory of Wing Sections, app. IV, NACA 0012 at Re 6e6, smooth):
  // cd about 0.0058 at zero lift (the figure; from memory). Tolerance 15 %, as the issue
  // asks for cd_min of cambered sections. Measured 0.00546 (-6 %).
  EXPECT_NEAR(r.cd, 0.0058, 0.15 * 0.0058);
  // Friction dominates the drag of a thin section at zero lift; pressure drag small and positive
  // within the accuracy of the split (common practice: 5-20 % of cd).
  EXPECT_GT(r.cd_friction, 0.6 * r.cd);
  EXPECT_LT(r.cd_friction, 1.1 * r.cd);
}

// The Newton Jacobian (block boundary-layer part plus the edge-velocity coupling through the
// mass-defect matrix) against central differences of the residuals, cold and warm started.
struct JacobianCase {
  std::string digits;
  double alpha;
  int steps;
  double warm_from;  // NaN: cold start
};

class CoupledJacobian : public ::testing::TestWithParam<JacobianCase> {};

TEST_P(CoupledJacobian, MatchesCentralDifferences) {
  const JacobianCase c = GetParam();
  const ViscousSolver solver(naca_nodes(c.digits, 120), options_at(3.0e6));
  ViscousResult warm;
  if (!std::isnan(c.warm_from)) {
    warm = solver.solve_alpha(c.warm_from);
    ASSERT_TRUE(warm.converged) << warm.reason;
  }
  const JacobianCheck j =
      solver.jacobian_check(c.alpha, c.steps, std::isnan(c.warm_from) ? nullptr : &warm.state);
  ASSERT_EQ(j.analytic.rows(), j.difference.rows());
  // Relative to each row's largest entry: central differences with a 1e-6 relative step carry
  // truncation and round-off errors near 1e-6 of that scale; 1e-4 leaves room for rows whose
  // entries span many decades, and a wrong term shows up as an O(1) difference.
  int bad = 0;
  for (Eigen::Index r = 0; r < j.analytic.rows(); ++r) {
    const double scale = j.difference.row(r).cwiseAbs().maxCoeff() + 1e-12;
    const double err = (j.analytic.row(r) - j.difference.row(r)).cwiseAbs().maxCoeff();
    if (err > 1e-4 * scale) ++bad;
  }
  EXPECT_EQ(bad, 0);
}

INSTANTIATE_TEST_SUITE_P(States, CoupledJacobian,
                         ::testing::Values(JacobianCase{"0012", 0.0, 0, NAN},
                                           JacobianCase{"0012", 4.0, 2, NAN},
                                           JacobianCase{"2412", 3.0, 0, 2.0},
                                           JacobianCase{"4412", 6.0, 3, NAN}),
                         [](const ::testing::TestParamInfo<JacobianCase>& i) {
                           return "naca" + i.param.digits + "_case" + std::to_string(i.index);
                         });

class ConvergesAt : public ::testing::TestWithParam<double> {};

TEST_P(ConvergesAt, Naca0012FreeTransition) {
  const double alpha = GetParam();
  const ViscousSolver solver(naca_nodes("0012", 160), options_at(6.0e6));
  const ViscousResult r = solver.solve_alpha(alpha);
  ASSERT_TRUE(r.converged) << r.reason;
  // Symmetric section: the lift changes sign with the angle (exact); its size against the
  // inviscid slope of a 12 % section, 2 pi (1 + 0.77 t/c) per rad (from memory; the panel method
  // gives it within 0.5 %), which the boundary layer lowers by up to 10 % below stall (common
  // practice). Measured ratio to that slope: 0.918-0.938 (to 2 pi: 1.003-1.025).
  const double inviscid = 2.0 * M_PI * (1.0 + 0.77 * 0.12) * alpha * M_PI / 180.0;
  EXPECT_GT(r.cl * inviscid, 0.0);
  EXPECT_LT(r.cl / inviscid, 1.0);
  EXPECT_GT(r.cl / inviscid, 0.9);
  EXPECT_TRUE(std::isfinite(r.cd) && r.cd > 0.0);
}

INSTANTIATE_TEST_SUITE_P(Angles, ConvergesAt, ::testing::Values(-3.0, 2.0, 5.0, 8.0),
                         [](const ::testing::TestParamInfo<double>& i) {
                           return "alpha_" + std::to_string(i.index);
                         });

// Warm starts across a transition point that moves upstream: from the neighbour's state the first
// Newton step asked the first turbulent station behind the transition (a reattaching layer,
// H 2.25) for H 0.8 and took it to 1.07, after which every step was cut to 1-2 % and the solve
// gave up (NACA 0012 at 7 deg from 6.5, NACA 4415 at -4 from -3, Re 6e6, 160 panels: both failed
// after 13 iterations). A turbulent H - 1 now falls at most to 0.3 of itself per step; both
// converge in 8. Converged, each must also be the solution that two half steps reach (cd within
// 0.1 %: two converged solutions of one case closer than that are the same state, given the 1e-9
// tolerance; a second branch differs by percents).
struct WarmCase {
  const char* digits;
  double from, to;
};
class WarmAcrossTransition : public ::testing::TestWithParam<WarmCase> {};

TEST_P(WarmAcrossTransition, ConvergesToTheColdSolution) {
  const WarmCase c = GetParam();
  const ViscousSolver solver(naca_nodes(c.digits, 160), options_at(6.0e6));
  const ViscousResult neighbour = solver.solve_from(c.from, nullptr);
  ASSERT_TRUE(neighbour.converged) << neighbour.reason;
  const ViscousResult warm = solver.solve_from(c.to, &neighbour.state);
  ASSERT_TRUE(warm.converged) << warm.reason;
  // The reference: the same angle reached in two half steps (a cold start at 7 deg does not
  // converge for NACA 0012).
  const ViscousResult half = solver.solve_from(0.5 * (c.from + c.to), &neighbour.state);
  ASSERT_TRUE(half.converged) << half.reason;
  const ViscousResult ref = solver.solve_from(c.to, &half.state);
  ASSERT_TRUE(ref.converged) << ref.reason;
  EXPECT_NEAR(warm.cd, ref.cd, 1e-3 * ref.cd);
  EXPECT_NEAR(warm.cl, ref.cl, 1e-3 * std::abs(ref.cl) + 1e-4);
}

INSTANTIATE_TEST_SUITE_P(Sections, WarmAcrossTransition,
                         ::testing::Values(WarmCase{"0012", 6.5, 7.0},
                                           WarmCase{"4415", -3.0, -4.0}),
                         [](const ::testing::TestParamInfo<WarmCase>& i) {
                           return "naca" + std::string(i.param.digits) + "_" +
                                  std::to_string(i.index);
                         });

// Cold starts below stall: the optimizer's first analysis of every shape is one, so each angle of
// the attached range -4..14 deg (0.5-deg steps) of these cambered sections at Re 6e6 (stall near
// 16-18 deg; Abbott & von Doenhoff 1959, from memory) must converge without a neighbour's state.
// Failed at 3 of 37 angles (NACA 2412) and 1 of 37 (NACA 23012) while a node next to the
// stagnation point kept a delta* made meaningless by the displacement effect's first shift of the
// stagnation point (H 0.97 on one side, 9.2 on the other).
class ColdStart : public ::testing::TestWithParam<const char*> {};

TEST_P(ColdStart, ConvergesAtEveryAngleOfTheAttachedRange) {
  const ViscousSolver solver(naca_nodes(GetParam(), 160), options_at(6.0e6));
  for (int k = 0; k <= 36; ++k) {
    const double alpha = -4.0 + 0.5 * k;
    const ViscousResult r = solver.solve_from(alpha, nullptr);
    EXPECT_TRUE(r.converged) << "alpha " << alpha << ": " << r.reason;
  }
}

INSTANTIATE_TEST_SUITE_P(Sections, ColdStart, ::testing::Values("2412", "23012"),
                         [](const ::testing::TestParamInfo<const char*>& i) {
                           return std::string("naca") + i.param;
                         });

// NACA 0012, Re 6e6, M 0.15, transition fixed near the leading edge: C. L. Ladson, NASA TM 4074
// (1988), values quoted by the issue (about 0.0081 at zero lift, cl about 1.07 at 10.1 deg, lift
// slope about 0.108 per deg, cl_max about 1.61 near 17 deg). Trip at 5 % chord on both sides.
TEST(ViscousValidation, Naca0012TrippedAgainstLadson1988) {
  const ViscousSolver solver(naca_nodes("0012", 160), options_at(6.0e6, 0.05, 0.15));
  const ViscousResult r0 = solver.solve_alpha(0.0);
  ASSERT_TRUE(r0.converged) << r0.reason;
  // Measured 0.00811. 5 %: the scatter of tripped-drag data between tunnels and trip heights
  // (common practice) and the "about".
  EXPECT_NEAR(r0.cd, 0.0081, 0.05 * 0.0081);
  const ViscousResult r4 = solver.solve_alpha(4.0, &r0.state);
  ASSERT_TRUE(r4.converged) << r4.reason;
  // Measured 0.116 per deg, 7 % above the tunnel value: the method has no wall-interference or
  // trip-drag effects, and viscous lift slopes of such methods run a few percent high (common
  // practice). Tolerance 10 %.
  const double slope = (r4.cl - r0.cl) / 4.0;
  EXPECT_NEAR(slope, 0.108, 0.0108);
  const ViscousResult r10 = solver.solve_alpha(10.1, &r4.state);
  ASSERT_TRUE(r10.converged) << r10.reason;
  // Measured 1.13 (+6 %), which follows from the slope above; tolerance 0.1 (9 %).
  EXPECT_NEAR(r10.cl, 1.07, 0.10);
  // cl_max about 1.61: the largest converged cl on a 1-deg march from 12 deg (the solution stops
  // converging at separation). Measured 1.66 at 16 deg. Tolerance 0.15, as the issue allows for
  // cambered sections.
  double cl_max = 0.0;
  ViscousResult prev = r10;
  for (double a = 12.0; a <= 20.0; a += 1.0) {
    ViscousResult r = solver.solve_alpha(a, prev.converged ? &prev.state : nullptr);
    if (!r.converged) break;
    cl_max = std::max(cl_max, r.cl);
    prev = std::move(r);
  }
  EXPECT_NEAR(cl_max, 1.61, 0.15);
}

// Cambered sections at Re 6e6, free transition, against Abbott & von Doenhoff 1959 (Theory of
// Wing Sections, app. IV; values from memory): NACA 2412 zero-lift angle about -2.0 deg, cm
// about -0.047, cd_min about 0.0060; NACA 4412 zero-lift angle about -3.9 deg, cm about -0.095,
// cd_min about 0.0062. The tolerances: zero-lift angle within 0.5 deg, cm within 0.02,
// cd_min within 15 %.
struct CamberedCase {
  std::string digits;
  double alpha_zero_lift, cm, cd_min;
};

class CamberedSection : public ::testing::TestWithParam<CamberedCase> {};

TEST_P(CamberedSection, AgreesWithAbbottAndVonDoenhoff1959) {
  const CamberedCase c = GetParam();
  const ViscousSolver solver(naca_nodes(c.digits, 160), options_at(6.0e6));
  std::vector<ViscousResult> polar;
  const ViscousState* warm = nullptr;
  for (double a : {-5.0, -4.0, -3.0, -2.0, -1.0, 0.0, 1.0, 2.0}) {
    polar.push_back(solver.solve_alpha(a, warm));
    ASSERT_TRUE(polar.back().converged) << c.digits << " " << a << ": " << polar.back().reason;
    warm = &polar.back().state;
  }
  double a0 = NAN, cd_min = 1.0;
  for (std::size_t k = 0; k + 1 < polar.size(); ++k) {
    if (polar[k].cl <= 0.0 && polar[k + 1].cl > 0.0) a0 = zero_lift_angle(polar[k], polar[k + 1]);
    cd_min = std::min(cd_min, polar[k].cd);
  }
  ASSERT_FALSE(std::isnan(a0));
  EXPECT_NEAR(a0, c.alpha_zero_lift, 0.5);
  // cm about the quarter chord in the linear range (at zero lift, the mean of the polar; it
  // varies by less than 0.002 over it).
  for (const ViscousResult& r : polar) EXPECT_NEAR(r.cm, c.cm, 0.02) << r.alpha;
  // Sampled at 1-deg steps: the true minimum is at most a few tenths of a percent lower.
  EXPECT_NEAR(cd_min, c.cd_min, 0.15 * c.cd_min);
  // Facts of the trade (common practice): cambered sections have a negative cm, and it barely
  // changes with angle below stall.
  EXPECT_LT(polar.front().cm, 0.0);
  EXPECT_NEAR(polar.front().cm, polar.back().cm, 0.01);
}

INSTANTIATE_TEST_SUITE_P(Naca, CamberedSection,
                         ::testing::Values(CamberedCase{"2412", -2.0, -0.047, 0.0060},
                                           CamberedCase{"4412", -3.9, -0.095, 0.0062}),
                         [](const ::testing::TestParamInfo<CamberedCase>& i) {
                           return "naca" + i.param.digits;
                         });

// x/c of the first upper-surface node behind the stagnation point with reversed wall shear (the
// laminar separation point), or NaN when the upper layer stays attached.
double upper_separation(const ViscousResult& r, const Points& nodes) {
  for (int i = r.state.stagnation_node; i >= 0; --i)
    if (r.cf(i) < 0.0) return nodes(i, 0);
  return NAN;
}

// NACA 0012 at Re 2e5, free transition (N_crit 9): the laminar layer separates and transition
// happens in the separated shear layer (a laminar separation bubble). Wind-tunnel studies of
// this section's bubble at Re 1e5..3e5 (surface oil flow and hot-wire surveys; values from
// memory, the individual reports not checked here) place laminar separation near x/c 0.6-0.7 and
// transition in the bubble near 0.75-0.85 at zero incidence, with cd about 0.010-0.012. Solved as a
// polar sweep would: cold at 1 deg, then warm starts to the neighbours.
TEST(ViscousLowReynolds, Naca0012AtTwoHundredThousandHasALaminarSeparationBubble) {
  const Points nodes = naca_nodes("0012", 160);
  const ViscousSolver solver(nodes, options_at(2.0e5));
  const ViscousResult r1 = solver.solve_alpha(1.0);
  ASSERT_TRUE(r1.converged) << r1.reason;
  const ViscousResult r0 = solver.solve_alpha(0.0, &r1.state);
  ASSERT_TRUE(r0.converged) << r0.reason;
  // Symmetric section at zero incidence: no lift, the same transition on both sides (exact).
  EXPECT_NEAR(r0.cl, 0.0, 1e-3);
  EXPECT_NEAR(r0.transition_upper, r0.transition_lower, 0.01);
  // A bubble at 0 and 1 deg: laminar separation, then transition downstream of it and upstream
  // of the trailing edge. Measured at 0 deg: separation 0.71, transition 0.87. Separation within
  // 0.1 of the quoted band (about the bubble's sensitivity to tunnel turbulence, common
  // practice); transition within 0.1 of its band (the model's first-order rate puts it up to half
  // an interval, 0.01, late, and N_crit 9 stands for one quiet tunnel).
  for (const ViscousResult* r : {&r0, &r1}) {
    const double sep = upper_separation(*r, nodes);
    ASSERT_FALSE(std::isnan(sep)) << r->alpha;
    EXPECT_GT(sep, 0.5) << r->alpha;
    EXPECT_LT(sep, 0.8) << r->alpha;
    EXPECT_GT(r->transition_upper, sep) << r->alpha;
    EXPECT_LT(r->transition_upper, 0.95) << r->alpha;
    EXPECT_GT(r->transition_upper, 0.65) << r->alpha;
  }
  // Measured 0.00957 (-4 % from the lower end of the quoted range); tolerance 15 % outside the
  // range: the scatter of low-Reynolds-number drag between tunnels (common practice), where the
  // bubble's size depends on the free-stream turbulence.
  EXPECT_GT(r0.cd, 0.85 * 0.010);
  EXPECT_LT(r0.cd, 1.15 * 0.012);
  // Up to 4 deg: converged, cd rises and the upper transition moves forward with the angle.
  ViscousResult prev = r1;
  for (double a : {2.0, 3.0, 4.0}) {
    ViscousResult r = solver.solve_alpha(a, &prev.state);
    ASSERT_TRUE(r.converged) << a << ": " << r.reason;
    EXPECT_GT(r.cd, prev.cd) << a;
    EXPECT_LT(r.transition_upper, prev.transition_upper) << a;
    prev = std::move(r);
  }
}

// Smoothness for the optimizer: cd over alpha 0..4 deg in 0.02-deg steps (warm-started) and
// over a sweep of one CST coefficient has no jump larger than 1 % of cd between neighbours (the
// issue's criterion). Measured at Re 3e6: 0.36 % (NACA 0012), 0.48 % (2412), 0.43 % (4412,
// whose lower-surface transition runs from 23 % chord to the trailing edge over this range).
class DragInAngle : public ::testing::TestWithParam<const char*> {};

TEST_P(DragInAngle, IsSmooth) {
  const ViscousSolver solver(naca_nodes(GetParam(), 160), options_at(3.0e6));
  ViscousResult prev = solver.solve_alpha(0.0);
  ASSERT_TRUE(prev.converged) << prev.reason;
  double worst = 0.0;
  for (int k = 1; k <= 200; ++k) {
    const double a = 0.02 * k;
    ViscousResult r = solver.solve_alpha(a, &prev.state);
    ASSERT_TRUE(r.converged) << a << ": " << r.reason;
    worst = std::max(worst, std::abs(r.cd - prev.cd) / prev.cd);
    prev = std::move(r);
  }
  EXPECT_LT(worst, 0.01);
}

INSTANTIATE_TEST_SUITE_P(ViscousSmoothness, DragInAngle, ::testing::Values("0012", "2412", "4412"));

TEST(ViscousSmoothness, DragIsSmoothInAShapeCoefficient) {
  const CstFit fit = fit_cst(naca_section("2412"), 5, 5);
  PanellingOptions po;
  po.panels = 160;
  double prev = NAN, worst = 0.0;
  for (int k = 0; k <= 10; ++k) {
    CstShape shape = fit.shape;
    shape.upper(2) += 2e-4 * k;  // 0.2 % of the coefficient per step
    const ViscousSolver solver(panel_nodes(cst_section(shape), po), options_at(3.0e6));
    const ViscousResult r = solver.solve_cl(0.5);
    ASSERT_TRUE(r.converged) << k << ": " << r.reason;
    if (!std::isnan(prev)) worst = std::max(worst, std::abs(r.cd - prev) / prev);
    prev = r.cd;
  }
  EXPECT_LT(worst, 0.01);
}

// A steady solution must not depend on how it was reached: marching up 0..10 deg in 0.5-deg warm
// starts and back down gives the same cd at every angle where both converge. The Newton
// tolerance moves cd by far less than 1e-5 relative; 0.2 % flags a second solution. NACA 4415,
// Re 6e6, free transition: with constant wake sources (a node-to-node sawtooth in the near
// wake left free) 10 of 20 angles differed, by up to 9.9 %.
TEST(ViscousSmoothness, SameAngleSameDragMarchingUpOrDown) {
  const ViscousSolver solver(naca_nodes("4415", 160), options_at(6.0e6));
  std::vector<ViscousResult> up;
  up.reserve(21);
  up.push_back(solver.solve_alpha(0.0));
  ASSERT_TRUE(up.back().converged) << up.back().reason;
  for (int k = 1; k <= 20; ++k) {
    up.push_back(solver.solve_alpha(0.5 * k, &up.back().state));
    ASSERT_TRUE(up.back().converged) << 0.5 * k << ": " << up.back().reason;
  }
  ViscousResult down = up.back();
  for (int k = 19; k >= 0; --k) {
    down = solver.solve_alpha(0.5 * k, &down.state);
    ASSERT_TRUE(down.converged) << 0.5 * k << ": " << down.reason;
    EXPECT_NEAR(down.cd / up[k].cd, 1.0, 0.002) << 0.5 * k << " deg";
  }
}

// Refinement: cd changes less than 2 % from 160 to 320 panels (the criterion).
TEST(ViscousRefinement, DragChangesLittleFrom160To320Panels) {
  const ViscousResult coarse =
      ViscousSolver(naca_nodes("0012", 160), options_at(3.0e6)).solve_alpha(0.0);
  const ViscousResult fine =
      ViscousSolver(naca_nodes("0012", 320), options_at(3.0e6)).solve_alpha(0.0);
  ASSERT_TRUE(coarse.converged && fine.converged) << coarse.reason << " / " << fine.reason;
  EXPECT_NEAR(fine.cd, coarse.cd, 0.02 * coarse.cd);
}

// Loads are continuous as the Mach number tends to zero (an exact limit: Karman-Tsien and the
// edge-Mach terms of the boundary layer change the loads by order M^2, 1e-6 at M = 0.001).
// NACA 4412, Re 6e6, 14 deg, near stall, where the trailing-edge separation carries a large mass
// defect. Tolerance 1e-4 of each load: a hundred times the M^2 change, and a hundredth of the
// 1.5 % step in cl seen when M = 0 took the lift from the circulation of the edge speed and
// M > 0 from the pressures (1.7636 against 1.7375).
TEST(ViscousSolver, LoadsAreContinuousAsMachTendsToZero) {
  const Points nodes = naca_nodes("4412", 160);
  const double alpha = 14.0;  // deg
  const ViscousResult r0 = ViscousSolver(nodes, options_at(6.0e6, 1.0, 0.0)).solve_alpha(alpha);
  const ViscousResult r1 = ViscousSolver(nodes, options_at(6.0e6, 1.0, 1e-3)).solve_alpha(alpha);
  ASSERT_TRUE(r0.converged) << r0.reason;
  ASSERT_TRUE(r1.converged) << r1.reason;
  EXPECT_NEAR(r1.cl, r0.cl, 1e-4 * std::abs(r0.cl));
  EXPECT_NEAR(r1.cd, r0.cd, 1e-4 * r0.cd);
  EXPECT_NEAR(r1.cm, r0.cm, 1e-4 * std::abs(r0.cm));
}

// Past the lift peak the stagnation point creeps towards the nose and the edge speed at the first
// station beside it is about 0.004 of the free stream; an unchecked Newton step there once drove
// that station's delta* negative and then huge (H from -9 to 11), and the warm start from 16.0
// to 16.25 deg on NACA 4412 (Re 6e6, M 0.1) cycled until the iteration limit. The step's
// shape-factor floor now also holds the two first stations. A continuation in 0.25 deg steps over
// the peak must converge at every step, and cl must stay smooth there: within 0.003 of the mean
// of its neighbours (twice the largest departure measured on this converged chain, 0.0014, which
// is the curvature of cl(alpha) near the peak; the wrong branch the failure led to was 0.014 low).
TEST(ViscousSolver, ContinuationOverTheLiftPeakStaysOnTheBranch) {
  const ViscousSolver solver(naca_nodes("4412", 160), options_at(6.0e6, 1.0, 0.1));
  ViscousResult r = solver.solve_alpha(14.0);
  ASSERT_TRUE(r.converged) << r.reason;
  std::vector<double> cl;
  for (int k = 1; k <= 12; ++k) {  // 14.25 .. 17 deg
    const double a = 14.0 + 0.25 * k;
    ViscousResult t = solver.solve_from(a, &r.state);
    ASSERT_TRUE(t.converged) << a << " deg: " << t.reason;
    if (a >= 15.5) cl.push_back(t.cl);
    r = std::move(t);
  }
  for (std::size_t i = 1; i + 1 < cl.size(); ++i)
    EXPECT_NEAR(cl[i], 0.5 * (cl[i - 1] + cl[i + 1]), 0.003) << 15.5 + 0.25 * i << " deg";
}

TEST(ViscousSolver, EveryResultIsFiniteAndSaysWhatHappened) {
  ViscousOptions o = options_at(1.0e6);
  o.max_iterations = 8;
  const ViscousSolver solver(naca_nodes("2412", 120), o);
  for (double a : {-2.0, 3.0, 90.0}) {
    const ViscousResult r = solver.solve_alpha(a);
    for (double v : {r.cl, r.cd, r.cm, r.cd_friction, r.cd_pressure,
                     r.residual == INFINITY ? 0.0 : r.residual})
      EXPECT_TRUE(std::isfinite(v)) << a;
    EXPECT_FALSE(r.reason.empty());
    EXPECT_EQ(r.converged, r.status == SolveStatus::kConverged);
    const nlohmann::json j = r.to_json();
    EXPECT_EQ(j.at("status").get<std::string>(), to_string(r.status));
    EXPECT_EQ(j.at("history").size(), r.history.size());
  }
}

TEST(ViscousSolver, TargetLiftIsReached) {
  const ViscousSolver solver(naca_nodes("2412", 160), options_at(3.0e6));
  for (double cl : {0.3, 0.9}) {
    const ViscousResult r = solver.solve_cl(cl);
    ASSERT_TRUE(r.converged) << r.reason;
    EXPECT_NEAR(r.cl, cl, 1e-5);  // the stopping rule of solve_cl
  }
}

}  // namespace
}  // namespace fulmar::viscous
