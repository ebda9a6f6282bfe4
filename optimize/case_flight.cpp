#include <tuple>

#include "common/number_text.h"
#include "flight/flight_conditions.h"
#include "optimize/case_sections.h"
#include "solvers/viscous/viscous_solver.h"

namespace fulmar::optimize::case_detail {
namespace {

// The lift coefficients a design point may ask for (a case rule: below -0.5 or above 2 no clean
// section flies level).
constexpr double kDesignClMin = -0.5, kDesignClMax = 2.0;

// The rule of one field of the viscous analysis, as its own Validate() states it: the case file
// repeats none of the solver's ranges.
auto viscous_rule(double viscous::ViscousOptions::*field) {
  return [field](double value) {
    viscous::ViscousOptions o;
    o.*field = value;
    o.Validate();
  };
}

double read_mach(Reader r) {
  return r.number_by(viscous_rule(&viscous::ViscousOptions::mach));
}

double read_reynolds(Reader r) {
  return r.number_by(viscous_rule(&viscous::ViscousOptions::reynolds));
}

// Reynolds and Mach numbers that came from a flight point (speed, altitude) must suit the viscous
// analysis too; the speed is named as the place.
void check_flight_flow(const Reader& r, const std::string& speed_path, double reynolds,
                       double mach) {
  for (auto [value, name, field] :
       {std::tuple{reynolds, "Reynolds number", &viscous::ViscousOptions::reynolds},
        std::tuple{mach, "Mach number", &viscous::ViscousOptions::mach}}) {
    try {
      viscous_rule(field)(value);
    } catch (const InputError& e) {
      r.fail_at(speed_path, std::string("gives a ") + name + " of " + general_text(value) +
                                "; the viscous analysis' " + stated_rule(e.what()));
    }
  }
}

}  // namespace

Airplane read_airplane(Reader r, double& wing_to_section) {
  // Each value by the rule of src/flight (Airplane::Validate, stall_conditions).
  Airplane a{1, 1, 1};
  a.mass = r.child("mass").number_by([](double v) { Airplane{v, 1, 1}.Validate(); });
  a.wing_area = r.child("wing_area").number_by([](double v) { Airplane{1, v, 1}.Validate(); });
  a.chord = r.child("chord").number_by([](double v) { Airplane{1, 1, v}.Validate(); });
  if (auto f = r.optional_child("wing_to_section"))
    wing_to_section = f->number_by([](double v) {
      stall_conditions(Airplane{1, 1, 1}, 1.0, 0.0, v);
    });
  r.finish();
  return a;
}

// ncrit, trip_upper, trip_lower of a transition block or scenario, by the viscous analysis' rules.
void read_transition_values(Reader& r, TransitionScenario& s) {
  if (auto c = r.optional_child("ncrit"))
    s.ncrit = c->number_by(viscous_rule(&viscous::ViscousOptions::n_crit));
  if (auto c = r.optional_child("trip_upper"))
    s.trip_upper = c->number_by(viscous_rule(&viscous::ViscousOptions::trip_upper));
  if (auto c = r.optional_child("trip_lower"))
    s.trip_lower = c->number_by(viscous_rule(&viscous::ViscousOptions::trip_lower));
}

TransitionScenario read_scenario(Reader r, const TransitionScenario& defaults) {
  TransitionScenario s = defaults;
  if (auto c = r.optional_child("name")) s.name = c->string();
  read_transition_values(r, s);
  if (auto c = r.optional_child("weight")) s.weight = c->positive();
  r.finish();
  return s;
}

DesignPoint read_point(Reader r, const std::optional<Airplane>& airplane, size_t index) {
  DesignPoint p;
  p.name = "point " + std::to_string(index + 1);
  if (auto c = r.optional_child("name")) p.name = c->string();
  if (auto c = r.optional_child("weight")) p.weight = c->positive();
  if (auto c = r.optional_child("cm_min")) p.cm_min = c->in_range(-1, 1, false, false);
  const bool direct = r.has("cl") || r.has("reynolds");
  const bool flight = r.has("speed") || r.has("altitude");
  if (direct && flight)
    r.fail("give either a flight point (speed, altitude) or cl, reynolds and mach, not both");
  if (flight) {
    if (!airplane)
      r.fail_at(r.path() + "/speed", "a flight point needs the airplane (missing /airplane)");
    p.from_airplane = true;
    // Each value by the rules of src/flight (cruise_conditions, standard_atmosphere).
    p.speed = r.child("speed").number_by([&](double v) { cruise_conditions(*airplane, v, 0.0); });
    p.altitude = r.child("altitude").number_by([](double v) { standard_atmosphere(v); });
    if (auto c = r.optional_child("temperature_offset"))
      p.temperature_offset = c->number_by([&](double v) { standard_atmosphere(p.altitude, v); });
    const CruiseConditions cc =
        cruise_conditions(*airplane, p.speed, p.altitude, p.temperature_offset);
    p.cl = cc.cl;
    p.reynolds = cc.reynolds;
    p.mach = cc.mach;
    check_flight_flow(r, r.path() + "/speed", p.reynolds, p.mach);
    if (p.cl > kDesignClMax)
      r.fail_at(r.path() + "/speed", "gives a cruise cl of " + general_text(p.cl) + ", above " +
                                         general_text(kDesignClMax) +
                                         " (too slow for this airplane)");
  } else {
    p.cl = r.child("cl").in_range(kDesignClMin, kDesignClMax, false, false);
    p.reynolds = read_reynolds(r.child("reynolds"));
    p.mach = r.has("mach") ? read_mach(r.child("mach")) : 0.0;
  }
  r.finish();
  return p;
}

LandingPoint read_landing(Reader r, const std::optional<Airplane>& airplane, double factor) {
  LandingPoint l;
  l.present = true;
  l.wing_to_section = factor;
  const bool stall = r.has("stall_speed");
  if (stall) {
    if (!airplane)
      r.fail_at(r.path() + "/stall_speed", "a stall speed needs the airplane (missing /airplane)");
    l.stall_speed = r.child("stall_speed").number_by([&](double v) {
      stall_conditions(*airplane, v, 0.0, factor);
    });
    l.altitude = r.has("altitude")
                     ? r.child("altitude").number_by([](double v) { standard_atmosphere(v); })
                     : 0.0;
    double dt = 0;
    if (auto c = r.optional_child("temperature_offset"))
      dt = c->number_by([&](double v) { standard_atmosphere(l.altitude, v); });
    const StallConditions sc = stall_conditions(*airplane, l.stall_speed, l.altitude, factor, dt);
    l.reynolds = sc.reynolds;
    l.mach = sc.mach;
    check_flight_flow(r, r.path() + "/stall_speed", l.reynolds, l.mach);
    l.cl_max_required = sc.cl_max_required;
    if (l.cl_max_required > 2.4)
      r.fail_at(r.path() + "/stall_speed",
                "needs a section cl_max of " + general_text(l.cl_max_required) +
                    ", beyond what a clean section reaches (about 2.4 at most: common practice)");
  } else {
    l.reynolds = read_reynolds(r.child("reynolds"));
    l.mach = r.has("mach") ? read_mach(r.child("mach")) : 0.0;
  }
  r.finish();
  return l;
}

}  // namespace fulmar::optimize::case_detail
