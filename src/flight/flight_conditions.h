#pragma once
// From an airplane's data to the design conditions of its wing section: the lift equation for the
// cruise lift coefficient, and the stall speed for the maximum lift the section must reach.
#include "flight/atmosphere.h"

namespace fulmar {

// The airplane as the section designer sees it. SI units.
struct Airplane {
  double mass = 0;       // kg, the weight the wing carries at the flight point
  double wing_area = 0;  // m^2, reference (planform) area
  double chord = 0;      // m, the mean aerodynamic chord: the length for the Reynolds number

  // Throws InputError naming the field when a value is not finite and positive.
  void Validate() const;
};

// Conditions at a cruise (or climb) flight point.
struct CruiseConditions {
  AtmosphereState air;
  double speed = 0;             // m/s true airspeed
  double dynamic_pressure = 0;  // Pa, q = rho V^2 / 2
  double cl = 0;                // lift coefficient from the lift equation, L = W = q S CL
  double reynolds = 0;          // rho V c / mu
  double mach = 0;              // V / a
};

// The design conditions of cruise at `speed` (m/s true airspeed) and `altitude` (m geopotential),
// in level flight (lift = weight, standard gravity). Throws InputError for a non-positive speed or
// an altitude outside the standard atmosphere.
CruiseConditions cruise_conditions(const Airplane& airplane, double speed, double altitude,
                                   double temperature_offset_k = 0.0);

// What the stall speed asks of the section.
struct StallConditions {
  AtmosphereState air;
  double speed = 0;             // m/s true airspeed at the stall
  double dynamic_pressure = 0;  // Pa
  double wing_cl_max = 0;       // the wing's maximum lift coefficient the stall speed needs
  double cl_max_required = 0;   // the section cl_max that implies: wing_cl_max / wing_to_section
  double reynolds = 0;          // the stall (landing) Reynolds number
  double mach = 0;
};

// Default wing-to-section factor: CL_max(wing) = 0.9 cl_max(section) for a clean, unswept,
// high-aspect-ratio wing (Raymer, Aircraft Design: A Conceptual Approach, the clean-wing
// maximum-lift relation of the chapter on aerodynamics).
inline constexpr double kWingToSectionFactor = 0.9;

// The maximum lift the stall speed needs at `altitude`. `wing_to_section` in (0, 1.2] converts
// the wing's CL_max to the section's cl_max (cl_max = CL_max / factor). Throws InputError for a
// non-positive speed, a factor out of range, or an altitude outside the standard atmosphere.
StallConditions stall_conditions(const Airplane& airplane, double stall_speed, double altitude,
                                 double wing_to_section = kWingToSectionFactor,
                                 double temperature_offset_k = 0.0);

// The inverse of the stall relation: the stall speed (m/s true airspeed) of `airplane` whose
// section reaches `section_cl_max`. Used to show what a cl_max gain buys.
double stall_speed_for(const Airplane& airplane, double section_cl_max, double altitude,
                       double wing_to_section = kWingToSectionFactor,
                       double temperature_offset_k = 0.0);

}  // namespace fulmar
