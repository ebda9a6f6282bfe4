#pragma once
// Test helper: NACA 4-digit sections from the formulas of NACA Report 460 (Jacobs, Ward &
// Pinkerton 1933), written here independently of the geometry library so that the CAD tests have
// an outside reference. Thickness laid perpendicular to the mean line.
#include <algorithm>
#include <cmath>
#include <numbers>
#include <string>

#include "geometry/section.h"

namespace fulmar::cad::testing {

// Half thickness at x (chord fractions) for thickness ratio t; closed_te uses -0.1036 for x^4.
inline double naca4_half_thickness(double x, double t, bool closed_te = false) {
  const double a4 = closed_te ? -0.1036 : -0.1015;
  return 5.0 * t *
         (0.2969 * std::sqrt(x) - 0.1260 * x - 0.3516 * x * x + 0.2843 * x * x * x +
          a4 * x * x * x * x);
}

// A point on the section at beta in [-pi, pi]: beta < 0 upper, beta > 0 lower surface, with
// x = (1 - cos beta) / 2 (cosine spacing in beta). m, p: camber and its position (chord).
inline Eigen::Vector2d naca4_point(double beta, double m, double p, double t, bool closed_te) {
  const double x = 0.5 * (1.0 - std::cos(beta));
  const double yt = naca4_half_thickness(x, t, closed_te);
  double yc = 0.0;
  double slope = 0.0;
  if (m > 0.0) {
    if (x < p) {
      yc = m / (p * p) * (2 * p * x - x * x);
      slope = 2 * m / (p * p) * (p - x);
    } else {
      yc = m / ((1 - p) * (1 - p)) * ((1 - 2 * p) + 2 * p * x - x * x);
      slope = 2 * m / ((1 - p) * (1 - p)) * (p - x);
    }
  }
  const double theta = std::atan(slope);
  const double side = beta < 0.0 ? 1.0 : -1.0;  // upper: +, lower: -
  return {x - side * yt * std::sin(theta), yc + side * yt * std::cos(theta)};
}

// digits like "0012" or "2412"; per_surface intervals on each surface (cosine spaced).
inline Section naca4_section(const std::string& digits, int per_surface = 120,
                             bool closed_te = false) {
  const double m = (digits[0] - '0') / 100.0;
  const double p = (digits[1] - '0') / 10.0;
  const double t = std::stod(digits.substr(2, 2)) / 100.0;
  Section s{"NACA " + digits, Points(2 * per_surface + 1, 2)};
  for (int i = 0; i <= 2 * per_surface; ++i) {
    const double beta = -std::numbers::pi + std::numbers::pi * i / per_surface;
    s.points.row(i) = naca4_point(beta, m, p, t, closed_te).transpose();
  }
  s.points.row(per_surface) << 0.0, 0.0;
  return s;
}

// Distance from q to the analytic NACA 00tt / mm pp tt curve: coarse search over beta, then
// golden-section refinement (the distance is unimodal within one coarse step of the minimum).
inline double distance_to_naca(const Eigen::Vector2d& q, double m, double p, double t,
                               bool closed) {
  constexpr int kCoarse = 4000;
  int best = 0;
  double best_d = 1e300;
  for (int i = 0; i <= kCoarse; ++i) {
    const double beta = -std::numbers::pi + 2 * std::numbers::pi * i / kCoarse;
    const double d = (naca4_point(beta, m, p, t, closed) - q).squaredNorm();
    if (d < best_d) {
      best_d = d;
      best = i;
    }
  }
  const double step = 2 * std::numbers::pi / kCoarse;
  double a = -std::numbers::pi + step * (best - 1);
  double b = -std::numbers::pi + step * (best + 1);
  a = std::max(a, -std::numbers::pi);
  b = std::min(b, std::numbers::pi);
  const double g = 0.5 * (std::sqrt(5.0) - 1.0);
  for (int it = 0; it < 80; ++it) {
    const double c = b - g * (b - a);
    const double d = a + g * (b - a);
    if ((naca4_point(c, m, p, t, closed) - q).squaredNorm() <
        (naca4_point(d, m, p, t, closed) - q).squaredNorm()) {
      b = d;
    } else {
      a = c;
    }
  }
  return (naca4_point(0.5 * (a + b), m, p, t, closed) - q).norm();
}

}  // namespace fulmar::cad::testing
