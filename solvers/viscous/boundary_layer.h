#pragma once
// The integral boundary-layer equations between two stations, with exact Jacobians, and a direct
// march for a prescribed edge velocity.
//
// Equations (M. Drela and M. B. Giles, AIAA J. 25(10), 1347-1355, 1987), per unit arc length xi:
//   momentum        dtheta/dxi + (2 + H - Me^2) theta/ue due/dxi = Cf/2
//   kinetic energy  theta dH*/dxi + (2 H** + H* (1 - H)) theta/ue due/dxi = 2 CD - H* Cf/2
//   laminar: amplification  dN/dxi = (envelope rate, transition.h)
//   turbulent and wake: Ctau lag (in c = sqrt(Ctau))
//     2 delta/c dc/dxi = K_C (sqrt(Ctau_EQ) - c)
//                        + 2 delta [4/(3 delta*) (Cf/2 - ((H_k - 1)/(A H_k))^2) - 1/ue due/dxi]
// Each equation is divided by the variable it advances (theta, H*, c) and integrated over the
// interval in the logarithms (on a wall the sources over ln xi), second order, and exact for the
// Falkner-Skan similarity solutions, whose logarithmic derivatives are constant.
#include <Eigen/Core>
#include <array>
#include <vector>

#include "solvers/viscous/closures.h"
#include "solvers/viscous/dual.h"
#include "solvers/viscous/transition.h"

