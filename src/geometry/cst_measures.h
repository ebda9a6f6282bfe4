#pragma once
// Analytic measures of a CST shape (thickness, spar depth, camber, nose radius, trailing edge,
// area, shape-function gap, curvature reversals), evaluated on the analytic surfaces rather than on
// sampled coordinates, so that they move smoothly with the coefficients (the optimizer's
// finite-difference gradients need that). Lengths in chord fractions.
#include <vector>

#include "geometry/cst.h"

namespace fulmar {

// Geometry of a CST shape, measured on the analytic surfaces (smooth in the coefficients, which
// the finite-difference gradients need). Lengths in chord fractions.
struct CstMeasures {
  double thickness = 0, thickness_x = 0;  // maximum of y_u - y_l and its x
  double camber = 0, camber_x = 0;        // (y_u + y_l)/2 of largest magnitude, signed, and its x
  std::vector<double> spar_thickness;     // thickness at each station asked for
  double te_gap = 0;
  double te_angle_deg = 0;   // wedge angle between the surface tangents at x = 1
  double le_radius = 0;      // the smaller of the two surfaces' nose radii a_0^2 / 2 (Kulfan 2008)
  double area = 0;           // integral of the thickness over the chord
  double min_shape_gap = 0;  // min over x of S_u(x) - S_l(x) (thickness / class function)
  int reversals_upper = 0, reversals_lower = 0;  // counted on the section (geometry/metrics.h)
  // Strength of the first curvature reversal beyond the allowed number on each surface: the
  // reversals between runs of one sign of y'' are ranked by min(peak |y''| before, after); this is
  // the (allowed + 1)-th largest, 0 when there are no more reversals than allowed. Unlike the
  // count it grows continuously from 0 as a wave appears, so the search can see it coming.
  double excess_reversal_upper = 0, excess_reversal_lower = 0;  // 1/chord
};
// The measures of `shape`; `spar_x`: chord stations whose thickness is wanted (in order);
// `allowed_upper` / `allowed_lower`: curvature reversals tolerated on each surface (see
// excess_reversal_*).
CstMeasures measure_cst(const CstShape& shape, const std::vector<double>& spar_x,
                        int allowed_upper = 0, int allowed_lower = 1);

// A curvature reversal weaker than this (|y''| peak on the weaker side, 1/chord) is rounding,
// not a wave (about the curvature of a 0.5 % camber arc: common practice for smoothness checks).
inline constexpr double kFlatCurvature = 0.05;

// Thickness y_u(x) - y_l(x) of a CST shape at x in [0, 1].
double cst_thickness_at(const CstShape& shape, double x);

}  // namespace fulmar
