#include "cad/writer_parts.h"

namespace fulmar::cad::detail {

std::string ascii(const std::string& text) {
  std::string out;
  for (unsigned char c : text) out += (c >= 32 && c < 127) ? static_cast<char>(c) : '?';
  return out;
}

bool closed_curve(const BSplineCurve& c) {
  return (c.control.row(0) - c.control.row(c.control_count() - 1)).norm() <=
         1e-12 * (1.0 + c.control.cwiseAbs().maxCoeff());
}

void Box::add(const Eigen::MatrixXd& pts) {
  for (Eigen::Index i = 0; i < pts.rows(); ++i) {
    lo = lo.cwiseMin(pts.row(i).transpose());
    hi = hi.cwiseMax(pts.row(i).transpose());
  }
}

Eigen::MatrixXd curve_samples(const BSplineCurve& c, int count) {
  if (c.degree == 1) return c.control;
  return sample_uniform(c, count);
}

Box drawing_box(const CadDrawing& d) {
  Box b;
  for (const BSplineCurve& c : d.curves) b.add(curve_samples(c, 400));
  return b;
}

}  // namespace fulmar::cad::detail
