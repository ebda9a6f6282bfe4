#include "geometry/coordinates_io.h"

#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

#include "common/error.h"
#include "geometry/naca.h"

namespace fulmar {
namespace {

std::string rows_of(const Points& p, bool reverse = false) {
  std::string t;
  char b[80];
  for (Eigen::Index k = 0; k < p.rows(); ++k) {
    const Eigen::Index i = reverse ? p.rows() - 1 - k : k;
    std::snprintf(b, sizeof b, "%.17g %.17g\n", p(i, 0), p(i, 1));
    t += b;
  }
  return t;
}

std::string error_of(const std::string& text, bool csv = false) {
  try {
    parse_coordinates(text, "f.dat", csv);
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}

TEST(CoordinatesIo, BothPointOrdersGiveTheSameSection) {
  const Section s = naca_section("2412", 60);
  const CoordinateFile a = parse_coordinates("NACA 2412\n" + rows_of(s.points), "a.dat", false);
  const CoordinateFile b =
      parse_coordinates("NACA 2412\n" + rows_of(s.points, true), "b.dat", false);
  EXPECT_EQ(a.section.name, "NACA 2412");
  EXPECT_FALSE(a.normalisation.reversed);
  EXPECT_TRUE(b.normalisation.reversed);
  EXPECT_FALSE(a.normalisation.applied);  // already on the unit chord: kept as tabulated
  EXPECT_EQ(a.section.points, b.section.points);
  EXPECT_EQ(a.section.points, s.points);
}

TEST(CoordinatesIo, CommentsBlankLinesAndRepeatsAreTolerated) {
  const Section s = naca_section("0012", 30);
  std::string text = "# a comment\n\n  my section  \n";
  const std::string rows = rows_of(s.points);
  std::size_t pos = 0;
  int k = 0;
  while (pos < rows.size()) {
    const std::size_t e = rows.find('\n', pos);
    const std::string row = rows.substr(pos, e - pos);
    text += row + "   # point " + std::to_string(k) + "\n";
    if (k == 10) text += "\n" + row + "\n";  // a repeated point after a blank line
    pos = e + 1;
    ++k;
  }
  const CoordinateFile f = parse_coordinates(text, "c.dat", false);
  EXPECT_EQ(f.section.name, "my section");
  EXPECT_EQ(f.normalisation.repeats_dropped, 1);
  EXPECT_EQ(f.section.points, s.points);
}

TEST(CoordinatesIo, ScaledRotatedMovedInputIsNormalisedBack) {
  // A 250 mm chord, pitched 7 degrees nose-up about a point off the section, moved: the reader
  // undoes it. Symmetric NACA 0012: the point farthest from the trailing edge is the nose point
  // (0, 0), so the result equals the original to round-off.
  const Section s = naca_section("0012", 80);
  const double a = 7 * std::numbers::pi / 180, c = 250.0;
  Points moved = s.points;
  for (Eigen::Index i = 0; i < moved.rows(); ++i) {
    const double x = s.points(i, 0) * c, y = s.points(i, 1) * c;
    moved(i, 0) = std::cos(a) * x + std::sin(a) * y + 40.0;
    moved(i, 1) = -std::sin(a) * x + std::cos(a) * y - 12.5;
  }
  const CoordinateFile f = parse_coordinates(rows_of(moved), "m.dat", false);
  EXPECT_TRUE(f.normalisation.applied);
  EXPECT_NEAR(f.normalisation.chord, c, 1e-9);
  EXPECT_NEAR(f.normalisation.rotation_deg, 7.0, 1e-9);
  EXPECT_NEAR(f.normalisation.leading_edge.x(), 40.0, 1e-9);
  EXPECT_NEAR(f.normalisation.leading_edge.y(), -12.5, 1e-9);
  EXPECT_LT((f.section.points - s.points).cwiseAbs().maxCoeff(), 1e-12);
}

TEST(CoordinatesIo, CsvWithHeader) {
  const Section s = naca_section("0012", 30);
  std::string text = "# from a spreadsheet\nindex,X,Y\n";
  for (Eigen::Index i = 0; i < s.points.rows(); ++i) {
    char b[80];
    std::snprintf(b, sizeof b, "%d,%.17g,%.17g\n", static_cast<int>(i), s.points(i, 0),
                  s.points(i, 1));
    text += b;
  }
  const CoordinateFile f = parse_coordinates(text, "s.csv", true);
  EXPECT_EQ(f.section.points, s.points);
  // Also recognised by its header without the .csv name, and behind a UTF-8 byte-order mark.
  EXPECT_EQ(parse_coordinates(text, "s.txt", false).section.points, s.points);
  EXPECT_EQ(parse_coordinates("\xEF\xBB\xBF" + text, "s.csv", true).section.points, s.points);
  const std::string plain = coordinates_text(s);
  const CoordinateFile bom = parse_coordinates("\xEF\xBB\xBF" + plain, "s.dat", false);
  EXPECT_EQ(bom.section.name, s.name);
}

TEST(CoordinatesIo, WritersRoundTrip) {
  const Section s = naca_section("23012", 40);
  for (bool csv : {false, true}) {
    const std::string text = csv ? coordinates_csv(s) : coordinates_text(s);
    const CoordinateFile f = parse_coordinates(text, csv ? "w.csv" : "w.dat", csv);
    EXPECT_EQ(f.section.name, s.name);
    EXPECT_LT((f.section.points - s.points).cwiseAbs().maxCoeff(), 1e-10);  // 10 decimals
  }
}

// Each bad-file kind: the message has file:line and says what is wrong.
TEST(CoordinatesIo, NotANumber) {
  const std::string m = error_of("name\n1 0\n0.5 0.05\n0.0 abc\n0.5 -0.05\n1 0\n");
  EXPECT_NE(m.find("f.dat:4:"), std::string::npos) << m;
  EXPECT_NE(m.find("not a number"), std::string::npos) << m;
  EXPECT_NE(error_of("1 0\n0.5 0.05 7\n").find("f.dat:2: expected two numbers"), std::string::npos);
  EXPECT_NE(error_of("1 0\n0.5 nan\n").find("f.dat:2:"), std::string::npos);
  EXPECT_NE(error_of("x,y\n1,0\n0.5,zz\n", true).find("f.dat:3: y is not a number"),
            std::string::npos);
  EXPECT_NE(error_of("a,b\n1,0\n", true).find("f.dat:1: CSV header"), std::string::npos);
}

TEST(CoordinatesIo, TooFewPoints) {
  const std::string m = error_of("1 0\n0 0\n1 0.1\n\n");
  EXPECT_NE(m.find("f.dat:4: too few points"), std::string::npos) << m;
  EXPECT_NE(error_of("only a name\n").find("f.dat:1: too few points"), std::string::npos);
}

TEST(CoordinatesIo, NoTrailingEdge) {
  // One surface only: from the trailing edge to the nose.
  const Section s = naca_section("0012", 20);
  const std::string upper = rows_of(s.points.topRows(20));
  const std::string m = error_of("name\n" + upper);
  EXPECT_NE(m.find("f.dat:2: no trailing edge"), std::string::npos) << m;
  // A closed curve that starts in the middle of the upper surface.
  Points rolled(s.points.rows(), 2);
  const Eigen::Index n = s.points.rows();
  for (Eigen::Index i = 0; i < n; ++i) rolled.row(i) = s.points.row((i + 10) % n);
  const std::string m2 = error_of(rows_of(rolled));
  EXPECT_NE(m2.find("f.dat:1: no trailing edge"), std::string::npos) << m2;
}

TEST(CoordinatesIo, DoublesBack) {
  // A spike: the curve goes forward and comes straight back.
  const Section s = naca_section("0012", 20);
  Points p = s.points;
  std::string text = rows_of(p.topRows(8)) + "0.9 0.02\n" + rows_of(p.bottomRows(p.rows() - 8));
  const std::string m = error_of(text);
  // The turn is at the last good point (line 8), where the curve heads back to the spike.
  EXPECT_NE(m.find("f.dat:8: the curve doubles back"), std::string::npos) << m;
  EXPECT_NE(m.find("line 9"), std::string::npos) << m;
  // A gentle reversal in x on the upper surface (no sharp turn): the x-monotonicity check.
  p(6, 0) = p(4, 0) + 0.01;
  const std::string m2 = error_of(rows_of(p));
  EXPECT_NE(m2.find("doubles back"), std::string::npos) << m2;
  EXPECT_NE(m2.find("f.dat:"), std::string::npos) << m2;
}

TEST(CoordinatesIo, CrossesItself) {
  // Swap the surfaces over part of the chord: the curve crosses itself twice.
  const Section s = naca_section("0012", 40);
  Points p = s.points;
  for (Eigen::Index i = 0; i < p.rows(); ++i) {
    if (p(i, 0) > 0.5 && p(i, 0) < 0.7) p(i, 1) *= -1;
  }
  const std::string m = error_of("crossed\n" + rows_of(p));
  EXPECT_NE(m.find("crosses or touches itself"), std::string::npos) << m;
  EXPECT_NE(m.find("f.dat:"), std::string::npos) << m;
}

}  // namespace
}  // namespace fulmar
