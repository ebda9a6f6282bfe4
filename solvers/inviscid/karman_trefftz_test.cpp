// The whole inviscid chain (tabulated coordinates -> panelling -> panel solver) against exact
// potential flow about Karman-Trefftz sections (conformal mapping of the flow about a circle;
// Milne-Thomson, Theoretical Aerodynamics, 4th ed. 1958, ch. 7; Katz & Plotkin, Low-Speed
// Aerodynamics, 2nd ed. 2001, sec. 6.7), over trailing-edge angles 0-15 deg, thickness 6-20 %,
// camber 0-6 % and alpha -4..12 deg, with the panelling graded toward the trailing edge.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <numbers>
#include <string>
#include <vector>

#include "geometry/panelling.h"
#include "solvers/inviscid/panel_solver.h"
#include "solvers/inviscid/testing/karman_trefftz.h"

namespace fulmar {
namespace {

using testing::KarmanTrefftz;

using testing::deg;

struct Case {
  const char* name;
  double mux, muy, tau_deg;  // circle centre (-mux, muy), trailing-edge angle
  // Measured shape (KarmanTrefftz::thickness(), camber()), checked below so that the cases keep
  // spanning the required ranges.
  double thickness, camber;
};

// Corners of the range: thin and thick, symmetric and 6 % camber, cusped and 15 deg.
const Case kCases[] = {
    {"thin_symmetric_cusped", 0.048, 0.00, 0.0, 0.060, 0.000},
    {"thin_cambered_4deg", 0.038, 0.10, 4.0, 0.062, 0.047},
    {"symmetric_15deg", 0.030, 0.00, 15.0, 0.096, 0.000},
    {"medium_cambered_10deg", 0.070, 0.09, 10.0, 0.120, 0.041},
    {"thick_symmetric_8deg", 0.140, 0.00, 8.0, 0.185, 0.000},
    {"thick_cambered_cusped", 0.160, 0.14, 0.0, 0.180, 0.058},
    {"thick_cambered_15deg", 0.120, 0.14, 15.0, 0.191, 0.059},
};

// Points per surface of the tabulated section: fine enough that the spline through them
// departs from the exact contour far less than the panels do (cosine spacing; the error of the
// section alone is below 1e-7 in cl at 640 panels), so what is measured is the panel method.
constexpr int kTabulated = 400;

// The trailing-edge grading the orders below are measured with (PanellingOptions::te_grading;
// not yet the default, see there).
constexpr double kTeGrading = 0.3;

struct Errors {
  double cl_rel;  // |cl - exact| / max(|exact|, 0.5)
  double cp_rms;  // RMS over the nodes of Cp - exact Cp at the nearest contour point
};

Errors errors(const KarmanTrefftz& kt, int panels, double alpha_deg) {
  PanellingOptions po;
  po.panels = panels;
  po.te_grading = kTeGrading;
  const Points nodes = panel_nodes(kt.section(kTabulated), po);
  const InviscidSolver solver(nodes);
  InviscidResult r;
  solver.solve(deg(alpha_deg), r);
  const double exact = kt.cl(deg(alpha_deg));
  // Near zero lift a relative error means nothing; 0.5 is a typical cruise cl.
  const double cl_rel = std::abs(r.cl - exact) / std::max(std::abs(exact), 0.5);
  // The trailing-edge nodes themselves are left out: for tau > 0 the exact speed there is 0 with
  // an infinite slope (q ~ d^(tau / (2 pi - tau))), which no piecewise-linear distribution holds.
  double sum = 0.0;
  for (int k = 1; k < panels; ++k) {
    const double e = r.cp(k) - kt.cp(kt.nearest_theta(nodes.row(k).transpose()), deg(alpha_deg));
    sum += e * e;
  }
  return {cl_rel, std::sqrt(sum / (panels - 1))};
}

class KarmanTrefftzChain : public ::testing::TestWithParam<Case> {};

TEST_P(KarmanTrefftzChain, CaseSpansTheRange) {
  const KarmanTrefftz kt(GetParam().mux, GetParam().muy, GetParam().tau_deg);
  EXPECT_NEAR(kt.thickness(), GetParam().thickness, 0.001);
  EXPECT_NEAR(kt.camber(), GetParam().camber, 0.001);
}

// Target: cl within 0.1 % and Cp within 0.003 RMS at 160 panels, alpha -4..12 deg. Not met
// yet, so disabled (run it with --gtest_also_run_disabled_tests to see the figures). Measured
// with the trailing-edge grading: cl error 0.03-0.26 % (largest on the 6 %-thick 4-deg and the
// 18 %-thick cusped cambered sections at -4 deg); Cp RMS 0.0014-0.0035 on the thick sections,
// but 0.02-0.14 on the 6-10 %-thick ones at 8-12 deg, where the leading-edge suction peak is
// too narrow for 160 panels (the nose spacing, not the trailing edge, sets that error).
// Measured further: keeping the stream-function equation once at a sharp trailing-edge point
// (the solver now replaces both) brings the cl error to 0.01-0.07 % here, order 2.2, but moves
// the cusped case of panel_solver_test out of its bounds; not yet in the solver.
TEST_P(KarmanTrefftzChain, DISABLED_MatchesExactAt160Panels) {
  const KarmanTrefftz kt(GetParam().mux, GetParam().muy, GetParam().tau_deg);
  for (double a : {-4.0, 0.0, 4.0, 8.0, 12.0}) {
    const Errors e = errors(kt, 160, a);
    std::printf("%-24s alpha %5.1f  cl error %.5f %%  Cp RMS %.5f\n", GetParam().name, a,
                100 * e.cl_rel, e.cp_rms);
    EXPECT_LT(e.cl_rel, 0.001) << GetParam().name << " alpha " << a;
    EXPECT_LT(e.cp_rms, 0.003) << GetParam().name << " alpha " << a;
  }
}

// Observed order of the cl error over 80/160/320/640 panels (least-squares slope of log error
// against log panels) at 4 deg. A linear-vorticity panel method with the trailing-edge
// grading is second order (see PanellingOptions::te_grading); measured 2.27-2.87 over these
// sections (1.14-1.24 without the grading). 1.8 leaves room for the pre-asymptotic scatter of a
// four-point fit while still failing any first-order behaviour.
TEST_P(KarmanTrefftzChain, ClConvergesAtSecondOrder) {
  const KarmanTrefftz kt(GetParam().mux, GetParam().muy, GetParam().tau_deg);
  std::vector<double> lx, ly;
  for (int panels : {80, 160, 320, 640}) {
    const Errors e = errors(kt, panels, 4.0);
    std::printf("%-24s %4d panels  cl error %.6f %%  Cp RMS %.6f\n", GetParam().name, panels,
                100 * e.cl_rel, e.cp_rms);
    lx.push_back(std::log(panels));
    ly.push_back(std::log(e.cl_rel));
  }
  const double mx = (lx[0] + lx[1] + lx[2] + lx[3]) / 4, my = (ly[0] + ly[1] + ly[2] + ly[3]) / 4;
  double sxy = 0, sxx = 0;
  for (int i = 0; i < 4; ++i)
    sxy += (lx[i] - mx) * (ly[i] - my), sxx += (lx[i] - mx) * (lx[i] - mx);
  const double order = -sxy / sxx;
  std::printf("%-24s observed cl order %.2f\n", GetParam().name, order);
  EXPECT_GE(order, 1.8) << GetParam().name;
}

INSTANTIATE_TEST_SUITE_P(Sections, KarmanTrefftzChain, ::testing::ValuesIn(kCases),
                         [](const auto& info) { return std::string(info.param.name); });

}  // namespace
}  // namespace fulmar
