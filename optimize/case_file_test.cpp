// Reading and validating case files. The full table of bad cases (one per rule, through the command
// line: exit code 2, nothing written) is in tests/cli_optimize_test.cpp; here: what a good case
// resolves to, and the message format.
#include "optimize/case_file.h"

#include <gtest/gtest.h>

#include <cmath>

#include "common/error.h"

namespace fulmar::optimize {
namespace {

using nlohmann::json;

// A fictional two-seat trainer at sea level: 600 kg, 11 m^2, 1.4 m chord, cruise 50 m/s.
json good_case() {
  return json::parse(R"({
    "schema_version": 1,
    "name": "trainer",
    "description": "test case",
    "airplane": {"mass": 600, "wing_area": 11.0, "chord": 1.4},
    "design_points": [
      {"name": "cruise", "speed": 50, "altitude": 0, "weight": 2},
      {"name": "climb", "cl": 0.8, "reynolds": 3e6, "mach": 0.08}
    ],
    "landing": {"stall_speed": 26, "altitude": 0},
    "constraints": {"cm": {"min": -0.1}, "thickness": {"min": 0.12},
                    "spar": [{"x": 0.3, "min": 0.1}]},
    "baseline": {"naca": "naca2412"}
  })");
}

Case parse(const json& j) {
  return parse_case(j.dump(), "case.json", ".");
}

std::string error_of(const json& j) {
  try {
    parse(j);
  } catch (const InputError& e) {
    return e.what();
  }
  return "no error";
}

TEST(CaseFile, FlightPointGoesThroughTheLiftEquation) {
  const Case c = parse(good_case());
  ASSERT_EQ(c.points.size(), 2u);
  // Sea-level ISA density 1.225 kg/m^3 (ISO 2533:1975 table), standard gravity 9.80665: the lift
  // equation by hand gives cl = 2 m g / (rho V^2 S) = 0.17465. The 1e-4 tolerance covers the
  // rounding of the tabulated density (1.2250 vs 1.22500 computed).
  EXPECT_NEAR(c.points[0].cl, 2 * 600 * 9.80665 / (1.225 * 50 * 50 * 11.0), 1e-4);
  // Re = rho V c / mu with mu = 1.7894e-5 Pa s at 288.15 K (ISO 2533): 4.79e6 to 0.1 %.
  EXPECT_NEAR(c.points[0].reynolds / (1.225 * 50 * 1.4 / 1.7894e-5), 1.0, 1e-3);
  EXPECT_TRUE(c.points[0].from_airplane);
  EXPECT_DOUBLE_EQ(c.points[0].weight, 2.0);
  EXPECT_DOUBLE_EQ(c.points[1].cl, 0.8);
  EXPECT_DOUBLE_EQ(c.points[1].cm_min, -0.1);  // the global cm limit applies to every point
  EXPECT_EQ(c.baseline.naca, "2412");
}

TEST(CaseFile, StallSpeedGivesTheRequiredClMax) {
  const Case c = parse(good_case());
  // cl_max = 2 m g / (rho V_s^2 S) / 0.9 (default wing-to-section factor) = 1.4351.
  const double wing = 2 * 600 * 9.80665 / (1.225 * 26 * 26 * 11.0);
  EXPECT_NEAR(c.constraints.cl_max_min, wing / 0.9, 2e-4);
  EXPECT_NEAR(c.landing.reynolds / (1.225 * 26 * 1.4 / 1.7894e-5), 1.0, 1e-3);
}

TEST(CaseFile, DefaultsAreThoseDocumented) {
  const Case c = parse(good_case());
  EXPECT_EQ(c.optimizer.algorithm, Algorithm::slsqp);
  EXPECT_EQ(c.parameterization.order_upper, 5);
  EXPECT_EQ(c.analysis.panels, 160);
  ASSERT_EQ(c.scenarios.size(), 1u);
  EXPECT_DOUBLE_EQ(c.scenarios[0].ncrit, 9.0);
  EXPECT_DOUBLE_EQ(c.scenarios[0].trip_upper, 1.0);
}

TEST(CaseFile, ScenariosInheritTheNominalTransition) {
  json j = good_case();
  j["transition"] = json::parse(R"({"ncrit": 7, "scenarios": [
      {"name": "clean", "weight": 3}, {"name": "tripped", "trip_upper": 0.05, "trip_lower": 0.1}]})");
  const Case c = parse(j);
  ASSERT_EQ(c.scenarios.size(), 2u);
  EXPECT_DOUBLE_EQ(c.scenarios[0].ncrit, 7.0);
  EXPECT_DOUBLE_EQ(c.scenarios[0].weight, 3.0);
  EXPECT_DOUBLE_EQ(c.scenarios[1].ncrit, 7.0);
  EXPECT_DOUBLE_EQ(c.scenarios[1].trip_upper, 0.05);
}

