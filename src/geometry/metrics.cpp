#include "geometry/metrics.h"

#include <Eigen/QR>
#include <algorithm>
#include <cmath>
#include <numbers>

#include "common/error.h"

namespace fulmar {

namespace {

// Golden-section search for the maximum of f on [a, b] (f unimodal there).
template <class F>
double golden_max(double a, double b, F f) {
  const double g = 0.5 * (std::sqrt(5.0) - 1.0);
  double c = b - g * (b - a), d = a + g * (b - a);
  double fc = f(c), fd = f(d);
  while (b - a > 1e-12) {
    if (fc >= fd) {
      b = d, d = c, fd = fc;
      c = b - g * (b - a);
      fc = f(c);
    } else {
      a = c, c = d, fc = fd;
      d = a + g * (b - a);
      fd = f(d);
    }
  }
  return 0.5 * (a + b);
}

// Maximum of f over [lo, hi]: a grid of `n` cosine-spaced stations (dense at both ends), then a
// golden-section refinement between the neighbours of the best station.
template <class F>
std::pair<double, double> maximum_over(double lo, double hi, int n, F f) {
  int best = 0;
  double fbest = -std::numeric_limits<double>::infinity();
  std::vector<double> xs(n + 1);
  for (int j = 0; j <= n; ++j) {
    xs[j] = lo + (hi - lo) * 0.5 * (1 - std::cos(std::numbers::pi * j / n));
    const double v = f(xs[j]);
    if (v > fbest) fbest = v, best = j;
  }
  const double a = xs[std::max(best - 1, 0)], b = xs[std::min(best + 1, n)];
  const double x = golden_max(a, b, f);
  const double fx = f(x);
  if (fx >= fbest) return {x, fx};
  return {xs[best], fbest};
}

double cross(double ax, double ay, double bx, double by) {
  return ax * by - ay * bx;
}

bool segments_meet(double ax, double ay, double bx, double by, double cx, double cy, double dx,
                   double dy) {
  if (std::max(ax, bx) < std::min(cx, dx) || std::max(cx, dx) < std::min(ax, bx) ||
      std::max(ay, by) < std::min(cy, dy) || std::max(cy, dy) < std::min(ay, by)) {
    return false;
  }
  const double o1 = cross(bx - ax, by - ay, cx - ax, cy - ay);
  const double o2 = cross(bx - ax, by - ay, dx - ax, dy - ay);
  const double o3 = cross(dx - cx, dy - cy, ax - cx, ay - cy);
  const double o4 = cross(dx - cx, dy - cy, bx - cx, by - cy);
  if (((o1 > 0 && o2 < 0) || (o1 < 0 && o2 > 0)) && ((o3 > 0 && o4 < 0) || (o3 < 0 && o4 > 0))) {
    return true;
  }
  // Touching or collinear overlap: an endpoint lies on the other segment.
  auto on = [](double px, double py, double qx, double qy, double tx, double ty, double o) {
    return o == 0 && tx >= std::min(px, qx) && tx <= std::max(px, qx) && ty >= std::min(py, qy) &&
           ty <= std::max(py, qy);
  };
  return on(ax, ay, bx, by, cx, cy, o1) || on(ax, ay, bx, by, dx, dy, o2) ||
         on(cx, cy, dx, dy, ax, ay, o3) || on(cx, cy, dx, dy, bx, by, o4);
}

// Radius of curvature at the nose. Near the nose each surface is a graph x(y). Anchored at the
// point nearest the nose (a data point, so free of any spline error), the fit
//   x - x_a = c1 dy + c2 dy^2 + c3 dy^3 + c4 dy^4,   dy = y - y_a,
// with c1 shared (the tangent is continuous) and c2..c4 per side, through four points on each
// side (least squares, 8 rows, 7 unknowns) gives each side's curvature 2 c2 / (1 + c1^2)^1.5 to
// third order. Separate sides matter: NACA and CST noses carry |dy|^3 terms of opposite sign on
// the two sides, which a spline or any single polynomial across the nose follows only to first
// or second order (the spline curvature is 0.75 % low for NACA 0012 at 120 points per surface).
// The radius is the inverse of the two sides' mean curvature. Falls back to the spline curvature
// when there are not four points on a side or they do not run monotonically away in y.
double nose_radius(const SectionSurfaces& surf) {
  const SectionSpline& sp = surf.spline();
  const double s_le = surf.leading_edge_parameter();
  const double spline_radius = 1.0 / std::abs(sp.at(s_le).curvature());
  int anchor = sp.interval(s_le);
  if (sp.knot(anchor + 1) - s_le < s_le - sp.knot(anchor)) ++anchor;
  if (anchor - 4 < 0 || anchor + 4 >= sp.knot_count()) return spline_radius;
  const double xa = sp.knot_x(anchor), ya = sp.knot_y(anchor);
  double scale = 0;
  for (int r = 1; r <= 4; ++r) {
    scale = std::max(
        {scale, std::abs(sp.knot_y(anchor - r) - ya), std::abs(sp.knot_y(anchor + r) - ya)});
  }
  Eigen::Matrix<double, 8, 7> v = Eigen::Matrix<double, 8, 7>::Zero();
  Eigen::Matrix<double, 8, 1> rhs;
  for (int side = 0; side < 2; ++side) {
    double previous = 0;
    for (int r = 1; r <= 4; ++r) {
      const int i = side == 0 ? anchor - r : anchor + r;
      const double dy = (sp.knot_y(i) - ya) / scale;  // upper side: dy > 0, lower: dy < 0
      const double u = std::abs(dy);
      if (!(u > previous) || (side == 0) != (dy > 0)) return spline_radius;
      previous = u;
      const int row = 4 * side + r - 1;
      v(row, 0) = dy;
      v(row, 1 + 3 * side) = u * u;
      v(row, 2 + 3 * side) = u * u * u;
      v(row, 3 + 3 * side) = u * u * u * u;
      rhs[row] = (sp.knot_x(i) - xa) / scale;
    }
  }
  const Eigen::Matrix<double, 7, 1> c = v.colPivHouseholderQr().solve(rhs);
  const double slope = std::pow(1 + c[0] * c[0], 1.5);
  const double mean = 0.5 * (2 * c[1] + 2 * c[4]) / slope / scale;
  return mean > 0 ? 1.0 / mean : spline_radius;
}

}  // namespace

SectionSurfaces::SectionSurfaces(const Section& section) : spline_(section.points) {
  s_le_ = spline_.minimum_x();
  k_le_ = spline_.interval(s_le_);
  const int n = spline_.knot_count() - 1;
  const double te_x = 0.5 * (spline_.knot_x(0) + spline_.knot_x(n));
  const double te_y = 0.5 * (spline_.knot_y(0) + spline_.knot_y(n));
  chord_slope_ = te_x > 0 ? te_y / te_x : 0.0;
}

double SectionSurfaces::surface_y(bool upper, double x) const {
  const SectionSpline& sp = spline_;
  const int n = sp.knot_count() - 1;
  const SplinePoint end = upper ? sp.at(0.0, 0) : sp.at(sp.length(), n - 1);
  if (x >= end.x) {
    if (end.dx == 0) return end.y;
    return end.y + end.dy / end.dx * (x - end.x);
  }
  const SplinePoint le = sp.at(s_le_, k_le_);
  if (x <= le.x) return le.y;
  // Bracket x between two knots (x runs down to the nose on the upper side, up on the lower).
  double lo, hi;
  if (upper) {
    int a = 0, b = k_le_;
    if (sp.knot_x(b) >= x) {
      lo = sp.knot(b), hi = s_le_;
    } else {
      while (b - a > 1) {
        const int m = (a + b) / 2;
        (sp.knot_x(m) >= x ? a : b) = m;
      }
      lo = sp.knot(a), hi = sp.knot(b);
    }
  } else {
    int a = k_le_ + 1, b = n;
    if (sp.knot_x(a) >= x) {
      lo = s_le_, hi = sp.knot(a);
    } else {
      while (b - a > 1) {
        const int m = (a + b) / 2;
        (sp.knot_x(m) >= x ? b : a) = m;
      }
      lo = sp.knot(a), hi = sp.knot(b);
    }
  }
  // Safeguarded Newton on x(s) = x inside [lo, hi].
  const int interval = sp.interval(0.5 * (lo + hi));
  SplinePoint pl = sp.at(lo, interval);
  const double sign = (pl.x - x) <= 0 ? 1.0 : -1.0;  // orient so that g(lo) <= 0 <= g(hi)
  double s = 0.5 * (lo + hi);
  SplinePoint p = sp.at(s, interval);
  for (int it = 0; it < 100; ++it) {
    const double g = sign * (p.x - x);
    if (g == 0) break;
    if (g < 0)
      lo = s;
    else
      hi = s;
    double next = s - (p.x - x) / p.dx;
    if (!(next > lo && next < hi) || p.dx == 0) next = 0.5 * (lo + hi);
    if (std::abs(next - s) <= 1e-15 * (1 + std::abs(s))) {
      s = next;
      p = sp.at(s, interval);
      break;
    }
    s = next;
    p = sp.at(s, interval);
  }
  return p.y;
}

double SectionSurfaces::upper_y(double x) const {
  return surface_y(true, x);
}
double SectionSurfaces::lower_y(double x) const {
  return surface_y(false, x);
}

// Camber below this (chord fractions) is reported as none: the resolution of coordinate files.
constexpr double kFlatCamber = 1e-6;

SectionMetrics section_metrics(const Section& section) {
  const SectionSurfaces surf(section);
  const SectionSpline& sp = surf.spline();
  SectionMetrics m;
  const auto [tx, t] = maximum_over(0.0, 1.0, 300, [&](double x) { return surf.thickness_at(x); });
  m.thickness = t;
  m.thickness_x = tx;
  // Camber of largest magnitude, with its sign.
  const auto [cxp, cp] = maximum_over(0.0, 1.0, 300, [&](double x) { return surf.camber_at(x); });
  const auto [cxn, cn] = maximum_over(0.0, 1.0, 300, [&](double x) { return -surf.camber_at(x); });
  if (std::max(cp, cn) > kFlatCamber) {
    if (cp >= cn)
      m.camber = cp, m.camber_x = cxp;
    else
      m.camber = -cn, m.camber_x = cxn;
  }
  m.le_radius = nose_radius(surf);
  const Points& p = section.points;
  m.te_gap = (p.row(0) - p.row(p.rows() - 1)).norm();
  const SplinePoint u = sp.at(0.0), l = sp.at(sp.length());
  const double angle_u = std::atan2(-u.dy, -u.dx);  // upper surface, pointing downstream
  const double angle_l = std::atan2(l.dy, l.dx);    // lower surface, pointing downstream
  m.te_angle_deg = (angle_l - angle_u) * 180.0 / std::numbers::pi;
  // Area: (1/2) closed integral of (x dy - y dx); three-point Gauss-Legendre is exact on each
  // cubic piece (the integrand is of degree 5), plus the straight trailing-edge closure.
  const double g = std::sqrt(3.0 / 5.0);
  const double gx[3] = {-g, 0.0, g}, gw[3] = {5.0 / 9, 8.0 / 9, 5.0 / 9};
  double area2 = 0;
  for (int i = 0; i + 1 < sp.knot_count(); ++i) {
    const double a = sp.knot(i), b = sp.knot(i + 1);
    for (int k = 0; k < 3; ++k) {
      const SplinePoint q = sp.at(0.5 * (a + b) + 0.5 * (b - a) * gx[k], i);
      area2 += 0.5 * (b - a) * gw[k] * (q.x * q.dy - q.y * q.dx);
    }
  }
  area2 += l.x * u.y - u.x * l.y;
  m.area = 0.5 * area2;
  return m;
}

double thickness_at(const Section& section, double x) {
  if (!(x >= 0 && x <= 1)) {
    throw InputError("thickness station x/c = " + std::to_string(x) + " is outside [0, 1]");
  }
  return SectionSurfaces(section).thickness_at(x);
}

double minimum_thickness(const Section& section, double x_from, double x_to) {
  if (!(x_from >= 0 && x_to <= 1 && x_from < x_to)) {
    throw InputError("minimum thickness interval [" + std::to_string(x_from) + ", " +
                     std::to_string(x_to) + "] must satisfy 0 <= from < to <= 1");
  }
  const SectionSurfaces surf(section);
  return -maximum_over(x_from, x_to, 200, [&](double x) { return -surf.thickness_at(x); }).second;
}

CurvatureReversals curvature_reversals(const Section& section, double flat_curvature) {
  if (!(flat_curvature >= 0)) {
    throw InputError("flat_curvature " + std::to_string(flat_curvature) + " must be >= 0");
  }
  const SectionSurfaces surf(section);
  const SectionSpline& sp = surf.spline();
  const double s_le = surf.leading_edge_parameter();
  auto count = [&](double from, double to) {
    int state = 0, reversals = 0;
    const int i0 = sp.interval(from), i1 = sp.interval(to);
    for (int i = i0; i <= i1; ++i) {
      const double a = std::max(sp.knot(i), from), b = std::min(sp.knot(i + 1), to);
      for (int k = 0; k < 4; ++k) {
        const double kappa = sp.at(a + (b - a) * k / 4.0, i).curvature();
        if (kappa >= flat_curvature) {
          if (state < 0) ++reversals;
          state = 1;
        } else if (kappa <= -flat_curvature) {
          if (state > 0) ++reversals;
          state = -1;
        }
      }
    }
    return reversals;
  };
  return {count(0.0, s_le), count(s_le, sp.length())};
}

std::optional<std::pair<int, int>> first_self_intersection(const Points& p) {
  const int n = static_cast<int>(p.rows());
  if (n < 4) return std::nullopt;
  const double extent = std::max(p.col(0).maxCoeff() - p.col(0).minCoeff(),
                                 p.col(1).maxCoeff() - p.col(1).minCoeff());
  const bool closed = (p.row(0) - p.row(n - 1)).norm() <= 1e-12 * extent;
  const int segments = closed ? n - 1 : n;  // segment k joins p[k] and p[(k + 1) % n]
  for (int j = 2; j < segments; ++j) {
    const int j1 = (j + 1) % n;
    for (int i = 0; i + 1 < j; ++i) {
      if (i == 0 && j == segments - 1) continue;  // they share the trailing-edge point
      const int i1 = i + 1;
      if (segments_meet(p(i, 0), p(i, 1), p(i1, 0), p(i1, 1), p(j, 0), p(j, 1), p(j1, 0),
                        p(j1, 1))) {
        return std::make_pair(i, j);
      }
    }
  }
  return std::nullopt;
}

bool self_intersects(const Section& section) {
  return first_self_intersection(section.points).has_value();
}

}  // namespace fulmar
