#pragma once
// A parametric cubic spline x(s), y(s) through a section's points, s the cumulative chord length
// (polygon arc length) from the first point. Not-a-knot end conditions, so that the end tangents
// (trailing-edge wedge angle) are those of the cubic through the last four points rather than
// forced straight. Used by the metrics and the panelling; refit reuses storage.
#include <Eigen/Core>
#include <vector>

#include "geometry/section.h"

namespace fulmar {

struct SplinePoint {
  double x = 0, y = 0;    // position
  double dx = 0, dy = 0;  // first derivatives with respect to s
  double ddx = 0, ddy = 0;
  // Signed curvature, 1/chord: positive where the curve turns left (convex parts of a section in
  // fulmar point order, which runs counter-clockwise).
  double curvature() const;
};

class SectionSpline {
 public:
  SectionSpline() = default;
  // Fits through `points` (#points by 2), dropping consecutive repeats closer than 1e-12 of the
  // polygon length. Throws InputError when fewer than 4 distinct points remain.
  explicit SectionSpline(const Points& points) { fit(points); }
  void fit(const Points& points);

  double length() const { return s_.back(); }  // parameter range [0, length()]
  int knot_count() const { return static_cast<int>(s_.size()); }
  double knot(int i) const { return s_[i]; }
  double knot_x(int i) const { return x_[i]; }
  double knot_y(int i) const { return y_[i]; }

  SplinePoint at(double s) const;  // s is clamped to [0, length()]
  // Same, with the knot interval known (s in [knot(i), knot(i + 1)]); skips the search.
  SplinePoint at(double s, int interval) const;
  int interval(double s) const;  // i with knot(i) <= s < knot(i + 1), clamped

  // Parameter of the point of minimum x (the leading edge of a section in its chord frame),
  // found to round-off between the knots around the smallest knot x.
  double minimum_x() const;
  // Parameter of the point farthest from (px, py), refined the same way.
  double farthest_from(double px, double py) const;

 private:
  std::vector<double> s_, x_, y_, mx_, my_;       // knots, values and second derivatives
  std::vector<double> work_a_, work_b_, work_c_;  // tridiagonal workspace
};

}  // namespace fulmar
