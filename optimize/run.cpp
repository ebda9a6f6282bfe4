#include "optimize/run.h"

#include "cad/export.h"

#include <unistd.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <map>
#include <numbers>
#include <ostream>
#include <set>
#include <sstream>

#include "common/atomic_file.h"
#include "common/error.h"
#include "geometry/coordinates_io.h"
#include "geometry/cst.h"
#include "optimize/driver.h"
#include "optimize/section_problem.h"
#include "optimize/svg_plot.h"
#include "solvers/viscous/polar_csv.h"

namespace fulmar::optimize {
namespace {

// The design vector [upper a_0.., lower a_0..] of a shape at the search's orders, clamped into
// its bounds.
std::vector<double> clamped_design(const CstShape& st, const SearchProblem& search) {
  std::vector<double> x(search.start.size());
  for (Eigen::Index i = 0; i < st.upper.size(); ++i) x[size_t(i)] = st.upper[i];
  for (Eigen::Index i = 0; i < st.lower.size(); ++i) x[size_t(st.upper.size() + i)] = st.lower[i];
  for (size_t i = 0; i < x.size(); ++i) x[i] = std::clamp(x[i], search.lower[i], search.upper[i]);
  return x;
}

namespace fs = std::filesystem;
using nlohmann::json;

std::string g6(double v, int precision = 6) {
  if (!std::isfinite(v)) return "";
  char buf[48];
  std::snprintf(buf, sizeof buf, "%.*g", precision, v);
  return buf;
}

std::string fixed(double v, int decimals) {
  if (!std::isfinite(v)) return "-";
  char buf[48];
  std::snprintf(buf, sizeof buf, "%.*f", decimals, v);
  return buf;
}

std::string csv_field(const std::string& s) {
  if (s.find_first_of(",\"\n") == std::string::npos) return s;
  std::string q = "\"";
  for (char c : s) q += (c == '"') ? std::string("\"\"") : std::string(1, c);
  return q + "\"";
}

double jnum(const json& j, const char* key) {
  if (!j.is_object() || !j.contains(key) || !j.at(key).is_number()) return std::nan("");
  return j.at(key).get<double>();
}

// The flow conditions the polars are run at: every distinct design Reynolds number and the landing.
struct PolarCondition {
  std::string name;
  FlowCondition flow;
  bool landing = false;
};

std::vector<PolarCondition> polar_conditions(const Case& c) {
  std::vector<PolarCondition> out;
  const TransitionScenario& s = c.scenarios.front();
  for (const auto& p : c.points) {
    bool seen = false;
    for (const auto& o : out)
      if (std::abs(o.flow.reynolds - p.reynolds) <= 1e-6 * p.reynolds &&
          std::abs(o.flow.mach - p.mach) < 1e-6)
        seen = true;
    if (!seen)
      out.push_back(
          {p.name, FlowCondition{p.reynolds, p.mach, s.ncrit, s.trip_upper, s.trip_lower}, false});
  }
  if (c.landing.present)
    out.push_back(
        {"landing",
         FlowCondition{c.landing.reynolds, c.landing.mach, s.ncrit, s.trip_upper, s.trip_lower},
         true});
  return out;
}

std::vector<double> polar_angles(const AnalysisOptions& a) {
  std::vector<double> alphas;
  const int n =
      int(std::floor((a.polar_alpha_max - a.polar_alpha_min) / a.polar_alpha_step + 1e-9));
  for (int i = 0; i <= n; ++i) alphas.push_back(a.polar_alpha_min + i * a.polar_alpha_step);
  return alphas;
}

struct SectionPolars {
  std::vector<std::vector<PointResult>> per_condition;
};

// The polar CSV of fulmar polar (solvers/viscous/polar_csv.h), one row per condition and angle.
std::string polar_csv(const std::vector<PolarCondition>& conds, const SectionPolars& polars,
                      const std::string& section_name) {
  std::vector<viscous::PolarCsvRow> rows;
  for (size_t k = 0; k < conds.size(); ++k) {
    for (const auto& p : polars.per_condition[k]) {
      viscous::PolarCsvRow r;
      r.re = conds[k].flow.reynolds;
      r.mach = conds[k].flow.mach;
      r.alpha = p.alpha_deg;
      r.cl = p.cl;
      r.cd = p.cd;
      r.cd_friction = p.cd_friction;
      r.cd_pressure = p.cd_pressure;
      r.cm = p.cm;
      r.transition_upper = p.transition_upper;
      r.transition_lower = p.transition_lower;
      r.converged = p.converged;
      r.iterations = p.iterations;
      r.section = section_name;
      r.condition = conds[k].name;
      rows.push_back(r);
    }
  }
  return viscous::polar_csv(rows);
}

std::string history_csv(const SearchResult& r, const std::vector<std::string>& names, double tol) {
  std::ostringstream o;
  const size_t n = r.history.empty() ? 0 : r.history.front().x.size();
  o << "evaluation,status,objective_100cd,worst_constraint,feasible";
  for (size_t i = 0; i < n; ++i) o << ",x" << i;
  for (const auto& name : names) o << "," << csv_field(name);
  o << "\n";
  for (size_t k = 0; k < r.history.size(); ++k) {
    const Evaluation& e = r.history[k];
    const double w = worst_constraint(e);
    o << k + 1 << "," << csv_field(e.status) << "," << g6(e.objective, 10) << "," << g6(w, 6) << ","
      << (e.ok && w <= tol ? "true" : "false");
    for (double x : e.x) o << "," << g6(x, 17);
    for (double g : e.constraints) o << "," << g6(g, 8);
    o << "\n";
  }
  return o.str();
}

double weighted_cd(const Case& /*c*/, const Evaluation& e) {
  if (!e.ok) return std::nan("");
  return e.objective / 100.0;
}

json section_block(const Case& c, const Evaluation& e, const std::string& name,
                   const CstShape& shape) {
  json b;
  b["name"] = name;
  b["analysis_ok"] = e.ok;
  b["status"] = e.status;
  b["panels"] = e.detail.value("panels", 0);
  const double wcd = weighted_cd(c, e);
  b["weighted_cd"] = std::isfinite(wcd) ? json(wcd) : json(nullptr);
  b["points"] = e.detail.value("points", json::array());
  const json clm = e.detail.value("cl_max", json::object());
  b["cl_max"] = clm.value("found", false) ? clm.at("cl_max") : json(nullptr);
  b["alpha_cl_max"] = clm.value("found", false) ? clm.at("alpha") : json(nullptr);
  const json g = e.detail.value("geometry", json::object());
  for (const char* k : {"thickness", "thickness_x", "camber", "camber_x", "le_radius", "te_gap",
                        "te_angle_deg", "area"})
    b[k] = g.value(k, 0.0);
  b["t_c"] = g.value("thickness", 0.0);
  b["cst"] = cst_to_json(shape, name);
  return b;
}

// ---- plots ----

Chart section_chart(const CstShape& base, const CstShape& opt) {
  Chart c;
  c.title = "Sections";
  c.x_label = "x/c";
  c.y_label = "y/c";
  c.equal_aspect = true;
  c.height = 260;
  for (int k = 0; k < 2; ++k) {
    const Section s = cst_section(k == 0 ? base : opt, 121);
    Series se;
    se.label = k == 0 ? "baseline" : "optimized";
    se.colour = k == 0 ? kBaselineColour : kOptimizedColour;
    se.dashed = k == 0;
    for (Eigen::Index i = 0; i < s.points.rows(); ++i)
      se.x.push_back(s.points(i, 0)), se.y.push_back(s.points(i, 1));
    c.series.push_back(se);
  }
  return c;
}

Chart distribution_chart(const CstShape& base, const CstShape& opt, bool thickness) {
  Chart c;
  c.title = thickness ? "Thickness distribution" : "Camber distribution";
  c.x_label = "x/c";
  c.y_label = thickness ? "t/c" : "camber / c";
  c.height = 220;
  for (int k = 0; k < 2; ++k) {
    const CstShape& s = k == 0 ? base : opt;
    Series se;
    se.label = k == 0 ? "baseline" : "optimized";
    se.colour = k == 0 ? kBaselineColour : kOptimizedColour;
    se.dashed = k == 0;
    for (int i = 0; i <= 120; ++i) {
      const double x = 0.5 * (1 - std::cos(std::numbers::pi * i / 120));
      se.x.push_back(x);
      se.y.push_back(thickness ? cst_upper_y(s, x) - cst_lower_y(s, x)
                               : 0.5 * (cst_upper_y(s, x) + cst_lower_y(s, x)));
    }
    c.series.push_back(se);
  }
  return c;
}

Series polar_series(const std::vector<PointResult>& p, bool optimized, int what) {
  // what: 0 cd-cl, 1 alpha-cl, 2 alpha-cm
  Series s;
  s.label = optimized ? "optimized" : "baseline";
  s.colour = optimized ? kOptimizedColour : kBaselineColour;
  s.dashed = !optimized;
  for (const auto& r : p) {
    const double nan = std::nan("");
    const bool ok = r.converged;
    s.x.push_back(what == 0 ? (ok ? r.cd : nan) : r.alpha_deg);
    s.y.push_back(!ok ? nan : (what == 2 ? r.cm : r.cl));
  }
  return s;
}

}  // namespace

void require_output_dir(const fs::path& dir) {
  std::error_code ec;
  if (fs::exists(dir, ec)) {
    if (!fs::is_directory(dir, ec))
      throw InputError(dir.string() + ": exists and is not a directory");
    if (::access(dir.c_str(), W_OK) != 0)
      throw InputError(dir.string() + ": directory is not writable");
    return;
  }
  const fs::path parent = dir.has_parent_path() ? dir.parent_path() : fs::path(".");
  if (!fs::is_directory(parent, ec))
    throw InputError(dir.string() + ": cannot create the output directory (" + parent.string() +
                     " does not exist)");
  if (::access(parent.c_str(), W_OK) != 0)
    throw InputError(dir.string() + ": cannot create the output directory (" + parent.string() +
                     " is not writable)");
}

RunOutcome run_optimization(const Case& c, const SectionEvaluator& evaluator,
                            const RunOptions& options) {
  // Everything that can fail on input is checked before the first file is written.
  require_output_dir(options.output_dir);
  const BaselineShape baseline = resolve_baseline(c);
  const DesignSpace space = design_space(c, baseline.shape);
  const SectionProblem problem(c, evaluator, space);
  const fs::path dir = options.output_dir;
  if (options.resume && !fs::exists(dir / kCheckpointFile))
    throw InputError((dir / kCheckpointFile).string() +
                     ": no checkpoint to resume from (run without --resume first)");

  json identity = c.source;
  if (identity.contains("optimizer")) {
    identity["optimizer"].erase("max_evaluations");
    identity["optimizer"].erase("time_limit_s");
  }
  identity.erase("outputs");
  identity["evaluator"] = evaluator.description();
  if (options.start_shape) identity["start"] = cst_to_json(*options.start_shape, "start");

  SearchSettings settings;
  settings.options = c.optimizer;
  settings.checkpoint = dir / kCheckpointFile;
  settings.fingerprint = identity.dump();
  settings.resume = options.resume;
  settings.threads = options.threads;
  settings.stop = options.stop;
  settings.progress = options.progress;
  if (options.progress)
    *options.progress << "fulmar optimize: " << c.name << ": " << space.start.size()
                      << " CST coefficients, " << problem.constraint_names().size()
                      << " constraints, algorithm " << to_string(c.optimizer.algorithm)
                      << ", budget " << c.optimizer.max_evaluations << " analyses"
                      << (options.resume ? ", resuming" : "") << "\n"
                      << std::flush;
  SearchProblem search = problem.search_problem();
  if (options.start_shape) {
    const CstShape& st = *options.start_shape;
    if (st.upper.size() != space.layout.upper.size() ||
        st.lower.size() != space.layout.lower.size())
      throw InputError("start design: its CST orders " + std::to_string(st.upper.size() - 1) + "/" +
                       std::to_string(st.lower.size() - 1) + " differ from the case's " +
                       std::to_string(c.parameterization.order_upper) + "/" +
                       std::to_string(c.parameterization.order_lower));
    search.start = clamped_design(st, search);
  }
  if (c.second_start) {
    const std::vector<double> x = clamped_design(resolve_shape(c, *c.second_start).shape, search);
    if (x != search.start) search.extra_starts.push_back(x);
  }
  fs::create_directories(dir);
  const SearchResult r = run_search(search, settings);
  const double tol = c.optimizer.constraint_tol;

  // Re-verification: fresh analyses with finer panels of the baseline and the chosen design.
  // A verification that does not converge at verify_panels is repeated with a few more panels
  // (a different discretisation of the same section); the panel count used is in the summary.
  auto verify = [&](const std::vector<double>& x) {
    Evaluation e = problem.evaluate(x, c.analysis.verify_panels);
    for (int extra : {8, 16, 24, 40}) {
      if (e.ok) break;
      e = problem.evaluate(x, c.analysis.verify_panels + extra);
    }
    return e;
  };
  // The search's best feasible design usually sits on a constraint boundary (cl_max, most
  // often), where the finer verification can land just outside it. So the search-feasible designs
  // are verified in order of objective, up to kVerifyCandidates of them, and the first that the
  // verification finds feasible is the optimum; when none is, the best one is reported as it
  // verified (infeasible). Deterministic in the history, so a resumed run chooses the same.
  std::vector<int> candidates;
  for (int i = 0; i < static_cast<int>(r.history.size()); ++i)
    if (r.history[size_t(i)].ok && worst_constraint(r.history[size_t(i)]) <= tol)
      candidates.push_back(i);
  std::stable_sort(candidates.begin(), candidates.end(), [&](int a, int b) {
    return r.history[size_t(a)].objective < r.history[size_t(b)].objective;
  });
  if (candidates.size() > kVerifyCandidates) candidates.resize(kVerifyCandidates);
  if (candidates.empty()) candidates.push_back(r.best_any);  // -1: the baseline
  const Evaluation base_v = verify(space.start);
  std::vector<double> x_opt;
  Evaluation opt_v;
  json verified = json::array();
  for (size_t k = 0; k < candidates.size(); ++k) {
    const int i = candidates[k];
    const std::vector<double> x = i >= 0 ? r.history[size_t(i)].x : space.start;
    if (options.progress)
      *options.progress << "verifying " << (k == 0 ? "the optimum" : "the next-best design")
                        << " (evaluation " << i + 1 << ") with " << c.analysis.verify_panels
                        << " panels\n"
                        << std::flush;
    Evaluation e = verify(x);
    const bool ok = e.ok && worst_constraint(e) <= tol;
    verified.push_back(
        {{"evaluation", i + 1},
         {"search_objective", i >= 0 ? json(r.history[size_t(i)].objective) : json(nullptr)},
         {"verified_objective", e.ok ? json(e.objective) : json(nullptr)},
         {"feasible", ok},
         {"status", e.status}});
    if (k == 0 || ok) {
      x_opt = x;
      opt_v = std::move(e);
    }
    if (ok) break;
  }
  // Never worse than the start: a search whose gains at the search panels do not survive the
  // verification (or whose candidates all fail it) keeps a start that verifies feasible and
  // better. In a study, where each point starts from a neighbour's optimum that also meets this
  // point's constraints, that makes the swept cd follow the constraint monotonically.
  bool kept_start = false;
  {
    const bool same = search.start == space.start;
    const Evaluation start_v = same ? base_v : verify(search.start);
    const bool start_ok = start_v.ok && worst_constraint(start_v) <= tol;
    const bool opt_ok = opt_v.ok && worst_constraint(opt_v) <= tol;
    if (start_ok && (!opt_ok || start_v.objective < opt_v.objective)) {
      kept_start = true;
      x_opt = search.start;
      opt_v = start_v;
      if (options.progress)
        *options.progress << "the start design verifies feasible and better than the search's "
                             "candidates: it is kept as the optimum\n"
                          << std::flush;
    }
  }
  const CstShape opt_shape = space.shape(x_opt);
  const bool feasible = opt_v.ok && worst_constraint(opt_v) <= tol;

  const std::string opt_name = c.name + " optimized";
  json files = json::object();
  auto put = [&](const std::string& key, const std::string& file, const std::string& content) {
    write_file_atomically(dir / file, content);
    files[key] = (dir / file).string();
  };

  const int per_surface = (c.outputs.points + 1) / 2;
  const Section opt_section = cst_section(opt_shape, per_surface, opt_name);
  put("coordinates", "optimized.dat", coordinates_text(opt_section));
  put("coordinates_csv", "optimized.csv", coordinates_csv(opt_section));
  put("cst", "optimized_cst.json", cst_to_json(opt_shape, opt_name).dump(2) + "\n");
  put("baseline_cst", "baseline_cst.json",
      cst_to_json(baseline.shape, baseline.name).dump(2) + "\n");
  put("history", "history.csv", history_csv(r, problem.constraint_names(), tol));
  for (const std::string& format_name : c.outputs.cad_formats) {
    cad::ExportOptions e;
    e.format = cad::cad_format_from_string(format_name);
    e.placement.units = cad::length_unit_from_string(c.outputs.cad_units);
    e.placement.chord = c.outputs.cad_chord > 0
                            ? c.outputs.cad_chord
                            : c.airplane->chord / cad::metres_per_unit(e.placement.units);
    const std::string file = "optimized_cad." + format_name;
    const cad::ExportReport report = cad::export_section(opt_section, e, dir / file);
    files["cad_" + format_name] = (dir / file).string();
    if (options.progress)
      *options.progress << "wrote " << file << ": " << report.message << "\n" << std::flush;
  }

  const auto conds = polar_conditions(c);
  SectionPolars base_p, opt_p;
  if (c.outputs.polars || c.outputs.plots) {
    const auto alphas = polar_angles(c.analysis);
    const Section bs = cst_section(baseline.shape, 161, baseline.name);
    const Section os = cst_section(opt_shape, 161, opt_name);
    for (const auto& k : conds) {
      base_p.per_condition.push_back(evaluator.polar(bs, k.flow, alphas, c.analysis.verify_panels));
      opt_p.per_condition.push_back(evaluator.polar(os, k.flow, alphas, c.analysis.verify_panels));
    }
  }
  if (c.outputs.polars) {
    put("polar_baseline", "polar_baseline.csv", polar_csv(conds, base_p, baseline.name));
    put("polar_optimized", "polar_optimized.csv", polar_csv(conds, opt_p, opt_name));
  }

  json constraints = SectionProblem::constraint_table(opt_v);
  int failed = 0;
  for (const auto& e : r.history) failed += e.ok ? 0 : 1;

  if (c.outputs.plots) {
    put("plot_sections", "sections.svg",
        svg_document({section_chart(baseline.shape, opt_shape),
                      distribution_chart(baseline.shape, opt_shape, true),
                      distribution_chart(baseline.shape, opt_shape, false)}));
    std::vector<Chart> polar_charts, lift_charts;
    for (size_t k = 0; k < conds.size(); ++k) {
      Chart pc;
      pc.title = "Drag polar, " + conds[k].name + " (Re " + g6(conds[k].flow.reynolds, 3) + ")";
      pc.x_label = "cd";
      pc.y_label = "cl";
      pc.series = {polar_series(base_p.per_condition[k], false, 0),
                   polar_series(opt_p.per_condition[k], true, 0)};
      if (conds[k].landing && !std::isnan(c.constraints.cl_max_min))
        pc.guides.push_back({"cl_max required " + fixed(c.constraints.cl_max_min, 2),
                             c.constraints.cl_max_min, true});
      // Design points at this Reynolds number, as verified.
      for (int which = 0; which < 2; ++which) {
        Series dp;
        dp.label = which == 0 ? "" : "design points";
        dp.line = false;
        dp.markers = true;
        dp.colour = which == 0 ? kBaselineColour : kOptimizedColour;
        const json pts = (which == 0 ? base_v : opt_v).detail.value("points", json::array());
        for (const auto& p : pts)
          if (std::abs(jnum(p, "reynolds") - conds[k].flow.reynolds) <=
                  1e-6 * conds[k].flow.reynolds &&
              p.value("converged", false))
            dp.x.push_back(jnum(p, "cd")), dp.y.push_back(jnum(p, "cl"));
        if (!dp.x.empty()) pc.series.push_back(dp);
      }
      polar_charts.push_back(pc);
      Chart la;
      la.title = "Lift, " + conds[k].name + " (Re " + g6(conds[k].flow.reynolds, 3) + ")";
      la.x_label = "alpha (deg)";
      la.y_label = "cl";
      la.height = 260;
      la.series = {polar_series(base_p.per_condition[k], false, 1),
                   polar_series(opt_p.per_condition[k], true, 1)};
      Chart ma = la;
      ma.title = "Pitching moment about c/4, " + conds[k].name;
      ma.y_label = "cm";
      ma.series = {polar_series(base_p.per_condition[k], false, 2),
                   polar_series(opt_p.per_condition[k], true, 2)};
      if (!conds[k].landing && !std::isnan(c.points.front().cm_min))
        ma.guides.push_back({"cm limit", c.points.front().cm_min, true});
      lift_charts.push_back(la);
      lift_charts.push_back(ma);
    }
    put("plot_polars", "polars.svg", svg_document(polar_charts));
    put("plot_lift_moment", "lift_moment.svg", svg_document(lift_charts));

    Chart cp;
    const DesignPoint& cruise = c.points.front();
    const TransitionScenario& s0 = c.scenarios.front();
    cp.title = "Pressure at " + cruise.name + " (cl " + fixed(cruise.cl, 3) + ", Re " +
               g6(cruise.reynolds, 3) + ")";
    cp.x_label = "x/c";
    cp.y_label = "Cp";
    cp.flip_y = true;
    const FlowCondition f0{cruise.reynolds, cruise.mach, s0.ncrit, s0.trip_upper, s0.trip_lower};
    for (int k = 0; k < 2; ++k) {
      const Points p = evaluator.pressure(cst_section(k == 0 ? baseline.shape : opt_shape, 161), f0,
                                          cruise.cl, c.analysis.verify_panels);
      Series se;
      se.label = k == 0 ? "baseline" : "optimized";
      se.colour = k == 0 ? kBaselineColour : kOptimizedColour;
      se.dashed = k == 0;
      for (Eigen::Index i = 0; i < p.rows(); ++i) se.x.push_back(p(i, 0)), se.y.push_back(p(i, 1));
      cp.series.push_back(se);
    }
    put("plot_cp", "cp_cruise.svg", svg_document({cp}));

    Chart conv;
    conv.title = "Convergence";
    conv.x_label = "evaluation";
    conv.y_label = "100 x weighted cd";
    Series all, best;
    all.label = "each analysis";
    all.line = false;
    all.markers = true;
    all.colour = "#9db4c8";
    best.label = "best feasible so far";
    best.colour = kOptimizedColour;
    double best_so_far = std::nan("");
    for (size_t k = 0; k < r.history.size(); ++k) {
      const Evaluation& e = r.history[k];
      all.x.push_back(double(k + 1));
      all.y.push_back(e.ok ? e.objective : std::nan(""));
      if (e.ok && worst_constraint(e) <= tol && !(e.objective >= best_so_far))
        best_so_far = e.objective;
      best.x.push_back(double(k + 1));
      best.y.push_back(best_so_far);
    }
    conv.series = {all, best};
    Chart viol;
    viol.title = "Worst scaled constraint (<= 0 is met)";
    viol.x_label = "evaluation";
    viol.y_label = "worst constraint";
    viol.height = 240;
    Series w;
    w.colour = "#1f4e79";
    for (size_t k = 0; k < r.history.size(); ++k) {
      w.x.push_back(double(k + 1));
      w.y.push_back(r.history[k].ok ? std::clamp(worst_constraint(r.history[k]), -1.0, 1.0)
                                    : std::nan(""));
    }
    viol.series = {w};
    viol.guides.push_back({"feasible below", 0.0, true, "#2e8b57"});
    put("plot_convergence", "convergence.svg", svg_document({conv, viol}));
  }

  json summary;
  summary["case"] = c.name;
  summary["case_file"] = c.path.string();
  summary["description"] = c.description;
  summary["evaluator"] = evaluator.description();
  if (c.airplane)
    summary["airplane"] = {{"mass", c.airplane->mass},
                           {"wing_area", c.airplane->wing_area},
                           {"chord", c.airplane->chord}};
  json dps = json::array();
  for (const auto& p : c.points) {
    json d{{"name", p.name},
           {"cl", p.cl},
           {"reynolds", p.reynolds},
           {"mach", p.mach},
           {"weight", p.weight}};
    if (!std::isnan(p.cm_min)) d["cm_min"] = p.cm_min;
    if (p.from_airplane) d["speed"] = p.speed, d["altitude"] = p.altitude;
    dps.push_back(d);
  }
  summary["design_points"] = dps;
  json scen = json::array();
  for (const auto& s : c.scenarios)
    scen.push_back({{"name", s.name},
                    {"ncrit", s.ncrit},
                    {"trip_upper", s.trip_upper},
                    {"trip_lower", s.trip_lower},
                    {"weight", s.weight}});
  summary["transition_scenarios"] = scen;
  if (c.landing.present) {
    json l{{"reynolds", c.landing.reynolds}, {"mach", c.landing.mach}};
    if (!std::isnan(c.landing.stall_speed)) l["stall_speed"] = c.landing.stall_speed;
    if (!std::isnan(c.landing.cl_max_required)) l["cl_max_required"] = c.landing.cl_max_required;
    summary["landing"] = l;
  }
  summary["baseline"] = section_block(c, base_v, baseline.name, baseline.shape);
  summary["baseline"]["fit_max_deviation"] = baseline.fit_deviation;
  summary["optimized"] = section_block(c, opt_v, opt_name, opt_shape);
  const double cd0 = weighted_cd(c, base_v), cd1 = weighted_cd(c, opt_v);
  summary["drag_reduction_percent"] = std::isfinite(cd0) && std::isfinite(cd1) && cd0 > 0
                                          ? json(100.0 * (1 - cd1 / cd0))
                                          : json(nullptr);
  summary["constraints"] = constraints;
  summary["feasible"] = feasible;
  summary["evaluations"] = r.history.size();
  summary["verified_candidates"] = verified;
  summary["optimum_is_start"] = kept_start;
  summary["failed_evaluations"] = failed;
  summary["iterations"] = r.iterations;
  summary["converged"] = r.converged;
  summary["stop_reason"] = r.stop_reason;
  summary["interrupted"] = r.interrupted;
  summary["replayed_from_checkpoint"] = r.replayed;
  summary["elapsed_s"] = r.elapsed_s;
  summary["algorithm"] = to_string(c.optimizer.algorithm);
  summary["search_panels"] = c.analysis.panels;
  summary["verify_panels"] = c.analysis.verify_panels;
  files["checkpoint"] = (dir / kCheckpointFile).string();

  if (c.outputs.report) {
    std::ostringstream m;
    m << "# " << c.name << ": section design report\n\n";
    if (!options.caution.empty()) m << "> **" << options.caution << "**\n\n";
    if (!c.description.empty()) m << c.description << "\n\n";
    m << "## Airplane and design conditions\n\n";
    if (c.airplane)
      m << "Mass " << fixed(c.airplane->mass, 1) << " kg, wing area "
        << fixed(c.airplane->wing_area, 2) << " m², mean chord " << fixed(c.airplane->chord, 3)
        << " m.\n\n";
    m << "| point | cl | Re | M | weight | flight |\n|---|---|---|---|---|---|\n";
    for (const auto& p : c.points)
      m << "| " << p.name << " | " << fixed(p.cl, 3) << " | " << g6(p.reynolds, 3) << " | "
        << fixed(p.mach, 3) << " | " << g6(p.weight, 3) << " | "
        << (p.from_airplane ? fixed(p.speed, 1) + " m/s at " + fixed(p.altitude, 0) + " m"
                            : std::string("given"))
        << " |\n";
    if (c.landing.present)
      m << "\nLanding: Re " << g6(c.landing.reynolds, 3) << ", M " << fixed(c.landing.mach, 3)
        << (std::isnan(c.landing.stall_speed)
                ? std::string("")
                : ", stall speed " + fixed(c.landing.stall_speed, 1) + " m/s")
        << "; section cl_max required " << fixed(c.constraints.cl_max_min, 3) << ".\n";
    m << "\nTransition scenarios:";
    for (const auto& s : c.scenarios)
      m << " " << s.name << " (N " << g6(s.ncrit, 3) << ", trips " << g6(s.trip_upper, 3) << "/"
        << g6(s.trip_lower, 3) << ", weight " << g6(s.weight, 3) << ");";
    m << "\n\n## Result\n\n";
    m << (feasible ? "The optimized section meets every constraint in the verification analysis."
                   : "**The optimized section does NOT meet every constraint in the verification "
                     "analysis.**")
      << " Search: " << to_string(c.optimizer.algorithm) << ", " << r.history.size()
      << " analyses (" << failed << " failed), " << r.stop_reason
      << (r.interrupted ? " (interrupted)" : "") << ". Verification with "
      << c.analysis.verify_panels << " panels (search: " << c.analysis.panels
      << "). Analysis: " << evaluator.description() << ".";
    if (kept_start)
      m << " No design of the search verified feasible and better than the start, which is "
           "therefore the result.";
    else if (verified.size() > 1 && feasible)
      m << " The " << verified.size() - 1
        << " better design(s) of the search did not meet every constraint when verified; the "
           "result is the best one that did.";
    else if (verified.size() > 1)
      m << " None of the " << verified.size()
        << " best designs of the search met every constraint when verified; the best is shown.";
    m << "\n\n";
    m << "| point | section | alpha (deg) | cl | cd | cm c/4 | transition up / low "
         "|\n|---|---|---|---|---|---|---|\n";
    for (int k = 0; k < 2; ++k) {
      const json pts = (k == 0 ? base_v : opt_v).detail.value("points", json::array());
      for (const auto& p : pts)
        m << "| " << p.value("point", std::string())
          << (c.scenarios.size() > 1 ? "/" + p.value("scenario", std::string()) : "") << " | "
          << (k == 0 ? "baseline" : "optimized") << " | " << fixed(jnum(p, "alpha"), 2) << " | "
          << fixed(jnum(p, "cl"), 3) << " | " << fixed(jnum(p, "cd"), 5) << " | "
          << fixed(jnum(p, "cm"), 4) << " | " << fixed(jnum(p, "transition_upper"), 3) << " / "
          << fixed(jnum(p, "transition_lower"), 3) << " |\n";
    }
    m << "\nWeighted cd: baseline " << fixed(cd0, 5) << ", optimized " << fixed(cd1, 5);
    if (std::isfinite(cd0) && std::isfinite(cd1) && cd0 > 0)
      m << " (" << fixed(100 * (1 - cd1 / cd0), 1) << " % less)";
    m << ".\n\nGeometry: baseline " << baseline.name << " t/c "
      << fixed(summary["baseline"]["t_c"].get<double>(), 4) << "; optimized t/c "
      << fixed(summary["optimized"]["t_c"].get<double>(), 4) << " at x/c "
      << fixed(summary["optimized"]["thickness_x"].get<double>(), 3) << ", camber "
      << fixed(summary["optimized"]["camber"].get<double>(), 4) << ".\n\n";
    m << "## Constraints (verification)\n\n| constraint | value | limit | met "
         "|\n|---|---|---|---|\n";
    for (const auto& k : constraints)
      m << "| " << k.at("name").get<std::string>() << " | "
        << (k.at("value").is_number() ? g6(k.at("value").get<double>(), 5)
                                      : std::string("(analysis failed)"))
        << " | " << (k.at("kind") == "min" ? ">= " : "<= ") << g6(k.at("limit").get<double>(), 5)
        << " | " << (k.at("satisfied").get<bool>() ? "yes" : "**no**") << " |\n";
    if (c.outputs.plots) {
      m << "\n## Plots\n\n";
      for (const auto& [file, title] : std::vector<std::pair<std::string, std::string>>{
               {"sections.svg", "Sections, thickness and camber"},
               {"polars.svg", "Drag polars"},
               {"lift_moment.svg", "Lift and moment"},
               {"cp_cruise.svg", "Pressure at the first design point"},
               {"convergence.svg", "Convergence"}})
        m << "![" << title << "](" << file << ")\n\n";
    }
    m << "## Files\n\nCoordinates for CAD: `optimized.dat` (plain text) and `optimized.csv`, "
      << c.outputs.points
      << " points; CST description: `optimized_cst.json`; polars: `polar_baseline.csv`, "
         "`polar_optimized.csv`; "
         "every analysis: `history.csv`; all figures: `summary.json`.\n\n";
    m << "## Cautions\n\nThese are two-dimensional section estimates from a numerical model (panel "
         "method with an "
         "integral boundary layer). Three-dimensional effects, surface quality, contamination and "
         "manufacturing "
         "tolerances change the real drag and maximum lift.\n";
    if (!options.caution.empty()) m << "\n" << options.caution << "\n";
    files["report"] = (dir / "report.md").string();
    summary["files"] = files;
    write_file_atomically(dir / "report.md", m.str());
  }
  summary["files"] = files;
  summary["files"]["summary"] = (dir / kSummaryFile).string();
  write_file_atomically(dir / kSummaryFile, summary.dump(2) + "\n");

  RunOutcome out;
  out.interrupted = r.interrupted;
  out.converged = r.converged;
  out.feasible = feasible;
  out.summary = summary;
  return out;
}

}  // namespace fulmar::optimize
