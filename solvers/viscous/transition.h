#pragma once
// Transition prediction by the e^N envelope method: the amplification factor N of the most
// amplified Tollmien-Schlichting wave grows downstream of the critical Reynolds number at a rate
// that depends on the local shape factor, and transition is where N reaches N_crit.
//
// Sources:
//  [DG87] M. Drela and M. B. Giles, AIAA J. 25(10), 1347-1355, 1987: envelope fits to the
//         Orr-Sommerfeld amplification of Falkner-Skan profiles: dN/dRe_theta(H_k), the
//         critical Re_theta(H_k), and dRe_theta/dxi from the similarity relations l(H_k), m(H_k).
//  [M77]  L. M. Mack, "Transition and laminar instability", JPL Publication 77-15, 1977:
//         N_crit = -8.43 - 2.4 ln(Tu) with Tu the free-stream turbulence level as a fraction.
#include "solvers/viscous/dual.h"

namespace fulmar::viscous {

inline constexpr double kDefaultNCrit = 9.0;

// N_crit from the free-stream turbulence level `tu` (a fraction, e.g. 0.0007 for 0.07 %) by Mack's
// correlation [M77]. Throws InputError unless 0 < tu < 0.1.
double n_crit_from_turbulence(double tu);

// log10 of the critical Re_theta where amplification starts, as a function of H_k [DG87].
template <class T>
T log10_critical_re_theta(const T& hk) {
  const T a = 1.0 / (hk - 1.0);
  return (1.415 * a - 0.489) * tanh(20.0 * a - 12.9) + 3.295 * a + 0.44;
}

// Half-width in log10 Re_theta of the ramp that switches amplification on around the critical
// Re_theta: keeps dN/dxi continuous so that the transition point (and cd) moves smoothly with
// angle and shape. A modelling choice made here for smoothness; 0.08 is a few percent of Re_theta.
inline constexpr double kOnsetRampHalfWidth = 0.08;

// Spatial amplification rate dN/dxi (per unit arc length, same length unit as theta) of a laminar
// layer with kinematic shape factor `hk`, momentum thickness `theta` and Reynolds number
// `re_theta` [DG87]. Zero below the critical Re_theta, ramped smoothly onto the envelope.
template <class T>
T amplification_rate(const T& hk_in, const T& theta, const T& re_theta) {
  const T hk = hk_in < 1.05 ? T(1.05) : hk_in;
  const T excess = log10(re_theta) - log10_critical_re_theta(hk);
  const double e = value_of(excess);
  if (e <= -kOnsetRampHalfWidth) return T(0.0);
  T ramp(1.0);
  if (e < kOnsetRampHalfWidth) {
    const T r = (excess + kOnsetRampHalfWidth) / (2.0 * kOnsetRampHalfWidth);
    ramp = r * r * (3.0 - 2.0 * r);
  }
  const T a = 2.4 * hk - 3.7 + 2.5 * tanh(1.5 * hk - 4.65);
  const T dn_dre = 0.01 * sqrt(a * a + 0.25);
  const T l = (6.54 * hk - 14.07) / (hk * hk);
  const T b = hk - 4.0;
  const T m = (0.058 * b * b / (hk - 1.0) - 0.068) / l;
  return ramp * dn_dre * 0.5 * (m + 1.0) * l / theta;
}

}  // namespace fulmar::viscous
