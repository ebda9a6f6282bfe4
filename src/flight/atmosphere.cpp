#include "flight/atmosphere.h"

#include <cmath>
#include <sstream>

#include "common/error.h"

namespace fulmar {

double sutherland_viscosity(double temperature_k) {
  constexpr double beta = 1.458e-6;  // kg/(m s K^0.5), ISO 2533:1975
  constexpr double s = 110.4;        // K, Sutherland's constant, ISO 2533:1975
  return beta * std::pow(temperature_k, 1.5) / (temperature_k + s);
}

AtmosphereState standard_atmosphere(double altitude_m, double temperature_offset_k) {
  if (!std::isfinite(altitude_m) || altitude_m < 0.0 || altitude_m > kAtmosphereCeiling) {
    std::ostringstream msg;
    msg << "altitude " << altitude_m << " m is outside the standard atmosphere range 0 to "
        << kAtmosphereCeiling << " m";
    throw InputError(msg.str());
  }
  if (!std::isfinite(temperature_offset_k)) {
    throw InputError("temperature offset must be a finite number of kelvin");
  }
  const double g_over_r = kStandardGravity / kAirGasConstant;
  double t_std = 0;
  double p = 0;
  if (altitude_m <= kTropopauseAltitude) {
    t_std = kSeaLevelTemperature - kTroposphereLapseRate * altitude_m;
    p = kSeaLevelPressure *
        std::pow(t_std / kSeaLevelTemperature, g_over_r / kTroposphereLapseRate);
  } else {
    const double t_tropopause = kSeaLevelTemperature - kTroposphereLapseRate * kTropopauseAltitude;
    const double p_tropopause = kSeaLevelPressure * std::pow(t_tropopause / kSeaLevelTemperature,
                                                             g_over_r / kTroposphereLapseRate);
    t_std = t_tropopause;
    p = p_tropopause * std::exp(-g_over_r * (altitude_m - kTropopauseAltitude) / t_tropopause);
  }
  const double t = t_std + temperature_offset_k;
  if (t <= 150.0) {
    std::ostringstream msg;
    msg << "temperature offset " << temperature_offset_k << " K gives " << t << " K at "
        << altitude_m << " m: it must stay above 150 K";
    throw InputError(msg.str());
  }
  AtmosphereState s;
  s.altitude = altitude_m;
  s.temperature = t;
  s.pressure = p;
  s.density = p / (kAirGasConstant * t);
  s.viscosity = sutherland_viscosity(t);
  s.kinematic_viscosity = s.viscosity / s.density;
  s.speed_of_sound = std::sqrt(kAirHeatRatio * kAirGasConstant * t);
  return s;
}

}  // namespace fulmar
