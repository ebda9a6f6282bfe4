#pragma once
// Exact potential flow about Karman-Trefftz sections, for tests of the panel method and of the
// chain that feeds it (coordinate text -> reading -> panelling -> solver).
//
// The section is the conformal image of a circle through zeta = 1 with centre (-mux, muy) under
//   z = n (1 + r^n) / (1 - r^n),  r = (zeta - 1) / (zeta + 1),  n = 2 - tau / pi,
// tau the trailing-edge angle (Milne-Thomson, Theoretical Aerodynamics, 4th ed. 1958, ch. 7;
// Katz & Plotkin, Low-Speed Aerodynamics, 2nd ed. 2001, sec. 6.7). The flow about the circle
// with the rear stagnation point at zeta = 1 (Kutta) maps to the flow about the section.
//
// Two frames: the mapping's own (trailing edge at z = n) and the chord frame fulmar uses for a
// section (geometry/section.h): leading edge, the point farthest from the trailing edge, at
// (0, 0), trailing edge at (1, 0). Angles of attack given to the functions below are in the
// chord frame; cl is over that chord. The surface speed over the free stream is the same in both
// frames (the change of frame is a rotation and a scaling).
#include <algorithm>
#include <cmath>
#include <complex>
#include <numbers>
#include <vector>

#include "geometry/section.h"

namespace fulmar::testing {

// Degrees to radians (the test cases give angles in degrees, the solvers take radians).
inline double deg(double degrees) {
  return degrees * std::numbers::pi / 180.0;
}

class KarmanTrefftz {
 public:
  using cplx = std::complex<double>;

  // mux, muy: circle centre (-mux, muy), mux > 0 for thickness, muy > 0 for positive camber;
  // tau_deg: trailing-edge angle in degrees, [0, 90).
  KarmanTrefftz(double mux, double muy, double tau_deg) : mux_(mux), muy_(muy), tau_deg_(tau_deg) {
    // Leading edge: the farthest point from the trailing edge, on a fine sampling refined by
    // golden-section search to 1e-14 in the circle angle.
    const int m = 20000;
    int best = 0;
    double dist = 0.0;
    for (int k = 0; k < m; ++k) {
      const double d = std::abs(z_of(theta_te() + 2.0 * kPi * k / m) - n());
      if (d > dist) dist = d, best = k;
    }
    double lo = theta_te() + 2.0 * kPi * (best - 1) / m,
           hi = theta_te() + 2.0 * kPi * (best + 1) / m;
    const double g = 0.5 * (std::sqrt(5.0) - 1.0);
    for (int it = 0; it < 200 && hi - lo > 1e-15; ++it) {
      const double a = hi - g * (hi - lo), b = lo + g * (hi - lo);
      if (std::abs(z_of(a) - n()) > std::abs(z_of(b) - n()))
        hi = b;
      else
        lo = a;
    }
    theta_le_ = 0.5 * (lo + hi);
    le_ = z_of(theta_le_);
    chord_ = std::abs(n() - le_);
    chord_angle_ = std::arg(cplx(n(), 0.0) - le_);
  }

  double n() const { return 2.0 - tau_deg_ / 180.0; }  // 2 - tau / pi
  double tau_deg() const { return tau_deg_; }
  // Circle angle of the trailing edge; the upper surface runs from it to theta_le(), the lower
  // from theta_le() to theta_te() + 2 pi.
  double theta_te() const { return std::arg(cplx(1.0, 0.0) - centre()); }
  double theta_le() const { return theta_le_; }
  // Direction of the chord (leading edge to trailing edge) in the mapping's frame, rad. A free
  // stream at angle a in the mapping's frame is at a - chord_angle() in the chord frame.
  double chord_angle() const { return chord_angle_; }

  // Point of the section at circle angle theta, in the chord frame.
  Eigen::Vector2d point(double theta) const {
    const cplx w = (z_of(theta) - le_) * std::polar(1.0, -chord_angle_) / chord_;
    return {w.real(), w.imag()};
  }

