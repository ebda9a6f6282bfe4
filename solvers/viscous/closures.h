#pragma once
// Integral boundary-layer closure relations, written once as templates on the scalar type so that
// `Dual` arguments return the exact partial derivatives alongside the value.
//
// Sources (constants taken from them):
//  [DG87]  M. Drela and M. B. Giles, "Viscous-inviscid analysis of transonic and low Reynolds
//          number airfoils", AIAA J. 25(10), 1347-1355, 1987: laminar closures fitted to
//          Falkner-Skan profiles, turbulent H* (after Swafford), turbulent Cf (Swafford's profile
//          fit as given there), dissipation with the shear-stress coefficient, equilibrium Ctau
//          and the Ctau lag equation.
//  [W78]   J. D. Whitfield, "Integral solution of compressible turbulent boundary layers using
//          improved velocity profiles", AEDC-TR-78-42, 1978: kinematic shape factor H_k and
//          density shape factor H** (as quoted in [DG87]).
//  [GWB77] J. E. Green, D. J. Weeks and J. W. F. Brooman, "Prediction of turbulent boundary
//          layers and wakes in compressible flow by a lag-entrainment method", ARC R&M 3791,
//          1977: the G-beta equilibrium locus G = A sqrt(1 + B beta), A = 6.7, B = 0.75, and the
//          boundary-layer thickness estimate delta = theta (3.15 + 1.72 / (H_k - 1)) + delta*.
//
// Variables: H = delta*/theta, H_k kinematic shape factor, H* = theta*/theta (kinetic energy),
// Re_theta = ue theta / nu, Me2 = edge Mach number squared, Ctau = max shear stress / (rho ue^2).
#include "solvers/viscous/dual.h"

