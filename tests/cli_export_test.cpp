// `fulmar export`: the command-line contract (issue 7). The geometry of every exported file is
// checked by independent readers in tests/cad/reader_check_test.cpp; here the command itself:
// what it prints, what it writes, and that bad requests get exit 2, a clear message and no file.
#include <gtest/gtest.h>

#include <filesystem>
#include <nlohmann/json.hpp>

#include "cli_run.h"

namespace fulmar::testing {
namespace {

namespace fs = std::filesystem;

TEST(CliExport, HelpStatesTheAxesTwistSignAndCaution) {
  const CliResult r = run_fulmar({"export", "--help"});
  EXPECT_EQ(r.exit_code, 0);
  EXPECT_NE(r.out.find("x-y plane at z = offset z"), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("nose"), std::string::npos);
  EXPECT_NE(r.out.find("Confirm every result by test"), std::string::npos);
}

class CliExportFormat : public ::testing::TestWithParam<const char*> {};

TEST_P(CliExportFormat, WritesTheFileAndPrintsTheDeviation) {
  const fs::path dir = fresh_directory(std::string("export_") + GetParam());
  const fs::path out = dir / (std::string("root.") + GetParam());
  const CliResult r = run_fulmar({"export", "naca2412", "--format", GetParam(), "--chord", "250",
                                  "--twist", "2", "--offset", "0", "0", "100", "-o", out.string()});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_NE(r.out.find("largest deviation"), std::string::npos) << r.out;
  const std::string text = read_file(out);
  ASSERT_FALSE(text.empty());
  const std::string f = GetParam();
  if (f == "step") {
    EXPECT_EQ(text.rfind("ISO-10303-21;", 0), 0u);
  }
  if (f == "iges") {
    EXPECT_EQ(text.find('\n'), 80u);  // 80-column records
  }
  if (f == "dxf") {
    EXPECT_NE(text.find("AC1015"), std::string::npos);
  }
  if (f == "csv") {
    EXPECT_EQ(text.rfind("x_mm,y_mm,z_mm\n", 0), 0u);
  }
  if (f == "svg") {
    EXPECT_NE(text.find("chord 250 mm"), std::string::npos);
  }
}

INSTANTIATE_TEST_SUITE_P(Formats, CliExportFormat,
                         ::testing::Values("dxf", "iges", "step", "csv", "svg"));

TEST(CliExport, JsonReportHoldsTheDeviationWithinTheTolerance) {
  const fs::path dir = fresh_directory("export_json");
  const CliResult r =
      run_fulmar({"export", "naca0012", "--format", "iges", "--chord", "0.3", "--units", "m",
                  "--split", "--close-te", "--json", "-o", (dir / "s.igs").string()});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const nlohmann::json j = nlohmann::json::parse(r.out);
  EXPECT_TRUE(j.at("tolerance_met").get<bool>());
  EXPECT_LE(j.at("max_deviation").get<double>(), 1e-5);
  EXPECT_GT(j.at("max_deviation").get<double>(), 0.0);
  EXPECT_EQ(j.at("curves").get<int>(), 2);
  EXPECT_EQ(j.at("units").get<std::string>(), "m");
  // Exact: the deviation in length units is the chord (0.3 m) times the chord fraction.
  EXPECT_NEAR(j.at("max_deviation_length").get<double>(), 0.3 * j.at("max_deviation").get<double>(),
              1e-15);
}

TEST(CliExport, TighterToleranceGivesASmallerDeviation) {
  const fs::path dir = fresh_directory("export_tol");
  double last = 1.0;
  for (const char* tol : {"1e-4", "1e-5", "1e-6"}) {
    const CliResult r = run_fulmar({"export", "naca4415", "--format", "step", "--chord", "100",
                                    "--tolerance", tol, "--json", "-o", (dir / "s.stp").string()});
    ASSERT_EQ(r.exit_code, 0) << r.err;
    const double d = nlohmann::json::parse(r.out).at("max_deviation").get<double>();
    EXPECT_LE(d, std::stod(tol));
    EXPECT_LT(d, last);
    last = d;
  }
}

struct BadRequest {
  const char* label;
  std::vector<std::string> args;  // without -o
  const char* message;            // part of the expected message on stderr
};

void PrintTo(const BadRequest& b, std::ostream* os) {
  *os << b.label;
}

class CliExportBad : public ::testing::TestWithParam<BadRequest> {};

TEST_P(CliExportBad, ExitTwoWithAMessageAndNothingWritten) {
  const fs::path dir = fresh_directory(std::string("export_bad_") + GetParam().label);
  std::vector<std::string> args = {"export"};
  args.insert(args.end(), GetParam().args.begin(), GetParam().args.end());
  args.push_back("-o");
  args.push_back((dir / "out.file").string());
  const CliResult r = run_fulmar(args);
  EXPECT_EQ(r.exit_code, 2) << r.out << r.err;
  EXPECT_NE(r.err.find(GetParam().message), std::string::npos) << r.err;
  EXPECT_TRUE(fs::is_empty(dir)) << "something was written";
}

INSTANTIATE_TEST_SUITE_P(
    Requests, CliExportBad,
    ::testing::Values(
        BadRequest{"format", {"naca2412", "--format", "stl", "--chord", "100"}, "--format"},
        BadRequest{"zero_chord", {"naca2412", "--format", "step", "--chord", "0"}, "--chord"},
        BadRequest{"negative_chord", {"naca2412", "--format", "step", "--chord", "-5"}, "--chord"},
        BadRequest{
            "units", {"naca2412", "--format", "dxf", "--chord", "1", "--units", "ft"}, "--units"},
        BadRequest{"shape", {"naca99x9", "--format", "dxf", "--chord", "1"}, "naca99x9"},
        BadRequest{"missing_file",
                   {"no_such_section.dat", "--format", "dxf", "--chord", "1"},
                   "no_such_section.dat"},
        BadRequest{
            "degree", {"naca2412", "--format", "iges", "--chord", "1", "--degree", "2"}, "degree"},
        BadRequest{
            "twist", {"naca2412", "--format", "iges", "--chord", "1", "--twist", "100"}, "twist"}),
    [](const ::testing::TestParamInfo<BadRequest>& info) { return std::string(info.param.label); });

TEST(CliExport, UnwritablePathIsExitTwo) {
  const fs::path dir = fresh_directory("export_unwritable");
  const fs::path out = dir / "missing_dir" / "s.stp";
  const CliResult r =
      run_fulmar({"export", "naca2412", "--format", "step", "--chord", "100", "-o", out.string()});
  EXPECT_EQ(r.exit_code, 2);
  EXPECT_NE(r.err.find("missing_dir"), std::string::npos) << r.err;
  EXPECT_FALSE(fs::exists(out));
}

}  // namespace
}  // namespace fulmar::testing
