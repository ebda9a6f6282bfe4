#include "solvers/viscous/boundary_layer.h"

#include <Eigen/LU>
#include <algorithm>
#include <cmath>

namespace fulmar::viscous {
namespace {

// How far (as a fraction of the interval) the transition point may leave its interval in the
// Newton iterations (see residuals_of).
constexpr double kTransitionOvershoot = 0.1;

std::array<Dual, 4> inputs(const StationState& s, int offset) {
  return {Dual::input(s.c, offset), Dual::input(s.theta, offset + 1),
          Dual::input(s.dstar, offset + 2), Dual::input(s.ue, offset + 3)};
}

}  // namespace

namespace {

// Residuals of an interval for the given inputs (Dual or not), `x1`, `x2` its arc lengths. With
// `s1`, `s2` (the stations whose inputs a and b are), the closures of a same-kind interval are
// taken per station (station_closure, or `given`); without, from a and b.
std::array<Dual, 3> residuals_of(const IntervalSpec& spec, const Dual& x1, const Dual& x2,
                                 const std::array<Dual, 4>& a, const std::array<Dual, 4>& b,
                                 const FlowConditions& flow, double* fraction_out,
                                 const StationState* s1 = nullptr, const StationState* s2 = nullptr,
                                 const IntervalClosures& given = {}) {
  auto same_kind = [&](LayerKind kind, double gap1, double gap2) {
    if (!s1 || !s2) return interval_residuals(kind, x1, x2, a.data(), b.data(), flow, gap1, gap2);
    return interval_residuals(
        kind, x1, x2, a.data(), b.data(),
        widen(given.first ? *given.first : station_closure(kind, *s1, flow, gap1), 0),
        widen(given.second ? *given.second : station_closure(kind, *s2, flow, gap2), 4), gap1,
        gap2);
  };
  switch (spec.type) {
    case IntervalType::kLaminar:
      return same_kind(LayerKind::kLaminar, 0.0, 0.0);
    case IntervalType::kTurbulent:
      return same_kind(LayerKind::kTurbulent, 0.0, 0.0);
    case IntervalType::kWake:
      return same_kind(LayerKind::kWake, spec.gap1, spec.gap2);
    case IntervalType::kSimilarity:
      return similarity_residuals(x2, spec.m_exponent, b.data(), flow);
    case IntervalType::kTransition: {
      Dual w = transition_fraction(x1, x2, a.data(), flow);
      if (spec.trip_fraction < w.v) w = Dual(spec.trip_fraction);
      // Beyond the interval the residuals continue smoothly (extrapolated states), so that a
      // Newton step that carries the transition point into a neighbouring interval sees no kink;
      // the transition interval is reassigned before the next step, and in a converged solution
      // w lies in [0, 1]. Far outside, the continuation is not meaningful: clamp.
      if (w.v < -kTransitionOvershoot) w = Dual(-kTransitionOvershoot);
      if (w.v > 1.0 + kTransitionOvershoot) w = Dual(1.0 + kTransitionOvershoot);
      if (fraction_out) *fraction_out = w.v;
      return transition_residuals(x1, x2, a.data(), b.data(), w, flow);
    }
  }
  return {};
}

}  // namespace

Closure<StationDual> station_closure(LayerKind kind, const StationState& s,
                                     const FlowConditions& flow, double gap) {
  return close_station(kind, StationDual::input(s.c, 0), StationDual::input(s.theta, 1),
                       StationDual::input(s.dstar, 2), StationDual::input(s.ue, 3), flow, gap);
}

IntervalLinearization linearize_interval(const IntervalSpec& spec, const StationState& s1,
                                         const StationState& s2, const FlowConditions& flow,
                                         double* fraction_out, Eigen::Vector3d* d_origin,
                                         const IntervalClosures& given) {
  const std::array<Dual, 4> a = inputs(s1, 0), b = inputs(s2, 4);
  const bool similarity = spec.type == IntervalType::kSimilarity;
  // The origin shift rides along as one more derivative (the closures do not see x).
  Dual x1(spec.x1), x2(spec.x2);
  if (similarity) {
    x2 = Dual::input(spec.x2, 0);
  } else if (d_origin) {
    x1.d[kOriginShift] = 1.0;
    x2.d[kOriginShift] = 1.0;
  }
  const std::array<Dual, 3> r =
      residuals_of(spec, x1, x2, a, b, flow, fraction_out, &s1, &s2, given);
  IntervalLinearization lin;
  for (int i = 0; i < 3; ++i) {
    lin.r(i) = r[i].v;
    for (int k = 0; k < 8; ++k) lin.j(i, k) = r[i].d[static_cast<std::size_t>(k)];
    if (d_origin) (*d_origin)(i) = r[i].d[static_cast<std::size_t>(similarity ? 0 : kOriginShift)];
  }
  return lin;
}

namespace {

// Newton on station 2's unknowns with station 1 fixed. `inverse_hk` > 0: H = inverse_hk is
// imposed and ue2 is an unknown in place of delta*. Returns true when converged.
bool solve_station(const IntervalSpec& spec, const StationState& s1, StationState& s2,
                   const FlowConditions& flow, double inverse_hk) {
  for (int it = 0; it < 40; ++it) {
    if (inverse_hk > 0.0) s2.dstar = inverse_hk * s2.theta;
    const IntervalLinearization lin = linearize_interval(spec, s1, s2, flow);
    Eigen::Matrix3d j;
    j.col(0) = lin.j.col(4);
    if (inverse_hk > 0.0) {
      j.col(1) = lin.j.col(5) + inverse_hk * lin.j.col(6);
      j.col(2) = lin.j.col(7);
    } else {
      j.col(1) = lin.j.col(5);
      j.col(2) = lin.j.col(6);
    }
    const Eigen::Vector3d dx = j.partialPivLu().solve(-lin.r);
    if (!dx.allFinite()) return false;
    // Step limiting: relative changes of theta, delta* (or ue) at most 50 %, of c as below.
    double rlx = 1.0;
    const double third = inverse_hk > 0.0 ? s2.ue : s2.dstar;
    auto limit = [&rlx](double change, double allowed) {
      if (std::abs(change) * rlx > allowed) rlx = allowed / std::abs(change);
    };
    limit(dx(1), 0.5 * s2.theta);
    limit(dx(2), 0.5 * third);
    limit(dx(0), spec.type == IntervalType::kLaminar || spec.type == IntervalType::kSimilarity
                     ? 2.0
                     : 0.5 * s2.c);
    // Keep H above the closures' floor: beyond it they are constant and admit spurious roots.
    if (inverse_hk <= 0.0) {
      const double h_old = s2.dstar / s2.theta, h_floor = 1.05;
      for (int k = 0; k < 20; ++k) {
        const double h_new = (s2.dstar + rlx * dx(2)) / (s2.theta + rlx * dx(1));
        if (h_new >= 0.5 * (h_old + h_floor)) break;
        rlx *= 0.5;
      }
    }
    s2.c += rlx * dx(0);
    s2.theta += rlx * dx(1);
    if (inverse_hk > 0.0)
      s2.ue += rlx * dx(2);
    else
      s2.dstar += rlx * dx(2);
    if (lin.r.cwiseAbs().maxCoeff() < 1e-11 && rlx == 1.0 && dx.cwiseAbs().maxCoeff() < 1e-10)
      return true;
    if (rlx == 1.0 && std::abs(dx(1)) < 1e-12 * s2.theta && std::abs(dx(2)) < 1e-12 * third &&
        std::abs(dx(0)) < 1e-12 * std::max(1.0, std::abs(s2.c)))
      return true;
  }
  return false;
}

}  // namespace

double shape_factor(const StationState& s) {
  return s.dstar / s.theta;
}

double skin_friction(LayerKind kind, const StationState& s, const FlowConditions& flow) {
  const Closure<double> k = close_station(kind, s.c, s.theta, s.dstar, s.ue, flow);
  return k.cf * s.ue * s.ue;
}

MarchResult march_surface(const Eigen::VectorXd& x, const Eigen::VectorXd& ue, double m_exponent,
                          double x_trip, const FlowConditions& flow, bool allow_inverse) {
  const int n = static_cast<int>(x.size());
  MarchResult out;
  out.stations.resize(static_cast<std::size_t>(n));
  out.kinds.assign(static_cast<std::size_t>(n), LayerKind::kLaminar);
  // First station: Thwaites-like starting guess, then the similarity equations.
  StationState s;
  s.ue = ue(0);
  const double grad = m_exponent > 0.0 ? m_exponent * ue(0) / x(0) : 0.0;
  s.theta = grad > 0.0 ? std::sqrt(0.075 / (flow.reynolds * grad))
                       : 0.664 * std::sqrt(x(0) / (flow.reynolds * ue(0)));
  s.dstar = (m_exponent > 0.5 ? 2.2 : 2.6) * s.theta;
  IntervalSpec sim;
  sim.type = IntervalType::kSimilarity;
  sim.x2 = x(0);
  sim.m_exponent = m_exponent;
  out.converged = solve_station(sim, s, s, flow, 0.0) && out.converged;
  out.stations[0] = s;
  bool turbulent = false;
  const double hk_max_laminar = 3.8, hk_max_turbulent = 2.5;  // inverse mode above (guess only)
  for (int i = 1; i < n; ++i) {
    const StationState s1 = out.stations[static_cast<std::size_t>(i - 1)];
    StationState s2 = s1;
    s2.ue = ue(i);
    IntervalSpec spec;
    spec.x1 = x(i - 1);
    spec.x2 = x(i);
    spec.type = turbulent ? IntervalType::kTurbulent : IntervalType::kLaminar;
    bool ok = solve_station(spec, s1, s2, flow, 0.0);
    double transition_c = 0.0;  // sqrt(Ctau) guess of a transition interval's station 2
    if (!turbulent) {
      const double trip = (x_trip - spec.x1) / (spec.x2 - spec.x1);
      if (s2.c >= flow.n_crit || trip <= 1.0) {
        spec.type = IntervalType::kTransition;
        spec.trip_fraction = std::max(trip, 0.0);
        const Closure<double> kt =
            close_station(LayerKind::kTurbulent, 0.0, s2.theta, s2.dstar, s2.ue, flow);
        s2.c = transition_ctau_root(kt);
        transition_c = s2.c;
        ok = solve_station(spec, s1, s2, flow, 0.0);
        double w = 1.0;
        linearize_interval(spec, s1, s2, flow, &w);
        out.x_transition = spec.x1 + w * (spec.x2 - spec.x1);
        turbulent = true;
      }
    }
    const double hk_max = turbulent ? hk_max_turbulent : hk_max_laminar;
    if (allow_inverse &&
        (!ok || (shape_factor(s2) > hk_max && shape_factor(s2) > shape_factor(s1)))) {
      StationState inv = s1;
      if (spec.type == IntervalType::kTransition) inv.c = transition_c;
      inv.ue = s1.ue;
      if (solve_station(spec, s1, inv, flow, hk_max)) {
        s2 = inv;
        ok = true;
        ++out.inverse_stations;
      }
    }
    out.converged = out.converged && ok;
    out.stations[static_cast<std::size_t>(i)] = s2;
    out.kinds[static_cast<std::size_t>(i)] =
        turbulent ? LayerKind::kTurbulent : LayerKind::kLaminar;
  }
  return out;
}

MarchResult march_wake(const StationState& first, const Eigen::VectorXd& x,
                       const Eigen::VectorXd& ue, const Eigen::VectorXd& gap,
                       const FlowConditions& flow) {
  const int n = static_cast<int>(x.size());
  MarchResult out;
  out.stations.assign(static_cast<std::size_t>(n), first);
  out.kinds.assign(static_cast<std::size_t>(n), LayerKind::kWake);
  for (int i = 1; i < n; ++i) {
    const StationState s1 = out.stations[static_cast<std::size_t>(i - 1)];
    StationState s2 = s1;
    s2.ue = ue(i);
    IntervalSpec spec;
    spec.type = IntervalType::kWake;
    spec.x1 = x(i - 1);
    spec.x2 = x(i);
    spec.gap1 = gap(i - 1);
    spec.gap2 = gap(i);
    s2.dstar = std::max(s2.dstar - gap(i - 1) + gap(i), 1.05 * s2.theta);
    out.converged = solve_station(spec, s1, s2, flow, 0.0) && out.converged;
    out.stations[static_cast<std::size_t>(i)] = s2;
  }
  return out;
}

}  // namespace fulmar::viscous
