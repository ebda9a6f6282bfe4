#include "solvers/inviscid/panel_kernels.h"

#include <algorithm>
#include <cmath>
#include <numbers>

namespace fulmar::panel {
namespace {

constexpr double kTwoPi = 2.0 * std::numbers::pi;
constexpr double kCoincident = 1e-12;  // relative to the panel length

struct Local {
  double x, y, L, r1s, r2s, ln1, ln2;  // r1s, r2s: squared distances to the ends
};

// `log_scale` replaces ln r at an end the point coincides with; in the stream function every such
// ln r is multiplied by a factor that vanishes there, so the choice does not matter.
Local local_frame(const Frame& f, const Eigen::Vector2d& p) {
  const Eigen::Vector2d d = p - f.a;
  Local l;
  l.x = d.dot(f.t);
  l.y = d.dot(f.n);
  l.L = f.length;
  if (l.y == 0.0) l.y = 0.0;
  l.r1s = l.x * l.x + l.y * l.y;
  l.r2s = (l.x - l.L) * (l.x - l.L) + l.y * l.y;
  return l;
}

Local local(const Frame& f, const Eigen::Vector2d& p, double log_scale) {
  const Eigen::Vector2d d = p - f.a;
  Local l;
  l.x = d.dot(f.t);
  l.y = d.dot(f.n);
  l.L = f.length;
  if (l.y == 0.0) l.y = 0.0;  // no negative zero: atan2 must see the left-side limit
  l.r1s = l.x * l.x + l.y * l.y;
  l.r2s = (l.x - l.L) * (l.x - l.L) + l.y * l.y;
  const double eps2 = kCoincident * kCoincident * l.L * l.L;
  l.ln1 = l.r1s > eps2 ? 0.5 * std::log(l.r1s) : std::log(log_scale);
  l.ln2 = l.r2s > eps2 ? 0.5 * std::log(l.r2s) : std::log(log_scale);
  return l;
}

double integral_ln(const Local& l, double dtheta) {  // Int_0^L ln r dxi
  return l.x * l.ln1 - (l.x - l.L) * l.ln2 - l.L + l.y * dtheta;
}

// theta2 - theta1 = arg((p - b) / (p - a)), left-side limit on the panel (y = +0 gives +pi).
double dtheta_left(const Local& l) {
  return std::atan2(l.y * l.L, l.x * (l.x - l.L) + l.y * l.y);
}

// theta2 - theta1 for velocities: on the panel itself (ends included) the mean of both sides.
double dtheta_mean(const Local& l) {
  const double eps = kCoincident * l.L;
  if (std::abs(l.y) <= eps && l.x >= -eps && l.x <= l.L + eps) return 0.0;
  return dtheta_left(l);
}

Eigen::Vector2d to_global(const Frame& f, double u, double v) {
  return u * f.t + v * f.n;
}

}  // namespace

Frame frame(const Eigen::Vector2d& a, const Eigen::Vector2d& b) {
  Frame f;
  f.a = a;
  const Eigen::Vector2d d = b - a;
  f.length = d.norm();
  f.t = d / f.length;
  f.n = Eigen::Vector2d(-f.t.y(), f.t.x());
  return f;
}

void psi_vortex_linear(const Frame& f, const Eigen::Vector2d& p, double& wa, double& wb) {
  const Local l = local(f, p, 1.0);
  const double i0 = integral_ln(l, dtheta_left(l));
  const double j = 0.5 * l.r2s * l.ln2 - 0.25 * (l.L - l.x) * (l.L - l.x) - 0.5 * l.r1s * l.ln1 +
                   0.25 * l.x * l.x;
  const double i1 = l.x * i0 + j;  // Int_0^L xi ln r dxi
  wa = (i0 - i1 / l.L) / kTwoPi;
  wb = i1 / (l.L * kTwoPi);
}

void psi_vortex_linear(const Frame& f, const Eigen::Vector2d& p, double ln1, double ln2, double& wa,
                       double& wb) {
  Local l = local_frame(f, p);
  l.ln1 = ln1;
  l.ln2 = ln2;
  const double i0 = integral_ln(l, dtheta_left(l));
  const double j = 0.5 * l.r2s * l.ln2 - 0.25 * (l.L - l.x) * (l.L - l.x) - 0.5 * l.r1s * l.ln1 +
                   0.25 * l.x * l.x;
  const double i1 = l.x * i0 + j;
  wa = (i0 - i1 / l.L) / kTwoPi;
  wb = i1 / (l.L * kTwoPi);
}

double half_log_distance_squared(const Eigen::Vector2d& p, const Eigen::Vector2d& q, double scale) {
  const double r2 = (p - q).squaredNorm();
  return r2 > kCoincident * kCoincident * scale * scale ? 0.5 * std::log(r2) : 0.0;
}

double psi_vortex_constant(const Frame& f, const Eigen::Vector2d& p) {
  const Local l = local(f, p, 1.0);
  return integral_ln(l, dtheta_left(l)) / kTwoPi;
}

namespace {
double source_psi(const Local& l, Cut cut) {
  double k = 0.0;
  if (cut == Cut::kRight) {
    // Standard atan2 (cut along -t of each element), continued into y < 0 through the side ahead
    // of the element; behind it (xi > x) the angle is 2 pi larger there.
    const double t1 = std::atan2(l.y, l.x), t2 = std::atan2(l.y, l.x - l.L);
    k = l.x * t1 + l.y * l.ln1 - (l.x - l.L) * t2 - l.y * l.ln2;
    if (l.y < 0.0) k += kTwoPi * (l.L - std::clamp(l.x, 0.0, l.L));
  } else {
    // Angle measured from -t: cut along +t beyond each element.
    const double my = l.y == 0.0 ? 0.0 : -l.y;
    const double t1 = std::atan2(my, -l.x), t2 = std::atan2(my, l.L - l.x);
    k = l.x * t1 + l.y * l.ln1 - (l.x - l.L) * t2 - l.y * l.ln2;
  }
  return k / kTwoPi;
}
}  // namespace

double psi_source_constant(const Frame& f, const Eigen::Vector2d& p, Cut cut) {
  return source_psi(local(f, p, 1.0), cut);
}

double psi_source_constant(const Frame& f, const Eigen::Vector2d& p, double ln1, double ln2,
                           Cut cut) {
  Local l = local_frame(f, p);
  l.ln1 = ln1;
  l.ln2 = ln2;
  return source_psi(l, cut);
}

void velocity_vortex_linear(const Frame& f, const Eigen::Vector2d& p, double log_scale,
                            Eigen::Vector2d& va, Eigen::Vector2d& vb) {
  const Local l = local(f, p, log_scale);
  const double dt = dtheta_mean(l);
  const double i0 = integral_ln(l, dt);
  const double ub = (l.x * dt + l.y * (l.ln2 - l.ln1)) / l.L;  // d(I1)/dy / L
  const double vb_ = (i0 - l.L * l.ln2) / l.L;                 // d(I1)/dx / L
  const double ua = dt - ub;
  const double va_ = (l.ln1 - l.ln2) - vb_;
  va = to_global(f, ua / kTwoPi, -va_ / kTwoPi);
  vb = to_global(f, ub / kTwoPi, -vb_ / kTwoPi);
}

Eigen::Vector2d velocity_vortex_constant(const Frame& f, const Eigen::Vector2d& p,
                                         double log_scale) {
  const Local l = local(f, p, log_scale);
  return to_global(f, dtheta_mean(l) / kTwoPi, -(l.ln1 - l.ln2) / kTwoPi);
}

Eigen::Vector2d velocity_source_constant(const Frame& f, const Eigen::Vector2d& p,
                                         double log_scale) {
  const Local l = local(f, p, log_scale);
  return to_global(f, (l.ln1 - l.ln2) / kTwoPi, dtheta_mean(l) / kTwoPi);
}

void velocity_source_linear(const Frame& f, const Eigen::Vector2d& p, double log_scale,
                            Eigen::Vector2d& va, Eigen::Vector2d& vb) {
  const Local l = local(f, p, log_scale);
  const double lnr = l.ln1 - l.ln2, dth = dtheta_mean(l);
  // Unit constant sheet (u0, v0) and the ramp xi / L (u1, v1), from
  // Int xi (x - xi) / R^2 = x ln(r1/r2) - L + y dtheta and Int xi y / R^2 = x dtheta - y ln(r1/r2).
  const double u0 = lnr, v0 = dth;
  const double u1 = (l.x * lnr - l.L + l.y * dth) / l.L;
  const double v1 = (l.x * dth - l.y * lnr) / l.L;
  va = to_global(f, (u0 - u1) / kTwoPi, (v0 - v1) / kTwoPi);
  vb = to_global(f, u1 / kTwoPi, v1 / kTwoPi);
}

void wake_source_velocity(const std::vector<Frame>& wake_panels, const Eigen::Vector2d& p,
                          const Eigen::Vector2d& t, double log_scale, Eigen::VectorXd& weights) {
  const int k_count = static_cast<int>(wake_panels.size());
  weights.setZero(k_count);
  // Node j's strength: the mean of panels j - 1 and j, or the one panel at a wake end.
  auto add_node = [&](int j, double w) {
    if (j == 0 || j == k_count) {
      weights(std::min(j, k_count - 1)) += w;
    } else {
      weights(j - 1) += 0.5 * w;
      weights(j) += 0.5 * w;
    }
  };
  for (int k = 0; k < k_count; ++k) {
    const Frame& w = wake_panels[k];
    Frame first = w, second = w;
    first.length = second.length = 0.5 * w.length;
    second.a = w.a + 0.5 * w.length * w.t;
    Eigen::Vector2d a1, m1, m2, b2;
    velocity_source_linear(first, p, log_scale, a1, m1);
    velocity_source_linear(second, p, log_scale, m2, b2);
    weights(k) += t.dot(m1 + m2);
    add_node(k, t.dot(a1));
    add_node(k + 1, t.dot(b2));
  }
}

}  // namespace fulmar::panel
