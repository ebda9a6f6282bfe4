// Structure of the written files, checked record by record against the rules of each format's
// public specification (reference integrity of ISO 10303-21). The geometry read back by independent
// readers is checked in tests/cad/reader_check_test.cpp.
#include "cad/writers.h"

#include <gtest/gtest.h>

#include <map>
#include <regex>
#include <set>

#include "cad/writer_test_drawing.h"

namespace fulmar::cad {
namespace {

using testing::drawing;
using testing::lines_of;

TEST(Step, EveryReferenceIsDefinedOnce) {
  const std::string text = step_text(drawing(true));
  EXPECT_EQ(text.rfind("ISO-10303-21;\nHEADER;\n", 0), 0u);
  EXPECT_NE(text.find("FILE_SCHEMA(('AUTOMOTIVE_DESIGN"), std::string::npos);
  EXPECT_NE(text.find("END-ISO-10303-21;\n"), std::string::npos);
  std::set<int> defined;
  const std::regex def(R"(^#(\d+)=)", std::regex::multiline);
  for (auto it = std::sregex_iterator(text.begin(), text.end(), def); it != std::sregex_iterator();
       ++it) {
    EXPECT_TRUE(defined.insert(std::stoi((*it)[1])).second) << "defined twice: " << (*it)[0];
  }
  const std::regex use(R"([(,]#(\d+))");
  for (auto it = std::sregex_iterator(text.begin(), text.end(), use); it != std::sregex_iterator();
       ++it) {
    EXPECT_TRUE(defined.count(std::stoi((*it)[1]))) << "undefined reference #" << (*it)[1];
  }
  size_t curves = 0;
  for (size_t p = text.find("B_SPLINE_CURVE_WITH_KNOTS"); p != std::string::npos;
       p = text.find("B_SPLINE_CURVE_WITH_KNOTS", p + 1)) {
    ++curves;
  }
  EXPECT_EQ(curves, 2u);
}

}  // namespace
}  // namespace fulmar::cad
