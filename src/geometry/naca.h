#pragma once
// NACA four-digit sections (Jacobs, Ward & Pinkerton, NACA Report 460, 1933) and five-digit
// sections with the standard (non-reflexed) mean lines 210..250 (Jacobs & Pinkerton, NACA Report
// 537, 1935). The thickness is laid perpendicular to the mean line, as both Reports define it.
#include <string>

#include "geometry/section.h"

namespace fulmar {

// A parsed NACA designation. Lengths are fractions of the chord.
struct NacaDesignation {
  enum class Family { kFourDigit, kFiveDigit };
  Family family = Family::kFourDigit;
  std::string digits;    // "2412", "23012"
  double thickness = 0;  // t: maximum thickness of the thickness form
  // Four-digit mean line (Report 460): maximum camber m at chord station p.
  double max_camber = 0;  // m
  double camber_x = 0;    // p
  // Five-digit standard mean line (Report 537), tabulated for a design lift coefficient of 0.3
  // and scaled linearly by design_cl / 0.3 for the other first digits.
  double design_cl = 0;     // 0.15 * first digit
  double mean_line_m = 0;   // end of the cubic part of the mean line (Report 537 "m")
  double mean_line_k1 = 0;  // Report 537 "k1"
};

// Parses "2412", "23012", "naca2412", "NACA 23012", "naca-0012" (case-insensitive prefix).
// Four-digit: camber digit 0..9, position digit 1..9 (0 only with zero camber), thickness 01..99.
// Five-digit: first digit 1..9, second 1..5 (mean lines 210..250), third 0 (reflexed mean lines are
// not part of Report 537), thickness 01..99. Throws InputError naming the designation and the rule.
NacaDesignation parse_naca(const std::string& designation);

// Half-thickness y_t(x) of the NACA thickness form of maximum thickness t (chord fractions),
// Report 460: y_t = 5 t (0.2969 sqrt(x) - 0.1260 x - 0.3516 x^2 + 0.2843 x^3 - 0.1015 x^4), with
// the last coefficient -0.1036 for the closed trailing-edge variant (y_t(1) = 0). x in [0, 1].
double naca_half_thickness(double t, double x, bool closed_te);

// Mean-line height y_c(x) and slope dy_c/dx at chord station x in [0, 1].
struct MeanLinePoint {
  double y = 0;
  double slope = 0;
};
MeanLinePoint naca_mean_line(const NacaDesignation& naca, double x);

// The section as a fulmar point list: `points_per_surface` points on each surface including the
// leading and trailing edges, cosine-spaced in the mean-line chord station (x = (1 - cos b) / 2),
// so 2 * points_per_surface - 1 points in all, upper trailing edge first. Coordinates are those of
// the Reports: the mean line runs from (0, 0) to (1, 0); the trailing-edge midpoint is (1, 0). For
// a cambered section the point farthest from the trailing edge lies slightly ahead of and above the
// mean line's nose (NACA 2412: about 4e-5 ahead, 1.6e-3 above), which fulmar keeps rather than
// re-normalising, so that the Reports' ordinates and chord line (angle-of-attack reference) hold.
// closed_te selects the -0.1036 thickness coefficient. points_per_surface in [10, 5000].
// Throws InputError for a bad designation or point count.
Section naca_section(const std::string& digits, int points_per_surface = 120,
                     bool closed_te = false);

}  // namespace fulmar