namespace fulmar::viscous {

// x for x >= lo + w, lo for x <= lo - w, and a quadratic blend between that is continuous in
// value and slope (keeps the Newton Jacobian continuous where a closure must be bounded).
template <class T>
T smooth_floor(const T& x, double lo, double w) {
  if (value_of(x) >= lo + w) return x;
  if (value_of(x) <= lo - w) return T(lo);
  const T g = lo + w - x;
  return x + g * g / (4.0 * w);
}
template <class T>
T smooth_ceiling(const T& x, double hi, double w) {
  return -smooth_floor(T(-x), -hi, w);
}

// Kinematic shape factor H_k from H and the edge Mach number squared [W78].
template <class T>
T kinematic_shape(const T& h, const T& me2) {
  return (h - 0.29 * me2) / (1.0 + 0.113 * me2);
}

// Density shape factor H** = delta**/theta [W78]; zero in incompressible flow.
template <class T>
T density_shape(const T& hk, const T& me2) {
  return (0.064 / (hk - 0.8) + 0.251) * me2;
}

// ---- Laminar closures [DG87], fitted to Falkner-Skan profiles --------------------------------

inline constexpr double kLaminarHkMin = 1.05;  // the attached Falkner-Skan range starts at 2.2

// H* of a laminar layer as a function of H_k.
template <class T>
T laminar_energy_shape(const T& hk) {
  if (value_of(hk) < 4.0) {
    const T a = 4.0 - hk;
    return 1.515 + 0.076 * a * a / hk;
  }
  const T a = hk - 4.0;
  return 1.515 + 0.040 * a * a / hk;
}

// Cf Re_theta of a laminar layer (twice the correlated Re_theta Cf/2).
template <class T>
T laminar_cf_re_theta(const T& hk) {
  if (value_of(hk) < 7.4) {
    const T a = 7.4 - hk;
    return 2.0 * (-0.067 + 0.01977 * a * a / (hk - 1.0));
  }
  const T a = 1.0 - 1.4 / (hk - 6.0);
  return 2.0 * (-0.067 + 0.022 * a * a);
}

// 2 CD Re_theta / H* of a laminar layer (CD = dissipation / (rho ue^3)).
template <class T>
T laminar_dissipation(const T& hk) {
  if (value_of(hk) < 4.0) return 0.207 + 0.00205 * pow(T(4.0 - hk), 5.5);
  const T a = hk - 4.0;
  return 0.207 - 0.003 * a * a / (1.0 + 0.02 * a * a);
}

// ---- Turbulent closures [DG87] ---------------------------------------------------------------

inline constexpr double kTurbulentHkMin = 1.05;
// In a wake H_k tends to 1 as the velocity defect decays (it is near 1.05 one chord behind the
// trailing edge of a thin section), so the wake's bound sits just above 1: a bound inside that
// range would freeze H* there and leave the far-wake energy equation without a say in H. The H*
// fit below is regular down to H_k = 1.
inline constexpr double kWakeHkMin = 1.005;
inline constexpr double kWakeHkBlend = 0.004;
// Lower bounds of Re_theta in the turbulent fits: H* is fitted for Re_theta >= 200 or so (its H0
// changes form at 400); the Cf fit needs log10(Re_theta) well above 0 (20 gives 1.3).
inline constexpr double kTurbulentReThetaMin = 200.0;
inline constexpr double kFrictionReThetaMin = 20.0;

// H* of a turbulent layer from H_k, Re_theta and Me2 (compressibility factor as in [DG87]).
template <class T>
T turbulent_energy_shape(const T& hk_in, const T& re_theta_in, const T& me2,
                         double hk_min = kTurbulentHkMin, double hk_blend = 0.02) {
  const T hk = smooth_floor(hk_in, hk_min, hk_blend);
  const T rt = smooth_floor(re_theta_in, kTurbulentReThetaMin, 20.0);
  const T h0 = value_of(rt) > 400.0 ? T(3.0 + 400.0 / rt) : T(4.0);
  T hs;
  if (value_of(hk) < value_of(h0)) {
    const T a = h0 - hk;
    hs = 1.505 + 4.0 / rt + (0.165 - 1.6 / sqrt(rt)) * pow(a, 1.6) / hk;
  } else {
    const T a = hk - h0;
    const T lr = log(rt);
    const T b = a + 4.0 / lr;
    hs = 1.505 + 4.0 / rt + a * a * (0.04 / hk + 0.007 * lr / (b * b));
  }
  return (hs + 0.028 * me2) / (1.0 + 0.014 * me2);
}

// Turbulent skin friction Cf from H_k, Re_theta and Me2 (Swafford's fit as given in [DG87]).
template <class T>
T turbulent_skin_friction(const T& hk_in, const T& re_theta_in, const T& me2) {
  const T hk = smooth_floor(hk_in, kTurbulentHkMin, 0.02);
  const T rt = smooth_floor(re_theta_in, kFrictionReThetaMin, 2.0);
  const T fc = sqrt(1.0 + 0.2 * me2);
  const T lr = log10(rt / fc);
  const T cf =
      0.3 * exp(-1.33 * hk) * pow(lr, -1.74 - 0.31 * hk) + 0.00011 * (tanh(4.0 - hk / 0.875) - 1.0);
  return cf / fc;
}

// Equivalent normalised wall slip velocity U_s of the outer layer [DG87]; bounded below 1 so that
// the equilibrium stress stays finite (0.95 on a wall, 0.98 in a wake: common practice).
template <class T>
T slip_velocity(const T& hs, const T& hk, const T& h, bool wake) {
  const T us = 0.5 * hs * (1.0 - (4.0 / 3.0) * (hk - 1.0) / h);
  return smooth_ceiling(us, wake ? 0.98 : 0.95, 0.01);
}

// G-beta equilibrium-locus constants [GWB77].
inline constexpr double kLocusA = 6.7;
inline constexpr double kLocusB = 0.75;

// Equilibrium shear-stress coefficient Ctau_EQ [DG87] from the G-beta locus [GWB77].
template <class T>
T equilibrium_ctau(const T& hs, const T& hk, const T& h, const T& us) {
  const T a = hk - 1.0;
  return hs * a * a * a / (2.0 * kLocusA * kLocusA * kLocusB * hk * hk * h * (1.0 - us));
}

// Dissipation coefficient CD of a turbulent layer [DG87]: wall-layer part Cf/2 U_s plus the outer
// layer's shear stress Ctau times (1 - U_s). In a wake (cf = 0) the caller doubles it for the two
// shear layers.
template <class T>
T turbulent_dissipation(const T& cf, const T& us, const T& ctau) {
  return 0.5 * cf * us + ctau * (1.0 - us);
}

// Boundary-layer thickness estimate delta [GWB77] used by the lag equation.
template <class T>
T layer_thickness(const T& theta, const T& hk, const T& dstar) {
  return theta * (3.15 + 1.72 / (hk - 1.0)) + dstar;
}

// Lag-equation rate constant K_C and the wall-shear term's locus constant [DG87].
inline constexpr double kLagRate = 5.6;

}  // namespace fulmar::viscous
