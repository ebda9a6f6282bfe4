// `fulmar polar`: the flow about one section over a range of angles of attack.
#include <algorithm>
#include <atomic>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <exception>
#include <iostream>
#include <memory>
#include <nlohmann/json.hpp>
#include <numbers>
#include <sstream>
#include <string>
#include <thread>
#include <vector>

#include "app/cli_checks.h"
#include "app/commands.h"
#include "app/section_options.h"
#include "app/text_table.h"
#include "common/atomic_file.h"
#include "common/error.h"
#include "common/number_text.h"
#include "common/parallel_for.h"
#include "common/rule_check.h"
#include "geometry/panelling.h"
#include "geometry/shape_source.h"
#include "solvers/inviscid/panel_solver.h"
#include "solvers/viscous/polar.h"
#include "solvers/viscous/polar_csv.h"

namespace fulmar::app {
namespace {

struct PolarArgs {
  SectionArgs section;
  ViscousArgs flow;
  std::string alpha_range;
  std::string output_csv;
  bool json = false;
};

InputError bad_alpha(const std::string& text, const std::string& rule) {
  return InputError("--alpha '" + text + "': " + rule +
                    " (expected FROM:TO:STEP in degrees, e.g. -4:12:0.5)");
}

// FROM:TO:STEP -> the three numbers (the syntax only).
std::vector<double> alpha_numbers(const std::string& text) {
  auto bad = [&](const std::string& rule) { return bad_alpha(text, rule); };
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
  return v;
}

// FROM:TO:STEP in degrees for potential flow -> the angles FROM, FROM+STEP, ... up to TO
// (inclusive within 1e-9 of a step). STEP may be negative when TO < FROM; at most 10001 angles.
std::vector<double> parse_alpha_range(const std::string& text) {
  auto bad = [&](const std::string& rule) { return bad_alpha(text, rule); };
  const std::vector<double> v = alpha_numbers(text);
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

void run_inviscid(const PolarArgs& args) {
  const SectionArgs& a = args.section;
  const std::vector<double> alphas = parse_alpha_range(args.alpha_range);
  if (!args.output_csv.empty()) require_writable(args.output_csv);
  Section section;
  const Points nodes = section_nodes(a, section);
  InviscidOptions options;
  options.mach = a.mach;
  const InviscidSolver solver(nodes, options);

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
  if (!args.output_csv.empty()) write_file_atomically(args.output_csv, csv.str());

  if (args.json) {
    nlohmann::json j{{"shape", section.name},
                     {"analysis", "inviscid"},
                     {"panels", a.panels},
                     {"points", points}};
    if (a.mach_given) j["mach"] = a.mach;
    std::cout << j.dump(2) << "\n";
    return;
  }
  std::printf("%s - potential flow over %zu angles\n", section.name.c_str(), points.size());
  std::printf("  flow       %s\n",
              a.mach_given ? ("Mach " + fixed_text(a.mach, 3) + " (Karman-Tsien)").c_str()
                           : "incompressible");
  std::printf("  analysis   %d panels, no boundary layer\n\n", a.panels);
  std::vector<TextColumn> columns = {
      {"angle", "deg", 8}, {"loads", "cl", 8}, {"loads", "cm c/4", 8}, {"pressure", "Cp min", 8}};
  if (a.mach_given) columns.push_back({"pressure", "sonic", 9, true});
  TextTable table(columns);
  for (const auto& p : points) {
    std::vector<std::string> row = {
        fixed_text(p["alpha"].get<double>(), 2), fixed_text(p["cl"].get<double>(), 4),
        fixed_text(p["cm"].get<double>(), 4), fixed_text(p["cp_min"].get<double>(), 3)};
    if (a.mach_given) row.push_back(p["critical_exceeded"].get<bool>() ? "reached" : "below");
    table.add_row(row);
  }
  std::printf("%s", table.str().c_str());
}

// FROM:TO:STEP for a viscous polar, by the rules of viscous::PolarOptions (the angles are marched
// outward from zero lift and returned increasing).
viscous::PolarOptions viscous_alpha_range(const std::string& text) {
  const std::vector<double> v = alpha_numbers(text);
  viscous::PolarOptions o;
  o.alpha_from = v[0];
  o.alpha_to = v[1];
  o.alpha_step = v[2];
  static const char* const kNames[] = {"alpha_from", "alpha_to", "alpha_step"};
  static const char* const kParts[] = {"FROM", "TO", "STEP"};
  try {
    o.Validate();
  } catch (const InputError& e) {
    // The field the message is about (the first one it names) is FROM, TO or STEP.
    std::string m = e.what();
    int subject = -1;
    std::size_t first = std::string::npos;
    for (int k = 0; k < 3; ++k) {
      const auto at = m.find(std::string(kNames[k]) + " =");
      if (at < first) first = at, subject = k;
    }
    if (subject >= 0 && m.find("must") != std::string::npos)
      m = kParts[subject] + std::string(" ") + stated_rule(m);
    for (int k = 0; k < 3; ++k) {
      for (auto at = m.find(kNames[k]); at != std::string::npos; at = m.find(kNames[k]))
        m.replace(at, std::string(kNames[k]).size(), kParts[k]);
    }
    throw InputError("--alpha '" + text + "': " + m + " for a viscous polar");
  }
  return o;
}

// One Reynolds number's polar and what it took.
struct ReynoldsPolar {
  viscous::ViscousOptions options;
  viscous::Polar polar;
  double seconds = 0.0;
};

nlohmann::json polar_json(const ReynoldsPolar& p) {
  nlohmann::json points = nlohmann::json::array();
  for (const viscous::ViscousResult& r : p.polar.points) points.push_back(viscous_point_json(r));
  return {{"re", p.options.reynolds},
          {"mach", p.options.mach},
          {"ncrit", p.options.n_crit},
          {"trip_upper", p.options.trip_upper},
          {"trip_lower", p.options.trip_lower},
          {"solves", p.polar.solves},
          {"points", points},
          {"summary", p.polar.summary.to_json()}};
}

// The CSV (solvers/viscous/polar_csv.h): one row per point (all Reynolds numbers, in the order
// given); numbers of points with converged = 0 are the last iterate, not a solution.
std::string polar_csv(const std::vector<ReynoldsPolar>& polars, const std::string& section_name) {
  std::vector<viscous::PolarCsvRow> rows;
  for (const ReynoldsPolar& p : polars) {
    for (const viscous::ViscousResult& r : p.polar.points) {
      rows.push_back(viscous::polar_csv_row(r, p.options.reynolds, p.options.mach));
      rows.back().section = section_name;
    }
  }
  return viscous::polar_csv(rows);
}

// A summary value of the polar: "n/a" when the summary has none (null).
std::string summary_value(const nlohmann::json& v, int decimals) {
  return v.is_null() ? std::string(kNotAvailable) : fixed_text(v.get<double>(), decimals);
}

// fulmar's polar table: a block stating the conditions, the points grouped as angle | forces |
// drag split | transition | status, and a footer with the summary.
void print_polar_text(const std::string& name, int panels, const ReynoldsPolar& p) {
  const viscous::ViscousOptions& o = p.options;
  std::printf("%s - viscous polar\n", name.c_str());
  std::printf("  flow         Reynolds number %s, Mach %s\n", general_text(o.reynolds, 4).c_str(),
              fixed_text(o.mach, 3).c_str());
  std::printf("  transition   %s\n", transition_words(o).c_str());
  std::printf("  analysis     %d panels, %d solves in %.1f s\n\n", panels, p.polar.solves,
              p.seconds);
  TextTable table({{"angle", "deg", 7},
                   {"forces", "cl", 8},
                   {"forces", "cd", 8},
                   {"forces", "cm c/4", 8},
                   {"drag split", "friction", 8},
                   {"drag split", "pressure", 8},
                   {"transition x/c", "upper", 6},
                   {"transition x/c", "lower", 6},
                   {"status", "", 13, true}});
  int converged = 0;
  for (const viscous::ViscousResult& r : p.polar.points) {
    converged += r.converged;
    table.add_row({fixed_text(r.alpha, 2), fixed_text(r.cl, 4), fixed_text(r.cd, 5),
                   fixed_text(r.cm, 4), fixed_text(r.cd_friction, 5), fixed_text(r.cd_pressure, 5),
                   fixed_text(r.transition_upper, 3), fixed_text(r.transition_lower, 3),
                   r.converged ? "converged" : "NOT converged"});
  }
  std::printf("%s\n", table.str().c_str());
  const nlohmann::json s = p.polar.summary.to_json();
  const bool lower_bound = p.polar.summary.has_cl_max && !p.polar.summary.cl_max_bracketed;
  std::printf("  highest lift   cl_max %s%s at %s deg\n", summary_value(s["cl_max"], 4).c_str(),
              lower_bound ? " (a lower bound)" : "", summary_value(s["alpha_cl_max"], 2).c_str());
  std::printf("  least drag     cd_min %s at cl %s", summary_value(s["cd_min"], 5).c_str(),
              summary_value(s["cl_at_cd_min"], 4).c_str());
  if (!s["bucket"].is_null()) {
    std::printf("; low-drag range cl %s to %s",
                fixed_text(s["bucket"]["cl_lower"].get<double>(), 3).c_str(),
                fixed_text(s["bucket"]["cl_upper"].get<double>(), 3).c_str());
  }
  std::printf("\n  linear range   zero lift at %s deg, slope %s per deg, cm %s, centre x/c %s\n",
              summary_value(s["alpha_zero_lift"], 3).c_str(),
              summary_value(s["lift_slope_per_deg"], 4).c_str(),
              summary_value(s["cm_zero_lift"], 4).c_str(), summary_value(s["x_ac"], 4).c_str());
  std::printf("  converged      %d of %zu angles\n", converged, p.polar.points.size());
  if (!p.polar.summary.note.empty())
    std::printf("  note           %s\n", p.polar.summary.note.c_str());
}

void run_viscous(const PolarArgs& args) {
  const SectionArgs& a = args.section;
  const viscous::PolarOptions polar_options = viscous_alpha_range(args.alpha_range);
  std::vector<ReynoldsPolar> polars;
  for (double re : args.flow.reynolds) polars.push_back({viscous_options(a, args.flow, re), {}, 0});
  if (!args.output_csv.empty()) require_writable(args.output_csv);
  Section section;
  const Points nodes = section_nodes(a, section);

  // One solver and one thread per Reynolds number, at most as many threads as cores.
  parallel_for(polars.size(), 0, [&](std::size_t i) {
    const auto t0 = std::chrono::steady_clock::now();
    const viscous::ViscousSolver solver(nodes, polars[i].options);
    polars[i].polar = viscous::sweep_polar(solver, polar_options);
    polars[i].seconds =
        std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
  });

  for (const ReynoldsPolar& p : polars) {
    int failed = 0;
    for (const viscous::ViscousResult& r : p.polar.points) failed += !r.converged;
    if (failed > 0) {
      std::cerr << "fulmar: warning: Re " << p.options.reynolds << ": " << failed << " of "
                << p.polar.points.size()
                << " angles did not converge (converged false; their numbers are not a "
                   "solution)\n";
    }
  }
  if (!args.output_csv.empty())
    write_file_atomically(args.output_csv, polar_csv(polars, section.name));

  if (args.json) {
    nlohmann::json list = nlohmann::json::array();
    for (const ReynoldsPolar& p : polars) list.push_back(polar_json(p));
    nlohmann::json j{
        {"shape", section.name}, {"analysis", "viscous"}, {"panels", a.panels}, {"polars", list}};
    if (polars.size() == 1) {
      j["points"] = list[0]["points"];
      j["summary"] = list[0]["summary"];
    }
    std::cout << j.dump(2) << "\n";
    return;
  }
  for (std::size_t i = 0; i < polars.size(); ++i) {
    if (i > 0) std::printf("\n");
    print_polar_text(section.name, a.panels, polars[i]);
  }
}

void run_polar(const PolarArgs& a) {
  if (a.section.inviscid) {
    run_inviscid(a);
    return;
  }
  if (a.flow.reynolds.empty()) {
    throw InputError(
        "polar: the viscous analysis needs --re RE (the Reynolds number); for potential flow "
        "alone add --inviscid");
  }
  run_viscous(a);
}

}  // namespace

void add_polar_command(CLI::App& app) {
  auto args = std::make_shared<PolarArgs>();
  CLI::App* cmd = app.add_subcommand(
      "polar",
      "Lift, drag and moment of one section over a range of angles of attack: viscous with "
      "--re (one polar per Reynolds number), potential flow with --inviscid.\n\n"
      "Viscous (--re): each angle is solved by the coupled panel / boundary-layer method, "
      "marching outward from the zero-lift angle with each solution started from its converged "
      "neighbour (retried cold, then in smaller steps, when that fails). Several --re values "
      "run in parallel, one thread each. JSON: {\"polars\": [{re, mach, ncrit, points, "
      "summary}, ...]}, and with one --re also points and summary at the top level; each point "
      "has the keys of `fulmar analyze --json`. summary: cl_max and alpha_cl_max (refined to "
      "0.05 deg when cl falls after the maximum; a lower bound when the solutions stop "
      "converging after it; null when cl still rises at the end of the range), alpha_zero_lift, "
      "lift_slope_per_deg and x_ac (least squares over alpha_zero_lift -2 to +6 deg), "
      "cm_zero_lift, cd_min and cl_at_cd_min, bucket (the cl range where cd is within 10 % of "
      "cd_min), note. Angles that do not converge are kept with converged false and a warning "
      "on stderr (exit code 0); their numbers are not a solution.\n\n"
      "Inviscid (--inviscid): a linear-vorticity panel method (one factorisation for all "
      "angles), Karman-Tsien corrected with --mach.\n\n" +
          std::string(kCaution));
  add_section_options(cmd, args->section);
  cmd->add_option("--alpha", args->alpha_range,
                  "Angles FROM:TO:STEP in degrees, e.g. -4:12:1 (viscous: FROM <= TO, STEP > 0)")
      ->required();
  add_viscous_options(cmd, args->flow, true);
  cmd->add_option("-o,--output", args->output_csv,
                  "Write the polar to this CSV file. Viscous columns: re, mach, alpha, cl, cd, "
                  "cd_friction, cd_pressure, cm, transition_upper, transition_lower, converged, "
                  "iterations (one row per point and Reynolds number). Inviscid: alpha, cl, cm, "
                  "cp_min, converged, and critical_exceeded with --mach");
  cmd->add_flag("--json", args->json, "Print one JSON object");
  cmd->callback([args, cmd]() {
    args->section.mach_given = cmd->count("--mach") > 0;
    run_polar(*args);
  });
}

}  // namespace fulmar::app
