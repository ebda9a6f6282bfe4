// The outputs of a coupled solve from its final state (see result_extraction.h).
#include "solvers/viscous/result_extraction.h"

#include <algorithm>
#include <cmath>
#include <numbers>
#include <vector>

namespace fulmar::viscous::detail {

void extract_result(const CoupledSystem& fin, const InviscidSolver& inviscid,
                    const FlowConditions& flow, double alpha_deg, ViscousResult& res) {
  const double alpha = alpha_deg * (std::numbers::pi / 180.0);
  const Layout& lay = fin.layout();
  const int ns = lay.n_surface, nw = lay.n_wake;
  const Eigen::VectorXd& ue = fin.ue();
  Eigen::VectorXd q = lay.sign.head(ns).cwiseProduct(ue.head(ns));
  res.ue = q;
  res.theta = fin.theta().head(ns);
  res.dstar.resize(ns);
  res.shape.resize(ns);
  res.cf.resize(ns);
  res.amplification = fin.c().head(ns);
  for (int i = 0; i < ns; ++i) {
    const StationState s = fin.station(i);
    res.dstar(i) = s.dstar;
    res.shape(i) = s.dstar / s.theta;
    res.cf(i) = skin_friction(fin.kinds()[i], s, flow);
  }
  res.wake_theta = fin.theta().tail(nw);
  res.wake_ue = ue.tail(nw);
  res.wake_dstar = fin.mu().tail(nw).cwiseQuotient(ue.tail(nw));
  InviscidResult loads;
  inviscid.loads_from_speed(alpha, q, loads);
  // Lift from the surface pressures at every Mach number, like cm. The circulation of the edge
  // speed (Kutta-Joukowski, which the inviscid solver uses at M = 0) is the lift of a potential
  // flow; with the displacement sources on the surface and in the wake it is not: NACA 4412,
  // Re 6e6, 14 deg, gave 1.7636 by circulation against 1.7375 from the pressures (which M = 0.001
  // then gave too: a step of 1.5 % between M = 0 and any M > 0), 0.2 % apart at 4 deg.
  res.cl = loads.converged ? loads.cl_pressure : loads.cl;
  res.cm = loads.cm;
  res.cp = loads.cp;
  // Squire-Young at the wake end.
  const int last = lay.n - 1;
  const StationState se = fin.station(last);
  const double h_end = (se.dstar - lay.gap(last)) / se.theta;
  res.cd = 2.0 * se.theta * std::pow(std::max(se.ue, 1e-6), 0.5 * (h_end + 5.0));
  // Friction drag: wall shear along the local flow direction, projected on the free stream.
  const Points& nodes = inviscid.nodes();
  const Eigen::Vector2d e(std::cos(alpha), std::sin(alpha));
  double cdf = 0.0;
  for (int side = 0; side < 2; ++side) {
    const std::vector<int> idx = fin.side_nodes(side);
    for (std::size_t p = 1; p < idx.size(); ++p) {
      const int i1 = idx[p - 1], i2 = idx[p];
      const Eigen::Vector2d t = (nodes.row(i2) - nodes.row(i1)).transpose();
      cdf += 0.5 * (res.cf(i1) + res.cf(i2)) * t.dot(e);
    }
  }
  res.cd_friction = cdf / inviscid.chord();
  res.cd_pressure = res.cd - res.cd_friction;
  // Transition points as x/c.
  for (int side = 0; side < 2; ++side) {
    const int p = fin.transition_interval(side);
    double xt = 1.0;
    if (p > 0) {
      const std::vector<int> idx = fin.side_nodes(side);
      const double w = fin.transition_weight(side);
      xt = lay.x(idx[p - 1]) + w * (lay.x(idx[p]) - lay.x(idx[p - 1]));
    }
    (side == 0 ? res.transition_upper : res.transition_lower) = xt;
  }
  // State for warm starts.
  res.state.alpha = alpha_deg;
  res.state.stagnation_node = lay.stag;
  res.state.stations.resize(static_cast<std::size_t>(lay.n));
  res.state.kinds = fin.kinds();
  for (int i = 0; i < lay.n; ++i) res.state.stations[i] = fin.station(i);
  // Never a NaN in the outputs.
  const double scalars[] = {res.cl, res.cd, res.cm, res.cd_friction, res.cd_pressure};
  bool finite = true;
  for (double v : scalars) finite = finite && std::isfinite(v);
  if (!finite) {
    res.converged = false;
    res.status = SolveStatus::kFailed;
    res.reason += "; non-finite loads, outputs zeroed";
    res.cl = res.cd = res.cm = res.cd_friction = res.cd_pressure = 0.0;
    res.state = ViscousState{};
  }
}

}  // namespace fulmar::viscous::detail
