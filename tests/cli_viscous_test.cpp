// End-to-end contract of the viscous command line: `fulmar analyze ... --re` and
// `fulmar polar ... --re`, their JSON keys and CSV files, physically sensible drag, target lift,
// several Reynolds numbers, exit code 2 naming the option for bad values, nothing written then.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <filesystem>
#include <nlohmann/json.hpp>
#include <sstream>
#include <string>
#include <vector>

#include "cli_run.h"

namespace fulmar::testing {
namespace {

nlohmann::json run_json(const std::vector<std::string>& args) {
  const CliResult r = run_fulmar(args);
  EXPECT_EQ(r.exit_code, 0) << r.err;
  return nlohmann::json::parse(r.out);
}

std::vector<std::string> split(const std::string& line) {
  std::vector<std::string> cells;
  std::stringstream ss(line);
  std::string c;
  while (std::getline(ss, c, ',')) cells.push_back(c);
  return cells;
}

const char* const kPointKeys[] = {"alpha",
                                  "cl",
                                  "cd",
                                  "cm",
                                  "cd_friction",
                                  "cd_pressure",
                                  "transition_upper",
                                  "transition_lower",
                                  "converged",
                                  "iterations",
                                  "status",
                                  "reason",
                                  "residual"};

TEST(CliViscous, AnalyzeJsonKeysAndDrag) {
  const nlohmann::json j =
      run_json({"analyze", "naca0012", "--alpha", "2", "--re", "3e6", "--json"});
  for (const char* key : kPointKeys) EXPECT_TRUE(j.contains(key)) << key;
  for (const char* key : {"re", "mach", "ncrit"}) EXPECT_TRUE(j.contains(key)) << key;
  ASSERT_TRUE(j["converged"].get<bool>()) << j["reason"];
  EXPECT_DOUBLE_EQ(j["re"].get<double>(), 3e6);
  const double cd = j["cd"].get<double>();
  // Bounds from flat-plate friction on both sides at Re 3e6: above all-laminar Blasius,
  // 2 * 1.328 / sqrt(Re) = 0.0015; below all-turbulent Prandtl-Schlichting,
  // 2 * 0.455 / (log10 Re)^2.58 = 0.0073, times a 12 % section's form factor
  // 1 + 2 t/c + 60 (t/c)^4 = 1.36 (Hoerner, Fluid-Dynamic Drag, 1965; from memory): 0.0100.
  EXPECT_GT(cd, 0.0015);
  EXPECT_LT(cd, 0.0100);
  // Abbott & von Doenhoff (1959), NACA 0012 smooth, Re 3e6: cd about 0.0058 near cl 0.2
  // (from memory); 20 % covers reading the chart and the transition model's spread.
  EXPECT_NEAR(cd, 0.0058, 0.2 * 0.0058);
  EXPECT_NEAR(j["cd_friction"].get<double>() + j["cd_pressure"].get<double>(), cd, 1e-12);
  // Positive incidence: upper-surface transition ahead of the lower one (suction peak on top).
  EXPECT_LT(j["transition_upper"].get<double>(), j["transition_lower"].get<double>());
}

TEST(CliViscous, TargetLiftIsReached) {
  const nlohmann::json j =
      run_json({"analyze", "naca2412", "--cl", "0.5", "--re", "3e6", "--json"});
  ASSERT_TRUE(j["converged"].get<bool>()) << j["reason"];
  EXPECT_NEAR(j["cl"].get<double>(), 0.5, 1e-4);  // the solver's target tolerance is 1e-5
  EXPECT_DOUBLE_EQ(j["cl_target"].get<double>(), 0.5);
}

// fulmar's polar table: the conditions in words, the columns grouped as angle | forces | drag
// split | transition | status, and the summary under it, with the same numbers as the JSON.
TEST(CliViscous, PolarTextGroupsTheColumnsAndSummarises) {
  const std::vector<std::string> args = {"polar",   "naca0012", "--re",     "3e6",
                                         "--alpha", "0:4:2",    "--panels", "120"};
  const CliResult r = run_fulmar(args);
  ASSERT_EQ(r.exit_code, 0) << r.err;
  for (const char* words :
       {"viscous polar", "Reynolds number 3e+06, Mach 0.000", "critical N 9; no trips", "| forces",
        "| drag split", "| transition x/c", "cm c/4", "friction pressure", "highest lift",
        "least drag", "converged      3 of 3 angles"})
    EXPECT_NE(r.out.find(words), std::string::npos) << words << "\n" << r.out;
  std::vector<std::string> with_json = args;
  with_json.push_back("--json");
  const nlohmann::json j = run_json(with_json);
  for (const nlohmann::json& p : j["points"]) {
    char row[64];
    std::snprintf(row, sizeof row, "%.2f |", p["alpha"].get<double>());
    char cd[32];
    std::snprintf(cd, sizeof cd, " %.5f ", p["cd"].get<double>());
    const auto at = r.out.find(row);
    ASSERT_NE(at, std::string::npos) << row << "\n" << r.out;
    const std::string line = r.out.substr(at, r.out.find('\n', at) - at);
    EXPECT_NE(line.find(cd), std::string::npos) << cd << " in " << line;
  }
}

// A critical N below the viscous analysis' rule (ViscousOptions: [0.5, 20]) is refused before
// any work, with the option, the rule and the value.
TEST(CliViscous, NcritBelowTheRuleIsRefusedWithTheRule) {
  const CliResult r =
      run_fulmar({"analyze", "naca0012", "--alpha", "2", "--re", "3e6", "--ncrit", "0.3"});
  EXPECT_EQ(r.exit_code, 2);
  EXPECT_NE(r.err.find("--ncrit: must be in [0.5, 20] (got 0.3)"), std::string::npos) << r.err;
  EXPECT_TRUE(r.out.empty()) << r.out;
}

TEST(CliViscous, TextOutputWithoutJson) {
  const CliResult r = run_fulmar({"analyze", "naca0012", "--alpha", "0", "--re", "6e6"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_NE(r.out.find("cd"), std::string::npos);
  EXPECT_NE(r.out.find("converged"), std::string::npos);
}

// At 55 deg the flow about a 12 % section is separated over most of the upper surface, far
// beyond stall (about 16 deg; Abbott & von Doenhoff 1959, from memory), where an attached
// integral boundary layer has no solution: the analysis must say so as a result (exit 0,
// converged false, a warning on stderr) with finite numbers, not fail or print NaN.
TEST(CliViscous, NonConvergenceIsAResultNotAnError) {
  const CliResult r = run_fulmar({"analyze", "naca0012", "--alpha", "55", "--re", "1e6", "--json"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_NE(r.err.find("warning"), std::string::npos) << r.err;
  const nlohmann::json j = nlohmann::json::parse(r.out);
  EXPECT_FALSE(j["converged"].get<bool>());
  EXPECT_NE(j["status"].get<std::string>(), "converged");
  EXPECT_FALSE(j["reason"].get<std::string>().empty());
  for (const char* key : {"cl", "cd", "cm", "cd_friction", "cd_pressure"}) {
    ASSERT_TRUE(j[key].is_number()) << key << " " << j[key];
    EXPECT_TRUE(std::isfinite(j[key].get<double>())) << key;
  }
}

TEST(CliViscous, SurfaceCsvHasBoundaryLayerColumns) {
  const auto dir = fresh_directory("viscous_surface");
  const auto file = dir / "surface.csv";
  const CliResult r = run_fulmar(
      {"analyze", "naca0012", "--alpha", "2", "--re", "3e6", "--surface", file.string()});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  std::istringstream in(read_file(file));
  std::string header, line;
  std::getline(in, header);
  const std::vector<std::string> cols = split(header);
  const std::vector<std::string> want = {
      "x", "y", "cp", "ue", "theta", "dstar", "shape_factor", "cf", "regime", "n_or_sqrt_ctau"};
  for (const std::string& c : want) {
    EXPECT_NE(std::find(cols.begin(), cols.end(), c), cols.end()) << header;
  }
  const auto col = [&](const std::string& name) {
    return static_cast<std::size_t>(std::find(cols.begin(), cols.end(), name) - cols.begin());
  };
  int rows = 0, laminar = 0;
  while (std::getline(in, line)) {
    if (line.empty()) continue;
    ++rows;
    const std::vector<std::string> cells = split(line);
    ASSERT_EQ(cells.size(), cols.size()) << line;
    for (const char* c :
         {"x", "y", "s", "cp", "ue", "theta", "dstar", "shape_factor", "cf", "n_or_sqrt_ctau"}) {
      const double v = std::stod(cells[col(c)]);
      EXPECT_TRUE(std::isfinite(v)) << c << " in " << line;
    }
    // Integral-boundary-layer definitions: theta > 0 and H = dstar / theta > 1 everywhere.
    EXPECT_GT(std::stod(cells[col("theta")]), 0.0) << line;
    EXPECT_GT(std::stod(cells[col("shape_factor")]), 1.0) << line;
    laminar += cells[col("regime")] == "laminar";
  }
  EXPECT_EQ(rows, 161);   // 160 panels
  EXPECT_GT(laminar, 0);  // free transition at Re 3e6 leaves laminar flow near the nose
}

TEST(CliViscous, PolarOneReynoldsNumberAtTopLevel) {
  const auto dir = fresh_directory("viscous_polar");
  const auto file = dir / "polar.csv";
  const nlohmann::json j = run_json(
      {"polar", "naca0012", "--re", "6e6", "--alpha", "-1:1:1", "-o", file.string(), "--json"});
  ASSERT_TRUE(j.contains("points"));
  ASSERT_TRUE(j.contains("summary"));
  ASSERT_EQ(j["polars"].size(), 1u);
  ASSERT_EQ(j["points"].size(), 3u);
  for (const auto& p : j["points"]) {
    for (const char* key : kPointKeys) EXPECT_TRUE(p.contains(key)) << key;
    EXPECT_TRUE(p["converged"].get<bool>()) << p["reason"];
  }
  for (const char* key :
       {"cl_max", "alpha_cl_max", "has_cl_max", "alpha_zero_lift", "lift_slope_per_deg", "cd_min",
        "cl_at_cd_min", "cm_zero_lift", "x_ac", "bucket", "note"}) {
    EXPECT_TRUE(j["summary"].contains(key)) << key;
  }
  // Exact by symmetry: a symmetric section's cl is odd and its cd even in alpha (the panelling
  // is symmetric; 1e-6 allows for the convergence tolerance).
  EXPECT_NEAR(j["points"][0]["cl"].get<double>(), -j["points"][2]["cl"].get<double>(), 1e-6);
  EXPECT_NEAR(j["points"][0]["cd"].get<double>(), j["points"][2]["cd"].get<double>(), 1e-7);
  EXPECT_NEAR(j["summary"]["alpha_zero_lift"].get<double>(), 0.0, 1e-3);
  EXPECT_FALSE(j["summary"]["has_cl_max"].get<bool>());  // cl still rises at 1 deg
  const std::string csv = read_file(file);
  EXPECT_EQ(csv.rfind("re,", 0), 0u) << csv;
  int lines = 0;
  for (char c : csv) lines += c == '\n';
  EXPECT_EQ(lines, 4);
}

TEST(CliViscous, PolarTwoReynoldsNumbers) {
  const nlohmann::json j =
      run_json({"polar", "naca0012", "--re", "3e6", "--re", "6e6", "--alpha", "0:2:2", "--json"});
  ASSERT_EQ(j["polars"].size(), 2u);
  EXPECT_DOUBLE_EQ(j["polars"][0]["re"].get<double>(), 3e6);
  EXPECT_DOUBLE_EQ(j["polars"][1]["re"].get<double>(), 6e6);
  EXPECT_FALSE(j.contains("points"));
  for (const auto& p : j["polars"]) {
    ASSERT_EQ(p["points"].size(), 2u);
    EXPECT_TRUE(p.contains("summary"));
    for (const auto& q : p["points"]) EXPECT_TRUE(q["converged"].get<bool>()) << q["reason"];
  }
  // Skin friction falls with Reynolds number (flat-plate laws, e.g. Prandtl-Schlichting): the
  // zero-lift drag at Re 6e6 is below that at 3e6.
  EXPECT_LT(j["polars"][1]["points"][0]["cd"].get<double>(),
            j["polars"][0]["points"][0]["cd"].get<double>());
}

// Exact: each Reynolds number has its own solver and thread, so a polar computed beside another
// equals the same polar computed alone, digit for digit.
TEST(CliViscous, ParallelPolarsEqualSingleRuns) {
  const nlohmann::json both = run_json({"polar", "naca2412", "--re", "3e6", "--re", "6e6",
                                        "--alpha", "0:2:1", "--panels", "120", "--json"});
  const nlohmann::json alone = run_json(
      {"polar", "naca2412", "--re", "6e6", "--alpha", "0:2:1", "--panels", "120", "--json"});
  ASSERT_EQ(both["polars"].size(), 2u);
  EXPECT_EQ(both["polars"][1]["points"], alone["points"]);
  EXPECT_EQ(both["polars"][1]["summary"], alone["summary"]);
}

TEST(CliViscous, BadValuesExitTwoNamingTheOptionAndWriteNothing) {
  const auto dir = fresh_directory("viscous_bad");
  const auto file = dir / "out.csv";
  const std::string out = file.string();
  struct Case {
    std::vector<std::string> args;
    std::string names;
  };
  const std::vector<Case> bad = {
      {{"polar", "naca0012", "--re", "-3e6", "--alpha", "0:4:1", "-o", out}, "--re"},
      {{"polar", "naca0012", "--re", "3e6", "--alpha", "0:4:0", "-o", out}, "--alpha"},
      {{"polar", "naca0012", "--re", "3e6", "--alpha", "4:0:-1", "-o", out}, "--alpha"},
      {{"polar", "naca0012", "--re", "3e6", "--alpha", "4:0:1", "-o", out}, "--alpha"},
      {{"polar", "naca0012", "--re", "3e6", "--alpha", "0:4:1", "--ncrit", "30", "-o", out},
       "--ncrit"},
      {{"polar", "naca0012", "--re", "3e6", "--alpha", "0:4:1", "--trip-upper", "1.5", "-o", out},
       "--trip-upper"},
      {{"polar", "naca0012", "--re", "3e6", "--alpha", "0:4:1", "--trip-lower", "-0.1", "-o", out},
       "--trip-lower"},
      {{"polar", "naca0012", "--alpha", "0:4:1", "-o", out}, "--re"},
      {{"analyze", "naca0012", "--alpha", "2", "--re", "3e6", "--mach", "0.75", "--surface", out},
       "--mach"},
      {{"analyze", "naca0012", "--alpha", "2", "--re", "0", "--surface", out}, "--re"},
      {{"analyze", "naca0012", "--alpha", "2", "--re", "3e6", "--ncrit", "0.1", "--surface", out},
       "--ncrit"},
  };
  for (const Case& c : bad) {
    const CliResult r = run_fulmar(c.args);
    EXPECT_EQ(r.exit_code, 2) << c.names << ": " << r.err;
    EXPECT_NE(r.err.find(c.names), std::string::npos) << r.err;
    EXPECT_FALSE(std::filesystem::exists(file)) << c.names;
  }
}

}  // namespace
}  // namespace fulmar::testing