  // Exact surface speed over the free stream at circle angle theta, angle of attack alpha (rad,
  // chord frame). Zero at the trailing edge when tau > 0.
  double speed(double theta, double alpha) const {
    const double a = alpha + chord_angle_;
    const cplx zt = zeta(theta), d = zt - centre();
    const double rad = radius();
    const cplx w = std::polar(1.0, -a) - rad * rad * std::polar(1.0, a) / (d * d) +
                   cplx(0.0, 1.0) * circulation(a) / (2.0 * kPi * d);
    return std::abs(w / dz(zt));
  }
  double cp(double theta, double alpha) const {
    const double q = speed(theta, alpha);
    return 1.0 - q * q;
  }
  // Exact lift coefficient (Kutta-Joukowski, 2 Gamma / (V c)) at alpha (rad, chord frame).
  double cl(double alpha) const { return 2.0 * circulation(alpha + chord_angle_) / chord_; }

  // Circle angle of the surface point with chord-frame abscissa x in [0, 1] on the upper or
  // lower surface (bisection: x is monotonic along each surface of these sections).
  double theta_at_x(double x, bool upper) const {
    double lo = upper ? theta_te() : theta_le_, hi = upper ? theta_le_ : theta_te() + 2.0 * kPi;
    // Upper: x falls from 1 to 0 as theta rises; lower: x rises from 0 to 1.
    for (int it = 0; it < 200 && hi - lo > 1e-15; ++it) {
      const double mid = 0.5 * (lo + hi);
      const bool beyond = upper ? point(mid).x() < x : point(mid).x() > x;
      (beyond ? hi : lo) = mid;
    }
    return 0.5 * (lo + hi);
  }

  // The section as a user would tabulate it: `per_surface` + 1 points on each surface at
  // x = (1 - cos(pi k / per_surface)) / 2 (cosine spacing, dense at both edges), upper trailing
  // edge -> leading edge -> lower trailing edge; 2 per_surface + 1 points, the leading edge
  // (0, 0) and the closed trailing edge (1, 0) included.
  Section section(int per_surface) const {
    Section s;
    s.name = "Karman-Trefftz section";
    s.points.resize(2 * per_surface + 1, 2);
    for (int k = 0; k <= per_surface; ++k) {
      const double x = 0.5 * (1.0 - std::cos(kPi * k / per_surface));
      const Eigen::Vector2d up = k == 0 ? Eigen::Vector2d(0.0, 0.0) : point(theta_at_x(x, true));
      const Eigen::Vector2d lo = k == 0 ? Eigen::Vector2d(0.0, 0.0) : point(theta_at_x(x, false));
      s.points.row(per_surface - k) = up.transpose();
      s.points.row(per_surface + k) = lo.transpose();
    }
    s.points.row(0) << 1.0, 0.0;
    s.points.row(2 * per_surface) << 1.0, 0.0;
    return s;
  }

  // Circle angles of the `panels` + 1 nodes of a panelling such as a solver would use,
  // counter-clockwise from theta_te() to theta_te() + 2 pi. On each surface (split at the node
  // farthest from the trailing edge of a fine sampling) a cosine distribution, dense at both
  // edges, in the curvature-weighted arc length d(mu) = (1 + kBlend sqrt(kappa c)) ds, so that
  // panels shrink where the surface bends.
  std::vector<double> panel_angles(int panels) const {
    const int m = 40000;
    std::vector<Eigen::Vector2d> pt(m + 1);
    std::vector<double> th(m + 1), s(m + 1, 0.0);
    for (int k = 0; k <= m; ++k) {
      th[k] = theta_te() + 2.0 * kPi * k / m;
      pt[k] = point(th[k]);
    }
    const Eigen::Vector2d te(1.0, 0.0);
    int le = 0;
    for (int k = 0; k <= m; ++k) {
      if ((pt[k] - te).norm() > (pt[le] - te).norm()) le = k;
    }
    const double c = (pt[le] - te).norm();
    for (int k = 1; k <= m; ++k) {
      const Eigen::Vector2d a = pt[k] - pt[k - 1];
      const double ds = a.norm();
      double kappa = 0.0;
      if (k < m) {  // turning angle over arc length
        const Eigen::Vector2d b = pt[k + 1] - pt[k];
        const double turn = std::abs(std::atan2(a.x() * b.y() - a.y() * b.x(), a.dot(b)));
        kappa = turn / (0.5 * (ds + b.norm()));
      }
      s[k] = s[k - 1] + ds * (1.0 + kBlend * std::sqrt(kappa * c));
    }
    const int n_up = panels / 2;
    std::vector<double> out(panels + 1);
    int j = 0;
    for (int k = 0; k <= panels; ++k) {
      const double target =
          k <= n_up
              ? s[le] * 0.5 * (1.0 - std::cos(kPi * k / n_up))
              : s[le] + (s[m] - s[le]) * 0.5 * (1.0 - std::cos(kPi * (k - n_up) / (panels - n_up)));
      while (j < m - 1 && s[j + 1] < target) ++j;
      const double w = (target - s[j]) / (s[j + 1] - s[j]);
      out[k] = th[j] + w * (th[j + 1] - th[j]);
    }
    out[0] = theta_te();
    out[panels] = theta_te() + 2.0 * kPi;
    return out;
  }