namespace fulmar::viscous {

// The kind of layer at a station.
enum class LayerKind { kLaminar, kTurbulent, kWake };

// Free-stream flow for the boundary layer.
struct FlowConditions {
  double reynolds = 1.0e6;  // based on the chord and the free-stream speed
  double mach = 0.0;        // free-stream Mach number
  double n_crit = kDefaultNCrit;
};

// Primary variables at one station (lengths in chords, ue over free-stream speed).
struct StationState {
  double c = 0.0;      // laminar: amplification factor N; turbulent and wake: sqrt(Ctau)
  double theta = 0.0;  // momentum thickness
  double dstar = 0.0;  // displacement thickness
  double ue = 0.0;     // edge velocity (> 0)
};

// Secondary quantities from the closures at a station.
template <class T>
struct Closure {
  T me2, h, hk, hs, hss, re_theta, cf, dissipation /* 2 CD / H* */, delta, us, ctau_eq_root;
};

// Edge Mach number squared from the free-stream Mach number and ue (isentropic, gamma = 1.4).
template <class T>
T edge_mach_squared(const T& ue, double mach) {
  const double m2 = mach * mach;
  return m2 * ue * ue / (1.0 + 0.2 * m2 * (1.0 - ue * ue));
}

// Closures at one station of kind `kind`; `gap` is the part of delta* in a wake that is the
// trailing-edge base (dead air), excluded from the shape factor of the shear layers.
template <class T>
Closure<T> close_station(LayerKind kind, const T& c, const T& theta, const T& dstar, const T& ue,
                         const FlowConditions& flow, double gap = 0.0) {
  Closure<T> k;
  k.me2 = edge_mach_squared(ue, flow.mach);
  k.h = (dstar - gap) / theta;
  k.hk = kind == LayerKind::kWake
             ? smooth_floor(kinematic_shape(k.h, k.me2), kWakeHkMin, kWakeHkBlend)
             : smooth_floor(kinematic_shape(k.h, k.me2), kLaminarHkMin + 0.02, 0.02);
  k.hss = density_shape(k.hk, k.me2);
  // No floor here: the laminar closures only divide by it (a stagnation-point station can have
  // Re_theta near zero); the turbulent closures bound it themselves.
  k.re_theta = flow.reynolds * ue * theta;
  if (kind == LayerKind::kLaminar) {
    k.hs = laminar_energy_shape(k.hk);
    k.cf = laminar_cf_re_theta(k.hk) / k.re_theta;
    k.dissipation = laminar_dissipation(k.hk) / k.re_theta;
    k.us = T(0.0);
    k.ctau_eq_root = T(0.0);
  } else {
    const bool wake = kind == LayerKind::kWake;
    k.hs = wake ? turbulent_energy_shape(k.hk, k.re_theta, k.me2, kWakeHkMin, kWakeHkBlend)
                : turbulent_energy_shape(k.hk, k.re_theta, k.me2);
    k.cf = wake ? T(0.0) : turbulent_skin_friction(k.hk, k.re_theta, k.me2);
    k.us = slip_velocity(k.hs, k.hk, k.h < 1.1 ? T(1.1) : k.h, wake);
    k.ctau_eq_root = sqrt(equilibrium_ctau(k.hs, k.hk, k.h < 1.1 ? T(1.1) : k.h, k.us));
    // Two shear layers in a wake: twice the outer-layer dissipation of one of them.
    const T cd = wake ? 2.0 * c * c * (1.0 - k.us) : turbulent_dissipation(k.cf, k.us, T(c * c));
    k.dissipation = 2.0 * cd / k.hs;
  }
  // In a wake delta is that of one of its two halves (the lag equation is for one shear layer).
  k.delta = layer_thickness(theta, k.hk, T(dstar - gap));
  if (kind == LayerKind::kWake) k.delta = 0.5 * k.delta;
  return k;
}

// The closures of one station with derivatives with respect to its own (c, theta, delta*, ue),
// placed at positions offset .. offset + 3 of an interval's Dual (0: station 1, 4: station 2).
// The same numbers as close_station on an interval's Dual inputs, at less than half the cost
// (the other station's derivatives, all zero, are not carried through the closures).
inline Closure<Dual> widen(const Closure<StationDual>& k, int offset) {
  auto w = [offset](const StationDual& x) { return widen<kDualSize>(x, offset); };
  return {w(k.me2), w(k.h),           w(k.hk),    w(k.hs), w(k.hss),         w(k.re_theta),
          w(k.cf),  w(k.dissipation), w(k.delta), w(k.us), w(k.ctau_eq_root)};
}

// Sqrt(Ctau) at the start of turbulent flow, a fraction of the equilibrium value that rises with
// H_k (transition of a separated shear layer is quicker): 1.8 exp(-3.3/(H_k - 1)) Ctau_EQ, a form
// from Drela's later papers (from memory); a modelling choice.
template <class T>
T transition_ctau_root(const Closure<T>& turbulent_side) {
  return turbulent_side.ctau_eq_root * sqrt(1.8 * exp(-3.3 / (turbulent_side.hk - 1.0)));
}

// How fast the averaging weight moves from trapezoidal to implicit with the change of
// ln(H_k - 1) across an interval (a numerical choice: 1/2 + 0.01 at a 5 % change of H_k - 1).
inline constexpr double kUpwindSharpness = 8.0;

// Residuals of the three equations over [x1, x2] for layers of the same kind at both ends.
// Order: (amplification or lag, momentum, kinetic energy). `gap1`, `gap2`: see close_station.
template <class T>
std::array<T, 3> interval_residuals(LayerKind kind, const T& x1, const T& x2, const T* s1,
                                    const T* s2, const Closure<T>& a, const Closure<T>& b,
                                    double gap1 = 0.0, double gap2 = 0.0);
template <class T>
std::array<T, 3> interval_residuals(LayerKind kind, const T& x1, const T& x2, const T* s1,
                                    const T* s2, const FlowConditions& flow, double gap1 = 0.0,
                                    double gap2 = 0.0) {
  return interval_residuals(
      kind, x1, x2, s1, s2, close_station(kind, s1[0], s1[1], s1[2], s1[3], flow, gap1),
      close_station(kind, s2[0], s2[1], s2[2], s2[3], flow, gap2), gap1, gap2);
}
// The same with the closures `a`, `b` of the two stations given (close_station of kind `kind`).
template <class T>
std::array<T, 3> interval_residuals(LayerKind kind, const T& x1, const T& x2, const T* s1,
                                    const T* s2, const Closure<T>& a, const Closure<T>& b,
                                    double gap1, double gap2) {
  const T dlnu = log(s2[3] / s1[3]);
  // Averaging weight of station 2: 1/2 (trapezoidal, second order) where H_k varies little, up
  // to 1 (implicit Euler) where it changes strongly across the interval, as behind transition,
  // where the stiff relaxation of the layer would make the trapezoidal rule overshoot and the
  // drag would then oscillate with the position of transition inside its interval.
  const T hl = log((b.hk - 1.0) / (a.hk - 1.0));
  const T u = 1.0 - 0.5 * exp(-kUpwindSharpness * hl * hl);
  // Source terms integrated over xi: on a wall as xi * f averaged over d ln(xi) (exact for the
  // self-similar layers, whose xi f is constant, and regular at a stagnation point where f ~
  // 1/xi); in a wake (xi from the trailing edge, can be 0) as f averaged over d xi.
  const bool wall = kind != LayerKind::kWake;
  const T span = wall ? T(log(x2 / x1)) : T(x2 - x1);
  const T w1 = wall ? x1 : T(1.0), w2 = wall ? x2 : T(1.0);
  auto avg = [&u](const T& p, const T& q) { return (1.0 - u) * p + u * q; };
  auto integral = [&](const T& f1, const T& f2) { return span * avg(w1 * f1, w2 * f2); };
  std::array<T, 3> r;
  if (kind == LayerKind::kLaminar) {
    // Explicit (upstream) rate: the same rule locates transition inside an interval from station
    // 1 alone, so the laminar march and the transition point agree exactly and the transition
    // point moves continuously across stations. (A rate using station 2 is not usable there:
    // in a transition interval station 2 is turbulent.) First order: transition lies up to half
    // an interval late where the rate grows along it.
    r[0] = s2[0] - s1[0] - (x2 - x1) * amplification_rate(a.hk, s1[1], a.re_theta);
  } else {
    auto source = [](const Closure<T>& k, const T& c, const T& dstar) {
      const T hr = (k.hk - 1.0) / (kLocusA * k.hk);
      return kLagRate * (k.ctau_eq_root - c) / k.delta +
             (8.0 / (3.0 * dstar)) * (0.5 * k.cf - hr * hr);
    };
    r[0] = 2.0 * log(s2[0] / s1[0]) -
           integral(source(a, s1[0], T(s1[2] - gap1)), source(b, s2[0], T(s2[2] - gap2))) +
           2.0 * dlnu;
  }
  r[1] = log(s2[1] / s1[1]) + (2.0 + avg(a.h, b.h) - avg(a.me2, b.me2)) * dlnu -
         0.5 * integral(a.cf / s1[1], b.cf / s2[1]);
  r[2] = log(b.hs / a.hs) +
         avg(2.0 * a.hss / a.hs + 1.0 - a.h, 2.0 * b.hss / b.hs + 1.0 - b.h) * dlnu -
         integral((a.dissipation - 0.5 * a.cf) / s1[1], (b.dissipation - 0.5 * b.cf) / s2[1]);
  return r;
}

// Residuals at the first station of a surface from the self-similar solution with
// dln(ue)/dln(xi) = `m_exponent` (1 at a stagnation point, 0 on a flat plate), at distance `x`
// from the origin: (N, momentum, kinetic energy) with N = 0 (laminar layer).
template <class T>
std::array<T, 3> similarity_residuals(const T& x, double m_exponent, const T* s,
                                      const FlowConditions& flow) {
  const Closure<T> k = close_station(LayerKind::kLaminar, s[0], s[1], s[2], s[3], flow);
  std::array<T, 3> r;
  r[0] = s[0];
  // dln(theta)/dln(xi) = (1 - m)/2 for a similar layer; dln(H*)/dln(xi) = 0.
  r[1] = 0.5 * (1.0 - m_exponent) + (2.0 + k.h - k.me2) * m_exponent - 0.5 * x * k.cf / s[1];
  r[2] = (2.0 * k.hss / k.hs + 1.0 - k.h) * m_exponent - x * (k.dissipation - 0.5 * k.cf) / s[1];
  return r;
}

// Where a laminar interval reaches N_crit, if it does: the fraction w of the interval (arc-length
// weight from station 1) from station 1's amplification rate (the rule of the laminar interval);
// a value > 1 when N_crit is not reached, < 0 when station 1 is already past it.
template <class T>
T transition_fraction(const T& x1, const T& x2, const T* s1, const FlowConditions& flow) {
  const Closure<T> a = close_station(LayerKind::kLaminar, s1[0], s1[1], s1[2], s1[3], flow);
  const T dn = amplification_rate(a.hk, s1[1], a.re_theta) * (x2 - x1);
  if (value_of(dn) <= 1e-12) return T(2.0);
  return (flow.n_crit - s1[0]) / dn;
}

// Residuals of an interval in which the layer becomes turbulent at fraction w of its length
// (w in [0, 1], w = transition_fraction or the forced trip). Station 1 is laminar (c = N), station
// 2 turbulent (c = sqrt(Ctau)). The state at the transition point is interpolated linearly; the
// laminar part [x1, xt] and the turbulent part [xt, x2] are added (momentum, energy), the lag
// equation covers the turbulent part from the initial stress.
template <class T>
std::array<T, 3> transition_residuals(const T& x1, const T& x2, const T* s1, const T* s2,
                                      const T& w, const FlowConditions& flow) {
  std::array<T, 4> st;
  for (int i = 1; i < 4; ++i) st[i] = s1[i] + w * (s2[i] - s1[i]);
  const T xt = x1 + w * (x2 - x1);
  st[0] = T(flow.n_crit);
  // Laminar part (its amplification residual is not used: N reaches N_crit by construction).
  std::array<T, 4> s1l{s1[0], s1[1], s1[2], s1[3]};
  const std::array<T, 3> lam =
      interval_residuals(LayerKind::kLaminar, T(x1), xt, s1l.data(), st.data(), flow);
  const Closure<T> kt = close_station(LayerKind::kTurbulent, T(0.0), st[1], st[2], st[3], flow);
  st[0] = transition_ctau_root(kt);
  const std::array<T, 3> turb =
      interval_residuals(LayerKind::kTurbulent, xt, T(x2), st.data(), s2, flow);
  return {turb[0], lam[1] + turb[1], lam[2] + turb[2]};
}

// ---- Jacobians ----------------------------------------------------------------------------------

// Residuals r (3) and their derivatives J (3 by 8) with respect to (c, theta, delta*, ue) at
// station 1 then station 2.
struct IntervalLinearization {
  Eigen::Vector3d r;
  Eigen::Matrix<double, 3, 8> j;
};

// Which equations an interval carries.
enum class IntervalType { kLaminar, kTurbulent, kWake, kTransition, kSimilarity };

struct IntervalSpec {
  IntervalType type = IntervalType::kLaminar;
  double x1 = 0.0, x2 = 0.0;      // arc lengths of the two stations (x1 unused for kSimilarity)
  double m_exponent = 1.0;        // kSimilarity: dln(ue)/dln(xi)
  double trip_fraction = 2.0;     // kTransition: forced transition at this fraction (> 1: none)
  double gap1 = 0.0, gap2 = 0.0;  // wake base thickness at the two stations
};

// Linearization of one interval. For kSimilarity station 2 is the station, and column 0 holds
// the derivative with respect to its arc length x2 (station 1 is not used). For kTransition,
// `fraction_out` receives the fraction of the interval where transition happens (natural or forced,
// whichever is first). `d_origin`, when given, receives the derivatives of the residuals with
// respect to a shift of the arc-length origin (x1 and x2 moving together), as when the stagnation
// point moves.
//
// `given`: the closures of the two stations of a laminar, turbulent or wake interval, when the
// caller has them from the neighbouring interval (station_closure of the interval's kind and the
// station's gap); those not given are computed. Other interval types ignore them.
struct IntervalClosures {
  const Closure<StationDual>* first = nullptr;
  const Closure<StationDual>* second = nullptr;
};
IntervalLinearization linearize_interval(const IntervalSpec& spec, const StationState& s1,
                                         const StationState& s2, const FlowConditions& flow,
                                         double* fraction_out = nullptr,
                                         Eigen::Vector3d* d_origin = nullptr,
                                         const IntervalClosures& given = {});

// The closures of kind `kind` at station s, with derivatives with respect to its (c, theta,
// delta*, ue); `gap` as in close_station.
Closure<StationDual> station_closure(LayerKind kind, const StationState& s,
                                     const FlowConditions& flow, double gap = 0.0);

// ---- Direct march for a prescribed edge velocity
// --------------------------------------------------

// One surface marched from its first station: arc lengths `x` (increasing, x[0] > 0), edge
// velocity `ue` at each, first-station similarity exponent `m_exponent`, forced transition at
// arc length `x_trip` (use a value beyond the end for none). With `allow_inverse`, where the
// direct solution would separate (H_k above 3.8 laminar, 2.5 turbulent and rising) H_k is capped
// and ue left free, so that the march gives a usable starting guess past separation; without it
// the prescribed ue is kept everywhere.
struct MarchResult {
  std::vector<StationState> stations;
  std::vector<LayerKind> kinds;
  double x_transition = -1.0;  // arc length of transition; -1 when the layer stays laminar
  bool converged = true;       // every local Newton solve converged
  int inverse_stations = 0;    // stations where H_k was capped and ue left free (separation)
};

// The wake marched from its merged first state `first` at x(0): arc lengths `x`, edge velocity
// `ue`, trailing-edge base thickness `gap` at each station (direct mode).
MarchResult march_wake(const StationState& first, const Eigen::VectorXd& x,
                       const Eigen::VectorXd& ue, const Eigen::VectorXd& gap,
                       const FlowConditions& flow);

MarchResult march_surface(const Eigen::VectorXd& x, const Eigen::VectorXd& ue, double m_exponent,
                          double x_trip, const FlowConditions& flow, bool allow_inverse = true);

// Skin friction coefficient Cf (on the free-stream dynamic pressure: Cf_e ue^2) at a station.
double skin_friction(LayerKind kind, const StationState& s, const FlowConditions& flow);
// Shape factor H, kinematic H_k.
double shape_factor(const StationState& s);

}  // namespace fulmar::viscous
