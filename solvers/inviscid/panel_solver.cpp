#include "solvers/inviscid/panel_solver.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numbers>
#include <vector>

#include "common/error.h"
#include "common/number_text.h"
#include "solvers/inviscid/panel_kernels.h"

namespace fulmar {
namespace {

using Eigen::MatrixXd;
using Eigen::Vector2d;
using Eigen::VectorXd;
using panel::point_row;

constexpr double kGamma = 1.4;  // ratio of specific heats of air

}  // namespace

void InviscidOptions::Validate() const {
  if (!std::isfinite(mach) || mach < 0.0 || mach > 0.8) {
    throw InputError("inviscid options: mach = " + general_text(mach) + " must be in [0, 0.8]");
  }
  if (!std::isfinite(sharp_te_gap) || sharp_te_gap <= 0.0 || sharp_te_gap > 0.01) {
    throw InputError("inviscid options: sharp_te_gap = " + general_text(sharp_te_gap) +
                     " must be in (0, 0.01]");
  }
  if (!std::isfinite(wake_length) || wake_length < 1.0 || wake_length > 100.0) {
    throw InputError("inviscid options: wake_length = " + general_text(wake_length) +
                     " chords must be in [1, 100]");
  }
  if (wake_nodes != 0 && (wake_nodes < 4 || wake_nodes > 1000)) {
    throw InputError("inviscid options: wake_nodes = " + std::to_string(wake_nodes) +
                     " must be 0 (automatic) or in [4, 1000]");
  }
}

double karman_tsien_cp(double cp0, double mach) {
  if (mach <= 0.0) return cp0;
  const double beta = std::sqrt(1.0 - mach * mach);
  return cp0 / (beta + mach * mach / (1.0 + beta) * 0.5 * cp0);
}

double karman_tsien_speed(double q0, double mach) {
  if (mach <= 0.0) return q0;
  const double beta = std::sqrt(1.0 - mach * mach);
  const double lambda = mach * mach / ((1.0 + beta) * (1.0 + beta));
  return q0 * (1.0 - lambda) / (1.0 - lambda * q0 * q0);
}

double critical_cp(double mach) {
  if (mach <= 0.0) return -std::numeric_limits<double>::infinity();
  const double m2 = mach * mach;
  return 2.0 / (kGamma * m2) *
         (std::pow((2.0 + (kGamma - 1.0) * m2) / (kGamma + 1.0), kGamma / (kGamma - 1.0)) - 1.0);
}

nlohmann::json InviscidResult::to_json() const {
  nlohmann::json j;
  j["alpha"] = alpha * 180.0 / std::numbers::pi;
  j["cl"] = cl;
  j["cl_circulation"] = cl_circulation;
  j["cl_pressure"] = cl_pressure;
  j["cd_pressure"] = cd_pressure;
  j["cm"] = cm;
  j["cp_min"] = cp_min;
  j["mach"] = mach;
  if (mach > 0.0) {
    j["cp_critical"] = cp_critical;
    j["critical_exceeded"] = critical_exceeded;
  }
  j["converged"] = converged;
  j["iterations"] = iterations;
  j["message"] = message;
  return j;
}

InviscidSolver::InviscidSolver(const Points& nodes, const InviscidOptions& options)
    : nodes_(nodes), options_(options) {
  options_.Validate();
  const int n_nodes = static_cast<int>(nodes_.rows());
  if (n_nodes < 9) {
    throw InputError("inviscid solver: " + std::to_string(n_nodes) +
                     " section nodes given; at least 9 are needed");
  }
  if (!nodes_.allFinite()) throw InputError("inviscid solver: a section node is not finite");
  const int n = n_nodes - 1;  // panels

  te_mid_ = 0.5 * (point_row(nodes_, 0) + point_row(nodes_, n));
  int le = 0;
  for (int i = 0; i < n_nodes; ++i) {
    if ((point_row(nodes_, i) - te_mid_).norm() > (point_row(nodes_, le) - te_mid_).norm()) le = i;
  }
  le_ = point_row(nodes_, le);
  chord_ = (le_ - te_mid_).norm();
  if (!(chord_ > 0.0)) throw InputError("inviscid solver: the section has zero chord");
  quarter_chord_ = le_ + 0.25 * (te_mid_ - le_);

  arc_.resize(n_nodes);
  arc_(0) = 0.0;
  for (int j = 0; j < n; ++j) {
    const double len = (point_row(nodes_, j + 1) - point_row(nodes_, j)).norm();
    if (!(len > 1e-10 * chord_)) {
      throw InputError("inviscid solver: section nodes " + std::to_string(j) + " and " +
                       std::to_string(j + 1) + " coincide (panel length " + general_text(len) +
                       ")");
    }
    arc_(j + 1) = arc_(j) + len;
  }
  double area2 = 0.0;  // twice the signed area, closed through the trailing-edge gap
  for (int j = 0; j < n_nodes; ++j) {
    const int k = (j + 1) % n_nodes;
    area2 += nodes_(j, 0) * nodes_(k, 1) - nodes_(k, 0) * nodes_(j, 1);
  }
  if (!(area2 > 0.0)) {
    throw InputError(
        "inviscid solver: the section nodes run clockwise (or enclose no area); expected upper "
        "trailing edge -> leading edge -> lower trailing edge");
  }

  te_gap_ = (point_row(nodes_, 0) - point_row(nodes_, n)).norm() / chord_;
  sharp_ = te_gap_ < options_.sharp_te_gap;
  const Vector2d t_up = (point_row(nodes_, 0) - point_row(nodes_, 1)).normalized();
  const Vector2d t_lo = (point_row(nodes_, n) - point_row(nodes_, n - 1)).normalized();
  te_bisector_ = t_up + t_lo;
  if (te_bisector_.norm() < 1e-6) te_bisector_ = te_mid_ - le_;
  te_bisector_.normalize();

  panel::Frame te_frame;
  if (!sharp_) {
    te_frame = panel::frame(point_row(nodes_, n), point_row(nodes_, 0));
    const Vector2d n_out = -te_frame.n;
    cn_ = 0.5 * te_bisector_.dot(n_out);
    cs_ = 0.5 * te_bisector_.dot(te_frame.t);
  }

  // Unknowns: gamma_0..gamma_N, psi_0. Rows 0..N: psi(node i) = psi_0; row N+1: Kutta.
  MatrixXd a = MatrixXd::Zero(n + 2, n + 2);
  std::vector<panel::Frame> frames;
  frames.reserve(n);
  panel::append_frames(nodes_, frames);
  VectorXd ln_r(n + 1);  // ln of the distances from the field node to every node
  for (int i = 0; i <= n; ++i) {
    const Vector2d p = point_row(nodes_, i);
    for (int j = 0; j <= n; ++j) {
      ln_r(j) = panel::half_log_distance_squared(p, point_row(nodes_, j), chord_);
    }
    for (int j = 0; j < n; ++j) {
      double wa = 0.0, wb = 0.0;
      panel::psi_vortex_linear(frames[j], p, ln_r(j), ln_r(j + 1), wa, wb);
      a(i, j) += wa;
      a(i, j + 1) += wb;
    }
  }
  if (!sharp_) {
    for (int i = 0; i <= n; ++i) {
      const Vector2d p = point_row(nodes_, i);
      const double w = cn_ * panel::psi_source_constant(te_frame, p, panel::Cut::kRight) -
                       cs_ * panel::psi_vortex_constant(te_frame, p);
      a(i, 0) += w;
      a(i, n) -= w;
    }
  }
  a.col(n + 1).head(n + 1).setConstant(-1.0);
  a(n + 1, 0) = 1.0;
  a(n + 1, n) = 1.0;
  if (sharp_) {
    // Nodes 0 and N coincide: their stream-function equations are the same, and the two
    // trailing-edge panels (nearly) overlap, so the node-0 equation hardly sees gamma_0 or
    // gamma_N. Both are replaced by linear extrapolation (in arc length) of the speed on each
    // side to the trailing edge; with the Kutta row this makes the extrapolated speeds equal.
    const double l0 = arc_(1) - arc_(0), l1 = arc_(2) - arc_(1);
    const double ln = arc_(n) - arc_(n - 1), ln1 = arc_(n - 1) - arc_(n - 2);
    a.row(0).setZero();
    a(0, 0) = 1.0;
    a(0, 1) = -(1.0 + l0 / l1);
    a(0, 2) = l0 / l1;
    a.row(n).setZero();
    a(n, n) = 1.0;
    a(n, n - 1) = -(1.0 + ln / ln1);
    a(n, n - 2) = ln / ln1;
  }
  lu_.compute(a);
  rcond_ = lu_.rcond();

  MatrixXd rhs = MatrixXd::Zero(n + 2, 2);
  for (int i = 0; i <= n; ++i) {
    rhs(i, 0) = -nodes_(i, 1);  // psi_inf = y cos(alpha) - x sin(alpha)
    rhs(i, 1) = nodes_(i, 0);
  }
  if (sharp_) {
    rhs.row(0).setZero();
    rhs.row(n).setZero();
  }
  const MatrixXd base = lu_.solve(rhs);
  q0_ = base.col(0).head(n + 1);
  q90_ = base.col(1).head(n + 1);

  auto circulation_cl = [&](const VectorXd& q) {
    double gamma = 0.0;
    for (int j = 0; j < n; ++j) gamma += 0.5 * (q(j) + q(j + 1)) * (arc_(j + 1) - arc_(j));
    if (!sharp_) gamma += -cs_ * (q(0) - q(n)) * te_frame.length;
    return 2.0 * gamma / chord_;
  };
  cl_circ_0_ = circulation_cl(q0_);
  cl_circ_90_ = circulation_cl(q90_);
}

void InviscidSolver::surface_speed(double alpha_rad, VectorXd& q) const {
  q = std::cos(alpha_rad) * q0_ + std::sin(alpha_rad) * q90_;
}

void InviscidSolver::solve(double alpha_rad, InviscidResult& out) const {
  // Reuse out.ue as the incompressible speed buffer: loads_from_speed reads q before writing ue.
  const int n_nodes = static_cast<int>(nodes_.rows());
  if (out.ue.size() != n_nodes) out.ue.resize(n_nodes);
  const double c = std::cos(alpha_rad), s = std::sin(alpha_rad);
  out.ue.noalias() = c * q0_ + s * q90_;
  loads_from_speed(alpha_rad, out.ue, out);
  out.iterations = 0;
}

void InviscidSolver::loads_from_speed(double alpha_rad, const VectorXd& q,
                                      InviscidResult& out) const {
  const int n_nodes = static_cast<int>(nodes_.rows());
  const int n = n_nodes - 1;
  const double mach = options_.mach;
  if (q.size() != n_nodes) {
    throw InputError("inviscid loads: " + std::to_string(q.size()) + " speeds given for " +
                     std::to_string(n_nodes) + " nodes");
  }
  if (out.cp.size() != n_nodes) out.cp.resize(n_nodes);
  if (out.ue.size() != n_nodes) out.ue.resize(n_nodes);
  out.alpha = alpha_rad;
  out.mach = mach;

  double gamma = 0.0;
  for (int j = 0; j < n; ++j) gamma += 0.5 * (q(j) + q(j + 1)) * (arc_(j + 1) - arc_(j));
  if (!sharp_) gamma += -cs_ * (q(0) - q(n)) * te_gap_ * chord_;
  const double beta = std::sqrt(1.0 - mach * mach);
  out.cl_circulation = 2.0 * gamma / chord_ / beta;

  // Karman-Tsien: valid while its denominators stay positive (cp0 above -2 beta (1+beta) / M^2).
  bool correction_valid = true;
  double q2_max = 0.0;
  const double lambda = mach * mach / ((1.0 + beta) * (1.0 + beta));
  for (int i = 0; i < n_nodes; ++i) {
    const double qi = q(i);
    const double cp0 = 1.0 - qi * qi;
    q2_max = std::max(q2_max, qi * qi);
    if (mach > 0.0) {
      const double den_cp = beta + mach * mach / (1.0 + beta) * 0.5 * cp0;
      const double den_q = 1.0 - lambda * qi * qi;
      if (den_cp < 1e-3 || den_q < 1e-3) correction_valid = false;
      out.cp(i) = cp0 / std::max(den_cp, 1e-3);
      out.ue(i) = qi * (1.0 - lambda) / std::max(den_q, 1e-3);
    } else {
      out.cp(i) = cp0;
      out.ue(i) = qi;
    }
  }

  // Pressure force and moment, Cp linear along each section panel (the gap panel is a closure
  // of the model, not a wall, and carries no load).
  Vector2d force = Vector2d::Zero();
  double moment = 0.0;  // counter-clockwise about the quarter chord
  for (int j = 0; j < n; ++j) {
    const Vector2d pa = point_row(nodes_, j) - quarter_chord_,
                   pb = point_row(nodes_, j + 1) - quarter_chord_;
    const Vector2d d = pb - pa;
    const double len = d.norm();
    const Vector2d n_out(d.y() / len, -d.x() / len);
    const double ca = out.cp(j), cb = out.cp(j + 1);
    const Vector2d cp_r = len * (ca * pa / 3.0 + (ca * pb + cb * pa) / 6.0 + cb * pb / 3.0);
    force -= 0.5 * (ca + cb) * len * n_out;
    moment -= cp_r.x() * n_out.y() - cp_r.y() * n_out.x();
  }
  const double ca = std::cos(alpha_rad), sa = std::sin(alpha_rad);
  out.cl_pressure = (-force.x() * sa + force.y() * ca) / chord_;
  out.cd_pressure = (force.x() * ca + force.y() * sa) / chord_;
  out.cm = -moment / (chord_ * chord_);
  out.cl = mach > 0.0 && correction_valid ? out.cl_pressure : out.cl_circulation;

  out.cp_min_node = 0;
  for (int i = 1; i < n_nodes; ++i) {
    if (out.cp(i) < out.cp(out.cp_min_node)) out.cp_min_node = i;
  }
  out.cp_min = out.cp(out.cp_min_node);
  out.cp_critical = critical_cp(mach);
  out.critical_exceeded = mach > 0.0 && out.cp_min < out.cp_critical;

  const bool finite =
      out.cp.allFinite() && out.ue.allFinite() && std::isfinite(out.cl) && std::isfinite(out.cm);
  const bool conditioned = rcond_ > 1e-13;
  out.converged = finite && correction_valid && conditioned;
  if (!finite) {
    out.message = "non-finite result";
    if (!std::isfinite(out.cl)) out.cl = 0.0;
    if (!std::isfinite(out.cm)) out.cm = 0.0;
  } else if (!conditioned) {
    out.message = "panel system ill-conditioned: rcond " + general_text(rcond_) + " < 1e-13";
  } else if (!correction_valid) {
    out.message = "Karman-Tsien correction invalid: incompressible cp_min " +
                  general_text(1.0 - q2_max) + " too low for Mach " + general_text(mach);
  } else if (out.critical_exceeded) {
    out.message = "solved; cp_min " + general_text(out.cp_min) + " below critical Cp " +
                  general_text(out.cp_critical) + ": locally supersonic, correction doubtful";
  } else {
    out.message = "solved";
  }
}

void InviscidSolver::solve_for_cl(double cl_target, InviscidResult& out) const {
  const double max_alpha = 60.0 * std::numbers::pi / 180.0;
  const double r = std::hypot(cl_circ_0_, cl_circ_90_);
  const double phi = std::atan2(cl_circ_0_, cl_circ_90_);  // cl = r sin(alpha + phi)
  const double beta = std::sqrt(1.0 - options_.mach * options_.mach);
  const double incompressible_target = cl_target * beta;  // Prandtl-Glauert first guess
  auto fail = [&](const std::string& why) {
    solve(0.0, out);
    out.converged = false;
    out.message = "no angle gives cl " + general_text(cl_target) + ": " + why;
  };
  if (!std::isfinite(cl_target)) return fail("target not finite");
  if (std::abs(incompressible_target) >= r) return fail("beyond the potential-flow maximum");
  double alpha = std::asin(incompressible_target / r) - phi;
  alpha = std::remainder(alpha, 2.0 * std::numbers::pi);
  if (std::abs(alpha) > max_alpha) return fail("needs |alpha| > 60 deg");
  solve(alpha, out);
  if (options_.mach <= 0.0) return;

  int it = 0;
  for (; it < 40 && std::abs(out.cl - cl_target) > 1e-10; ++it) {
    const double h = 1e-6;
    const double cl0 = out.cl;
    solve(alpha + h, out);
    const double slope = (out.cl - cl0) / h;
    if (!(std::abs(slope) > 1e-6)) break;
    alpha = std::clamp(alpha - (cl0 - cl_target) / slope, -max_alpha, max_alpha);
    solve(alpha, out);
  }
  const double err = std::abs(out.cl - cl_target);
  out.iterations = it;
  if (err > 1e-8) {
    out.converged = false;
    out.message = "target cl not reached: |cl - target| = " + general_text(err) + " > 1e-8 after " +
                  std::to_string(it) + " Newton steps";
  }
}

std::vector<panel::Frame> InviscidSolver::section_frames() const {
  const int n = panel_count();
  std::vector<panel::Frame> frames;
  frames.reserve(n + 1);
  panel::append_frames(nodes_, frames);
  if (!sharp_) frames.push_back(panel::frame(point_row(nodes_, n), point_row(nodes_, 0)));
  return frames;
}

}  // namespace fulmar