  // The nodes at panel_angles(panels) in the chord frame, (panels + 1) x 2, counter-clockwise
  // from the trailing edge; every node lies exactly on the section and the last repeats the first.
  Points panel_nodes(int panels) const {
    const std::vector<double> th = panel_angles(panels);
    Points p(panels + 1, 2);
    for (int k = 0; k <= panels; ++k) p.row(k) = point(th[k]).transpose();
    p.row(panels) = p.row(0);
    return p;
  }

  // Circle angle of the section point nearest to p (chord frame): fine sampling, then
  // golden-section refinement of the distance.
  double nearest_theta(const Eigen::Vector2d& p) const {
    const int m = 4000;
    int best = 0;
    double dist = 1e300;
    for (int k = 0; k <= m; ++k) {
      const double d = (point(theta_te() + 2.0 * kPi * k / m) - p).norm();
      if (d < dist) dist = d, best = k;
    }
    double lo = theta_te() + 2.0 * kPi * std::max(best - 1, 0) / m;
    double hi = theta_te() + 2.0 * kPi * std::min(best + 1, m) / m;
    const double g = 0.5 * (std::sqrt(5.0) - 1.0);
    for (int it = 0; it < 200 && hi - lo > 1e-15; ++it) {
      const double a = hi - g * (hi - lo), b = lo + g * (hi - lo);
      if ((point(a) - p).norm() < (point(b) - p).norm())
        hi = b;
      else
        lo = a;
    }
    return 0.5 * (lo + hi);
  }

  // Largest thickness and largest mean-line height over the chord (chord fractions), measured
  // normal to the chord at 400 stations.
  double thickness() const { return extent(true); }
  double camber() const { return extent(false); }

 private:
  static constexpr double kPi = std::numbers::pi;
  // Weight of curvature in the node spacing of panel_angles.
  static constexpr double kBlend = 0.6;
  cplx centre() const { return {-mux_, muy_}; }
  double radius() const { return std::abs(cplx(1.0, 0.0) - centre()); }
  cplx zeta(double theta) const { return centre() + radius() * std::polar(1.0, theta); }
  cplx z(cplx zt) const {
    const cplx r = (zt - 1.0) / (zt + 1.0);
    if (std::abs(r) < 1e-300) return n();
    const cplx rn = std::pow(r, n());
    return n() * (1.0 + rn) / (1.0 - rn);
  }
  cplx z_of(double theta) const { return z(zeta(theta)); }
  cplx dz(cplx zt) const {
    const cplx r = (zt - 1.0) / (zt + 1.0);
    const cplx rn = std::pow(r, n());
    return 4.0 * n() * n() * rn / r / ((1.0 - rn) * (1.0 - rn) * (zt + 1.0) * (zt + 1.0));
  }
  // Clockwise circulation (unit free stream at angle a in the mapping's frame) that puts the
  // rear stagnation point at zeta = 1.
  double circulation(double a) const {
    const cplx d = cplx(1.0, 0.0) - centre();
    const double rad = radius();
    const cplx w = std::polar(1.0, -a) - rad * rad * std::polar(1.0, a) / (d * d);
    return std::real(-w * 2.0 * kPi * d / cplx(0.0, 1.0));
  }
  double extent(bool thickness) const {
    double best = 0.0;
    for (int k = 1; k < 400; ++k) {
      const double x = 0.5 * (1.0 - std::cos(kPi * k / 400));
      const double yu = point(theta_at_x(x, true)).y(), yl = point(theta_at_x(x, false)).y();
      best = std::max(best, thickness ? yu - yl : std::abs(0.5 * (yu + yl)));
    }
    return best;
  }

  double mux_, muy_, tau_deg_;
  double theta_le_ = 0.0, chord_ = 1.0, chord_angle_ = 0.0;
  cplx le_;
};

}  // namespace fulmar::testing
