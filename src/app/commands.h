#pragma once
// Each subcommand lives in its own cmd_*.cpp and adds itself to the application here. A command's
// callback throws fulmar::InputError for bad input; main turns that into exit code 2.
#include <CLI/CLI.hpp>

namespace fulmar::app {

void add_shape_command(CLI::App& app);     // cmd_shape.cpp
void add_flight_command(CLI::App& app);    // cmd_flight.cpp
void add_analyze_command(CLI::App& app);   // cmd_analyze.cpp
void add_polar_command(CLI::App& app);     // cmd_polar.cpp
void add_export_command(CLI::App& app);    // cmd_export.cpp
void add_optimize_command(CLI::App& app);  // cmd_optimize.cpp
void add_study_command(CLI::App& app);     // cmd_study.cpp

// The caution every --help and every report carries.
inline constexpr const char* kCaution =
    "Caution: fulmar gives section-level (two-dimensional) estimates from a numerical model. "
    "Confirm every result by test before it is relied on; the airworthiness rules, local codes "
    "and licensed engineering practice that apply to the aircraft decide, not this program.";

}  // namespace fulmar::app
