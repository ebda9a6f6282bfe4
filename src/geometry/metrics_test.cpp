#include "geometry/metrics.h"

#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

#include "common/error.h"
#include "geometry/naca.h"

namespace fulmar {
namespace {

constexpr double kDeg = 180.0 / std::numbers::pi;

TEST(SectionMetrics, Naca0012AgainstTheReport460Formula) {
  // Reference values are exact consequences of the Report 460 thickness form (t = 0.12):
  // - maximum thickness 2 max y_t = 0.120035 at x = 0.2998 (from maximising the polynomial;
  //   the tabulated 6.002 % at 30 % rounds it);
  // - trailing-edge gap 2 y_t(1) = 10 t 0.0021 = 0.00252;
  // - wedge angle 2 atan(-y_t'(1)) with y_t'(1) = 5 t (0.2969/2 - 0.1260 - 0.7032 + 0.8529 -
  //   0.4060) = -0.1403, i.e. 15.974 degrees;
  // - area 2 int y_t = 10 t (0.2969 2/3 - 0.1260/2 - 0.3516/3 + 0.2843/4 - 0.1015/5)
  //   = 0.685075 t = 0.082209.
  const SectionMetrics m = section_metrics(naca_section("0012"));
  EXPECT_NEAR(m.thickness, 0.120035, 2e-6);  // spline interpolation at 120 points: ~1e-7
  EXPECT_NEAR(m.thickness_x, 0.2998, 1e-3);  // flat maximum: x is ill-conditioned
  EXPECT_NEAR(m.camber, 0.0, 1e-12);
  EXPECT_NEAR(m.te_gap, 0.00252, 1e-9);
  const double slope = 5 * 0.12 * (0.2969 / 2 - 0.1260 - 0.7032 + 0.8529 - 0.4060);
  EXPECT_NEAR(m.te_angle_deg, 2 * std::atan(-slope) * kDeg, 0.02);  // end tangent of the spline
  EXPECT_NEAR(m.area, 0.685075 * 0.12, 2e-6);
  EXPECT_NEAR(m.le_radius, 1.1019 * 0.0144, 1e-5);
}

TEST(SectionMetrics, Naca2412CamberFromTheMeanLine) {
  // Report 460: NACA 2412 has its maximum camber 0.02 at 0.4. fulmar measures camber as the
  // vertical mid-point of the surfaces, which differs from the mean line (thickness laid
  // perpendicular to it) by about y_t theta^2 / 2 ~ 1e-5 and shifts its x a little: 2e-4 and
  // 0.01 tolerances.
  const SectionMetrics m = section_metrics(naca_section("2412"));
  EXPECT_NEAR(m.camber, 0.02, 2e-4);
  EXPECT_NEAR(m.camber_x, 0.4, 0.01);
  EXPECT_NEAR(m.thickness, 0.12, 3e-4);
}

TEST(SectionMetrics, ThicknessScalesWithTheDesignation) {
  // Invariance: the thickness form is linear in t, so every length scales with t at fixed x.
  const double t06 = thickness_at(naca_section("0006"), 0.6);
  const double t18 = thickness_at(naca_section("0018"), 0.6);
  EXPECT_NEAR(t18, 3 * t06, 1e-9);
  EXPECT_THROW(thickness_at(naca_section("0006"), 1.5), InputError);
}

TEST(SectionMetrics, MinimumThicknessAndCrossingSurfaces) {
  const Section s = naca_section("0012");
  // Thickness falls monotonically aft of 0.3, so the minimum over [0.5, 0.9] is at 0.9:
  // 2 y_t(0.9) = 0.02896 (Report 460 formula; tabulated 1.448 %).
  EXPECT_NEAR(minimum_thickness(s, 0.5, 0.9), 2 * naca_half_thickness(0.12, 0.9, false), 1e-6);
  Section crossed = s;
  const Eigen::Index n = crossed.points.rows();
  for (Eigen::Index i = 0; i < n; ++i) {
    const double x = crossed.points(i, 0);
    if (x > 0.6 && x < 0.8) crossed.points(i, 1) *= -1;  // swap the surfaces there
  }
  EXPECT_LT(minimum_thickness(crossed, 0.1, 0.95), 0);
  EXPECT_TRUE(self_intersects(crossed));
  EXPECT_FALSE(self_intersects(s));
  EXPECT_FALSE(self_intersects(naca_section("2412", 120, true)));
}

TEST(SectionMetrics, CurvatureReversals) {
  // NACA 0012: both surfaces convex everywhere.
  const CurvatureReversals a = curvature_reversals(naca_section("0012"));
  EXPECT_EQ(a.upper, 0);
  EXPECT_EQ(a.lower, 0);
  // NACA 4415 lower surface: y_l'' = y_c'' - y_t''. Ahead of p = 0.4, y_c'' = -2m/p^2 = -0.5
  // outweighs y_t'' (about -0.40 at x = 0.39): concave; aft of p, y_c'' = -2m/(1-p)^2 = -0.22
  // does not: convex; near the trailing edge concave again (from the Report 460 formulas). So
  // convex nose -> concave -> convex -> concave: three reversals.
  const CurvatureReversals b = curvature_reversals(naca_section("4415"));
  EXPECT_EQ(b.upper, 0);
  EXPECT_EQ(b.lower, 3);
}

}  // namespace
}  // namespace fulmar
