#include "flight/atmosphere.h"

#include <gtest/gtest.h>

#include "common/error.h"

namespace fulmar {
namespace {

// One row of the standard-atmosphere table at a geopotential altitude.
struct TableRow {
  double altitude;        // m geopotential
  double temperature;     // K
  double pressure;        // Pa
  double density;         // kg/m^3
  double speed_of_sound;  // m/s
};

class StandardAtmosphereTable : public ::testing::TestWithParam<TableRow> {};

// Source: ISO 2533:1975 Standard Atmosphere, table of values by geopotential altitude (identical
// to the U.S. Standard Atmosphere 1976, NOAA/NASA/USAF, Table I, below 32 km). The tables are
// printed to five significant figures (values from memory), so the tolerance is 1e-4 relative:
// half a unit in the fifth figure plus margin.
TEST_P(StandardAtmosphereTable, MatchesPublishedTable) {
  const TableRow row = GetParam();
  const AtmosphereState s = standard_atmosphere(row.altitude);
  EXPECT_NEAR(s.temperature, row.temperature, 1e-4 * row.temperature);
  EXPECT_NEAR(s.pressure, row.pressure, 1e-4 * row.pressure);
  EXPECT_NEAR(s.density, row.density, 1e-4 * row.density);
  EXPECT_NEAR(s.speed_of_sound, row.speed_of_sound, 1e-4 * row.speed_of_sound);
}

INSTANTIATE_TEST_SUITE_P(Iso2533, StandardAtmosphereTable,
                         ::testing::Values(TableRow{0.0, 288.15, 101325.0, 1.2250, 340.29},
                                           TableRow{5000.0, 255.65, 54020.0, 0.73612, 320.53},
                                           TableRow{11000.0, 216.65, 22632.0, 0.36392, 295.07},
                                           TableRow{20000.0, 216.65, 5474.9, 0.088035, 295.07}));

// Source: ISO 2533:1975 gives the sea-level dynamic viscosity 1.7894e-5 Pa s at 288.15 K.
// Tolerance: the printed value has five figures.
TEST(Sutherland, SeaLevelValue) {
  EXPECT_NEAR(sutherland_viscosity(288.15), 1.7894e-5, 0.0001e-5);
  EXPECT_NEAR(standard_atmosphere(0.0).viscosity, 1.7894e-5, 0.0001e-5);
}

// Exact: the profile is continuous at the tropopause (both formulas meet at 11 km). The two points
// are 2e-6 m apart and dp/dh = -rho g = -3.6 Pa/m there, so a jump would show above 1e-4 Pa.
TEST(StandardAtmosphere, ContinuousAtTropopause) {
  const AtmosphereState below = standard_atmosphere(11000.0 - 1e-6);
  const AtmosphereState above = standard_atmosphere(11000.0 + 1e-6);
  EXPECT_NEAR(below.pressure, above.pressure, 1e-4);
  EXPECT_NEAR(below.temperature, above.temperature, 1e-8);
}

// Exact: on an ISA+dT day the pressure at a pressure altitude is the standard one and the density
// follows from the gas law, rho = p / (R T).
TEST(StandardAtmosphere, TemperatureOffsetKeepsPressure) {
  const AtmosphereState std_day = standard_atmosphere(3000.0);
  const AtmosphereState hot_day = standard_atmosphere(3000.0, 20.0);
  EXPECT_DOUBLE_EQ(hot_day.pressure, std_day.pressure);
  EXPECT_DOUBLE_EQ(hot_day.temperature, std_day.temperature + 20.0);
  EXPECT_NEAR(hot_day.density, std_day.density * std_day.temperature / hot_day.temperature, 1e-12);
}

TEST(StandardAtmosphere, RejectsAltitudeOutsideRange) {
  EXPECT_THROW(standard_atmosphere(-1.0), InputError);
  EXPECT_THROW(standard_atmosphere(20001.0), InputError);
  EXPECT_THROW(standard_atmosphere(1000.0, -200.0), InputError);
  try {
    standard_atmosphere(25000.0);
    FAIL();
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("altitude 25000"), std::string::npos) << e.what();
  }
}

}  // namespace
}  // namespace fulmar
