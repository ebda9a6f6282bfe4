// `fulmar flight`: the section's design conditions from the airplane's data.
#include <cmath>
#include <cstdio>
#include <iostream>
#include <memory>
#include <nlohmann/json.hpp>
#include <optional>

#include "app/commands.h"
#include "common/error.h"
#include "common/number_text.h"
#include "common/rule_check.h"
#include "flight/flight_conditions.h"

namespace fulmar::app {
namespace {

struct FlightArgs {
  double mass = 0;
  double wing_area = 0;
  double chord = 0;
  double speed = 0;
  double altitude = 0;
  double temperature_offset = 0;
  std::optional<double> stall_speed;
  std::optional<double> stall_altitude;
  double wing_to_section = kWingToSectionFactor;
  bool json = false;
};

void print_text(const CruiseConditions& c, const std::optional<StallConditions>& s) {
  std::printf("Cruise at %.1f m (ISA%+.1f K)\n", c.air.altitude,
              c.air.temperature - standard_atmosphere(c.air.altitude).temperature);
  std::printf("  temperature        %10.2f K\n", c.air.temperature);
  std::printf("  pressure           %10.1f Pa\n", c.air.pressure);
  std::printf("  density            %10.5f kg/m^3\n", c.air.density);
  std::printf("  viscosity          %10.4e Pa s\n", c.air.viscosity);
  std::printf("  speed of sound     %10.2f m/s\n", c.air.speed_of_sound);
  std::printf("  dynamic pressure   %10.1f Pa\n", c.dynamic_pressure);
  std::printf("  lift coefficient   %10.4f\n", c.cl);
  std::printf("  Reynolds number    %10.4g\n", c.reynolds);
  std::printf("  Mach number        %10.4f\n", c.mach);
  if (s) {
    std::printf("Stall at %.1f m, %.2f m/s\n", s->air.altitude, s->speed);
    std::printf("  wing CL_max needed %10.4f\n", s->wing_cl_max);
    std::printf("  section cl_max     %10.4f\n", s->cl_max_required);
    std::printf("  Reynolds number    %10.4g\n", s->reynolds);
    std::printf("  Mach number        %10.4f\n", s->mach);
  }
}

// Each option by the rule of src/flight that decides it (Airplane::Validate, the speed and factor
// checks of cruise_conditions and stall_conditions, standard_atmosphere's range); the error names
// the option.
void check_flight_args(const FlightArgs& a) {
  auto check = [](const char* option, double v, auto&& rule) {
    check_at(option, general_text(v, 10), [&] { rule(v); });
  };
  const Airplane unit{1, 1, 1};
  check("--mass", a.mass, [](double v) { Airplane{v, 1, 1}.Validate(); });
  check("--wing-area", a.wing_area, [](double v) { Airplane{1, v, 1}.Validate(); });
  check("--chord", a.chord, [](double v) { Airplane{1, 1, v}.Validate(); });
  check("--speed", a.speed, [&](double v) { cruise_conditions(unit, v, 0.0); });
  check("--altitude", a.altitude, [](double v) { standard_atmosphere(v); });
  check("--temperature-offset", a.temperature_offset,
        [&](double v) { standard_atmosphere(a.altitude, v); });
  if (a.stall_speed)
    check("--stall-speed", *a.stall_speed, [&](double v) { stall_conditions(unit, v, 0.0); });
  if (a.stall_altitude) {
    check("--stall-altitude", *a.stall_altitude,
          [&](double v) { standard_atmosphere(v, a.temperature_offset); });
  }
  check("--wing-to-section", a.wing_to_section,
        [&](double v) { stall_conditions(unit, 1.0, 0.0, v); });
}

void run_flight(const FlightArgs& a) {
  check_flight_args(a);
  const Airplane airplane{a.mass, a.wing_area, a.chord};
  const CruiseConditions c = cruise_conditions(airplane, a.speed, a.altitude, a.temperature_offset);
  std::optional<StallConditions> s;
  if (a.stall_speed) {
    s = stall_conditions(airplane, *a.stall_speed, a.stall_altitude.value_or(0.0),
                         a.wing_to_section, a.temperature_offset);
  } else if (a.stall_altitude) {
    throw InputError("'--stall-altitude' needs '--stall-speed'");
  }
  if (!a.json) {
    print_text(c, s);
    return;
  }
  nlohmann::json j{{"altitude", c.air.altitude},
                   {"temperature", c.air.temperature},
                   {"pressure", c.air.pressure},
                   {"density", c.air.density},
                   {"viscosity", c.air.viscosity},
                   {"kinematic_viscosity", c.air.kinematic_viscosity},
                   {"speed_of_sound", c.air.speed_of_sound},
                   {"speed", c.speed},
                   {"dynamic_pressure", c.dynamic_pressure},
                   {"cl", c.cl},
                   {"reynolds", c.reynolds},
                   {"mach", c.mach}};
  if (s) {
    j["stall_speed"] = s->speed;
    j["stall_altitude"] = s->air.altitude;
    j["stall_dynamic_pressure"] = s->dynamic_pressure;
    j["wing_cl_max_required"] = s->wing_cl_max;
    j["wing_to_section"] = a.wing_to_section;
    j["cl_max_required"] = s->cl_max_required;
    j["stall_reynolds"] = s->reynolds;
    j["stall_mach"] = s->mach;
  }
  std::cout << j.dump(2) << "\n";
}

}  // namespace

void add_flight_command(CLI::App& app) {
  auto args = std::make_shared<FlightArgs>();
  CLI::App* cmd = app.add_subcommand(
      "flight",
      "Design conditions of the section from the airplane: standard atmosphere, dynamic pressure, "
      "the cruise lift coefficient from the lift equation (lift = weight), Reynolds and Mach "
      "numbers; with a stall speed, the section cl_max that speed needs.\n\n" +
          std::string(kCaution));
  cmd->add_option("--mass", args->mass, "Airplane mass at the flight point, kg")->required();
  cmd->add_option("--wing-area", args->wing_area, "Wing reference area, m^2")->required();
  cmd->add_option("--chord", args->chord, "Mean aerodynamic chord, m (for the Reynolds number)")
      ->required();
  cmd->add_option("--speed", args->speed, "Cruise true airspeed, m/s")->required();
  cmd->add_option("--altitude", args->altitude,
                  "Cruise pressure altitude, m (the standard atmosphere: 0 to " +
                      general_text(kAtmosphereCeiling) + ")")
      ->required();
  cmd->add_option("--temperature-offset", args->temperature_offset,
                  "Temperature above the standard day, K (ISA+dT); applies to both points");
  cmd->add_option("--stall-speed", args->stall_speed, "Stall speed to meet, m/s true airspeed");
  cmd->add_option("--stall-altitude", args->stall_altitude,
                  "Pressure altitude of the stall requirement, m (default 0)");
  cmd->add_option("--wing-to-section", args->wing_to_section,
                  "CL_max(wing) / cl_max(section), default 0.9 (clean high-aspect-ratio wing, "
                  "Raymer, Aircraft Design: A Conceptual Approach)");
  cmd->add_flag("--json", args->json, "Print one JSON object (SI units)");
  cmd->callback([args]() { run_flight(*args); });
}

}  // namespace fulmar::app
