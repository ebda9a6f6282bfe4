// The stations of a coupled solve: layout, the stagnation point between two nodes and its model
// near the first station of each side, and the station states derived from the unknowns.
#include "solvers/viscous/coupled_system.h"

#include <algorithm>
#include <cmath>
#include <vector>

namespace fulmar::viscous::detail {

// Trailing-edge base thickness carried in the wake's delta*, fading out behind the trailing edge
// over 2.5 gap heights (the dead-air region behind a blunt base closes within a few heights;
// a modelling choice), smoothly (zero slope at both ends).
double wake_gap(double h, double distance) {
  if (h <= 0.0) return 0.0;
  const double t = distance / (2.5 * h);
  if (t >= 1.0) return 0.0;
  return h * (1.0 - t) * (1.0 - t) * (1.0 + 2.0 * t);
}

// The node k with q_k > 0 >= q_{k+1} (speed changes sign) nearest to the leading-edge node.
int stagnation_node(const Eigen::VectorXd& q, int n_surface, int le) {
  int best = -1;
  for (int k = 0; k + 1 < n_surface; ++k) {
    if (q(k) > 0.0 && q(k + 1) <= 0.0) {
      if (best < 0 || std::abs(k - le) < std::abs(best - le)) best = k;
    }
  }
  return best < 0 ? le : best;
}

CoupledSystem::CoupledSystem(const InviscidSolver& inviscid, const CouplingModel& model,
                             const ViscousOptions& options, const FlowConditions& flow)
    : inv_(inviscid),
      model_(model),
      opt_(options),
      flow_(flow),
      jac_(model.surface_nodes + model.wake_nodes) {
  lay_.n_surface = model.surface_nodes;
  lay_.n_wake = model.wake_nodes;
  lay_.n = lay_.n_surface + lay_.n_wake;
  lay_.s = model.arc_length;
  const Points& nodes = inviscid.nodes();
  lay_.x = nodes.col(0);
  const double xmin = lay_.x.minCoeff();
  lay_.x = (lay_.x.array() - xmin) / inviscid.chord();
  le_ = 0;
  lay_.x.minCoeff(&le_);
  lay_.gap = Eigen::VectorXd::Zero(lay_.n);
  te_gap_ = inviscid.te_gap() * inviscid.chord();
  for (int j = 0; j < lay_.n_wake; ++j)
    lay_.gap(lay_.n_surface + j) = wake_gap(te_gap_, lay_.s(lay_.n_surface + j));
  const int n3 = 3 * lay_.n;
  res_.resize(n3);
  c_.resize(lay_.n);
  th_.resize(lay_.n);
  mu_.resize(lay_.n);
  ue_.resize(lay_.n);
  cold_ue_ = Eigen::VectorXd::Ones(lay_.n);
  h_floor_.assign(static_cast<std::size_t>(lay_.n), 0.0);
  h_before_.assign(static_cast<std::size_t>(lay_.n), 0.0);
  kinds_.assign(static_cast<std::size_t>(lay_.n), LayerKind::kLaminar);
}

void CoupledSystem::set_stagnation(int stag) {
  lay_.stag = stag;
  lay_.sign = Eigen::VectorXd::Ones(lay_.n);
  for (int i = stag + 1; i < lay_.n_surface; ++i) lay_.sign(i) = -1.0;
  lay_.ue_inviscid = lay_.sign.cwiseProduct(model_.edge_velocity);
  lay_.d = lay_.sign.asDiagonal() * model_.mass_influence * lay_.sign.asDiagonal();
}

void CoupledSystem::update_edge_velocity() {
  ue_.noalias() = lay_.d * mu_;
  ue_ += lay_.ue_inviscid;
}

std::vector<int> CoupledSystem::side_nodes(int side) const {
  std::vector<int> idx;
  if (side == 0) {
    for (int i = lay_.stag; i >= 0; --i) idx.push_back(i);
  } else {
    for (int i = lay_.stag + 1; i < lay_.n_surface; ++i) idx.push_back(i);
  }
  return idx;
}

CoupledSystem::StagnationFraction CoupledSystem::stagnation_fraction(int side) const {
  const int k = lay_.stag;
  const Eigen::VectorXd& u = ue_valid_ ? ue_ : cold_ue_;
  return stagnation_fraction(side, u(k), u(k + 1));
}

CoupledSystem::StagnationFraction CoupledSystem::stagnation_fraction(int side, double a, double b) {
  StagnationFraction f;
  f.sum = std::max(a + b, 1e-10);
  const double raw = (side == 0 ? a : b) / f.sum;
  double draw_da = (side == 0 ? b : -b) / (f.sum * f.sum);
  double draw_db = (side == 0 ? -a : a) / (f.sum * f.sum);
  if (a + b <= 1e-10) draw_da = draw_db = 0.0;
  constexpr double lo = kMinStagnationFraction, w = 0.8 * kMinStagnationFraction;
  double slope = 1.0;
  f.t = raw;
  if (raw <= lo - w) {
    f.t = lo;
    slope = 0.0;
  } else if (raw < lo + w) {
    const double g = lo + w - raw;
    f.t = raw + g * g / (4.0 * w);
    slope = 1.0 - g / (2.0 * w);
  }
  f.d_uk = slope * draw_da;
  f.d_uk1 = slope * draw_db;
  return f;
}

double CoupledSystem::first_xi(int side, double* d_uk, double* d_uk1) const {
  const int k = lay_.stag;
  const double ds = std::abs(lay_.s(k + 1) - lay_.s(k));
  const StagnationFraction f = stagnation_fraction(side);
  if (d_uk) *d_uk = f.d_uk * ds;
  if (d_uk1) *d_uk1 = f.d_uk1 * ds;
  return f.t * ds;
}

double CoupledSystem::first_speed(int side, double* d_uk, double* d_uk1) const {
  const StagnationFraction f = stagnation_fraction(side);
  const bool has_sum = f.sum > 1e-10;
  if (d_uk) *d_uk = f.d_uk * f.sum + (has_sum ? f.t : 0.0);
  if (d_uk1) *d_uk1 = f.d_uk1 * f.sum + (has_sum ? f.t : 0.0);
  return f.t * f.sum;
}

int CoupledSystem::first_station_side(int i) const {
  if (i == lay_.stag) return 0;
  if (i == lay_.stag + 1) return 1;
  return -1;
}

double CoupledSystem::trip_arc(int side, const std::vector<int>& idx,
                               const Eigen::VectorXd& x) const {
  const double xt = side == 0 ? opt_.trip_upper : opt_.trip_lower;
  if (xt >= 1.0) return 1e9;
  for (std::size_t p = 1; p < idx.size(); ++p) {
    const double xa = lay_.x(idx[p - 1]), xb = lay_.x(idx[p]);
    if (xb > xt && xb > xa) {
      const double w = std::clamp((xt - xa) / (xb - xa), 0.0, 1.0);
      return x(static_cast<Eigen::Index>(p - 1)) + w * (x(p) - x(p - 1));
    }
  }
  return 1e9;
}

double CoupledSystem::trip_fraction(int side, int i1, int i2) const {
  const double xt = side == 0 ? opt_.trip_upper : opt_.trip_lower;
  if (xt >= 1.0) return 2.0;
  const double xa = lay_.x(i1), xb = lay_.x(i2);
  if (xb <= xt) return 2.0;
  if (xa >= xt) return 0.0;
  return (xt - xa) / (xb - xa);
}

double CoupledSystem::dstar_speed(int i) const {
  const int side = first_station_side(i);
  if (side >= 0) return first_speed(side);
  return std::max(ue_(i), kMinDstarSpeed);
}

StationState CoupledSystem::station(int i) const {
  StationState s;
  s.c = c_(i);
  s.theta = th_(i);
  const int side = first_station_side(i);
  s.ue = side >= 0 ? first_speed(side) : ue_(i);
  s.dstar = mu_(i) / dstar_speed(i);
  return s;
}

StationState CoupledSystem::merged_state() const {
  const int u = 0, l = lay_.n_surface - 1;
  StationState a = station_guess(u), b = station_guess(l);
  StationState w;
  w.theta = a.theta + b.theta;
  w.dstar = a.dstar + b.dstar + te_gap_;
  w.c = (turbulent_c(u, a) * a.theta + turbulent_c(l, b) * b.theta) / w.theta;
  w.ue = 0.5 * (a.ue + b.ue);
  return w;
}

StationState CoupledSystem::station_guess(int i) const {
  StationState s;
  s.c = c_(i);
  s.theta = th_(i);
  s.ue = ue_valid_ ? ue_(i) : cold_ue_(i);
  s.dstar = mu_(i) / s.ue;
  return s;
}

double CoupledSystem::turbulent_c(int i, const StationState& s) const {
  if (kinds_[i] != LayerKind::kLaminar) return s.c;
  const Closure<double> k =
      close_station(LayerKind::kTurbulent, 0.0, s.theta, s.dstar, s.ue, flow_);
  return transition_ctau_root(k);
}

double CoupledSystem::xi_of(int side, const std::vector<int>& idx, int p) const {
  return first_xi(side) + std::abs(lay_.s(idx[p]) - lay_.s(idx[0]));
}

void CoupledSystem::march_order(std::vector<int>& order) const {
  order.clear();
  for (int side = 0; side < 2; ++side)
    for (int i : side_nodes(side)) order.push_back(i);
  for (int j = 0; j < lay_.n_wake; ++j) order.push_back(lay_.n_surface + j);
}

}  // namespace fulmar::viscous::detail
