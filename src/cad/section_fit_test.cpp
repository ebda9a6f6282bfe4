// B-spline fitting of sections: tolerance honoured, error falls as the tolerance tightens, and the
// fitted curve checked against the analytic NACA 4-digit formula (Report 460) it came from.
#include "cad/section_fit.h"

#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

#include "cad/naca_test_section.h"
#include "common/error.h"

namespace fulmar::cad {
namespace {

using testing::distance_to_naca;
using testing::naca4_section;

TEST(SectionSpline, InterpolatesThePointsAndMeasuresCurvatureOfACircle) {
  // Points on a circle of radius 0.5: curvature 2 everywhere (exact geometry). A natural cubic
  // spline through 201 points spaced 0.0157 apart reproduces it to ~1e-4 away from the free ends.
  Points p(201, 2);
  for (int i = 0; i < 201; ++i) {
    const double a = std::numbers::pi * i / 200.0;
    p.row(i) << 0.5 * std::cos(a), 0.5 * std::sin(a);
  }
  const SectionSpline s(p);
  for (int i = 0; i < 201; ++i) {
    EXPECT_LT((s.point(s.knots()(i)) - p.row(i).transpose()).norm(), 1e-15);
  }
  for (int i = 40; i <= 160; ++i) {
    EXPECT_NEAR(s.curvature(s.knots()(i) + 0.3 * (s.knots()(i + 1) - s.knots()(i))), 2.0, 1e-3);
  }
}

TEST(SectionFit, Naca0012WithinDefaultToleranceAndMatchesTheFormula) {
  const Section sec = naca4_section("0012", 200);
  const FitOptions options;  // default tolerance 1e-5 chord
  const FittedSection fit = fit_section(sec, options);
  ASSERT_TRUE(fit.converged) << fit.message;
  ASSERT_EQ(fit.curves.size(), 1u);
  EXPECT_LE(fit.max_deviation, options.tolerance);
  EXPECT_LE(fit.max_deviation_input_points, fit.max_deviation);
  EXPECT_GT(fit.max_deviation, 0.0);
  // End points are held exactly: the TE corners of the CAD curve are the section's.
  const BSplineCurve& c = fit.curves[0];
  EXPECT_LT((point_at(c, 0.0) - sec.points.row(0).transpose()).norm(), 1e-15);
  EXPECT_LT((point_at(c, 1.0) - sec.points.row(sec.points.rows() - 1).transpose()).norm(), 1e-15);
  // Independent check against the analytic section (NACA Report 460 formula): every one of 3000
  // curve samples lies within the tolerance plus the interpolation error of a natural cubic
  // spline through 401 cosine-spaced points (measured below 5e-7 chord for this section; 1e-6
  // allowed).
  double worst = 0.0;
  for (int k = 0; k <= 3000; ++k) {
    const Eigen::VectorXd q = point_at(c, k / 3000.0);
    worst = std::max(worst, distance_to_naca(q, 0.0, 0.0, 0.12, false));
  }
  EXPECT_LE(worst, options.tolerance + 1e-6) << "curve to formula " << worst;
  RecordProperty("curve_to_formula", std::to_string(worst));
}

class SectionFitTolerance : public ::testing::TestWithParam<const char*> {};

// The error falls as the tolerance tightens, and the curve grows to pay for it.
TEST_P(SectionFitTolerance, ErrorFallsAsTheToleranceTightens) {
  const Section sec = naca4_section(GetParam(), 160);
  double last_deviation = 1e300;
  int last_count = 0;
  for (double tol : {1e-3, 1e-4, 1e-5, 1e-6}) {
    FitOptions o;
    o.tolerance = tol;
    const FittedSection fit = fit_section(sec, o);
    ASSERT_TRUE(fit.converged) << fit.message;
    EXPECT_LE(fit.max_deviation, tol);
    EXPECT_LT(fit.max_deviation, last_deviation);
    EXPECT_GE(fit.control_points, last_count);
    // Each round's worst deviation is recorded and the last one is the reported figure.
    ASSERT_FALSE(fit.history.empty());
    EXPECT_DOUBLE_EQ(fit.history.back(), fit.max_deviation);
    last_deviation = fit.max_deviation;
    last_count = fit.control_points;
  }
}

INSTANTIATE_TEST_SUITE_P(Sections, SectionFitTolerance, ::testing::Values("0012", "2412", "4415"));

TEST(SectionFit, SplitCurvesMeetAtTheLeadingEdgeWithOneTangent) {
  const Section sec = naca4_section("2412", 160);
  FitOptions o;
  o.split = true;
  const FittedSection fit = fit_section(sec, o);
  ASSERT_TRUE(fit.converged) << fit.message;
  ASSERT_EQ(fit.curves.size(), 2u);
  EXPECT_LE(fit.max_deviation, o.tolerance);
  const Eigen::VectorXd le_upper = point_at(fit.curves[0], 1.0);
  const Eigen::VectorXd le_lower = point_at(fit.curves[1], 0.0);
  EXPECT_LT((le_upper - le_lower).norm(), 1e-15);
  // The split point is the section's leading-edge point (farthest from the TE midpoint).
  const Eigen::Vector2d le = sec.points.row(leading_edge_index(sec.points)).transpose();
  EXPECT_LT((le_upper - le).norm(), 1e-15);
  const Eigen::VectorXd t_upper = point_at(derivative(fit.curves[0]), 1.0).normalized();
  const Eigen::VectorXd t_lower = point_at(derivative(fit.curves[1]), 0.0).normalized();
  EXPECT_GT(t_upper.dot(t_lower), 1.0 - 1e-12);  // G1: same direction of travel
}

TEST(SectionFit, HigherDegreeAlsoMeetsTheTolerance) {
  const Section sec = naca4_section("2412", 120);
  for (int degree : {4, 5}) {
    FitOptions o;
    o.degree = degree;
    const FittedSection fit = fit_section(sec, o);
    EXPECT_TRUE(fit.converged) << fit.message;
    EXPECT_EQ(fit.curves[0].degree, degree);
    EXPECT_LE(fit.max_deviation, o.tolerance);
  }
}

TEST(SectionFit, UnreachableToleranceIsReportedNotThrown) {
  const Section sec = naca4_section("2412", 120);
  FitOptions o;
  o.tolerance = 1e-9;
  o.max_control_points = 20;
  const FittedSection fit = fit_section(sec, o);
  EXPECT_FALSE(fit.converged);
  EXPECT_GT(fit.max_deviation, o.tolerance);
  EXPECT_NE(fit.message.find("tolerance not met"), std::string::npos) << fit.message;
  EXPECT_NE(fit.message.find("max_control_points"), std::string::npos) << fit.message;
}

TEST(SectionFit, OptionsAreValidated) {
  FitOptions o;
  o.tolerance = 0.0;
  EXPECT_THROW(o.Validate(), InputError);
  o = FitOptions{};
  o.degree = 2;
  try {
    o.Validate();
    FAIL();
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("degree"), std::string::npos);
  }
}

TEST(SectionPreparation, CloseTrailingEdgeMovesAtMostHalfTheGap) {
  const Section open = naca4_section("2412", 100, false);
  const Section closed = close_trailing_edge(open);
  const int n = static_cast<int>(open.points.rows());
  const double gap = (open.points.row(0) - open.points.row(n - 1)).norm();
  EXPECT_GT(gap, 1e-3);  // NACA 4-digit open TE: 2 * 5t * 0.00105 ~ 0.0025 chord at t = 0.12
  EXPECT_LT((closed.points.row(0) - closed.points.row(n - 1)).norm(), 1e-15);
  const int le = leading_edge_index(open.points);
  EXPECT_EQ(closed.points.row(le), open.points.row(le));  // the LE stays put
  for (int i = 0; i < n; ++i) {
    EXPECT_LE((closed.points.row(i) - open.points.row(i)).norm(), 0.5 * gap + 1e-15);
  }
  // And it still fits within the tolerance.
  const FittedSection fit = fit_section(closed, FitOptions{});
  EXPECT_TRUE(fit.converged) << fit.message;
}

TEST(SectionPreparation, BadSectionsAreInputErrors) {
  Section tiny{"tiny", Points(3, 2)};
  tiny.points << 1, 0, 0, 0, 1, 0;
  EXPECT_THROW(cleaned_section(tiny), InputError);
  Section nan = naca4_section("0012", 20);
  nan.points(5, 1) = std::nan("");
  EXPECT_THROW(cleaned_section(nan), InputError);
  // Repeated points are removed, not fatal.
  Section rep = naca4_section("0012", 20);
  Points doubled(rep.points.rows() + 1, 2);
  doubled << rep.points.topRows(10), rep.points.row(9),
      rep.points.bottomRows(rep.points.rows() - 10);
  rep.points = doubled;
  EXPECT_EQ(cleaned_section(rep).points.rows(), doubled.rows() - 1);
}

// Straight segments deviate by about h^2 kappa / 8 (chord sagitta, elementary geometry): doubling
// the point count divides the polyline deviation by about four.
TEST(PolylineDeviation, FallsWithTheSquareOfTheSpacing) {
  const double coarse = polyline_deviation(naca4_section("0012", 60));
  const double fine = polyline_deviation(naca4_section("0012", 120));
  EXPECT_GT(coarse / fine, 3.5);
  EXPECT_LT(coarse / fine, 4.5);
}

}  // namespace
}  // namespace fulmar::cad