TEST(CaseFile, MessagesNameFileJsonPathAndRule) {
  json j = good_case();
  j["airplane"]["mass"] = -600;
  EXPECT_EQ(error_of(j), "case.json: /airplane/mass: must be a positive number (got -600)");
  j = good_case();
  j["design_points"][1]["colour"] = "red";
  EXPECT_EQ(error_of(j), "case.json: /design_points/1/colour: unknown key");
  j = good_case();
  j["constraints"]["cl_max"] = {{"min", 0.5}};
  EXPECT_EQ(error_of(j).find("case.json: /constraints/cl_max/min: must be >= the cruise cl 0.8"),
            0u)
      << error_of(j);
}

TEST(CaseFile, SecondStartIsReadLikeTheBaseline) {
  json j = good_case();
  EXPECT_FALSE(parse(j).second_start.has_value());
  j["second_start"] = {{"naca", "0015"}};
  const Case c = parse(j);
  ASSERT_TRUE(c.second_start.has_value());
  EXPECT_EQ(c.second_start->naca, "0015");
  EXPECT_EQ(c.second_start->json_path, "/second_start");
  j["second_start"] = {{"naca", "0015"}, {"file", "x.dat"}};
  EXPECT_EQ(error_of(j), "case.json: /second_start: give exactly one of naca, file or cst");
}

TEST(CaseFile, NotJsonNamesLineColumnAndWhatIsWrong) {
  try {
    parse_case("{\n  \"schema_version\": 1,\n  oops\n}", "bad.json", ".");
    FAIL();
  } catch (const InputError& e) {
    EXPECT_STREQ(e.what(), "bad.json:3:3: expected a key in double quotes (found 'o')");
  }
}

// The viscous analysis' own rules decide (ViscousOptions::Validate: critical N in [0.5, 20]),
// reported at the JSON path of the value; the bounds themselves are allowed.
TEST(CaseFile, TransitionValuesFollowTheViscousAnalysisRules) {
  json j = good_case();
  j["transition"] = {{"ncrit", 0.3}};
  EXPECT_EQ(error_of(j), "case.json: /transition/ncrit: must be in [0.5, 20] (got 0.3)");
  j["transition"] = {{"ncrit", 0.5}, {"trip_upper", 0.0}};
  EXPECT_NO_THROW(parse(j));
  j["transition"] = {{"scenarios", {{{"name", "rough"}, {"ncrit", 25}}}}};
  EXPECT_EQ(error_of(j), "case.json: /transition/scenarios/0/ncrit: must be in [0.5, 20] (got 25)");
}

TEST(CaseFile, OptimizerAndAnalysisRangesAreTheirValidates) {
  json j = good_case();
  j["optimizer"] = {{"xtol_rel", 1.5}};
  EXPECT_EQ(error_of(j), "case.json: /optimizer/xtol_rel: must be in [0, 1) (got 1.5)");
  j = good_case();
  j["analysis"] = {{"polar_alpha", {{"min", -40}, {"max", 10}}}};
  EXPECT_EQ(error_of(j),
            "case.json: /analysis/polar_alpha/min: must be in [-30, 30] deg (got -40)");
  AnalysisOptions a;
  a.search_cl_max_margin = 0.3;
  EXPECT_THROW(a.Validate(), InputError);
}

TEST(CaseFile, OptionsValidateNameTheField) {
  OptimizerOptions o;
  o.max_evaluations = 0;
  EXPECT_THROW(o.Validate(), InputError);
  AnalysisOptions a;
  a.verify_panels = 100;
  try {
    a.Validate();
    FAIL();
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("analysis.verify_panels"), std::string::npos);
  }
}

}  // namespace
}  // namespace fulmar::optimize
