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
#include "app/section_options.h"
#include "common/atomic_file.h"
#include "common/error.h"
#include "common/number_text.h"
#include "geometry/panelling.h"
#include "geometry/shape_source.h"
#include "solvers/inviscid/panel_solver.h"
#include "solvers/viscous/viscous_solver.h"

namespace fulmar::app {
namespace {

struct AnalyzeArgs {
  SectionArgs section;
  ViscousArgs flow;
  std::optional<double> alpha_deg;
  std::optional<double> cl;
  std::string surface_csv;
  bool json = false;
};

// The panel node farthest from the trailing-edge midpoint: the end of the upper surface in the
// surface tables.
int leading_edge_node(const Points& p) {
  const int n = static_cast<int>(p.rows());
  const Eigen::RowVector2d te_mid = 0.5 * (p.row(0) + p.row(n - 1));
  int le = 0;
  for (int i = 0; i < n; ++i) {
    if ((p.row(i) - te_mid).norm() > (p.row(le) - te_mid).norm()) le = i;
  }
  return le;
}

// The surface table: one row per panel node, upper trailing edge -> leading edge -> lower
// trailing edge. `ue` is the edge velocity over the free stream, positive in the direction from
// the leading edge toward the trailing edge on each surface (negative between the stagnation
// point and the leading edge).
std::string surface_table(const InviscidSolver& solver, const InviscidResult& r) {
  const Points& p = solver.nodes();
  const int n = static_cast<int>(p.rows());
  const int le = leading_edge_node(p);
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

void run_inviscid(const AnalyzeArgs& args) {
  const SectionArgs& a = args.section;
  if (!args.surface_csv.empty()) require_writable(args.surface_csv);
  Section section;
  const Points nodes = section_nodes(a, section);
  InviscidOptions options;
  options.mach = a.mach;
  const InviscidSolver solver(nodes, options);
  InviscidResult r;
  if (args.alpha_deg) {
    solver.solve(*args.alpha_deg * std::numbers::pi / 180.0, r);
  } else {
    solver.solve_for_cl(*args.cl, r);
  }
  if (!args.surface_csv.empty()) write_file_atomically(args.surface_csv, surface_table(solver, r));

  const double alpha_deg = r.alpha * 180.0 / std::numbers::pi;
  if (args.json) {
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
    if (args.cl) j["cl_target"] = *args.cl;
    std::cout << j.dump(2) << "\n";
    return;
  }
  std::printf("%s - potential flow at one angle\n", section.name.c_str());
  std::printf("  flow         %s\n",
              a.mach_given ? ("Mach " + fixed_text(a.mach, 3) + " (Karman-Tsien)").c_str()
                           : "incompressible");
  std::printf("  analysis     %d panels, no boundary layer\n", a.panels);
  std::printf("  result       %s\n\n",
              r.converged ? "solved" : ("NOT solved: " + r.message).c_str());
  std::printf("  angle        %s deg%s\n", fixed_text(alpha_deg, 3).c_str(),
              args.cl ? (" (for cl " + fixed_text(*args.cl, 4) + ")").c_str() : "");
  std::printf("  loads        cl %s   cm c/4 %s\n", fixed_text(r.cl, 5).c_str(),
              fixed_text(r.cm, 5).c_str());
  std::printf("  lift check   from the circulation %s, from the pressures %s\n",
              fixed_text(r.cl_circulation, 5).c_str(), fixed_text(r.cl_pressure, 5).c_str());
  std::printf("  pressure     Cp min %s", fixed_text(r.cp_min, 4).c_str());
  if (a.mach_given) {
    std::printf(", sonic Cp %s: %s", fixed_text(r.cp_critical, 4).c_str(),
                r.critical_exceeded ? "REACHED (locally supersonic)" : "not reached");
  }
  std::printf("\n");
}

// The viscous surface table: the inviscid table's columns (ue from the viscous solution), then
// the boundary layer at each node: momentum and displacement thickness over the chord, shape
// factor H = dstar/theta, skin friction on the free-stream dynamic pressure, the regime
// (laminar or turbulent) and its transport variable: amplification factor N where laminar,
// sqrt of the shear-stress coefficient where turbulent.
std::string viscous_surface_table(const InviscidSolver& solver, const viscous::ViscousResult& r) {
  const Points& p = solver.nodes();
  const int n = static_cast<int>(p.rows());
  const int le = leading_edge_node(p);
  const bool have_kinds = static_cast<int>(r.state.kinds.size()) >= n;
  std::ostringstream out;
  out.precision(10);
  out << "node,surface,x,y,s,cp,ue,theta,dstar,shape_factor,cf,regime,n_or_sqrt_ctau\n";
  for (int i = 0; i < n; ++i) {
    const bool upper = i <= le;
    bool laminar = false;
    if (have_kinds) {
      laminar = r.state.kinds[i] == viscous::LayerKind::kLaminar;
    } else {  // not converged: no layer kinds kept; judge by the transition point
      laminar = p(i, 0) < (upper ? r.transition_upper : r.transition_lower);
    }
    out << i << ',' << (upper ? "upper" : "lower") << ',' << p(i, 0) << ',' << p(i, 1) << ','
        << solver.arc_length()(i) << ',' << r.cp(i) << ',' << (upper ? r.ue(i) : -r.ue(i)) << ','
        << r.theta(i) << ',' << r.dstar(i) << ',' << r.shape(i) << ',' << r.cf(i) << ','
        << (laminar ? "laminar" : "turbulent") << ',' << r.amplification(i) << '\n';
  }
  return out.str();
}

// A per-node vector is usable in the table: the right size and finite.
bool finite_vector(const Eigen::VectorXd& v, int n) {
  return v.size() == n && v.allFinite();
}

void run_viscous(const AnalyzeArgs& args) {
  const SectionArgs& a = args.section;
  const double re = args.flow.reynolds.front();
  const viscous::ViscousOptions options = viscous_options(a, args.flow, re);
  if (!args.surface_csv.empty()) require_writable(args.surface_csv);
  Section section;
  const Points nodes = section_nodes(a, section);
  const viscous::ViscousSolver solver(nodes, options);
  const viscous::ViscousResult r =
      args.alpha_deg ? solver.solve_alpha(*args.alpha_deg) : solver.solve_cl(*args.cl);

  if (!args.surface_csv.empty()) {
    const int n = static_cast<int>(nodes.rows());
    bool finite = true;
    for (const Eigen::VectorXd* v :
         {&r.ue, &r.cp, &r.theta, &r.dstar, &r.shape, &r.cf, &r.amplification}) {
      finite = finite && finite_vector(*v, n);
    }
    if (finite) {
      write_file_atomically(args.surface_csv, viscous_surface_table(solver.inviscid(), r));
    } else {
      // Not an input error: the solve has no usable boundary layer to tabulate.
      std::cerr << "fulmar: warning: no finite boundary layer to write; " << args.surface_csv
                << " not written\n";
    }
  }
  if (!r.converged) {
    std::cerr << "fulmar: warning: the viscous solution did not converge (" << r.reason
              << "); the numbers are the last iterate, not a solution\n";
  }
  if (args.json) {
    nlohmann::json j = r.to_json();
    j["shape"] = section.name;
    j["analysis"] = "viscous";
    j["panels"] = a.panels;
    j["re"] = re;
    j["mach"] = a.mach;
    j["ncrit"] = options.n_crit;
    j["trip_upper"] = options.trip_upper;
    j["trip_lower"] = options.trip_lower;
    if (args.cl) j["cl_target"] = *args.cl;
    std::cout << j.dump(2) << "\n";
    return;
  }
  std::printf("%s - viscous analysis at one angle\n", section.name.c_str());
  std::printf("  flow         Reynolds number %s, Mach %s\n", general_text(re, 4).c_str(),
              fixed_text(a.mach, 3).c_str());
  std::printf("  transition   %s\n", transition_words(options).c_str());
  std::printf("  analysis     %d panels, %d Newton iterations\n", a.panels, r.iterations);
  // The reason starts with what happened ("converged: max residual ..."); a failure is shouted.
  std::printf("  result       %s%s\n\n", r.converged ? "" : "NOT CONVERGED - ", r.reason.c_str());
  std::printf("  angle        %s deg%s\n", fixed_text(r.alpha, 3).c_str(),
              args.cl ? (" (for cl " + fixed_text(*args.cl, 4) + ")").c_str() : "");
  std::printf("  forces       cl %s   cd %s   cm c/4 %s\n", fixed_text(r.cl, 5).c_str(),
              fixed_text(r.cd, 6).c_str(), fixed_text(r.cm, 5).c_str());
  const double share = r.cd != 0.0 ? 100.0 / r.cd : std::nan("");
  std::printf("  drag split   friction %s (%s %%), pressure %s (%s %%)\n",
              fixed_text(r.cd_friction, 6).c_str(), fixed_text(r.cd_friction * share, 0).c_str(),
              fixed_text(r.cd_pressure, 6).c_str(), fixed_text(r.cd_pressure * share, 0).c_str());
  std::printf("  transition   upper x/c %s, lower x/c %s\n",
              fixed_text(r.transition_upper, 4).c_str(), fixed_text(r.transition_lower, 4).c_str());
}

void run_analyze(const AnalyzeArgs& a) {
  if (!a.alpha_deg && !a.cl)
    throw InputError("analyze: give the angle (--alpha DEG) or a target lift (--cl CL)");
  if (a.section.inviscid) {
    run_inviscid(a);
    return;
  }
  if (a.flow.reynolds.empty()) {
    throw InputError(
        "analyze: the viscous analysis needs --re RE (the Reynolds number); for potential flow "
        "alone add --inviscid");
  }
  run_viscous(a);
}

}  // namespace

void add_analyze_command(CLI::App& app) {
  auto args = std::make_shared<AnalyzeArgs>();
  CLI::App* cmd = app.add_subcommand(
      "analyze",
      "Flow about one section at one angle of attack (--alpha) or at the angle that gives a "
      "lift coefficient (--cl): viscous with --re, potential flow with --inviscid.\n\n"
      "Viscous (--re): a panel method strongly coupled to integral boundary layers on both "
      "surfaces and the wake, e^N transition (--ncrit) or forced transition (--trip-upper, "
      "--trip-lower), drag from the wake by Squire-Young, Karman-Tsien loads with --mach. JSON "
      "keys: alpha, cl, cd, cm, cd_friction, cd_pressure, transition_upper, "
      "transition_lower (x/c), converged, status, reason, residual, iterations, re, mach, ncrit. "
      "A solution that does not converge is a result, not an error: the exit code is 0, "
      "converged is false, status and reason say why, and a warning goes to stderr; its numbers "
      "are the last iterate and must not be used.\n\n"
      "Inviscid (--inviscid): a linear-vorticity panel method, Karman-Tsien corrected with "
      "--mach.\n\n" +
          std::string(kCaution));
  add_section_options(cmd, args->section);
  auto* alpha = cmd->add_option("--alpha", args->alpha_deg, "Angle of attack, degrees")
                    ->check(within(-90.0, 90.0));
  auto* cl = cmd->add_option("--cl", args->cl, "Target lift coefficient (solves for the angle)")
                 ->check(within(-10.0, 10.0));
  alpha->excludes(cl);
  cl->excludes(alpha);
  add_viscous_options(cmd, args->flow, false);
  cmd->add_option("--surface", args->surface_csv,
                  "Write the surface distribution to this CSV file: node, surface, x, y, s, cp, "
                  "ue (edge velocity / free stream, positive toward the trailing edge on each "
                  "surface); viscous adds theta, dstar (per chord), shape_factor (H), cf, regime "
                  "(laminar/turbulent), n_or_sqrt_ctau (N where laminar, sqrt(Ctau) where "
                  "turbulent)");
  cmd->add_flag("--json", args->json, "Print one JSON object");
  cmd->callback([args, cmd]() {
    args->section.mach_given = cmd->count("--mach") > 0;
    run_analyze(*args);
  });
}

}  // namespace fulmar::app
