// The CSV point list and the SVG sheet: header, one row per point, labels.
#include "cad/writers.h"

#include <gtest/gtest.h>

#include "cad/writer_test_drawing.h"

namespace fulmar::cad {
namespace {

using testing::drawing;
using testing::lines_of;

TEST(CsvAndSvg, Content) {
  const CadDrawing d = drawing(false);
  const std::vector<std::string> csv = lines_of(csv_text(d));
  EXPECT_EQ(csv[0], "x_mm,y_mm,z_mm");
  EXPECT_EQ(csv.size(), static_cast<size_t>(d.section_points.rows()) + 1);
  const std::string svg = svg_text(d);
  EXPECT_EQ(svg.rfind("<?xml", 0), 0u);
  EXPECT_NE(svg.find("chord 250 mm"), std::string::npos);
  EXPECT_NE(svg.find("</svg>"), std::string::npos);
}

}  // namespace
}  // namespace fulmar::cad
