#pragma once
// Geometric measures of a section. Thickness and camber are measured vertically (along y) at a
// chord station: thickness(x) = y_upper(x) - y_lower(x) (the spar depth at x), camber(x) =
// (y_upper(x) + y_lower(x)) / 2 - x y_te / x_te, the height of the mid-line above the chord
// line from the origin to the trailing-edge midpoint (x_te, y_te). For a normalised section y_te
// is 0; the term keeps camber unchanged by the shear y -> y + k x that a CST fit's trailing-edge
// heights absorb (a fitted section's trailing-edge midpoint may sit slightly off y = 0). The
// surfaces are a not-a-knot parametric cubic spline through the points (geometry/spline.h), split
// at its point of minimum x (the leading edge). All lengths in chord fractions for a
// chord-normalised section.
#include <optional>
#include <utility>

#include "geometry/section.h"
#include "geometry/spline.h"

namespace fulmar {

struct SectionMetrics {
  double thickness = 0;     // maximum of thickness(x) over [0, 1]
  double thickness_x = 0;   // its x
  double camber = 0;        // camber(x) of largest magnitude (signed) over [0, 1]; 0 when
                            // below 1e-6 (symmetric, up to the resolution of coordinate files)
  double camber_x = 0;      // its x (0 for a symmetric section)
  double le_radius = 0;     // radius of curvature at the leading edge (inverse of the mean
                            // of the two surfaces' nose curvatures from local fits through
                            // the four points on each side of the nose)
  double te_gap = 0;        // distance between the first and last points
  double te_angle_deg = 0;  // wedge angle between the surface tangents at the trailing edge,
                            // degrees (negative if the surfaces cross there)
  double area = 0;          // area enclosed by the curve and the trailing-edge gap
};

// The spline surfaces of one section, for many queries. Throws InputError for fewer than 4
// distinct points.
class SectionSurfaces {
 public:
  explicit SectionSurfaces(const Section& section);
  // y of a surface at chord station x; beyond an end of a surface it continues along the end
  // tangent (upper/lower trailing edges may lie a little short of x = 1).
  double upper_y(double x) const;
  double lower_y(double x) const;
  double thickness_at(double x) const { return upper_y(x) - lower_y(x); }
  double camber_at(double x) const { return 0.5 * (upper_y(x) + lower_y(x)) - chord_slope_ * x; }
  const SectionSpline& spline() const { return spline_; }
  double leading_edge_parameter() const { return s_le_; }

 private:
  double surface_y(bool upper, double x) const;
  SectionSpline spline_;
  double s_le_ = 0;
  int k_le_ = 0;            // knot interval holding the leading edge
  double chord_slope_ = 0;  // slope of the chord line from the origin to the TE midpoint
};

SectionMetrics section_metrics(const Section& section);

// Thickness at chord station x in [0, 1] (vertical; the spar depth). Throws InputError for x
// outside [0, 1].
double thickness_at(const Section& section, double x);

// Smallest thickness(x) over [x_from, x_to] (0 <= x_from < x_to <= 1). Negative where the
// surfaces cross. Throws InputError for a bad interval.
double minimum_thickness(const Section& section, double x_from, double x_to);

// Number of sign reversals of the curvature along each surface, leading edge excluded.
// Curvature magnitudes below `flat_curvature` (1/chord) count as neither sign, so that straight
// parts and rounding noise do not count; a reversal is a run from >= +flat to <= -flat or back.
struct CurvatureReversals {
  int upper = 0;
  int lower = 0;
};
CurvatureReversals curvature_reversals(const Section& section, double flat_curvature = 0.02);

// First pair of non-adjacent polygon segments (by index of their first point; segment i joins
// points i and i + 1, the last segment closes the trailing-edge gap) that touch or cross.
std::optional<std::pair<int, int>> first_self_intersection(const Points& points);
bool self_intersects(const Section& section);

}  // namespace fulmar
