#pragma once
// Options shared by `fulmar analyze` and `fulmar polar`: the section, its panelling, the Mach
// number and the viscous flow conditions, with their checks and the JSON of one viscous result.
#include <CLI/CLI.hpp>

#include <cmath>
#include <nlohmann/json.hpp>
#include <sstream>
#include <string>
#include <vector>

#include "app/cli_checks.h"
#include "common/error.h"
#include "geometry/panelling.h"
#include "geometry/shape_source.h"
#include "solvers/viscous/viscous_solver.h"

namespace fulmar::app {

// Highest Mach number of the viscous analysis (its closures and Karman-Tsien loads); the
// inviscid analysis goes to 0.8.
inline constexpr double kViscousMachLimit = 0.7;

struct SectionArgs {
  std::string shape;
  int panels = 160;
  double mach = 0.0;
  bool mach_given = false;
  bool inviscid = false;
};

struct ViscousArgs {
  std::vector<double> reynolds;  // one for analyze, one or more for polar
  double n_crit = viscous::kDefaultNCrit;
  double trip_upper = 1.0, trip_lower = 1.0;
};

// SHAPE, --inviscid, --mach, --panels.
inline void add_section_options(CLI::App* cmd, SectionArgs& a) {
  cmd->add_option("SHAPE", a.shape,
                  "NACA designation (naca2412), CST JSON file, or coordinate file")
      ->required();
  cmd->add_flag("--inviscid", a.inviscid, "Potential flow only (no boundary layer)");
  cmd->add_option("--mach", a.mach,
                  "Free-stream Mach number, Karman-Tsien correction (0 to 0.8; viscous: to 0.7)")
      ->check(within(0.0, 0.8));
  cmd->add_option("--panels", a.panels, "Number of panels (20 to 4000, default 160)")
      ->check(CLI::Range(20, 4000));
}

// --re, --ncrit, --trip-upper, --trip-lower; each excludes --inviscid. `several`: --re may be
// given more than once (or with several values).
inline void add_viscous_options(CLI::App* cmd, ViscousArgs& a, bool several) {
  CLI::Option* inviscid = cmd->get_option("--inviscid");
  CLI::Option* re =
      several
          ? cmd->add_option("--re", a.reynolds,
                            "Chord Reynolds number (1e4 to 1e9); repeat for several polars")
          : cmd->add_option("--re", a.reynolds, "Chord Reynolds number (1e4 to 1e9)")->expected(1);
  re->check(within(1e4, 1e9));
  CLI::Option* ncrit =
      cmd->add_option("--ncrit", a.n_crit,
                      "Critical amplification factor of the e^N transition model (0.5 to 20, "
                      "default 9: a quiet wind tunnel; lower for a turbulent free stream)")
          ->check(within(0.5, 20.0));
  CLI::Option* tu =
      cmd->add_option("--trip-upper", a.trip_upper,
                      "Forced transition x/c on the upper surface (0 to 1; default 1: "
                      "free transition)")
          ->check(within(0.0, 1.0));
  CLI::Option* tl =
      cmd->add_option("--trip-lower", a.trip_lower,
                      "Forced transition x/c on the lower surface (0 to 1; default 1: "
                      "free transition)")
          ->check(within(0.0, 1.0));
  for (CLI::Option* o : {re, ncrit, tu, tl}) o->excludes(inviscid);
}

// The panel nodes of the section (#panels + 1 by 2); `section` receives the loaded section.
inline Points section_nodes(const SectionArgs& a, Section& section) {
  section = load_shape(a.shape);
  PanellingOptions panelling;
  panelling.panels = a.panels;
  return panel_nodes(section, panelling);
}

// Viscous options for one Reynolds number; throws InputError naming the option.
inline viscous::ViscousOptions viscous_options(const SectionArgs& s, const ViscousArgs& v,
                                               double reynolds) {
  if (s.mach > kViscousMachLimit) {
    std::ostringstream msg;
    msg << "--mach " << s.mach << ": the viscous analysis accepts Mach 0 to " << kViscousMachLimit
        << " (add --inviscid for potential flow up to 0.8)";
    throw InputError(msg.str());
  }
  viscous::ViscousOptions o;
  o.reynolds = reynolds;
  o.mach = s.mach;
  o.n_crit = v.n_crit;
  o.trip_upper = v.trip_upper;
  o.trip_lower = v.trip_lower;
  o.Validate();
  return o;
}

// The scalar results of one viscous point: alpha (deg), cl, cd, cm (quarter chord), cd_friction,
// cd_pressure, transition_upper, transition_lower (x/c), converged, status, reason, residual,
// iterations.
inline nlohmann::json viscous_point_json(const viscous::ViscousResult& r) {
  nlohmann::json j = r.to_json();
  j.erase("residual_history");
  if (!std::isfinite(r.residual)) j["residual"] = nullptr;
  return j;
}

}  // namespace fulmar::app
