#include "geometry/spline.h"

#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

#include "common/error.h"

namespace fulmar {
namespace {

Points circle_arc(int n, double radius, double from, double to) {
  Points p(n, 2);
  for (int i = 0; i < n; ++i) {
    const double a = from + (to - from) * i / (n - 1);
    p(i, 0) = radius * std::cos(a);
    p(i, 1) = radius * std::sin(a);
  }
  return p;
}

TEST(SectionSpline, InterpolatesItsPoints) {
  const Points p = circle_arc(30, 1.0, 0.1, 5.0);
  const SectionSpline sp(p);
  ASSERT_EQ(sp.knot_count(), 30);
  for (int i = 0; i < 30; ++i) {
    const SplinePoint q = sp.at(sp.knot(i));
    EXPECT_NEAR(q.x, p(i, 0), 1e-14);
    EXPECT_NEAR(q.y, p(i, 1), 1e-14);
  }
}

TEST(SectionSpline, CurvatureOfACircleConvergesToOneOverRadius) {
  // Exact geometry: curvature 1/R (positive: the arc runs counter-clockwise). Chord-length
  // splines are second-order accurate in curvature; at 5 degrees between points the error is
  // about 1e-4 relative, so 1e-3 mid-arc.
  const Points p = circle_arc(60, 0.5, 0.0, 5.0);
  const SectionSpline sp(p);
  for (double f : {0.3, 0.5, 0.7}) {
    EXPECT_NEAR(sp.at(f * sp.length()).curvature(), 2.0, 2e-3);
  }
}

TEST(SectionSpline, MinimumXOfAnArcIsItsLeftmostPoint) {
  // Points at 0.1 .. 5.0 rad of a unit circle: the leftmost point (angle pi) is not a knot.
  const Points p = circle_arc(41, 1.0, 0.1, 5.0);
  const SectionSpline sp(p);
  const SplinePoint q = sp.at(sp.minimum_x());
  EXPECT_NEAR(q.x, -1.0, 1e-6);
  EXPECT_NEAR(q.y, 0.0, 1e-4);
  const SplinePoint f = sp.at(sp.farthest_from(1.0, 0.0));
  EXPECT_NEAR(f.x, -1.0, 1e-6);
}

TEST(SectionSpline, DropsRepeatsAndRejectsTooFewPoints) {
  Points p(6, 2);
  p << 0, 0, 1, 0, 1, 0, 2, 1, 3, 0, 3, 0;
  const SectionSpline sp(p);
  EXPECT_EQ(sp.knot_count(), 4);
  Points q(4, 2);
  q << 0, 0, 1, 1, 1, 1, 2, 0;
  EXPECT_THROW(SectionSpline{q}, InputError);
  Points r = circle_arc(10, 1.0, 0.0, 3.0);
  r(4, 1) = std::nan("");
  EXPECT_THROW(SectionSpline{r}, InputError);
}

}  // namespace
}  // namespace fulmar
