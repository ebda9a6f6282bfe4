#pragma once
// International Standard Atmosphere, 0 to 20 km (ISO 2533:1975, identical below 32 km to the U.S.
// Standard Atmosphere 1976): troposphere with a lapse rate of 6.5 K/km up to 11 km geopotential,
// isothermal stratosphere above. Altitudes are geopotential metres (what an altimeter set to
// 1013.25 hPa reads as pressure altitude); the difference from geometric altitude is 63 m at 20 km.

namespace fulmar {

// Constants of the standard (ISO 2533:1975, table 1).
inline constexpr double kStandardGravity = 9.80665;      // m/s^2
inline constexpr double kAirGasConstant = 287.05287;     // J/(kg K)
inline constexpr double kAirHeatRatio = 1.4;             // cp/cv of dry air
inline constexpr double kSeaLevelTemperature = 288.15;   // K
inline constexpr double kSeaLevelPressure = 101325.0;    // Pa
inline constexpr double kTroposphereLapseRate = 0.0065;  // K/m
inline constexpr double kTropopauseAltitude = 11000.0;   // m geopotential
inline constexpr double kAtmosphereCeiling = 20000.0;    // m geopotential: the range fulmar covers

// The state of the air at one altitude. SI units.
struct AtmosphereState {
  double altitude = 0;             // m geopotential
  double temperature = 0;          // K (includes the temperature offset)
  double pressure = 0;             // Pa
  double density = 0;              // kg/m^3
  double viscosity = 0;            // dynamic viscosity, Pa s (Sutherland)
  double kinematic_viscosity = 0;  // m^2/s
  double speed_of_sound = 0;       // m/s
};

// The standard atmosphere at `altitude_m` (0 to 20 000 m geopotential) with the temperature raised
// by `temperature_offset_k` (ISA+dT day: the pressure stays that of the standard day at this
// pressure altitude; the density follows from the gas law at the hotter or colder temperature).
// Throws InputError when the altitude is outside 0..20 000 m or the offset leaves a temperature
// at or below 150 K or the offset is not finite.
AtmosphereState standard_atmosphere(double altitude_m, double temperature_offset_k = 0.0);

// Dynamic viscosity of air by Sutherland's law with the constants of ISO 2533:1975
// (beta_s = 1.458e-6 kg/(m s K^0.5), S = 110.4 K). `temperature_k` > 0. Returns Pa s.
double sutherland_viscosity(double temperature_k);

}  // namespace fulmar
