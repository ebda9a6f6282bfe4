#include "flight/flight_conditions.h"

#include <cmath>
#include <sstream>
#include <string>

#include "common/error.h"

namespace fulmar {
namespace {

void require_positive(const char* field, double value, const char* unit) {
  if (!std::isfinite(value) || value <= 0.0) {
    std::ostringstream msg;
    msg << "'" << field << "' is " << value << " " << unit << ": it must be a positive number";
    throw InputError(msg.str());
  }
}

double weight(const Airplane& a) {
  return a.mass * kStandardGravity;
}

}  // namespace

void Airplane::Validate() const {
  require_positive("mass", mass, "kg");
  require_positive("wing_area", wing_area, "m^2");
  require_positive("chord", chord, "m");
}

CruiseConditions cruise_conditions(const Airplane& airplane, double speed, double altitude,
                                   double temperature_offset_k) {
  airplane.Validate();
  require_positive("speed", speed, "m/s");
  CruiseConditions c;
  c.air = standard_atmosphere(altitude, temperature_offset_k);
  c.speed = speed;
  c.dynamic_pressure = 0.5 * c.air.density * speed * speed;
  c.cl = weight(airplane) / (c.dynamic_pressure * airplane.wing_area);
  c.reynolds = c.air.density * speed * airplane.chord / c.air.viscosity;
  c.mach = speed / c.air.speed_of_sound;
  return c;
}

StallConditions stall_conditions(const Airplane& airplane, double stall_speed, double altitude,
                                 double wing_to_section, double temperature_offset_k) {
  airplane.Validate();
  require_positive("stall_speed", stall_speed, "m/s");
  if (!std::isfinite(wing_to_section) || wing_to_section <= 0.0 || wing_to_section > 1.2) {
    std::ostringstream msg;
    msg << "'wing_to_section' is " << wing_to_section << ": it must lie in (0, 1.2]";
    throw InputError(msg.str());
  }
  StallConditions s;
  s.air = standard_atmosphere(altitude, temperature_offset_k);
  s.speed = stall_speed;
  s.dynamic_pressure = 0.5 * s.air.density * stall_speed * stall_speed;
  s.wing_cl_max = weight(airplane) / (s.dynamic_pressure * airplane.wing_area);
  s.cl_max_required = s.wing_cl_max / wing_to_section;
  s.reynolds = s.air.density * stall_speed * airplane.chord / s.air.viscosity;
  s.mach = stall_speed / s.air.speed_of_sound;
  return s;
}

double stall_speed_for(const Airplane& airplane, double section_cl_max, double altitude,
                       double wing_to_section, double temperature_offset_k) {
  airplane.Validate();
  require_positive("section_cl_max", section_cl_max, "");
  const AtmosphereState air = standard_atmosphere(altitude, temperature_offset_k);
  const double wing_cl_max = section_cl_max * wing_to_section;
  return std::sqrt(2.0 * weight(airplane) / (air.density * airplane.wing_area * wing_cl_max));
}

}  // namespace fulmar
