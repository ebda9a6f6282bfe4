// Structure of the written files, checked record by record against the rules of each format's
// public specification (DXF group-code pairs and handles). The geometry read back by independent
// readers is checked in tests/cad/reader_check_test.cpp.
#include "cad/writers.h"

#include <gtest/gtest.h>

#include <map>
#include <set>

#include "cad/writer_test_drawing.h"

namespace fulmar::cad {
namespace {

using testing::drawing;
using testing::lines_of;

TEST(Dxf, PairsHandlesAndSplineCounts) {
  const CadDrawing d = drawing(true);
  const std::vector<std::string> lines = lines_of(dxf_text(d));
  ASSERT_EQ(lines.size() % 2, 0u);
  std::set<int> handles;
  int seed = -1;
  int splines = 0;
  for (size_t i = 0; i + 1 < lines.size(); i += 2) {
    const int code = std::stoi(lines[i]);
    const std::string& value = lines[i + 1];
    if (code == 5 || code == 105) {
      if (i >= 2 && lines[i - 1] == "$HANDSEED") {
        seed = std::stoi(value, nullptr, 16);
      } else {
        EXPECT_TRUE(handles.insert(std::stoi(value, nullptr, 16)).second) << value;
      }
    }
    if (code == 0 && value == "SPLINE") ++splines;
  }
  EXPECT_EQ(splines, 2);
  EXPECT_GT(seed, *handles.rbegin());
  EXPECT_EQ(lines[lines.size() - 1], "EOF");
}

TEST(Dxf, PolylineUsesLwpolylineAtTheElevation) {
  const std::string text = dxf_text(drawing(false, true));
  EXPECT_NE(text.find("LWPOLYLINE"), std::string::npos);
  EXPECT_EQ(text.find("SPLINE"), std::string::npos);
  EXPECT_NE(text.find(" 38\n300.\n"), std::string::npos);
}

}  // namespace
}  // namespace fulmar::cad
