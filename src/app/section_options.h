#pragma once
// Options shared by `fulmar analyze` and `fulmar polar`: the section, its panelling, the Mach
// number and the viscous flow conditions, with their checks and the JSON of one viscous result.
#include <CLI/CLI.hpp>

#include <cmath>
#include <limits>
#include <nlohmann/json.hpp>
#include <sstream>
#include <string>
#include <type_traits>
#include <vector>

#include "app/cli_checks.h"
#include "common/error.h"
#include "common/number_text.h"
#include "common/rule_check.h"
#include "geometry/panelling.h"
#include "geometry/shape_source.h"
#include "solvers/inviscid/panel_solver.h"
#include "solvers/viscous/viscous_solver.h"

namespace fulmar::app {

// The ranges of these options are not written here: they are the rules of the options each
// analysis validates (PanellingOptions, InviscidOptions, viscous::ViscousOptions). The help texts
// quote those rules (rule_of) and the checks below re-word their errors with the option name.

// The rule `Options::*field` has, as its Validate() states it for a value no rule accepts.
template <class Options, class T>
std::string option_rule(T Options::*field) {
  return rule_of([field] {
    Options o;
    if constexpr (std::is_floating_point_v<T>) {
      o.*field = std::numeric_limits<T>::quiet_NaN();
    } else {
      o.*field = std::numeric_limits<T>::min();
    }
    o.Validate();
  });
}

// Checks `value` for `Options::*field` by Options::Validate(); its error names `option`.
template <class Options, class T>
void check_option(const std::string& option, T Options::*field, T value) {
  Options o;
  o.*field = value;
  check_at(option, general_text(static_cast<double>(value), 10), [&] { o.Validate(); });
}

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
                  "Free-stream Mach number, Karman-Tsien correction (potential flow: " +
                      option_rule(&InviscidOptions::mach) +
                      "; viscous: " + option_rule(&viscous::ViscousOptions::mach) + ")");
  cmd->add_option("--panels", a.panels,
                  "Number of panels (default 160; " + option_rule(&PanellingOptions::panels) + ")");
}

// --re, --ncrit, --trip-upper, --trip-lower; each excludes --inviscid. `several`: --re may be
// given more than once (or with several values).
inline void add_viscous_options(CLI::App* cmd, ViscousArgs& a, bool several) {
  CLI::Option* inviscid = cmd->get_option("--inviscid");
  const std::string re_rule = option_rule(&viscous::ViscousOptions::reynolds);
  CLI::Option* re =
      several
          ? cmd->add_option("--re", a.reynolds,
                            "Chord Reynolds number (" + re_rule + "); repeat for several polars")
          : cmd->add_option("--re", a.reynolds, "Chord Reynolds number (" + re_rule + ")")
                ->expected(1);
  CLI::Option* ncrit = cmd->add_option(
      "--ncrit", a.n_crit,
      "Critical amplification factor of the e^N transition model (default 9: a quiet wind "
      "tunnel; lower for a turbulent free stream; " +
          option_rule(&viscous::ViscousOptions::n_crit) + ")");
  CLI::Option* tu =
      cmd->add_option("--trip-upper", a.trip_upper,
                      "Forced transition x/c on the upper surface (default 1: free transition; " +
                          option_rule(&viscous::ViscousOptions::trip_upper) + ")");
  CLI::Option* tl =
      cmd->add_option("--trip-lower", a.trip_lower,
                      "Forced transition x/c on the lower surface (default 1: free transition; " +
                          option_rule(&viscous::ViscousOptions::trip_lower) + ")");
  for (CLI::Option* o : {re, ncrit, tu, tl}) o->excludes(inviscid);
}

// --panels by PanellingOptions' rule and, for potential flow, --mach by InviscidOptions'.
inline void check_section_args(const SectionArgs& a) {
  check_option("--panels", &PanellingOptions::panels, a.panels);
  if (a.inviscid) check_option("--mach", &InviscidOptions::mach, a.mach);
}

// The panel nodes of the section (#panels + 1 by 2); `section` receives the loaded section.
inline Points section_nodes(const SectionArgs& a, Section& section) {
  check_section_args(a);
  section = load_shape(a.shape);
  PanellingOptions panelling;
  panelling.panels = a.panels;
  return panel_nodes(section, panelling);
}

// Viscous options for one Reynolds number, checked by ViscousOptions::Validate(); throws
// InputError naming the option, its rule and the value.
inline viscous::ViscousOptions viscous_options(const SectionArgs& s, const ViscousArgs& v,
                                               double reynolds) {
  using viscous::ViscousOptions;
  check_section_args(s);
  check_option("--re", &ViscousOptions::reynolds, reynolds);
  try {
    check_option("--mach", &ViscousOptions::mach, s.mach);
  } catch (const InputError& e) {
    throw InputError(std::string(e.what()) +
                     " for the viscous analysis (potential flow with "
                     "--inviscid: " +
                     option_rule(&InviscidOptions::mach) + ")");
  }
  check_option("--ncrit", &ViscousOptions::n_crit, v.n_crit);
  check_option("--trip-upper", &ViscousOptions::trip_upper, v.trip_upper);
  check_option("--trip-lower", &ViscousOptions::trip_lower, v.trip_lower);
  viscous::ViscousOptions o;
  o.reynolds = reynolds;
  o.mach = s.mach;
  o.n_crit = v.n_crit;
  o.trip_upper = v.trip_upper;
  o.trip_lower = v.trip_lower;
  o.Validate();
  return o;
}

// The transition conditions in words: "e^N with critical N 9; no trips", with the trips when there
// are any.
inline std::string transition_words(const viscous::ViscousOptions& o) {
  std::string text = "e^N with critical N " + general_text(o.n_crit, 3);
  if (o.trip_upper < 1.0 || o.trip_lower < 1.0)
    text += "; trips at x/c " + general_text(o.trip_upper, 3) + " upper, " +
            general_text(o.trip_lower, 3) + " lower";
  else
    text += "; no trips";
  return text;
}

// The scalar results of one viscous point: alpha (deg), cl, cd, cm (quarter chord), cd_friction,
// cd_pressure, transition_upper, transition_lower (x/c), converged, status, reason, residual,
// iterations.
inline nlohmann::json viscous_point_json(const viscous::ViscousResult& r) {
  nlohmann::json j = r.to_json();
  j.erase("residual_history");
  j["residual"] = json_number(r.residual);  // null when not finite
  return j;
}

}  // namespace fulmar::app
