#pragma once
// B-spline fitting of a wing section for CAD: least squares with adaptive knot insertion until
// the largest distance from the section to the fitted curve is within a tolerance.
#include <Eigen/Core>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "cad/bspline.h"
#include "geometry/section.h"

namespace fulmar::cad {

// The section's own smooth interpolant: a parametric natural cubic spline x(s), y(s) through every
// point, s the cumulative chord length (s = 0 at the first point). It is the reference the fitted
// curve is measured against between the input points.
class SectionSpline {
 public:
  // points: #points by 2, consecutive points distinct (at least 3).
  explicit SectionSpline(const Points& points);
  double length() const { return s_(s_.size() - 1); }
  const Eigen::VectorXd& knots() const { return s_; }  // s at each input point
  Eigen::Vector2d point(double s) const;
  Eigen::Vector2d first_derivative(double s) const;
  Eigen::Vector2d second_derivative(double s) const;
  double curvature(double s) const;  // unsigned, 1/chord

 private:
  int interval(double s) const;
  Eigen::VectorXd s_;
  Points p_;
  Points m_;  // second derivatives at the points
};

// Settings of the fit. Stopping rule: refinement stops when the largest distance from every dense
// sample of the section interpolant (input points included) to the fitted curve is <= tolerance,
// or when no knot span can be split further or the control point limit is reached (then
// `converged` is false and the message says which).
struct FitOptions {
  double tolerance = 1e-5;       // chord fractions, > 0
  int degree = 3;                // 3..7 (cubic or higher)
  bool split = false;            // false: one curve TE upper -> LE -> TE lower; true: two
                                 // curves (upper TE -> LE, lower LE -> TE), G1 at the LE
  int samples_per_interval = 8;  // dense samples of the interpolant per input interval, >= 1
  int max_control_points = 600;  // per curve, >= 2 * degree + 2
  void Validate() const;         // throws InputError naming the field
};

// Summary of a fit; the curves are in chord-normalised section coordinates (2-D control points).
struct FittedSection {
  std::vector<BSplineCurve> curves;  // 1 or 2 clamped curves (see FitOptions::split)
  bool converged = false;            // largest deviation <= tolerance
  double max_deviation = 0.0;        // chord fractions, over interpolant samples and input points
  double max_deviation_input_points = 0.0;  // the same over the input points alone
  double tolerance = 0.0;
  int control_points = 0;       // total over the curves
  std::vector<double> history;  // largest deviation after each knot-insertion round
  std::string message;          // the measured value against the tolerance, or why not
  nlohmann::json to_json() const;
};

// Fits `section` (points ordered TE upper -> LE -> TE lower, chord-normalised). Throws InputError
// for a section that cannot be fitted (fewer than 5 points, non-finite values).
FittedSection fit_section(const Section& section, const FitOptions& options);

// Largest distance (chord fractions) from the section interpolant to the polyline through the
// section points: what a straight-segment export deviates from the smooth section.
double polyline_deviation(const Section& section, int samples_per_interval = 8);

// The section with its trailing-edge gap closed: each surface is moved by half the gap vector
// times the fraction of the chord from the leading edge, so the LE stays put and both ends meet at
// the old trailing-edge midpoint. The change at any point is at most half the gap.
Section close_trailing_edge(const Section& section);

// Index of the leading-edge point: the point farthest from the trailing-edge midpoint.
int leading_edge_index(const Points& points);

// Checks a section for export and removes consecutive repeated points. Throws InputError naming
// the section and the rule broken.
Section cleaned_section(const Section& section);

}  // namespace fulmar::cad
