// The pieces shared by the CAD writers.
#include "cad/writer_parts.h"

#include <gtest/gtest.h>

#include "cad/writer_test_drawing.h"

namespace fulmar::cad::detail {
namespace {

TEST(WriterParts, AsciiReplacesEverythingElse) {
  EXPECT_EQ(ascii("NACA 2412 \xc2\xb0\n"), "NACA 2412 ???");
  EXPECT_EQ(ascii("plain ~text!"), "plain ~text!");
}

TEST(WriterParts, ClosedCurveAndBoundingBox) {
  // NACA 2412 has a finite trailing-edge gap: its loop is open until the ends are joined.
  const CadDrawing loop = testing::drawing(false);
  ASSERT_EQ(loop.curves.size(), 1u);
  EXPECT_FALSE(closed_curve(loop.curves[0]));
  BSplineCurve joined = loop.curves[0];
  joined.control.row(joined.control_count() - 1) = joined.control.row(0);
  EXPECT_TRUE(closed_curve(joined));
  // The section is placed in the plane z = 300 with its chord of 250 from x = 1 (2 deg twist
  // moves the ends by at most 250 (1 - cos 2 deg) < 0.2 in x).
  const Box b = drawing_box(loop);
  EXPECT_DOUBLE_EQ(b.lo.z(), 300.0);
  EXPECT_DOUBLE_EQ(b.hi.z(), 300.0);
  EXPECT_NEAR(b.hi.x() - b.lo.x(), 250.0, 1.0);
  EXPECT_LT(b.lo.y(), b.hi.y());
}

TEST(WriterParts, PolylineSamplesAreItsVertices) {
  const CadDrawing d = testing::drawing(false, true);
  ASSERT_EQ(d.curves[0].degree, 1);
  EXPECT_EQ(curve_samples(d.curves[0], 7).rows(), d.curves[0].control_count());
}

}  // namespace
}  // namespace fulmar::cad::detail
