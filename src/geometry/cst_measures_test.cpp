// Tests of the analytic measures of a CST shape (cst_measures.h).
#include "geometry/cst_measures.h"

#include <gtest/gtest.h>

#include "geometry/naca.h"

namespace fulmar {
namespace {

TEST(CstMeasures, Naca0012AgainstReport460) {
  const CstShape s = fit_cst(naca_section("0012", 201), 8, 8).shape;
  const CstMeasures g = measure_cst(s, {0.3});
  // NACA Report 460: the four-digit thickness form has its maximum t at x = 0.30. The CST fit
  // deviates by <= 2e-4 chord (issue 2 acceptance), hence 5e-4 on thickness; the flat top of the
  // distribution makes its x uncertain to about 0.01.
  EXPECT_NEAR(g.thickness, 0.12, 5e-4);
  EXPECT_NEAR(g.thickness_x, 0.30, 0.01);
  EXPECT_NEAR(g.spar_thickness[0], 0.12, 5e-4);
  // Area: the Report 460 half-thickness integrated by hand, 2 * 5t (0.2969*2/3 - 0.1260/2 -
  // 0.3516/3 + 0.2843/4 - 0.1015/5) = 0.68505 t. 0.5 %: fit deviation over the chord.
  EXPECT_NEAR(g.area, 0.68505 * 0.12, 0.005 * 0.68505 * 0.12);
  // Leading-edge radius 1.1019 t^2 (Report 460). The CST nose radius a_0^2/2 of an order-8 fit
  // matches to about 10 % (the NACA nose is not exactly a CST class-0.5 nose).
  EXPECT_NEAR(g.le_radius, 1.1019 * 0.12 * 0.12, 0.1 * 1.1019 * 0.12 * 0.12);
  // Trailing-edge wedge: the Report 460 slope at x = 1 is 5t(0.2969/2 - 0.1260 - 2*0.3516 +
  // 3*0.2843 - 4*0.1015) = -1.16925 t, a wedge of 2 atan(0.14031) = 15.97 deg for t = 0.12. The
  // fit's end slope is looser than its ordinates: 1.5 deg.
  EXPECT_NEAR(g.te_angle_deg, 15.97, 1.5);
  EXPECT_NEAR(g.camber, 0.0, 1e-6);
  EXPECT_GT(g.min_shape_gap, 0.1);
  EXPECT_EQ(g.reversals_upper, 0);
}

TEST(CstMeasures, SmoothInTheCoefficients) {
  // The finite-difference gradients need measures without steps: a tiny coefficient change
  // moves the maximum thickness by about its linear estimate.
  CstShape s = fit_cst(naca_section("2412", 201), 5, 5).shape;
  const double t0 = measure_cst(s, {}).thickness;
  s.upper[2] += 1e-6;
  const double t1 = measure_cst(s, {}).thickness;
  s.upper[2] += 1e-6;
  const double t2 = measure_cst(s, {}).thickness;
  EXPECT_GT(t1, t0);
  EXPECT_NEAR((t2 - t1) / (t1 - t0), 1.0, 0.05);
}

// A wave on the upper surface: the excess-reversal strength grows from 0 as the wave appears
// (continuous, which the search needs), while a smooth section has none beyond the allowance.
TEST(CstMeasures, ExcessReversalGrowsWithAWave) {
  CstShape s = fit_cst(naca_section("2412", 201), 5, 5).shape;
  EXPECT_EQ(measure_cst(s, {}).excess_reversal_upper, 0.0);
  double previous = 0.0;
  for (double bump : {0.05, 0.1, 0.2}) {
    CstShape w = s;
    w.upper[3] += bump;
    w.upper[2] -= bump;
    const double e = measure_cst(w, {}).excess_reversal_upper;
    EXPECT_GE(e, previous) << bump;
    previous = e;
  }
  EXPECT_GT(previous, kFlatCurvature);
}

// The shape-function gap uses cst.h's Bernstein sum: with every upper coefficient 0.2 and every
// lower one -0.1 the shape functions are those constants (the Bernstein basis sums to 1), so the
// gap is 0.3 at every x, to rounding.
TEST(CstMeasures, ShapeGapOfConstantShapeFunctions) {
  CstShape s;
  s.upper = Eigen::VectorXd::Constant(6, 0.2);
  s.lower = Eigen::VectorXd::Constant(6, -0.1);
  EXPECT_NEAR(measure_cst(s, {}).min_shape_gap, 0.3, 1e-14);
  // Lower a_2 = a_3 = 1: at x = 0.5 (a sample of the scan) B_{2,5} + B_{3,5} = 20/32 is their
  // largest, so the gap there is 0.3 - 1.1 * 0.625 = -0.3875 (the surfaces cross).
  s.lower[2] = s.lower[3] = 1.0;
  EXPECT_NEAR(measure_cst(s, {}).min_shape_gap, -0.3875, 1e-12);
}

}  // namespace
}  // namespace fulmar
