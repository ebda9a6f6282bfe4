// Residuals and Jacobian of the coupled boundary-layer equations (and the Jacobian by central
// differences, for the consistency test).
#include "solvers/viscous/coupled_system.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <vector>

namespace fulmar::viscous::detail {

std::array<double, 5> CoupledSystem::turbulent_c_linearized(int i, const StationState& s) const {
  if (kinds_[i] != LayerKind::kLaminar) return {s.c, 1.0, 0.0, 0.0, 0.0};
  const Closure<Dual> k = close_station(LayerKind::kTurbulent, Dual(0.0), Dual::input(s.theta, 0),
                                        Dual::input(s.dstar, 1), Dual::input(s.ue, 2), flow_);
  const Dual c = transition_ctau_root(k);
  return {c.v, 0.0, c.d[0], c.d[1], c.d[2]};
}

void CoupledSystem::add_row(int r, int i, double dc, double dth, double dds, double due) {
  const double u = dstar_speed(i);
  Eigen::Matrix3d& b = jac_.block(r / 3, i);
  b(r % 3, 0) += dc;
  b(r % 3, 1) += dth;
  b(r % 3, 2) += dds / u;
  const int side = first_station_side(i);
  if (side >= 0) {
    const double coef = due - dds * mu_(i) / (u * u);
    double d_uk = 0.0, d_uk1 = 0.0;
    first_speed(side, &d_uk, &d_uk1);
    jac_.add_speed(r, lay_.stag, coef * d_uk);
    jac_.add_speed(r, lay_.stag + 1, coef * d_uk1);
    return;
  }
  const double coef = due - (ue_(i) > kMinDstarSpeed ? dds * mu_(i) / (u * u) : 0.0);
  jac_.add_speed(r, i, coef);
}

double CoupledSystem::assemble() {
  jac_.clear();
  closure_kind_.assign(static_cast<std::size_t>(lay_.n), -1);
  closure_.resize(static_cast<std::size_t>(lay_.n));
  res_.setZero();
  const int n = lay_.n;
  for (int side = 0; side < 2; ++side) {
    const std::vector<int> idx = side_nodes(side);
    // First station: similarity.
    {
      const int i = idx[0];
      double d_uk = 0.0, d_uk1 = 0.0;
      IntervalSpec spec;
      spec.type = IntervalType::kSimilarity;
      spec.x2 = first_xi(side, &d_uk, &d_uk1);
      const IntervalLinearization lin = linearize_interval(spec, station(i), station(i), flow_);
      for (int e = 0; e < 3; ++e) {
        const int r = 3 * i + e;
        res_(r) = lin.r(e);
        add_row(r, i, lin.j(e, 4), lin.j(e, 5), lin.j(e, 6), lin.j(e, 7));
        // Through the stagnation point's position.
        const double dx = lin.j(e, 0);
        jac_.add_speed(r, lay_.stag, dx * d_uk);
        jac_.add_speed(r, lay_.stag + 1, dx * d_uk1);
      }
    }
    for (std::size_t p = 1; p < idx.size(); ++p) {
      const int i1 = idx[p - 1], i2 = idx[p];
      IntervalSpec spec;
      spec.x1 = xi_of(side, idx, static_cast<int>(p - 1));
      spec.x2 = xi_of(side, idx, static_cast<int>(p));
      if (static_cast<int>(p) == transition_interval_[side]) {
        spec.type = IntervalType::kTransition;
        spec.trip_fraction = trip_fraction(side, i1, i2);
      } else {
        spec.type =
            kinds_[i2] == LayerKind::kLaminar ? IntervalType::kLaminar : IntervalType::kTurbulent;
      }
      double w = -1.0;
      // Every wall station's xi is measured from the stagnation point, which moves with the
      // speeds at the two nodes around it.
      Eigen::Vector3d d_origin = Eigen::Vector3d::Zero();
      const bool first = true;
      IntervalClosures given;
      if (spec.type != IntervalType::kTransition) {
        const LayerKind kind = kinds_[i2];
        given = {closure_of(i1, kind, 0.0), closure_of(i2, kind, 0.0)};
      }
      const IntervalLinearization lin = linearize_interval(spec, station(i1), station(i2), flow_,
                                                           &w, first ? &d_origin : nullptr, given);
      if (spec.type == IntervalType::kTransition) transition_weight_[side] = w;
      double d_uk = 0.0, d_uk1 = 0.0;
      if (first) first_xi(side, &d_uk, &d_uk1);
      for (int e = 0; e < 3; ++e) {
        const int r = 3 * i2 + e;
        res_(r) = lin.r(e);
        add_row(r, i1, lin.j(e, 0), lin.j(e, 1), lin.j(e, 2), lin.j(e, 3));
        add_row(r, i2, lin.j(e, 4), lin.j(e, 5), lin.j(e, 6), lin.j(e, 7));
        if (first) {
          jac_.add_speed(r, lay_.stag, d_origin(e) * d_uk);
          jac_.add_speed(r, lay_.stag + 1, d_origin(e) * d_uk1);
        }
      }
    }
  }
  // Wake: merge at the trailing edge, then wake intervals.
  {
    const int w0 = lay_.n_surface, u = 0, l = lay_.n_surface - 1;
    const StationState a = station(u), b = station(l), w = station(w0);
    const double tsum = a.theta + b.theta;
    // c_w - (cu tu + cl tl) / (tu + tl); a laminar side hands on the initial turbulent
    // sqrt(Ctau) of its state (derivatives through the closures).
    const std::array<double, 5> lu = turbulent_c_linearized(u, a),
                                ll = turbulent_c_linearized(l, b);
    const double cu = lu[0], cl = ll[0];
    const double cm = (cu * a.theta + cl * b.theta) / tsum;
    int r = 3 * w0;
    res_(r) = w.c - cm;
    add_row(r, w0, 1.0, 0.0, 0.0, 0.0);
    const double fu = -a.theta / tsum, fl = -b.theta / tsum;
    add_row(r, u, fu * lu[1], -(cu - cm) / tsum + fu * lu[2], fu * lu[3], fu * lu[4]);
    add_row(r, l, fl * ll[1], -(cl - cm) / tsum + fl * ll[2], fl * ll[3], fl * ll[4]);
    r = 3 * w0 + 1;
    // (w - S) / S = w / S - 1: d/dS = -w / S^2.
    res_(r) = (w.theta - tsum) / tsum;
    const double dts = -w.theta / (tsum * tsum);
    add_row(r, w0, 0.0, 1.0 / tsum, 0.0, 0.0);
    add_row(r, u, 0.0, dts, 0.0, 0.0);
    add_row(r, l, 0.0, dts, 0.0, 0.0);
    r = 3 * w0 + 2;
    const double dscale = a.dstar + b.dstar + te_gap_;
    res_(r) = (w.dstar - dscale) / dscale;
    const double dds = -w.dstar / (dscale * dscale);
    add_row(r, w0, 0.0, 0.0, 1.0 / dscale, 0.0);
    add_row(r, u, 0.0, 0.0, dds, 0.0);
    add_row(r, l, 0.0, 0.0, dds, 0.0);
  }
  for (int j = 1; j < lay_.n_wake; ++j) {
    const int i1 = lay_.n_surface + j - 1, i2 = i1 + 1;
    IntervalSpec spec;
    spec.type = IntervalType::kWake;
    spec.x1 = lay_.s(i1);
    spec.x2 = lay_.s(i2);
    spec.gap1 = lay_.gap(i1);
    spec.gap2 = lay_.gap(i2);
    const IntervalLinearization lin = linearize_interval(
        spec, station(i1), station(i2), flow_, nullptr, nullptr,
        {closure_of(i1, LayerKind::kWake, spec.gap1), closure_of(i2, LayerKind::kWake, spec.gap2)});
    for (int e = 0; e < 3; ++e) {
      const int r = 3 * i2 + e;
      res_(r) = lin.r(e);
      add_row(r, i1, lin.j(e, 0), lin.j(e, 1), lin.j(e, 2), lin.j(e, 3));
      add_row(r, i2, lin.j(e, 4), lin.j(e, 5), lin.j(e, 6), lin.j(e, 7));
    }
  }
  (void)n;
  return res_.allFinite() ? res_.cwiseAbs().maxCoeff() : INFINITY;
}

const Closure<StationDual>* CoupledSystem::closure_of(int i, LayerKind kind, double gap) {
  const std::size_t k = static_cast<std::size_t>(i);
  if (closure_kind_[k] != static_cast<int>(kind)) {
    closure_[k] = station_closure(kind, station(i), flow_, gap);
    closure_kind_[k] = static_cast<int>(kind);
  }
  return &closure_[k];
}

Eigen::MatrixXd CoupledSystem::difference_jacobian(double rel_step) {
  const int n3 = 3 * lay_.n;
  Eigen::MatrixXd fd(n3, n3);
  Eigen::VectorXd* parts[3] = {&c_, &th_, &mu_};
  for (int col = 0; col < n3; ++col) {
    Eigen::VectorXd& v = *parts[col / lay_.n];
    const int i = col % lay_.n;
    const double v0 = v(i);
    const double h = rel_step * std::max(std::abs(v0), col / lay_.n == 0 ? 1e-2 : 1e-6);
    v(i) = v0 + h;
    update_edge_velocity();
    assemble();
    const Eigen::VectorXd rp = res_;
    v(i) = v0 - h;
    update_edge_velocity();
    assemble();
    fd.col(col) = (rp - res_) / (2.0 * h);
    v(i) = v0;
  }
  update_edge_velocity();
  assemble();
  return fd;
}

std::pair<int, int> CoupledSystem::worst_residual() const {
  Eigen::Index k = 0;
  res_.cwiseAbs().maxCoeff(&k);
  return {static_cast<int>(k / 3), static_cast<int>(k % 3)};
}

}  // namespace fulmar::viscous::detail
