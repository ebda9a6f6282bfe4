// Starts of a coupled solve: the cold start (boundary-layer marches on the inviscid edge velocity)
// and the warm start from a neighbouring solution's state.
#include "solvers/viscous/coupled_system.h"

#include <algorithm>
#include <cmath>
#include <vector>

namespace fulmar::viscous::detail {

void CoupledSystem::cold_march(const Eigen::VectorXd& q) {
  set_stagnation(stagnation_node(q, lay_.n_surface, le_));
  cold_ue_ = lay_.sign.cwiseProduct(q);
  march_on_cold_speed();
}

void CoupledSystem::march_on_cold_speed() {
  for (int side = 0; side < 2; ++side) {
    const std::vector<int> idx = side_nodes(side);
    const int m = static_cast<int>(idx.size());
    Eigen::VectorXd x(m), ue(m);
    const double xi0 = first_xi(side);
    for (int p = 0; p < m; ++p) {
      x(p) = xi0 + std::abs(lay_.s(idx[p]) - lay_.s(idx[0]));
      ue(p) = p == 0 ? first_speed(side) : std::max(cold_ue_(idx[p]), 1e-3);
    }
    // The inviscid speed falls steeply over the last panels towards the trailing-edge
    // stagnation of a finite-angle edge, which the displacement effect removes; a march on it
    // would start Newton from a layer far too thick there. Continue the trend of the two
    // panels before instead (initial guess only).
    if (m >= 6)
      for (int p = m - 2; p < m; ++p) ue(p) = std::max(ue(p), 2.0 * ue(p - 1) - ue(p - 2));
    for (int p = 0; p < m; ++p) cold_ue_(idx[p]) = ue(p);
    const double trip = trip_arc(side, idx, x);
    const MarchResult mr = march_surface(x, ue, 1.0, trip, flow_, true);
    for (int p = 0; p < m; ++p) {
      const int i = idx[p];
      const StationState& st = mr.stations[p];
      c_(i) = st.c;
      th_(i) = st.theta;
      mu_(i) = st.ue * st.dstar;
      kinds_[i] = mr.kinds[p];
    }
  }
  // Wake from the merged trailing-edge state.
  const StationState merged = merged_state();
  Eigen::VectorXd x(lay_.n_wake), ue(lay_.n_wake), gap(lay_.n_wake);
  for (int j = 0; j < lay_.n_wake; ++j) {
    const int i = lay_.n_surface + j;
    x(j) = lay_.s(i);
    // The same in the near wake: no dip below the trailing-edge speed.
    ue(j) = std::max(cold_ue_(i), 0.5 * (cold_ue_(0) + cold_ue_(lay_.n_surface - 1)));
    cold_ue_(i) = ue(j);
    gap(j) = lay_.gap(i);
  }
  StationState first = merged;
  first.ue = ue(0);
  const MarchResult mw = march_wake(first, x, ue, gap, flow_);
  for (int j = 0; j < lay_.n_wake; ++j) {
    const int i = lay_.n_surface + j;
    c_(i) = mw.stations[j].c;
    th_(i) = mw.stations[j].theta;
    mu_(i) = mw.stations[j].ue * mw.stations[j].dstar;
    kinds_[i] = LayerKind::kWake;
  }
}

bool CoupledSystem::warm_start(const ViscousState& st) {
  if (static_cast<int>(st.stations.size()) != lay_.n || st.stagnation_node < 0 ||
      st.stagnation_node + 1 >= lay_.n_surface)
    return false;
  set_stagnation(st.stagnation_node);
  for (int i = 0; i < lay_.n; ++i) {
    const StationState& s = st.stations[i];
    c_(i) = s.c;
    th_(i) = s.theta;
    mu_(i) = s.ue * s.dstar;
    kinds_[i] = st.kinds[i];
  }
  // Keep each station's delta* (the layer's own state) at this angle's speeds.
  ue_valid_ = true;
  for (int pass = 0; pass < 2; ++pass) {
    update_edge_velocity();
    for (int i = 0; i < lay_.n; ++i) mu_(i) = dstar_speed(i) * st.stations[i].dstar;
  }
  return true;
}

}  // namespace fulmar::viscous::detail
