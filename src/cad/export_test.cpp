// The export entry point: option checks, nothing written on bad requests, units and reports.
#include "cad/export.h"

#include <gtest/gtest.h>

#include <fstream>

#include "cad/naca_test_section.h"
#include "common/error.h"

namespace fulmar::cad {
namespace {

std::filesystem::path scratch(const std::string& tag) {
  const auto dir = std::filesystem::temp_directory_path() /
                   ("fulmar_cad_export_" + tag + "_" + std::to_string(::getpid()));
  std::filesystem::remove_all(dir);
  std::filesystem::create_directories(dir);
  return dir;
}

TEST(Export, FormatNamesRoundTrip) {
  for (CadFormat f :
       {CadFormat::dxf, CadFormat::iges, CadFormat::step, CadFormat::csv, CadFormat::svg}) {
    EXPECT_EQ(cad_format_from_string(to_string(f)), f);
  }
  try {
    cad_format_from_string("stl", "--format");
    FAIL();
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("--format = 'stl'"), std::string::npos) << e.what();
  }
}

TEST(Export, BadRequestsWriteNothing) {
  const auto dir = scratch("bad");
  const Section sec = testing::naca4_section("2412", 60);
  ExportOptions o;
  o.placement.chord = 0.0;
  EXPECT_THROW(export_section(sec, o, dir / "a.stp"), InputError);
  o.placement.chord = 100.0;
  o.tolerance = -1;
  EXPECT_THROW(export_section(sec, o, dir / "a.stp"), InputError);
  o.tolerance = 1e-5;
  EXPECT_THROW(export_section(sec, o, dir / "no_such_dir" / "a.stp"), InputError);
  EXPECT_TRUE(std::filesystem::is_empty(dir));
}

TEST(Export, WritesEveryFormatAndReportsTheDeviation) {
  const auto dir = scratch("all");
  const Section sec = testing::naca4_section("2412", 100);
  for (CadFormat f :
       {CadFormat::dxf, CadFormat::iges, CadFormat::step, CadFormat::csv, CadFormat::svg}) {
    ExportOptions o;
    o.format = f;
    o.placement.chord = 300;
    const auto path = dir / ("s." + to_string(f));
    const ExportReport r = export_section(sec, o, path);
    EXPECT_TRUE(std::filesystem::exists(path));
    EXPECT_TRUE(r.tolerance_met) << r.message;
    EXPECT_NEAR(r.max_deviation_length, r.max_deviation * 300, 1e-15);
    if (f == CadFormat::csv) {
      EXPECT_EQ(r.kind, "points");
    } else {
      EXPECT_EQ(r.kind, "bspline");
      EXPECT_LE(r.max_deviation, o.tolerance);
    }
    EXPECT_EQ(r.to_json().at("max_deviation").get<double>(), r.max_deviation);
  }
}

TEST(Export, UnitsScaleTheNumbersOnly) {
  // The same physical chord in m and in mm gives numbers a factor 1000 apart.
  const Section sec = testing::naca4_section("0012", 60);
  ExportOptions in_m, in_mm;
  in_m.placement.units = LengthUnit::m;
  in_m.placement.chord = 0.25;
  in_mm.placement.chord = 250;
  ExportReport r1, r2;
  const CadDrawing a = build_drawing(sec, in_m, r1);
  const CadDrawing b = build_drawing(sec, in_mm, r2);
  ASSERT_EQ(a.curves[0].control_count(), b.curves[0].control_count());
  EXPECT_LT((1000.0 * a.curves[0].control - b.curves[0].control).cwiseAbs().maxCoeff(), 1e-9);
  EXPECT_NEAR(r1.max_deviation, r2.max_deviation, 1e-15);
}

TEST(Export, PolylineReportsItsChordalDeviation) {
  const Section sec = testing::naca4_section("0012", 60);
  ExportOptions o;
  o.polyline = true;
  ExportReport r;
  const CadDrawing d = build_drawing(sec, o, r);
  EXPECT_EQ(r.kind, "polyline");
  EXPECT_EQ(d.curves[0].degree, 1);
  EXPECT_EQ(r.control_points, sec.points.rows());
  EXPECT_NEAR(r.max_deviation, polyline_deviation(sec), 1e-15);
  EXPECT_GT(r.max_deviation, 1e-5);  // 61 points per surface are far coarser than 1e-5 chord
}

}  // namespace
}  // namespace fulmar::cad
