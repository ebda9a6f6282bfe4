#include "cad/placement.h"

#include <cmath>
#include <numbers>

#include "common/enum_names.h"
#include "common/error.h"
#include "common/number_text.h"

namespace fulmar::cad {

namespace {

const EnumNames<LengthUnit> kUnits{
    {LengthUnit::mm, "mm"}, {LengthUnit::m, "m"}, {LengthUnit::in, "in"}};

}  // namespace

std::string to_string(LengthUnit unit) {
  return kUnits.name(unit);
}

LengthUnit length_unit_from_string(const std::string& text, const std::string& what) {
  // The message of the option's rule ("must be one of"), not EnumNames' "unknown": the case
  // file and the command line re-word it by its rule.
  if (const auto value = kUnits.find(text)) return *value;
  throw InputError(what + " = '" + text + "': must be one of " + kUnits.list());
}

double metres_per_unit(LengthUnit unit) {
  switch (unit) {
    case LengthUnit::mm:
      return 0.001;
    case LengthUnit::m:
      return 1.0;
    case LengthUnit::in:
      return 0.0254;  // exact by the 1959 international yard and pound agreement
  }
  return 1.0;
}

void Placement::Validate() const {
  auto fail = [](const std::string& field, double value, const std::string& rule) {
    throw InputError(field + " = " + general_text(value) + ": " + rule);
  };
  if (!std::isfinite(chord) || !(chord > 0.0)) fail("chord", chord, "must be a positive length");
  if (!std::isfinite(twist_deg) || std::abs(twist_deg) > 90.0) {
    fail("twist", twist_deg, "must be within -90..90 degrees");
  }
  if (!std::isfinite(pivot) || pivot < -1.0 || pivot > 2.0) {
    fail("pivot", pivot, "must be an x/c within -1..2");
  }
  for (int i = 0; i < 3; ++i) {
    if (!std::isfinite(offset(i)))
      fail(std::string("offset ") + "xyz"[i], offset(i), "must be finite");
  }
}

namespace {

Eigen::Matrix2d twist_matrix(double twist_deg) {
  const double a = twist_deg * std::numbers::pi / 180.0;
  Eigen::Matrix2d r;
  // Clockwise by `a` seen from +z: the leading edge (ahead of the pivot, at smaller x) rises.
  r << std::cos(a), std::sin(a), -std::sin(a), std::cos(a);
  return r;
}

}  // namespace

Eigen::Vector3d placed_point(const Placement& placement, const Eigen::Vector2d& chord_point) {
  const Eigen::Vector2d pivot(placement.pivot, 0.0);
  const Eigen::Vector2d q = pivot + twist_matrix(placement.twist_deg) * (chord_point - pivot);
  return placement.offset + placement.chord * Eigen::Vector3d(q.x(), q.y(), 0.0);
}

Eigen::MatrixXd placed_points(const Placement& placement, const Points& points) {
  Eigen::MatrixXd out(points.rows(), 3);
  for (Eigen::Index i = 0; i < points.rows(); ++i) {
    out.row(i) = placed_point(placement, points.row(i).transpose()).transpose();
  }
  return out;
}

BSplineCurve placed_curve(const Placement& placement, const BSplineCurve& chord_curve) {
  BSplineCurve out;
  out.degree = chord_curve.degree;
  out.knots = chord_curve.knots;
  out.control.resize(chord_curve.control_count(), 3);
  for (int i = 0; i < chord_curve.control_count(); ++i) {
    const Eigen::Vector2d p(chord_curve.control(i, 0), chord_curve.control(i, 1));
    out.control.row(i) = placed_point(placement, p).transpose();
  }
  return out;
}

}  // namespace fulmar::cad
