#include "geometry/shape_source.h"

#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>

#include "common/error.h"
#include "geometry/naca.h"

namespace fulmar {
namespace {

namespace fs = std::filesystem;

fs::path scratch(const std::string& name, const std::string& content) {
  const fs::path dir =
      fs::temp_directory_path() / ("fulmar_shape_source_" + std::to_string(::getpid()));
  fs::create_directories(dir);
  const fs::path p = dir / name;
  std::ofstream(p) << content;
  return p;
}

TEST(ShapeSource, NacaDesignations) {
  for (const char* spec : {"naca2412", "NACA2412", "naca 2412"}) {
    const ShapeSource s = load_shape_source(spec);
    EXPECT_EQ(s.kind, ShapeSource::Kind::kNaca);
    EXPECT_EQ(s.section.points, naca_section("2412").points) << spec;
  }
  EXPECT_EQ(load_shape("naca23012").points.rows(), 2 * kShapePointsPerSurface - 1);
  EXPECT_FALSE(load_cst_shape("naca0012").has_value());
  EXPECT_THROW(load_shape("naca2x12"), InputError);
  EXPECT_THROW(load_shape("naca23112"), InputError);  // right form, not a Report 537 mean line
}

TEST(ShapeSource, CstJsonIsLoadedExactly) {
  CstShape c;
  c.upper = Eigen::VectorXd::Constant(5, 0.17);
  c.lower = Eigen::VectorXd::Constant(3, -0.12);
  c.te_upper = 0.001;
  const fs::path p = scratch("c.json", cst_to_json(c, "test wing").dump(2));
  const std::optional<CstShape> back = load_cst_shape(p.string());
  ASSERT_TRUE(back.has_value());
  EXPECT_EQ(back->upper, c.upper);
  EXPECT_EQ(back->lower, c.lower);
  EXPECT_EQ(back->te_upper, c.te_upper);
  const Section s = load_shape(p.string());
  EXPECT_EQ(s.name, "test wing");
  EXPECT_EQ(s.points, cst_section(c, kShapePointsPerSurface, "test wing").points);
}

TEST(ShapeSource, CoordinateFilesAndErrors) {
  const fs::path p =
      scratch("s.dat", "NACA 0012 copy\n" + coordinates_text(naca_section("0012")).substr(10));
  const ShapeSource s = load_shape_source(p.string());
  // A file whose name starts with "naca" is still a file.
  const fs::path named = scratch("naca0012.dat", coordinates_text(naca_section("0012")));
  EXPECT_EQ(load_shape_source(named.string()).kind, ShapeSource::Kind::kCoordinates);
  EXPECT_EQ(s.kind, ShapeSource::Kind::kCoordinates);
  ASSERT_TRUE(s.normalisation.has_value());
  EXPECT_EQ(s.section.name, "NACA 0012 copy");
  try {
    load_shape("/no/such/file.dat");
    FAIL();
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("/no/such/file.dat"), std::string::npos);
  }
  const fs::path bad = scratch("bad.json", "{\"kind\": 3");
  try {
    load_shape(bad.string());
    FAIL();
  } catch (const InputError& e) {
    // The place in the file, in fulmar's words (common/json_text.h), not the parser's text.
    EXPECT_EQ(std::string(e.what()).rfind(bad.string() + ":1:", 0), 0u) << e.what();
  }
  const fs::path wrong = scratch("wrong.json", "{\"kind\": \"other\"}");
  try {
    load_shape(wrong.string());
    FAIL();
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("wrong.json: /kind"), std::string::npos) << e.what();
  }
}

}  // namespace
}  // namespace fulmar
