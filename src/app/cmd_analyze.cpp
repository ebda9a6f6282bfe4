// `fulmar analyze`: the flow about one section at one angle of attack or one target cl.
#include <cmath>
#include <cstdio>
#include <iostream>
#include <memory>
#include <nlohmann/json.hpp>
#include <numbers>
#include <optional>
#include <sstream>
#include <string>

#include "app/cli_checks.h"
#include "app/commands.h"
#include "common/atomic_file.h"
#include "common/error.h"
#include "geometry/panelling.h"
#include "geometry/shape_source.h"
#include "solvers/inviscid/panel_solver.h"

namespace fulmar::app {
namespace {

struct AnalyzeArgs {
  std::string shape;
  std::optional<double> alpha_deg;
  std::optional<double> cl;
  bool inviscid = false;
  double mach = 0.0;
  bool mach_given = false;
  int panels = 160;
  std::string surface_csv;
  bool json = false;
};

// The surface table: one row per panel node, upper trailing edge -> leading edge -> lower
// trailing edge. `ue` is the edge velocity over the free stream, positive in the direction from
// the leading edge toward the trailing edge on each surface (negative between the stagnation
// point and the leading edge).
std::string surface_table(const InviscidSolver& solver, const InviscidResult& r) {
  const Points& p = solver.nodes();
  const int n = static_cast<int>(p.rows());
  const Eigen::RowVector2d te_mid = 0.5 * (p.row(0) + p.row(n - 1));
  int le = 0;
  for (int i = 0; i < n; ++i) {
    if ((p.row(i) - te_mid).norm() > (p.row(le) - te_mid).norm()) le = i;
  }
  std::ostringstream out;
  out.precision(10);
  out << "node,surface,x,y,s,cp,ue\n";
  for (int i = 0; i < n; ++i) {
    const bool upper = i <= le;
    out << i << ',' << (upper ? "upper" : "lower") << ',' << p(i, 0) << ',' << p(i, 1) << ','
        << solver.arc_length()(i) << ',' << r.cp(i) << ',' << (upper ? r.ue(i) : -r.ue(i)) << '\n';
  }
  return out.str();
}

void run_inviscid(const AnalyzeArgs& a) {
  if (!a.surface_csv.empty()) require_writable(a.surface_csv);
  const Section section = load_shape(a.shape);
  PanellingOptions panelling;
  panelling.panels = a.panels;
  InviscidOptions options;
  options.mach = a.mach;
  const InviscidSolver solver(panel_nodes(section, panelling), options);
  InviscidResult r;
  if (a.alpha_deg) {
    solver.solve(*a.alpha_deg * std::numbers::pi / 180.0, r);
  } else {
    solver.solve_for_cl(*a.cl, r);
  }
  if (!a.surface_csv.empty()) write_file_atomically(a.surface_csv, surface_table(solver, r));

  const double alpha_deg = r.alpha * 180.0 / std::numbers::pi;
  if (a.json) {
    nlohmann::json j{{"shape", section.name},
                     {"analysis", "inviscid"},
                     {"panels", a.panels},
                     {"alpha", alpha_deg},
                     {"cl", r.cl},
                     {"cm", r.cm},
                     {"cp_min", r.cp_min},
                     {"cl_circulation", r.cl_circulation},
                     {"cl_pressure", r.cl_pressure},
                     {"converged", r.converged},
                     {"message", r.message}};
    if (a.mach_given) {
      j["mach"] = a.mach;
      j["cp_critical"] = r.cp_critical;
      j["critical_exceeded"] = r.critical_exceeded;
    }
    if (a.cl) j["cl_target"] = *a.cl;
    std::cout << j.dump(2) << "\n";
    return;
  }
  std::printf("%s: inviscid, %d panels%s\n", section.name.c_str(), a.panels,
              a.mach_given ? (", Mach " + std::to_string(a.mach).substr(0, 5)).c_str() : "");
  std::printf("  alpha   %9.4f deg\n", alpha_deg);
  std::printf("  cl      %9.5f   (circulation %.5f, pressure %.5f)\n", r.cl, r.cl_circulation,
              r.cl_pressure);
  std::printf("  cm c/4  %9.5f\n", r.cm);
  std::printf("  cp_min  %9.4f\n", r.cp_min);
  if (a.mach_given) {
    std::printf("  critical Cp %.4f: %s\n", r.cp_critical,
                r.critical_exceeded ? "EXCEEDED (locally supersonic)" : "not reached");
  }
  std::printf("  %s: %s\n", r.converged ? "converged" : "NOT converged", r.message.c_str());
}

void run_analyze(const AnalyzeArgs& a) {
  if (!a.alpha_deg && !a.cl)
    throw InputError("analyze: give the angle (--alpha DEG) or a target lift (--cl CL)");
  if (!a.inviscid) {
    throw InputError(
        "analyze: the viscous analysis needs --re RE (the Reynolds number); for potential flow "
        "alone add --inviscid");
  }
  run_inviscid(a);
}

}  // namespace

void add_analyze_command(CLI::App& app) {
  auto args = std::make_shared<AnalyzeArgs>();
  CLI::App* cmd = app.add_subcommand(
      "analyze",
      "Flow about one section at one angle of attack (--alpha) or at the angle that gives a "
      "lift coefficient (--cl). With --inviscid: potential flow by a linear-vorticity panel "
      "method, Karman-Tsien corrected with --mach.\n\n" +
          std::string(kCaution));
  cmd->add_option("SHAPE", args->shape,
                  "NACA designation (naca2412), CST JSON file, or coordinate file")
      ->required();
  auto* alpha = cmd->add_option("--alpha", args->alpha_deg, "Angle of attack, degrees")
                    ->check(within(-90.0, 90.0));
  auto* cl = cmd->add_option("--cl", args->cl, "Target lift coefficient (solves for the angle)")
                 ->check(within(-10.0, 10.0));
  alpha->excludes(cl);
  cl->excludes(alpha);
  cmd->add_flag("--inviscid", args->inviscid, "Potential flow only (no boundary layer)");
  cmd->add_option("--mach", args->mach, "Free-stream Mach number for the Karman-Tsien correction")
      ->check(within(0.0, 0.8));
  cmd->add_option("--panels", args->panels, "Number of panels (20 to 4000, default 160)")
      ->check(CLI::Range(20, 4000));
  cmd->add_option("--surface", args->surface_csv,
                  "Write the surface distribution to this CSV file (columns node, surface, x, y, "
                  "s, cp, ue; ue = edge velocity / free stream, positive toward the trailing "
                  "edge on each surface)");
  cmd->add_flag("--json", args->json, "Print one JSON object");
  cmd->callback([args, cmd]() {
    args->mach_given = cmd->count("--mach") > 0;
    run_analyze(*args);
  });
}

}  // namespace fulmar::app
