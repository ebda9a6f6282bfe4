// `fulmar polar`: the flow about one section over a range of angles of attack.
#include <cmath>
#include <cstdio>
#include <iostream>
#include <memory>
#include <nlohmann/json.hpp>
#include <numbers>
#include <sstream>
#include <string>
#include <vector>

#include "app/cli_checks.h"
#include "app/commands.h"
#include "common/atomic_file.h"
#include "common/error.h"
#include "geometry/panelling.h"
#include "geometry/shape_source.h"
#include "solvers/inviscid/panel_solver.h"

namespace fulmar::app {
namespace {

struct PolarArgs {
  std::string shape;
  std::string alpha_range;
  bool inviscid = false;
  double mach = 0.0;
  bool mach_given = false;
  int panels = 160;
  std::string output_csv;
  bool json = false;
};

// FROM:TO:STEP in degrees -> the angles FROM, FROM+STEP, ... up to TO (inclusive within 1e-9 of
// a step). STEP may be negative when TO < FROM; at most 10001 angles.
std::vector<double> parse_alpha_range(const std::string& text) {
  auto bad = [&](const std::string& rule) {
    return InputError("--alpha '" + text + "': " + rule +
                      " (expected FROM:TO:STEP in degrees, e.g. -4:12:0.5)");
  };
  std::vector<double> v;
  std::stringstream ss(text);
  std::string part;
  while (std::getline(ss, part, ':')) {
    size_t used = 0;
    double x = 0.0;
    try {
      x = std::stod(part, &used);
    } catch (const std::exception&) {
      throw bad("'" + part + "' is not a number");
    }
    if (used != part.size() || !std::isfinite(x)) throw bad("'" + part + "' is not a number");
    v.push_back(x);
  }
  if (v.size() != 3 || text.back() == ':') throw bad("needs exactly three numbers");
  const double from = v[0], to = v[1], step = v[2];
  if (std::abs(from) > 90.0 || std::abs(to) > 90.0) throw bad("angles must be within -90..90");
  if (step == 0.0) throw bad("STEP must not be zero");
  const double count = (to - from) / step;
  if (count < -1e-9) throw bad("STEP goes away from TO");
  if (count > 10000.0) throw bad("more than 10001 angles");
  std::vector<double> out;
  const int n = static_cast<int>(std::floor(count + 1e-9)) + 1;
  for (int i = 0; i < n; ++i) out.push_back(from + i * step);
  return out;
}

void run_polar(const PolarArgs& a) {
  const std::vector<double> alphas = parse_alpha_range(a.alpha_range);
  if (!a.inviscid) {
    throw InputError(
        "polar: the viscous analysis needs --re RE (the Reynolds number); for potential flow "
        "alone add --inviscid");
  }
  if (!a.output_csv.empty()) require_writable(a.output_csv);
  const Section section = load_shape(a.shape);
  PanellingOptions panelling;
  panelling.panels = a.panels;
  InviscidOptions options;
  options.mach = a.mach;
  const InviscidSolver solver(panel_nodes(section, panelling), options);

  nlohmann::json points = nlohmann::json::array();
  std::ostringstream csv;
  csv.precision(10);
  csv << "alpha,cl,cm,cp_min,converged" << (a.mach_given ? ",critical_exceeded" : "") << '\n';
  InviscidResult r;
  for (double deg : alphas) {
    solver.solve(deg * std::numbers::pi / 180.0, r);
    nlohmann::json p{{"alpha", deg},
                     {"cl", r.cl},
                     {"cm", r.cm},
                     {"cp_min", r.cp_min},
                     {"converged", r.converged}};
    csv << deg << ',' << r.cl << ',' << r.cm << ',' << r.cp_min << ',' << (r.converged ? 1 : 0);
    if (a.mach_given) {
      p["critical_exceeded"] = r.critical_exceeded;
      csv << ',' << (r.critical_exceeded ? 1 : 0);
    }
    csv << '\n';
    points.push_back(p);
  }
  if (!a.output_csv.empty()) write_file_atomically(a.output_csv, csv.str());

  if (a.json) {
    nlohmann::json j{{"shape", section.name},
                     {"analysis", "inviscid"},
                     {"panels", a.panels},
                     {"points", points}};
    if (a.mach_given) j["mach"] = a.mach;
    std::cout << j.dump(2) << "\n";
    return;
  }
  std::printf("%s: inviscid polar, %d panels%s\n", section.name.c_str(), a.panels,
              a.mach_given ? (", Mach " + std::to_string(a.mach).substr(0, 5)).c_str() : "");
  std::printf("  %9s %9s %9s %9s%s\n", "alpha", "cl", "cm", "cp_min",
              a.mach_given ? "  critical" : "");
  for (const auto& p : points) {
    std::printf("  %9.3f %9.5f %9.5f %9.4f%s\n", p["alpha"].get<double>(), p["cl"].get<double>(),
                p["cm"].get<double>(), p["cp_min"].get<double>(),
                a.mach_given ? (p["critical_exceeded"].get<bool>() ? "  exceeded" : "  -") : "");
  }
}

}  // namespace

void add_polar_command(CLI::App& app) {
  auto args = std::make_shared<PolarArgs>();
  CLI::App* cmd = app.add_subcommand(
      "polar",
      "Lift and moment of one section over a range of angles of attack. With --inviscid: "
      "potential flow by a linear-vorticity panel method (one factorisation for all angles), "
      "Karman-Tsien corrected with --mach.\n\n" +
          std::string(kCaution));
  cmd->add_option("SHAPE", args->shape,
                  "NACA designation (naca2412), CST JSON file, or coordinate file")
      ->required();
  cmd->add_option("--alpha", args->alpha_range, "Angles FROM:TO:STEP in degrees, e.g. -4:12:1")
      ->required();
  cmd->add_flag("--inviscid", args->inviscid, "Potential flow only (no boundary layer)");
  cmd->add_option("--mach", args->mach, "Free-stream Mach number for the Karman-Tsien correction")
      ->check(within(0.0, 0.8));
  cmd->add_option("--panels", args->panels, "Number of panels (20 to 4000, default 160)")
      ->check(CLI::Range(20, 4000));
  cmd->add_option("-o,--output", args->output_csv,
                  "Write the polar to this CSV file (columns alpha, cl, cm, cp_min, converged, "
                  "and critical_exceeded with --mach)");
  cmd->add_flag("--json", args->json, "Print one JSON object with the list 'points'");
  cmd->callback([args, cmd]() {
    args->mach_given = cmd->count("--mach") > 0;
    run_polar(*args);
  });
}

}  // namespace fulmar::app
