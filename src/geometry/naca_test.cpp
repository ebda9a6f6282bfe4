#include "geometry/naca.h"

#include <gtest/gtest.h>

#include <cmath>

#include "common/error.h"
#include "geometry/metrics.h"

namespace fulmar {
namespace {

// NACA 0012 ordinates, percent chord (Abbott & von Doenhoff, Theory of Wing Sections, 1959,
// Appendix I, from the Report 460 formula; values from memory). Tabulated to 0.001 % chord, so
// the tolerance is half a unit of the last digit plus round-off: 6e-6 chord.
struct Ordinate {
  double x, y;
};
constexpr Ordinate kNaca0012[] = {{1.25, 1.894}, {2.5, 2.615},  {5.0, 3.555},  {10.0, 4.683},
                                  {20.0, 5.737}, {30.0, 6.002}, {40.0, 5.803}, {50.0, 5.294},
                                  {70.0, 3.664}, {90.0, 1.448}, {100.0, 0.126}};

TEST(NacaThickness, MatchesTabulatedOrdinatesOf0012) {
  for (const Ordinate& o : kNaca0012) {
    EXPECT_NEAR(naca_half_thickness(0.12, o.x / 100, false), o.y / 100, 6e-6) << "x = " << o.x;
  }
}

TEST(NacaThickness, ThicknessAtThirtyPercentOfA4DigitSection) {
  // Report 460: the thickness form reaches t at 30 % chord; with its coefficients rounded to
  // four digits, 2 y_t(0.3) = 10 t (0.2969 sqrt(0.3) - 0.1260 0.3 - 0.3516 0.09 + 0.2843 0.027
  // - 0.1015 0.0081) = 1.000287 t (hand evaluation to 7 digits, hence 1e-6 t).
  for (double t : {0.06, 0.12, 0.15, 0.21}) {
    EXPECT_NEAR(2 * naca_half_thickness(t, 0.3, false), 1.000287 * t, 1e-6 * t);
  }
  // The same from the section's points through the spline: NACA 0012 is symmetric, so the
  // vertical thickness at x = 0.3 is 2 y_t(0.3) = 0.120024 (spline interpolation error is below
  // 1e-6 at 120 points per surface).
  const Section s = naca_section("0012");
  EXPECT_NEAR(thickness_at(s, 0.3), 2 * naca_half_thickness(0.12, 0.3, false), 1e-6);
  // A cambered section: thickness is laid perpendicular to the mean line, so the vertical
  // thickness at 0.3 exceeds 2 y_t by about y_t theta^2 (theta = mean-line slope there, 0.0417
  // for 2412: 1e-4 relative); measured within 2e-4 chord of 2 y_t.
  EXPECT_NEAR(thickness_at(naca_section("2412"), 0.3), 0.120024, 2e-4);
}

class NacaLeRadius : public ::testing::TestWithParam<const char*> {};

TEST_P(NacaLeRadius, IsPoint1019TSquared) {
  // Report 460: leading-edge radius r = 1.1019 t^2. The metric fits each side of the nose
  // locally; at 120 points per surface it is within 1e-4 relative (measured 6e-5), so 0.1 %.
  const NacaDesignation n = parse_naca(GetParam());
  const double r = section_metrics(naca_section(GetParam())).le_radius;
  EXPECT_NEAR(r, 1.1019 * n.thickness * n.thickness, 1e-3 * r) << GetParam();
}
INSTANTIATE_TEST_SUITE_P(Report460, NacaLeRadius,
                         ::testing::Values("0006", "0012", "0018", "0024"));

TEST(NacaFourDigitMeanLine, MaximumCamberMAtP) {
  // Report 460: the mean line is two parabolas meeting at x = p with y_c = m and zero slope.
  const NacaDesignation n = parse_naca("naca4415");
  EXPECT_DOUBLE_EQ(n.max_camber, 0.04);
  EXPECT_DOUBLE_EQ(n.camber_x, 0.4);
  EXPECT_DOUBLE_EQ(n.thickness, 0.15);
  EXPECT_NEAR(naca_mean_line(n, 0.4).y, 0.04, 1e-15);
  EXPECT_NEAR(naca_mean_line(n, 0.4).slope, 0.0, 1e-15);
  EXPECT_NEAR(naca_mean_line(n, 0.4 - 1e-9).y, naca_mean_line(n, 0.4 + 1e-9).y, 1e-10);
  EXPECT_NEAR(naca_mean_line(n, 0.0).y, 0.0, 1e-15);
  EXPECT_NEAR(naca_mean_line(n, 1.0).y, 0.0, 1e-15);
}

class FiveDigitMeanLine : public ::testing::TestWithParam<int> {};

TEST_P(FiveDigitMeanLine, MaximumCamberAtTheDesignatedPosition) {
  // Report 537: mean line 2P0 has its maximum camber at x = P / 20 (0.05 .. 0.25). The tabulated
  // m is rounded to 4 decimals, which moves the maximum by at most ~5e-5: tolerance 2e-4.
  const int p_digit = GetParam();
  const NacaDesignation n = parse_naca("2" + std::to_string(p_digit) + "012");
  double best_x = 0, best_y = -1;
  for (int i = 0; i <= 200000; ++i) {
    const double x = 0.5 * i / 200000;
    const double y = naca_mean_line(n, x).y;
    if (y > best_y) best_y = y, best_x = x;
  }
  EXPECT_NEAR(best_x, p_digit / 20.0, 2e-4);
  // Continuity at x = m where the cubic meets the straight line.
  EXPECT_NEAR(naca_mean_line(n, n.mean_line_m - 1e-12).y, naca_mean_line(n, n.mean_line_m).y, 1e-9);
}
INSTANTIATE_TEST_SUITE_P(Report537, FiveDigitMeanLine, ::testing::Values(1, 2, 3, 4, 5));

TEST(FiveDigitMeanLine, Camber230IsAbout1Point84Percent) {
  // NACA 23012 maximum camber 1.84 % chord at 15 % (Abbott & von Doenhoff 1959, section 6.4;
  // from memory); the mean line reproduces it to the rounding of the tabulated k1 and m.
  const NacaDesignation n = parse_naca("NACA23012");
  EXPECT_NEAR(naca_mean_line(n, 0.15).y, 0.0184, 1e-4);
  // Design lift coefficient scaling (Report 537): first digit 4 doubles the mean line of 2.
  const NacaDesignation d = parse_naca("43012");
  EXPECT_NEAR(naca_mean_line(d, 0.15).y, 2 * naca_mean_line(n, 0.15).y, 1e-15);
}

TEST(NacaSection, PointOrderAndClosedTrailingEdge) {
  const Section open = naca_section("2412", 50);
  ASSERT_EQ(open.points.rows(), 99);
  EXPECT_GT(open.points(0, 1), open.points(98, 1));  // upper trailing edge first
  EXPECT_NEAR(open.points(49, 0), 0.0, 1e-15);       // mean-line nose
  EXPECT_NEAR(open.points(49, 1), 0.0, 1e-15);
  // Open trailing edge: gap 2 y_t(1) = 2 * 5 t * 0.0021 = 0.00252 for t = 0.12 (Report 460).
  EXPECT_NEAR((open.points.row(0) - open.points.row(98)).norm(), 0.00252, 1e-6);
  const Section closed = naca_section("naca2412", 50, true);
  EXPECT_EQ(closed.points.row(0), closed.points.row(98));
  EXPECT_NEAR(closed.points(0, 0), 1.0, 1e-15);
  // The -0.1036 coefficient closes the form: 0.2969 - 0.1260 - 0.3516 + 0.2843 - 0.1036 = 0.
  EXPECT_NEAR(naca_half_thickness(0.12, 1.0 - 1e-12, true), 0.0, 1e-12);
}

TEST(NacaSection, BadDesignationsAreInputErrors) {
  for (const char* bad : {"naca", "12", "24a2", "naca241", "naca241234", "23112", "26012", "06012",
                          "2012", "0412", "0000", "naca 2400"}) {
    EXPECT_THROW(naca_section(bad), InputError) << bad;
  }
  EXPECT_THROW(naca_section("0012", 9), InputError);
  try {
    naca_section("23112");
    FAIL();
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("23112"), std::string::npos) << e.what();
    EXPECT_NE(std::string(e.what()).find("reflex"), std::string::npos) << e.what();
  }
}

}  // namespace
}  // namespace fulmar
