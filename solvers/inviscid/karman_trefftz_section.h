#pragma once
// Test sections with exact potential-flow solutions, for the panel solver's tests.
//  - Karman-Trefftz sections: conformal map of the flow about a circle (Milne-Thomson,
//    Theoretical Aerodynamics, 4th ed. 1958, ch. 7; Katz & Plotkin, Low-Speed Aerodynamics,
//    2nd ed. 2001, sec. 6.7). Section and exact Cp are generated here.
#include <algorithm>
#include <cmath>
#include <complex>
#include <numbers>
#include <vector>

#include "geometry/section.h"

namespace fulmar::testing {

using cplx = std::complex<double>;
inline constexpr double kPi = std::numbers::pi;
inline double deg(double d) {
  return d * kPi / 180.0;
}

// Karman-Trefftz section: circle through zeta = 1 with centre (-mux, muy), trailing-edge angle
// tau. z = n (1 + r^n) / (1 - r^n), r = (zeta - 1) / (zeta + 1), n = 2 - tau / pi.
// Weight of curvature in the node spacing of the test sections (see node_angles).
constexpr double kBlend = 0.6;

struct KarmanTrefftz {
  double mux, muy, tau_deg;
  cplx centre() const { return {-mux, muy}; }
  double radius() const { return std::abs(cplx(1.0, 0.0) - centre()); }
  double n() const { return 2.0 - deg(tau_deg) / kPi; }
  double theta_te() const { return std::arg(cplx(1.0, 0.0) - centre()); }
  cplx zeta(double theta) const { return centre() + radius() * std::polar(1.0, theta); }
  cplx z(cplx zt) const {
    const cplx r = (zt - 1.0) / (zt + 1.0);
    if (std::abs(r) < 1e-300) return n();
    const cplx rn = std::pow(r, n());
    return n() * (1.0 + rn) / (1.0 - rn);
  }
  cplx dz(cplx zt) const {
    const cplx r = (zt - 1.0) / (zt + 1.0);
    const cplx rn = std::pow(r, n());
    return 4.0 * n() * n() * rn / r / ((1.0 - rn) * (1.0 - rn) * (zt + 1.0) * (zt + 1.0));
  }
  // Clockwise circulation (unit free stream) that puts the rear stagnation point at zeta = 1.
  double circulation(double alpha) const {
    const cplx d = cplx(1.0, 0.0) - centre();
    const cplx w = std::polar(1.0, -alpha) - radius() * radius() * std::polar(1.0, alpha) / (d * d);
    return std::real(-w * 2.0 * kPi * d / cplx(0.0, 1.0));
  }
  double speed(double theta, double alpha) const {
    const cplx zt = zeta(theta), d = zt - centre();
    const cplx w = std::polar(1.0, -alpha) -
                   radius() * radius() * std::polar(1.0, alpha) / (d * d) +
                   cplx(0.0, 1.0) * circulation(alpha) / (2.0 * kPi * d);
    return std::abs(w / dz(zt));
  }
  // Circle angles of N+1 nodes, counter-clockwise from the trailing edge, spaced like a usual
  // section panelling: on each surface a cosine distribution (clustering at both edges) in a
  // curvature-weighted arc length d(mu) = (1 + kBlend sqrt(kappa c)) ds, so that panels shrink
  // where the surface bends. Nodes lie exactly on the section.
  std::vector<double> node_angles(int panels) const {
    const int m = 40000;
    std::vector<cplx> pt(m + 1);
    std::vector<double> th(m + 1), s(m + 1, 0.0);
    for (int k = 0; k <= m; ++k) {
      th[k] = theta_te() + 2.0 * kPi * k / m;
      pt[k] = z(zeta(th[k]));
    }
    int le = 0;
    for (int k = 0; k <= m; ++k) {
      if (std::abs(pt[k] - n()) > std::abs(pt[le] - n())) le = k;
    }
    const double c = std::abs(pt[le] - n());
    for (int k = 1; k <= m; ++k) {
      const double ds = std::abs(pt[k] - pt[k - 1]);
      double kappa = 0.0;
      if (k < m) {  // turning angle over arc length
        const double turn = std::abs(std::arg((pt[k + 1] - pt[k]) / (pt[k] - pt[k - 1])));
        kappa = turn / (0.5 * (ds + std::abs(pt[k + 1] - pt[k])));
      }
      s[k] = s[k - 1] + ds * (1.0 + kBlend * std::sqrt(kappa * c));
    }
    const int n_up = panels / 2;
    std::vector<double> out(panels + 1);
    int j = 0;
    for (int k = 0; k <= panels; ++k) {
      double target;
      if (k <= n_up) {
        target = s[le] * 0.5 * (1.0 - std::cos(kPi * k / n_up));
      } else {
        target =
            s[le] + (s[m] - s[le]) * 0.5 * (1.0 - std::cos(kPi * (k - n_up) / (panels - n_up)));
      }
      while (j < m - 1 && s[j + 1] < target) ++j;
      const double w = (target - s[j]) / (s[j + 1] - s[j]);
      out[k] = th[j] + w * (th[j + 1] - th[j]);
    }
    out[0] = theta_te();
    out[panels] = theta_te() + 2.0 * kPi;
    return out;
  }
  Points nodes(int panels) const {
    const std::vector<double> th = node_angles(panels);
    Points p(panels + 1, 2);
    for (int k = 0; k <= panels; ++k) {
      const cplx zz = z(zeta(th[k]));
      p(k, 0) = zz.real();
      p(k, 1) = zz.imag();
    }
    p.row(panels) = p.row(0);
    return p;
  }
  double chord() const {  // farthest point from the trailing edge on a fine sampling
    double c = 0.0;
    for (int k = 0; k < 200000; ++k)
      c = std::max(c, std::abs(z(zeta(theta_te() + 2 * kPi * k / 200000.0)) - n()));
    return c;
  }
};

// Sections with a finite trailing-edge gap: a Karman-Trefftz section opened by shearing the
// upper and lower surfaces apart in proportion to x (gap g at the trailing edge).
inline Points opened(const Points& closed, double gap) {
  Points p = closed;
  const int n = static_cast<int>(p.rows()) - 1;
  const double x_le = p.col(0).minCoeff(), x_te = p(0, 0);
  for (int k = 0; k <= n; ++k) {
    const double xi = (p(k, 0) - x_le) / (x_te - x_le);
    p(k, 1) += (k <= n / 2 ? 0.5 : -0.5) * gap * xi;
  }
  return p;
}

}  // namespace fulmar::testing
