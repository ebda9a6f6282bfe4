// Structure of the written files, checked record by record against the rules of each format's
// public specification (column layout of IGES 5.3). The geometry read back by independent readers
// is checked in tests/cad/reader_check_test.cpp.
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

class IgesLayout : public ::testing::TestWithParam<bool> {};

TEST_P(IgesLayout, RecordsAreColumnExact) {
  const CadDrawing d = drawing(GetParam());
  const std::vector<std::string> lines = lines_of(iges_text(d));
  std::map<char, int> count;
  const std::string order = "SGDPT";
  size_t stage = 0;
  for (const std::string& l : lines) {
    ASSERT_EQ(l.size(), 80u) << "'" << l << "'";
    const char sec = l[72];
    while (stage < order.size() && order[stage] != sec) ++stage;
    ASSERT_LT(stage, order.size()) << "section letters out of order at: " << l;
    const int seq = std::stoi(l.substr(73));
    EXPECT_EQ(seq, ++count[sec]) << l;  // 1, 2, 3, ... within each section
    if (sec == 'P') {
      // Columns 65-72: pointer to the directory entry (odd sequence number).
      EXPECT_EQ(std::stoi(l.substr(64, 8)) % 2, 1) << l;
    }
  }
  // Terminate record: the line counts of each section.
  const std::string& t = lines.back();
  EXPECT_EQ(t.substr(0, 32), [&] {
    char buf[64];
    std::snprintf(buf, sizeof buf, "S%7dG%7dD%7dP%7d", count['S'], count['G'], count['D'],
                  count['P']);
    return std::string(buf);
  }());
  EXPECT_EQ(count['D'], 2 * static_cast<int>(d.curves.size()));
  // Directory: entity 126, parameter pointer and line count consistent with the P section.
  int expected_p = 1;
  for (size_t e = 0; e < d.curves.size(); ++e) {
    const std::string& d1 = lines[count['S'] + count['G'] + 2 * e];
    const std::string& d2 = lines[count['S'] + count['G'] + 2 * e + 1];
    EXPECT_EQ(std::stoi(d1.substr(0, 8)), 126);
    EXPECT_EQ(std::stoi(d1.substr(8, 8)), expected_p);
    EXPECT_EQ(d1.substr(64, 8), "00000000");
    EXPECT_EQ(std::stoi(d2.substr(0, 8)), 126);
    expected_p += std::stoi(d2.substr(24, 8));
  }
  EXPECT_EQ(expected_p - 1, count['P']);
}

INSTANTIATE_TEST_SUITE_P(OneAndTwoCurves, IgesLayout, ::testing::Values(false, true));

TEST(Iges, ParameterDataRoundTripsTheCurve) {
  const CadDrawing d = drawing(false);
  std::string data;
  for (const std::string& l : lines_of(iges_text(d))) {
    if (l[72] == 'P') data += l.substr(0, 64);
  }
  std::vector<double> v;
  std::string token;
  for (char c : data) {
    if (c == ',' || c == ';') {
      v.push_back(std::stod(token));
      token.clear();
    } else if (c != ' ') {
      token += c;
    }
  }
  const BSplineCurve& c = d.curves[0];
  const int n = c.control_count();
  ASSERT_EQ(v.size(), 7u + c.knots.size() + n + 3u * n + 2u + 3u);
  EXPECT_EQ(v[0], 126);
  EXPECT_EQ(v[1], n - 1);
  EXPECT_EQ(v[2], c.degree);
  for (Eigen::Index k = 0; k < c.knots.size(); ++k) EXPECT_NEAR(v[7 + k], c.knots(k), 1e-15);
  const size_t xyz = 7 + c.knots.size() + n;
  for (int k = 0; k < n; ++k) {
    for (int j = 0; j < 3; ++j) {
      EXPECT_NEAR(v[xyz + 3 * k + j], c.control(k, j), 1e-12 * (1 + std::abs(c.control(k, j))));
    }
  }
}

TEST(Iges, GlobalSectionCarriesTheUnits) {
  for (auto [unit, flag, name] :
       {std::tuple{LengthUnit::mm, "2", "2HMM"}, std::tuple{LengthUnit::m, "6", "1HM"},
        std::tuple{LengthUnit::in, "1", "4HINCH"}}) {
    std::string global;
    for (const std::string& l : lines_of(iges_text(drawing(false, false, unit)))) {
      if (l[72] == 'G') {
        std::string data = l.substr(0, 72);
        data.erase(data.find_last_not_of(' ') + 1);  // the padding of each record
        global += data;
      }
    }
    EXPECT_NE(global.find(std::string(",1.,") + flag + "," + name + ","), std::string::npos)
        << global;
    EXPECT_NE(global.find(",15H20261201.180000,"), std::string::npos) << global;
    EXPECT_EQ(global.rfind("1H,,1H;,", 0), 0u);
  }
}

}  // namespace
}  // namespace fulmar::cad
