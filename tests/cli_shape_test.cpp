// End-to-end behaviour of `fulmar shape ...`.
#include <gtest/gtest.h>

#include <filesystem>
#include <nlohmann/json.hpp>

#include "cli_run.h"
#include "geometry/coordinates_io.h"
#include "geometry/naca.h"

namespace fulmar::testing {
namespace {

namespace fs = std::filesystem;

fs::path data(const std::string& name) {
  return source_dir() / "tests/data/geometry" / name;
}

nlohmann::json json_of(const CliResult& r) {
  EXPECT_EQ(r.exit_code, 0) << r.err;
  return nlohmann::json::parse(r.out);
}

TEST(CliShape, HelpOnEveryCommandCarriesTheCaution) {
  for (const std::vector<std::string>& args : {std::vector<std::string>{"shape", "--help"},
                                               {"shape", "naca", "--help"},
                                               {"shape", "info", "--help"},
                                               {"shape", "fit", "--help"}}) {
    const CliResult r = run_fulmar(args);
    EXPECT_EQ(r.exit_code, 0) << args[1];
    EXPECT_NE(r.out.find("Confirm every result by test"), std::string::npos) << r.out;
  }
}

TEST(CliShape, NacaWritesTextAndCsv) {
  const fs::path dir = fresh_directory("shape_naca");
  for (const char* name : {"s.dat", "s.csv"}) {
    const CliResult r = run_fulmar({"shape", "naca", "2412", "--points", "60", "-o", name}, dir);
    ASSERT_EQ(r.exit_code, 0) << r.err;
    const CoordinateFile f = read_coordinates(dir / name);
    EXPECT_EQ(f.section.points.rows(), 119);
    // Written with 10 decimals.
    EXPECT_LT((f.section.points - naca_section("2412", 60).points).cwiseAbs().maxCoeff(), 1e-10);
  }
  EXPECT_EQ(read_file(dir / "s.csv").find("# NACA 2412\nx,y\n"), 0u);
  const CliResult closed =
      run_fulmar({"shape", "naca", "naca23012", "--closed-te", "-o", "c.dat"}, dir);
  ASSERT_EQ(closed.exit_code, 0) << closed.err;
  const Points c = read_coordinates(dir / "c.dat").section.points;
  EXPECT_EQ(c.row(0), c.row(c.rows() - 1));
}

TEST(CliShape, NacaBadInputIsExitTwoAndWritesNothing) {
  const fs::path dir = fresh_directory("shape_naca_bad");
  for (const std::vector<std::string>& args :
       {std::vector<std::string>{"shape", "naca", "23112", "-o", "x.dat"},
        {"shape", "naca", "2412", "--points", "3", "-o", "x.dat"},
        {"shape", "naca", "2412", "-o", "no/such/dir/x.dat"}}) {
    const CliResult r = run_fulmar(args, dir);
    EXPECT_EQ(r.exit_code, 2) << r.out;
    EXPECT_FALSE(r.err.empty());
  }
  EXPECT_TRUE(fs::is_empty(dir));
}

TEST(CliShape, InfoJsonKeysAndValues) {
  const nlohmann::json j =
      json_of(run_fulmar({"shape", "info", "naca0012", "--json", "--at", "0.3"}));
  for (const char* key : {"thickness", "thickness_x", "camber", "camber_x", "le_radius", "te_gap",
                          "te_angle_deg", "area", "thickness_at"}) {
    ASSERT_TRUE(j.contains(key)) << key;
    EXPECT_TRUE(j[key].is_number()) << key;
  }
  // Report 460 values for NACA 0012 (see src/geometry/metrics_test.cpp for their derivation).
  EXPECT_NEAR(j["thickness"].get<double>(), 0.120035, 2e-6);
  EXPECT_NEAR(j["thickness_at"].get<double>(), 0.120034, 2e-6);
  EXPECT_NEAR(j["le_radius"].get<double>(), 1.1019 * 0.0144, 2e-5);
  EXPECT_NEAR(j["te_gap"].get<double>(), 0.00252, 1e-9);
  EXPECT_NEAR(j["area"].get<double>(), 0.685075 * 0.12, 2e-6);
  // Without --json: a readable report with the caution.
  const CliResult text = run_fulmar({"shape", "info", "naca2412"});
  EXPECT_EQ(text.exit_code, 0);
  EXPECT_NE(text.out.find("maximum camber"), std::string::npos) << text.out;
  EXPECT_NE(text.out.find("Confirm every result by test"), std::string::npos);
  EXPECT_EQ(run_fulmar({"shape", "info", "naca0012", "--at", "1.5"}).exit_code, 2);
}

TEST(CliShape, CoordinateFileNormalisedAndEitherOrder) {
  // The test file holds NACA 0012 at 200 mm chord, pitched 3 degrees, lower surface first, with
  // a repeated point: the report says what was undone, and the measures equal those of the
  // unit-chord CSV of the same ordinates (both rounded to 1e-6 of their units).
  const nlohmann::json a =
      json_of(run_fulmar({"shape", "info", data("naca0012_clockwise_mm.dat").string(), "--json"}));
  const nlohmann::json b =
      json_of(run_fulmar({"shape", "info", data("naca0012_unit.csv").string(), "--json"}));
  EXPECT_TRUE(a["normalisation"]["applied"].get<bool>());
  EXPECT_TRUE(a["normalisation"]["reversed"].get<bool>());
  EXPECT_EQ(a["normalisation"]["repeats_dropped"].get<int>(), 1);
  EXPECT_NEAR(a["normalisation"]["chord"].get<double>(), 200.0, 1e-4);
  EXPECT_NEAR(a["normalisation"]["rotation_deg"].get<double>(), 3.0, 1e-5);
  EXPECT_FALSE(b["normalisation"]["applied"].get<bool>());
  // Symmetric: rounding-level camber is reported as none.
  EXPECT_EQ(a["camber"].get<double>(), 0.0);
  EXPECT_EQ(a["camber_x"].get<double>(), 0.0);
  for (const char* key : {"thickness", "le_radius", "te_gap", "area"}) {
    EXPECT_NEAR(a[key].get<double>(), b[key].get<double>(), 1e-5) << key;
  }
  EXPECT_NEAR(a["te_angle_deg"].get<double>(), b["te_angle_deg"].get<double>(), 0.05);
}

TEST(CliShape, FitWritesAShape) {
  const fs::path dir = fresh_directory("shape_fit");
  const nlohmann::json j = json_of(
      run_fulmar({"shape", "fit", "naca2412", "--order", "8", "-o", "f.json", "--json"}, dir));
  // Issue acceptance: order 8 within 2e-4 chord (measured 1.3e-4).
  EXPECT_LE(j["max_deviation"].get<double>(), 2e-4);
  const nlohmann::json info =
      json_of(run_fulmar({"shape", "info", (dir / "f.json").string(), "--json"}));
  EXPECT_EQ(info["source"], "cst");
  EXPECT_NEAR(info["thickness"].get<double>(), 0.12, 1e-3);
  // The CST nose is the curve's own nose, nose_offset[1] (1.7e-3) above the NACA mean line's,
  // so its chord line runs from there: camber at x = 0.4 drops by (1 - 0.4) times that offset
  // (Report 460 camber 0.02; 3e-4 for the shift of the maximum and the fit).
  const double nose_y = j["nose_offset"][1].get<double>();
  EXPECT_NEAR(info["camber"].get<double>(), 0.02 - 0.6 * nose_y, 3e-4);
  // Refitting the CST file at its own order reproduces it: deviation at round-off.
  const nlohmann::json again = json_of(
      run_fulmar({"shape", "fit", (dir / "f.json").string(), "-o", "g.json", "--json"}, dir));
  EXPECT_LT(again["max_deviation"].get<double>(), 1e-12);
}

class CliShapeBadFile : public ::testing::TestWithParam<std::pair<const char*, const char*>> {};

TEST_P(CliShapeBadFile, ExitTwoWithFileAndLineAndNothingWritten) {
  const auto [file, where] = GetParam();
  const fs::path dir = fresh_directory("shape_bad");
  const std::string path = data(file).string();
  const CliResult info = run_fulmar({"shape", "info", path});
  EXPECT_EQ(info.exit_code, 2);
  EXPECT_NE(info.err.find(path + ":" + where), std::string::npos) << info.err;
  const CliResult fit = run_fulmar({"shape", "fit", path, "-o", "out.json"}, dir);
  EXPECT_EQ(fit.exit_code, 2);
  EXPECT_NE(fit.err.find(path + ":" + where), std::string::npos) << fit.err;
  EXPECT_TRUE(fs::is_empty(dir));
}
INSTANTIATE_TEST_SUITE_P(
    Kinds, CliShapeBadFile,
    ::testing::Values(std::make_pair("bad_not_a_number.dat", "6: y is not a number"),
                      std::make_pair("bad_too_few.dat", "4: too few points"),
                      std::make_pair("bad_doubles_back.dat", "5: the curve doubles back"),
                      std::make_pair("bad_crosses.dat", ""),
                      std::make_pair("bad_no_trailing_edge.dat", "2: no trailing edge")));

TEST(CliShape, CrossingFileNamesItsLines) {
  const CliResult r = run_fulmar({"shape", "info", data("bad_crosses.dat").string()});
  EXPECT_EQ(r.exit_code, 2);
  EXPECT_NE(r.err.find("crosses or touches itself"), std::string::npos) << r.err;
  EXPECT_NE(r.err.find("bad_crosses.dat:"), std::string::npos) << r.err;
}

TEST(CliShape, MissingShapeIsExitTwo) {
  const CliResult r = run_fulmar({"shape", "info", "no-such-file.dat"});
  EXPECT_EQ(r.exit_code, 2);
  EXPECT_NE(r.err.find("no-such-file.dat"), std::string::npos);
}

}  // namespace
}  // namespace fulmar::testing
