// Structure of the written files, checked record by record against the rules of each format's
// public specification (column layout of IGES 5.3, reference integrity of ISO 10303-21, DXF
// group-code pairs and handles). The geometry read back by independent readers is checked in
// tests/cad/reader_check_test.cpp.
#include "cad/writers.h"

#include <gtest/gtest.h>

#include <map>
#include <regex>
#include <set>
#include <sstream>

#include "cad/export.h"
#include "cad/naca_test_section.h"

namespace fulmar::cad {
namespace {

CadDrawing drawing(bool split, bool polyline = false, LengthUnit units = LengthUnit::mm) {
  ExportOptions o;
  o.placement.chord = 250;
  o.placement.units = units;
  o.placement.twist_deg = 2;
  o.placement.offset = Eigen::Vector3d(1, 2, 300);
  o.split = split;
  o.polyline = polyline;
  o.timestamp = "2026-12-01T18:00:00";
  ExportReport r;
  CadDrawing d = build_drawing(testing::naca4_section("2412", 80), o, r);
  d.file_name = "wing_root.igs";
  return d;
}

std::vector<std::string> lines_of(const std::string& text) {
  std::vector<std::string> out;
  std::istringstream s(text);
  for (std::string l; std::getline(s, l);) out.push_back(l);
  return out;
}

TEST(FormatReal, AlwaysHasADecimalPoint) {
  EXPECT_EQ(format_real(1.0), "1.");
  EXPECT_EQ(format_real(-0.25), "-0.25");
  EXPECT_EQ(format_real(0.0), "0.");
  EXPECT_EQ(format_real(-0.0), "0.");
  EXPECT_EQ(format_real(1e-5), "1.E-05");
  EXPECT_EQ(format_real(2.5e20), "2.5E+20");
  EXPECT_DOUBLE_EQ(std::stod(format_real(0.1234567890123456)), 0.123456789012346);
}

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
