#pragma once
// Where an exported section sits in the CAD model: chord length and units, twist about a pivot on
// the chord line, and an offset.
//
// Axis convention (also in `fulmar export --help`): the section lies in the x-y plane at
// z = offset z; x runs from the leading edge to the trailing edge, y up (suction side of a
// positively cambered section), z along the span. The chord-frame point (x/c, y/c) goes to
//   offset + chord * (pivot + R(twist) ((x/c, y/c) - pivot)),   pivot = (pivot x/c, 0),
// where R(twist) turns clockwise seen from +z, so a positive twist raises the leading edge (nose
// up: a larger angle of attack for a flow along +x). At zero twist the leading edge lands on the
// offset point.
#include <Eigen/Core>
#include <string>

#include "cad/bspline.h"
#include "geometry/section.h"

namespace fulmar::cad {

enum class LengthUnit { mm, m, in };

std::string to_string(LengthUnit unit);  // "mm", "m", "in"
// Parses "mm", "m" or "in"; throws InputError naming `what` (an option or field) otherwise.
LengthUnit length_unit_from_string(const std::string& text, const std::string& what = "units");
double metres_per_unit(LengthUnit unit);  // 0.001, 1, 0.0254

struct Placement {
  double chord = 1000.0;                             // in `units`, > 0
  LengthUnit units = LengthUnit::mm;                 // of chord, offset and the file
  double twist_deg = 0.0;                            // degrees, positive nose up, |twist| <= 90
  double pivot = 0.25;                               // x/c of the twist axis, in [-1, 2]
  Eigen::Vector3d offset = Eigen::Vector3d::Zero();  // in `units`
  void Validate() const;                             // throws InputError naming the field
};

// The placed image of one chord-frame point, in `units`.
Eigen::Vector3d placed_point(const Placement& placement, const Eigen::Vector2d& chord_point);

// #points by 2 chord-frame points -> #points by 3 placed points.
Eigen::MatrixXd placed_points(const Placement& placement, const Points& points);

// The placed curve: the map is affine, so placing the control points places the curve exactly.
BSplineCurve placed_curve(const Placement& placement, const BSplineCurve& chord_curve);

}  // namespace fulmar::cad
