// The Newton step of a coupled solve: the linear solve, the limits on the change of each unknown,
// the edge-velocity sign and shape-factor floors, and the update of the state.
#include "solvers/viscous/coupled_system.h"

#include <algorithm>
#include <cmath>
#include <string>

namespace fulmar::viscous::detail {

// Why NewtonOptions::shape_drop_fraction (how far the H - 1 of a turbulent or wake station may
// fall in one Newton step, as a fraction of itself) is 0.3.
// Behind a transition point that has moved upstream, the linearised transition interval can
// ask a reattaching layer for a shape factor far below any turbulent state (NACA 0012, Re 6e6,
// 6.5 -> 7 deg: H 2.25 -> 0.82 at the first turbulent station; the step the other limits let
// through took it to 1.07), from which the lag equation does not recover and every later step
// is cut to 1-2 % by the shape-factor floor. Held at this fraction, such warm starts converge
// (that one in 8 iterations). Measured on bench_polar's 20 regression polars (NACA 0012, 2412,
// 4412, 4415, 23012 x Re 2e5-6e6, -4..14 deg step 0.5): the same 740 solutions (cd within 1e-9),
// Newton iterations including failed attempts 8741 -> 8037, cold starts alone 554 -> 572 of 740.
// The response to the fraction is irregular: 0.5 gave 617 cold starts but lost NACA 23012 at
// 10.5 deg cold and one polar point, 0.7 gave 575 and lost 13 cold starts of the cold-start test.

bool CoupledSystem::solve_newton() {
  march_order(order_);
  return jac_.solve(lay_.d, order_, res_, step_);
}

double CoupledSystem::newton_step() {
  if (!solve_newton()) return 0.0;
  const int n = lay_.n;
  double rlx = 1.0;
  limited_by_.clear();
  auto limit = [&](double change, double allowed, const char* what, int i) {
    if (std::abs(change) * rlx > allowed) {
      rlx = allowed / std::abs(change);
      limited_by_ = std::string(what) + " at station " + std::to_string(i);
    }
  };
  const NewtonOptions& nw = opt_.newton;
  for (int i = 0; i < n; ++i) {
    limit(step_(n + i), nw.theta_change * th_(i), "theta", i);
    // m relative to itself, but not below a part of theta (m ~ 0 at the stagnation point).
    limit(step_(2 * n + i), nw.mass_change * std::abs(mu_(i)) + nw.mass_change_theta * th_(i),
          "mass defect", i);
    if (kinds_[i] == LayerKind::kLaminar)
      limit(step_(i), nw.amplification_change, "amplification", i);
    else
      limit(step_(i), nw.shear_change * c_(i), "shear stress", i);
  }
  // Keep every H above the closures' floor (see boundary_layer.cpp) and every ue positive.
  const Eigen::VectorXd dmu = step_.segment(2 * n, n);
  const Eigen::VectorXd due = lay_.d * dmu;
  // The shape-factor floor halves the step at most nw.floor_halvings times; stations still below
  // it after the step are then put on it (their delta* raised), so that one station near the
  // floor cannot freeze the whole solution.
  // Shape factors before the step: the floor (of delta* / theta) and H (of the layer's own
  // delta*, without the wake gap) for the limit on its fall after the step.
  for (int i = 0; i < n; ++i) {
    const double dstar = station(i).dstar;
    h_floor_[i] = 0.5 * (std::min(dstar / th_(i), 1.05) + 1.0);
    h_before_[i] = (dstar - lay_.gap(i)) / th_(i);
  }
  bool floor_fix = false;
  for (int k = 0; k < nw.max_halvings; ++k) {
    bool sign_ok = true, floor_ok = true;
    for (int i = 0; i < n && sign_ok; ++i) {
      double u = ue_(i) + rlx * due(i);
      const int first_side = first_station_side(i);
      if (first_side >= 0) {
        // A first station's delta* is m over the modelled speed near the stagnation point
        // (first_speed), which stays positive; its H is held above the floor like any other.
        const int k = lay_.stag;
        const StagnationFraction f =
            stagnation_fraction(first_side, ue_(k) + rlx * due(k), ue_(k + 1) + rlx * due(k + 1));
        u = f.t * f.sum;
      } else if (u <= 0.0) {
        sign_ok = false;
        limited_by_ = "edge velocity sign at station " + std::to_string(i);
        break;
      }
      const double h = ((mu_(i) + rlx * dmu(i)) / u - lay_.gap(i)) / (th_(i) + rlx * step_(n + i));
      if (h < h_floor_[i]) {
        floor_ok = false;
        limited_by_ = "shape factor floor at station " + std::to_string(i);
      }
    }
    if (sign_ok && floor_ok) break;
    if (sign_ok && k >= nw.floor_halvings) {
      floor_fix = true;
      break;
    }
    rlx *= 0.5;
  }
  saved_c_ = c_;
  saved_th_ = th_;
  saved_mu_ = mu_;
  apply_step(rlx);
  // After the step: a turbulent or wake station whose H - 1 fell below nw.shape_drop_fraction of
  // its value before the step is put back on that level (delta* raised), and with floor_fix every
  // station below its floor onto the floor.
  bool moved_mass = false;
  for (int i = 0; i < n; ++i) {
    if (first_station_side(i) >= 0) continue;
    double lo = floor_fix ? h_floor_[i] : 0.0;
    if (kinds_[i] != LayerKind::kLaminar)
      lo = std::max(lo, 1.0 + nw.shape_drop_fraction * (h_before_[i] - 1.0));
    const double u = dstar_speed(i);
    if ((mu_(i) / u - lay_.gap(i)) / th_(i) < lo) {
      mu_(i) = u * (lo * th_(i) + lay_.gap(i));
      moved_mass = true;
    }
  }
  if (moved_mass) update_edge_velocity();
  return rlx;
}

void CoupledSystem::apply_step(double rlx) {
  const int n = lay_.n;
  c_ = saved_c_ + rlx * step_.segment(0, n);
  th_ = saved_th_ + rlx * step_.segment(n, n);
  mu_ = saved_mu_ + rlx * step_.segment(2 * n, n);
  for (int i = 0; i < n; ++i) {
    th_(i) = std::max(th_(i), 1e-9);
    if (kinds_[i] != LayerKind::kLaminar) c_(i) = std::max(c_(i), 1e-5);
  }
  update_edge_velocity();
}

}  // namespace fulmar::viscous::detail
