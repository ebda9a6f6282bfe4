#include "solvers/inviscid/panel_solver.h"

#include <algorithm>
#include <cmath>
#include <vector>

#include "common/error.h"
#include "solvers/inviscid/panel_kernels.h"

// The parts of the panel solution that the viscous coupling needs: velocities off the surface,
// the wake trajectory, and the response of the surface and wake speeds to blowing sources.

namespace fulmar {
namespace {

using Eigen::MatrixXd;
using Eigen::Vector2d;
using Eigen::VectorXd;
using panel::point_row;

// Velocity / V_inf at `point` from the surface speeds q (#nodes), the section panels' frames
// (N, then the trailing-edge gap panel unless sharp) and the gap panel's coefficients.
Vector2d field_velocity(double alpha_rad, const VectorXd& q,
                        const std::vector<panel::Frame>& frames, bool sharp, double cn, double cs,
                        const Vector2d& point) {
  const int n = static_cast<int>(q.size()) - 1;
  Vector2d v(std::cos(alpha_rad), std::sin(alpha_rad));
  for (int j = 0; j < n; ++j) {
    Vector2d va, vb;
    panel::velocity_vortex_linear(frames[j], point, 1.0, va, vb);
    v += q(j) * va + q(j + 1) * vb;
  }
  if (!sharp) {
    const panel::Frame& f = frames[n];
    const double dq = q(0) - q(n);
    v += cn * dq * panel::velocity_source_constant(f, point, 1.0) -
         cs * dq * panel::velocity_vortex_constant(f, point, 1.0);
  }
  return v;
}

}  // namespace

Vector2d InviscidSolver::velocity_at(double alpha_rad, const Vector2d& point) const {
  VectorXd q;
  surface_speed(alpha_rad, q);
  return field_velocity(alpha_rad, q, section_frames(), sharp_, cn_, cs_, point);
}

Points InviscidSolver::wake_trajectory(double alpha_rad) const {
  const int n = panel_count();
  const double ds0 = 0.5 * (arc_(1) - arc_(0) + arc_(n) - arc_(n - 1));
  const double length = options_.wake_length * chord_;
  int nw = options_.wake_nodes;
  if (nw == 0) {
    const double g = 1.12;
    const double segments = std::log(1.0 + length * (g - 1.0) / ds0) / std::log(g);
    nw = std::clamp(static_cast<int>(std::ceil(segments)) + 1, 8, 1000);
  }
  // Growth ratio g with ds0 (g^(nw-1) - 1) / (g - 1) = length, by bisection.
  auto total = [&](double g) {
    return std::abs(g - 1.0) < 1e-12 ? ds0 * (nw - 1)
                                     : ds0 * (std::pow(g, nw - 1) - 1.0) / (g - 1.0);
  };
  double lo = 0.2, hi = 5.0;
  for (int it = 0; it < 200; ++it) {
    const double mid = 0.5 * (lo + hi);
    (total(mid) < length ? lo : hi) = mid;
  }
  const double g = 0.5 * (lo + hi);

  Points wake(nw, 2);
  wake.row(0) = te_mid_.transpose();
  Vector2d p = te_mid_ + ds0 * te_bisector_;
  wake.row(1) = p.transpose();
  double ds = ds0;
  // velocity_at with the speeds and panel frames computed once for the whole trajectory.
  VectorXd q;
  surface_speed(alpha_rad, q);
  const std::vector<panel::Frame> frames = section_frames();
  auto velocity = [&](const Vector2d& point) {
    return field_velocity(alpha_rad, q, frames, sharp_, cn_, cs_, point);
  };
  for (int k = 2; k < nw; ++k) {
    ds *= g;
    const Vector2d d1 = velocity(p).normalized();
    const Vector2d pred = p + ds * d1;
    const Vector2d d2 = velocity(pred).normalized();
    p += ds * (d1 + d2).normalized();
    wake.row(k) = p.transpose();
  }
  return wake;
}

SurfaceSourceResponse InviscidSolver::surface_source_response() const {
  const int n = panel_count();
  const int ns = n + 1;
  std::vector<panel::Frame> frames;
  frames.reserve(n);
  panel::append_frames(nodes_, frames);
  MatrixXd b = MatrixXd::Zero(n + 2, n);
  VectorXd ln_r(ns);
  for (int i = 0; i <= n; ++i) {
    const Vector2d p = point_row(nodes_, i);
    for (int j = 0; j < ns; ++j)
      ln_r(j) = panel::half_log_distance_squared(p, point_row(nodes_, j), chord_);
    for (int j = 0; j < n; ++j)
      b(i, j) = -panel::psi_source_constant(frames[j], p, ln_r(j), ln_r(j + 1), panel::Cut::kRight);
  }
  if (sharp_) {
    b.row(0).setZero();
    b.row(n).setZero();
  }
  SurfaceSourceResponse out;
  out.dgamma = lu_.solve(b);
  return out;
}

CouplingModel InviscidSolver::coupling_model(double alpha_rad,
                                             const SurfaceSourceResponse* surface) const {
  const int n = panel_count();
  const int ns = n + 1;
  CouplingModel m;
  m.alpha = alpha_rad;
  m.wake = wake_trajectory(alpha_rad);
  const int nw = static_cast<int>(m.wake.rows());
  const int nst = ns + nw;
  const int nps = n, npw = nw - 1, np = nps + npw;
  m.surface_nodes = ns;
  m.wake_nodes = nw;

  std::vector<panel::Frame> frames;
  frames.reserve(np);
  panel::append_frames(nodes_, frames);
  panel::append_frames(m.wake, frames);

  m.arc_length.resize(nst);
  m.arc_length.head(ns) = arc_;
  m.arc_length(ns) = 0.0;
  for (int k = 0; k < npw; ++k)
    m.arc_length(ns + k + 1) = m.arc_length(ns + k) + frames[nps + k].length;

  // Stream function of unit panel sources at the nodes -> change of the vortex strengths. The
  // surface panels' part does not depend on the angle (given precomputed, or solved here).
  const bool pre = surface && surface->dgamma.rows() == n + 2 && surface->dgamma.cols() == n;
  const int first = pre ? nps : 0;  // first panel solved for here
  MatrixXd b = MatrixXd::Zero(n + 2, np - first);
  VectorXd ln_r(ns + nw);  // ln of the distances from the field node to every station
  for (int i = 0; i <= n; ++i) {
    const Vector2d p = point_row(nodes_, i);
    if (!pre)
      for (int j = 0; j < ns; ++j)
        ln_r(j) = panel::half_log_distance_squared(p, point_row(nodes_, j), chord_);
    for (int k = 0; k < nw; ++k)
      ln_r(ns + k) = panel::half_log_distance_squared(p, point_row(m.wake, k), chord_);
    for (int j = first; j < nps; ++j) {
      b(i, j) = -panel::psi_source_constant(frames[j], p, ln_r(j), ln_r(j + 1), panel::Cut::kRight);
    }
    for (int k = 0; k < npw; ++k) {
      b(i, nps + k - first) = -panel::psi_source_constant(frames[nps + k], p, ln_r(ns + k),
                                                          ln_r(ns + k + 1), panel::Cut::kForward);
    }
  }
  if (sharp_) {
    b.row(0).setZero();
    b.row(n).setZero();
  }
  MatrixXd dgamma(n + 2, np);  // d gamma / d sigma
  if (pre) dgamma.leftCols(nps) = surface->dgamma;
  dgamma.rightCols(np - first) = lu_.solve(b);

  // Wake-node velocities: free stream + vortex sheet + gap panel + sources.
  VectorXd q;
  surface_speed(alpha_rad, q);
  MatrixXd wake_sigma = MatrixXd::Zero(nw, np);  // d ue_wake / d sigma
  m.edge_velocity.resize(nst);
  m.edge_velocity.head(ns) = q;
  const panel::Frame te_frame =
      sharp_ ? panel::Frame{} : panel::frame(point_row(nodes_, n), point_row(nodes_, 0));
  const std::vector<panel::Frame> wake_frames(frames.begin() + nps, frames.end());
  VectorXd wake_weights(npw);
  for (int k = 1; k < nw; ++k) {
    const Vector2d p = point_row(m.wake, k);
    Vector2d t = frames[nps + k - 1].t;
    if (k < nw - 1) t = (t + frames[nps + k].t).normalized();
    // Finite part at the node's own wake panels: the geometric mean of their lengths.
    const double scale = k < nw - 1 ? std::sqrt(frames[nps + k - 1].length * frames[nps + k].length)
                                    : frames[nps + k - 1].length;
    VectorXd dgam = VectorXd::Zero(ns);  // d(ue_k)/d(gamma_j)
    for (int j = 0; j < n; ++j) {
      Vector2d va, vb;
      panel::velocity_vortex_linear(frames[j], p, scale, va, vb);
      dgam(j) += t.dot(va);
      dgam(j + 1) += t.dot(vb);
    }
    if (!sharp_) {
      const double w = cn_ * t.dot(panel::velocity_source_constant(te_frame, p, scale)) -
                       cs_ * t.dot(panel::velocity_vortex_constant(te_frame, p, scale));
      dgam(0) += w;
      dgam(n) -= w;
    }
    for (int pp = 0; pp < nps; ++pp) {
      wake_sigma(k, pp) = t.dot(panel::velocity_source_constant(frames[pp], p, scale));
    }
    panel::wake_source_velocity(wake_frames, p, t, scale, wake_weights);
    wake_sigma.row(k).tail(npw) = wake_weights.transpose();
    wake_sigma.row(k) += dgam.transpose() * dgamma.topRows(ns);
    m.edge_velocity(ns + k) =
        t.dot(Vector2d(std::cos(alpha_rad), std::sin(alpha_rad))) + dgam.dot(q);
  }
  // Wake node 0 sits on the trailing edge: the mean of the two trailing-edge speeds.
  m.edge_velocity(ns) = 0.5 * (q(0) - q(n));
  wake_sigma.row(0) = 0.5 * (dgamma.row(0) - dgamma.row(n));

  // Sources from mass defects: each panel source is a difference of two station masses, so
  // each column of D combines at most two columns of d(ue)/d(sigma).
  m.mass_influence.setZero(nst, nst);
  auto add_panel = [&](int panel, int station_a, int station_b, double sign) {
    const double w = sign / frames[panel].length;  // sigma = w (m_b - m_a)
    m.mass_influence.col(station_b).head(ns) += w * dgamma.col(panel).head(ns);
    m.mass_influence.col(station_a).head(ns) -= w * dgamma.col(panel).head(ns);
    m.mass_influence.col(station_b).tail(nw) += w * wake_sigma.col(panel);
    m.mass_influence.col(station_a).tail(nw) -= w * wake_sigma.col(panel);
  };
  for (int j = 0; j < n; ++j) add_panel(j, j, j + 1, -1.0);
  for (int k = 0; k < npw; ++k) add_panel(nps + k, ns + k, ns + k + 1, 1.0);
  return m;
}

Eigen::VectorXd InviscidSolver::edge_velocity_with_sources(double alpha_rad, const Points& wake,
                                                           const Eigen::VectorXd& sigma) const {
  const int n = panel_count();
  const int ns = n + 1, nw = static_cast<int>(wake.rows()), npw = nw - 1;
  if (sigma.size() != n + npw) {
    throw InputError("edge_velocity_with_sources: " + std::to_string(sigma.size()) +
                     " sources given for " + std::to_string(n + npw) + " panels");
  }
  std::vector<panel::Frame> frames;
  frames.reserve(n + npw);
  panel::append_frames(nodes_, frames);
  panel::append_frames(wake, frames);
  const double ca = std::cos(alpha_rad), sa = std::sin(alpha_rad);
  Eigen::VectorXd rhs = Eigen::VectorXd::Zero(n + 2);
  for (int i = 0; i <= n; ++i) {
    const Vector2d p = point_row(nodes_, i);
    double psi = p.y() * ca - p.x() * sa;
    for (int k = 0; k < n + npw; ++k) {
      psi += sigma(k) * panel::psi_source_constant(
                            frames[k], p, k < n ? panel::Cut::kRight : panel::Cut::kForward);
    }
    rhs(i) = -psi;
  }
  if (sharp_) {
    rhs(0) = 0.0;
    rhs(n) = 0.0;
  }
  const Eigen::VectorXd x = lu_.solve(rhs);
  Eigen::VectorXd ue(ns + nw);
  ue.head(ns) = x.head(ns);
  ue(ns) = 0.5 * (x(0) - x(n));
  const panel::Frame te_frame =
      sharp_ ? panel::Frame{} : panel::frame(point_row(nodes_, n), point_row(nodes_, 0));
  const std::vector<panel::Frame> wake_frames(frames.begin() + n, frames.end());
  Eigen::VectorXd wake_weights(npw);
  for (int k = 1; k < nw; ++k) {
    const Vector2d p = point_row(wake, k);
    Vector2d t = frames[n + k - 1].t;
    if (k < nw - 1) t = (t + frames[n + k].t).normalized();
    const double scale = k < nw - 1 ? std::sqrt(frames[n + k - 1].length * frames[n + k].length)
                                    : frames[n + k - 1].length;
    Vector2d v(ca, sa);
    for (int j = 0; j < n; ++j) {
      Vector2d va, vb;
      panel::velocity_vortex_linear(frames[j], p, scale, va, vb);
      v += x(j) * va + x(j + 1) * vb;
    }
    if (!sharp_) {
      const double dq = x(0) - x(n);
      v += cn_ * dq * panel::velocity_source_constant(te_frame, p, scale) -
           cs_ * dq * panel::velocity_vortex_constant(te_frame, p, scale);
    }
    for (int pp = 0; pp < n; ++pp) {
      v += sigma(pp) * panel::velocity_source_constant(frames[pp], p, scale);
    }
    panel::wake_source_velocity(wake_frames, p, t, scale, wake_weights);
    ue(ns + k) = t.dot(v) + wake_weights.dot(sigma.tail(npw));
  }
  return ue;
}

}  // namespace fulmar
