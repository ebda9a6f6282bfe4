// Placement of a section in the CAD model: invariances of a scaled rigid motion.
#include "cad/placement.h"

#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

#include "common/error.h"

namespace fulmar::cad {
namespace {

Placement example() {
  Placement p;
  p.chord = 250.0;
  p.units = LengthUnit::mm;
  p.twist_deg = 3.5;
  p.pivot = 0.3;
  p.offset = Eigen::Vector3d(12.0, -4.0, 800.0);
  return p;
}

TEST(Placement, ZeroTwistPutsTheLeadingEdgeOnTheOffsetAndScalesTheChord) {
  Placement p = example();
  p.twist_deg = 0.0;
  EXPECT_LT((placed_point(p, {0.0, 0.0}) - p.offset).norm(), 1e-12);
  EXPECT_LT((placed_point(p, {1.0, 0.0}) - (p.offset + Eigen::Vector3d(250.0, 0, 0))).norm(),
            1e-12);
  EXPECT_NEAR(placed_point(p, {0.4, 0.06}).y(), p.offset.y() + 0.06 * 250.0, 1e-12);
}

TEST(Placement, TwistKeepsThePivotAndDistancesAndRaisesTheNose) {
  const Placement p = example();
  const Eigen::Vector3d pivot_at_zero = p.offset + Eigen::Vector3d(p.pivot * p.chord, 0, 0);
  EXPECT_LT((placed_point(p, {p.pivot, 0.0}) - pivot_at_zero).norm(), 1e-12);
  const Eigen::Vector2d a(0.1, 0.05), b(0.9, -0.02);
  EXPECT_NEAR((placed_point(p, a) - placed_point(p, b)).norm(), p.chord * (a - b).norm(), 1e-10);
  // Nose up: the leading edge rises by pivot * chord * sin(twist), the TE drops.
  const double rise = p.pivot * p.chord * std::sin(p.twist_deg * std::numbers::pi / 180.0);
  EXPECT_NEAR(placed_point(p, {0.0, 0.0}).y() - p.offset.y(), rise, 1e-10);
  EXPECT_LT(placed_point(p, {1.0, 0.0}).y(), p.offset.y());
  // Everything stays in the plane z = offset z.
  EXPECT_DOUBLE_EQ(placed_point(p, a).z(), p.offset.z());
}

TEST(Placement, TwistAnglesAdd) {
  Placement p = example();
  p.offset.setZero();
  p.chord = 1.0;
  Placement q = p;
  q.twist_deg = 2 * p.twist_deg;
  // Applying the chord-frame image of p twice (with zero offset, unit chord) equals q once.
  const Eigen::Vector2d x(0.7, 0.04);
  const Eigen::Vector3d once = placed_point(p, x);
  const Eigen::Vector3d twice = placed_point(p, {once.x(), once.y()});
  EXPECT_LT((twice - placed_point(q, x)).norm(), 1e-14);
}

TEST(Placement, PlacingControlPointsPlacesTheCurve) {
  // A B-spline is affine invariant (Piegl & Tiller 1997, property P4.6 for curves).
  BSplineCurve c;
  c.degree = 3;
  c.knots.resize(10);
  c.knots << 0, 0, 0, 0, 0.3, 0.6, 1, 1, 1, 1;
  c.control.resize(6, 2);
  c.control << 1, 0.01, 0.6, 0.08, 0.1, 0.07, 0.0, 0.0, 0.2, -0.05, 1, -0.01;
  const Placement p = example();
  const BSplineCurve placed = placed_curve(p, c);
  for (int k = 0; k <= 50; ++k) {
    const double u = k / 50.0;
    const Eigen::Vector2d q = point_at(c, u);
    EXPECT_LT((point_at(placed, u) - placed_point(p, q)).norm(), 1e-11);
  }
}

TEST(Placement, UnitsAndValidation) {
  EXPECT_EQ(length_unit_from_string("in"), LengthUnit::in);
  EXPECT_EQ(to_string(LengthUnit::m), "m");
  EXPECT_DOUBLE_EQ(metres_per_unit(LengthUnit::in), 0.0254);
  EXPECT_THROW(length_unit_from_string("ft"), InputError);
  for (double chord : {0.0, -1.0, std::nan("")}) {
    Placement p;
    p.chord = chord;
    try {
      p.Validate();
      FAIL() << chord;
    } catch (const InputError& e) {
      EXPECT_NE(std::string(e.what()).find("chord"), std::string::npos) << e.what();
    }
  }
  Placement p;
  p.twist_deg = 120;
  EXPECT_THROW(p.Validate(), InputError);
}

}  // namespace
}  // namespace fulmar::cad
