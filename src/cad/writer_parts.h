#pragma once
// Pieces every CAD writer shares: ASCII-only text, the closed-curve test and the drawing's
// bounding box. Internal to src/cad (the writers' public declarations are in cad/writers.h).
#include <Eigen/Core>
#include <string>

#include "cad/writers.h"

namespace fulmar::cad::detail {

// `text` with every character outside printable ASCII replaced by '?': the formats are ASCII
// files and names are free text.
std::string ascii(const std::string& text);

// True when the curve's first and last control points coincide (to 1e-12 of its size).
bool closed_curve(const BSplineCurve& c);

// Axis-aligned bounds of points (rows x, y, z); empty boxes have lo > hi.
struct Box {
  Eigen::Vector3d lo = Eigen::Vector3d::Constant(1e300);
  Eigen::Vector3d hi = Eigen::Vector3d::Constant(-1e300);
  void add(const Eigen::MatrixXd& pts);
};

// `count` points along the curve (count by 3); a polyline (degree 1) gives its vertices.
Eigen::MatrixXd curve_samples(const BSplineCurve& c, int count);

// The bounds of every curve of the drawing (400 samples per curve).
Box drawing_box(const CadDrawing& d);

}  // namespace fulmar::cad::detail
