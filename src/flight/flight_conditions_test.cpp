#include "flight/flight_conditions.h"

#include <gtest/gtest.h>

#include <cmath>

#include "common/error.h"

namespace fulmar {
namespace {

// Worked example, a scenario of our own: the "Kittiwake K-3", a fictional two-seat touring airplane
// of 780 kg with 11.6 m^2 of wing and a 1.30 m mean chord, cruising at 62 m/s true airspeed at 2
// 500 m, and required to stall at no more than 25 m/s at sea level. Hand calculation (ISA at 2 500
// m: T = 271.90 K, rho = 0.95686 kg/m^3, mu = 1.70989e-5 Pa s, a = 330.559 m/s):
//   W = 780 * 9.80665 = 7649.19 N
//   q = 0.5 * 0.95686 * 62^2 = 1839.08 Pa
//   CL = W / (q S) = 7649.19 / (1839.08 * 11.6) = 0.35856
//   Re = rho V c / mu = 0.95686 * 62 * 1.30 / 1.70989e-5 = 4.5104e6
//   M = 62 / 330.559 = 0.18756
// Stall at sea level: q = 0.5 * 1.225 * 25^2 = 382.81 Pa, CL_wing = 7649.19 / (382.81 * 11.6)
//   = 1.72255; section cl_max = 1.72255 / 0.9 = 1.91394; Re = 1.225 * 25 * 1.30 / 1.78938e-5
//   = 2.22493e6.
// Tolerance 1e-4 relative: the hand figures carry five or six significant digits.
const Airplane kKittiwake{780.0, 11.6, 1.30};

TEST(LiftEquation, KittiwakeCruise) {
  const CruiseConditions c = cruise_conditions(kKittiwake, 62.0, 2500.0);
  EXPECT_NEAR(c.dynamic_pressure, 1839.08, 1e-4 * 1839.08);
  EXPECT_NEAR(c.cl, 0.35856, 1e-4 * 0.35856);
  EXPECT_NEAR(c.reynolds, 4.5104e6, 1e-4 * 4.5104e6);
  EXPECT_NEAR(c.mach, 0.18756, 1e-4 * 0.18756);
}

TEST(LiftEquation, KittiwakeStall) {
  const StallConditions s = stall_conditions(kKittiwake, 25.0, 0.0);
  EXPECT_NEAR(s.wing_cl_max, 1.72255, 1e-4 * 1.72255);
  EXPECT_NEAR(s.cl_max_required, 1.91394, 1e-4 * 1.91394);
  EXPECT_NEAR(s.reynolds, 2.22493e6, 1e-4 * 2.22493e6);
}

// Exact: stall_speed_for inverts stall_conditions.
TEST(LiftEquation, StallSpeedRoundTrip) {
  const StallConditions s = stall_conditions(kKittiwake, 27.5, 600.0, 0.85);
  EXPECT_NEAR(stall_speed_for(kKittiwake, s.cl_max_required, 600.0, 0.85), 27.5, 1e-10);
}

// Exact consequence of the lift equation: V_stall ~ 1/sqrt(cl_max), so a higher cl_max means a
// lower stall speed, and doubling cl_max divides it by sqrt(2).
TEST(LiftEquation, HigherClMaxLowersStallSpeed) {
  const double v1 = stall_speed_for(kKittiwake, 1.4, 0.0);
  const double v2 = stall_speed_for(kKittiwake, 2.8, 0.0);
  EXPECT_LT(v2, v1);
  EXPECT_NEAR(v1 / v2, std::sqrt(2.0), 1e-12);
}

// Exact: CL scales with mass and inversely with area and V^2.
TEST(LiftEquation, Scaling) {
  const CruiseConditions base = cruise_conditions(kKittiwake, 62.0, 2500.0);
  const CruiseConditions heavy = cruise_conditions(Airplane{1560.0, 11.6, 1.30}, 62.0, 2500.0);
  const CruiseConditions fast = cruise_conditions(kKittiwake, 124.0, 2500.0);
  EXPECT_NEAR(heavy.cl, 2.0 * base.cl, 1e-12);
  EXPECT_NEAR(fast.cl, base.cl / 4.0, 1e-12);
  EXPECT_NEAR(fast.reynolds, 2.0 * base.reynolds, 1e-6);
}

TEST(LiftEquation, RejectsBadAirplane) {
  EXPECT_THROW(cruise_conditions(Airplane{-1.0, 11.6, 1.3}, 60.0, 0.0), InputError);
  EXPECT_THROW(cruise_conditions(Airplane{780.0, 0.0, 1.3}, 60.0, 0.0), InputError);
  EXPECT_THROW(cruise_conditions(kKittiwake, 0.0, 0.0), InputError);
  EXPECT_THROW(stall_conditions(kKittiwake, 25.0, 0.0, 0.0), InputError);
  try {
    cruise_conditions(Airplane{-5.0, 11.6, 1.3}, 60.0, 0.0);
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("'mass'"), std::string::npos) << e.what();
  }
}

}  // namespace
}  // namespace fulmar
