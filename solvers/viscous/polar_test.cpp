// The polar summary on synthetic polars with exact answers, and the polar options' rules.
#include "solvers/viscous/polar.h"

#include <gtest/gtest.h>

#include <cmath>
#include <functional>
#include <string>
#include <vector>

#include "common/error.h"
#include "solvers/viscous/polar_test_points.h"

namespace fulmar::viscous {
namespace {

using testing::point;

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

}  // namespace
}  // namespace fulmar::viscous
