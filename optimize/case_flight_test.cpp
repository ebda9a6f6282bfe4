// The airplane, flight points, landing point and transition of a case file.
#include <gtest/gtest.h>

#include "optimize/testing/case_json.h"

namespace fulmar::optimize {
namespace {

using nlohmann::json;
using testing::error_of;
using testing::good_case;
using testing::parse;

TEST(CaseFlight, FlightPointGoesThroughTheLiftEquation) {
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

TEST(CaseFlight, StallSpeedGivesTheRequiredClMax) {
  const Case c = parse(good_case());
  // cl_max = 2 m g / (rho V_s^2 S) / 0.9 (default wing-to-section factor) = 1.4351.
  const double wing = 2 * 600 * 9.80665 / (1.225 * 26 * 26 * 11.0);
  EXPECT_NEAR(c.constraints.cl_max_min, wing / 0.9, 2e-4);
  EXPECT_NEAR(c.landing.reynolds / (1.225 * 26 * 1.4 / 1.7894e-5), 1.0, 1e-3);
}

TEST(CaseFlight, ScenariosInheritTheNominalTransition) {
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

// The viscous analysis' own rules decide (ViscousOptions::Validate: critical N in [0.5, 20]),
// reported at the JSON path of the value; the bounds themselves are allowed.
TEST(CaseFlight, TransitionValuesFollowTheViscousAnalysisRules) {
  json j = good_case();
  j["transition"] = {{"ncrit", 0.3}};
  EXPECT_EQ(error_of(j), "case.json: /transition/ncrit: must be in [0.5, 20] (got 0.3)");
  j["transition"] = {{"ncrit", 0.5}, {"trip_upper", 0.0}};
  EXPECT_NO_THROW(parse(j));
  j["transition"] = {{"scenarios", {{{"name", "rough"}, {"ncrit", 25}}}}};
  EXPECT_EQ(error_of(j), "case.json: /transition/scenarios/0/ncrit: must be in [0.5, 20] (got 25)");
}

TEST(CaseFlight, DirectPointMustNotMixWithAFlightPoint) {
  json j = good_case();
  j["design_points"][1]["speed"] = 40;
  EXPECT_EQ(error_of(j),
            "case.json: /design_points/1: give either a flight point (speed, altitude) or cl, "
            "reynolds and mach, not both");
  j = good_case();
  j.erase("airplane");
  EXPECT_EQ(error_of(j),
            "case.json: /design_points/0/speed: a flight point needs the airplane "
            "(missing /airplane)");
}

}  // namespace
}  // namespace fulmar::optimize
