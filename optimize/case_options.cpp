#include <string>

#include "cad/export.h"
#include "cad/placement.h"
#include "common/enum_names.h"
#include "optimize/case_sections.h"
#include "solvers/viscous/viscous_solver.h"

namespace fulmar::optimize {
namespace {

const EnumNames<Algorithm> kAlgorithms{{Algorithm::slsqp, "slsqp"},
                                       {Algorithm::mma, "mma"},
                                       {Algorithm::cobyla, "cobyla"},
                                       {Algorithm::isres, "isres"},
                                       {Algorithm::multistart, "multistart"}};

}  // namespace

namespace case_detail {

// The values as written (types checked here); their ranges are OptimizerOptions::Validate's.
OptimizerOptions read_optimizer(Reader r) {
  OptimizerOptions o;
  if (auto c = r.optional_child("algorithm"))
    o.algorithm = algorithm_from_string(c->string(), c->where());
  if (auto c = r.optional_child("max_evaluations")) o.max_evaluations = c->integer();
  if (auto c = r.optional_child("xtol_rel")) o.xtol_rel = c->number();
  if (auto c = r.optional_child("ftol_rel")) o.ftol_rel = c->number();
  if (auto c = r.optional_child("time_limit_s")) o.time_limit_s = c->number();
  if (auto c = r.optional_child("seed")) {
    const int s = c->integer();
    if (s < 0) c->fail("must be a whole number >= 0 (got " + std::to_string(s) + ")");
    o.seed = unsigned(s);
  }
  if (auto c = r.optional_child("starts")) o.starts = c->integer();
  if (auto c = r.optional_child("fd_step")) o.fd_step = c->number();
  if (auto c = r.optional_child("constraint_tol")) o.constraint_tol = c->number();
  r.finish();
  r.validate_fields("optimizer", [&] { o.Validate(); });
  return o;
}

// The values as written (types checked here); their ranges are AnalysisOptions::Validate's.
AnalysisOptions read_analysis(Reader r) {
  AnalysisOptions a;
  if (auto c = r.optional_child("panels")) a.panels = c->integer();
  if (auto c = r.optional_child("verify_panels")) a.verify_panels = c->integer();
  if (auto c = r.optional_child("search_cl_max_margin")) a.search_cl_max_margin = c->number();
  if (auto c = r.optional_child("polar_alpha")) {
    a.polar_alpha_min = c->child("min").number();
    a.polar_alpha_max = c->child("max").number();
    if (c->has("step")) a.polar_alpha_step = c->child("step").number();
    c->finish();
  }
  r.finish();
  r.validate_fields("analysis", [&] { a.Validate(); });
  return a;
}

OutputOptions read_outputs(Reader r) {
  OutputOptions o;
  if (auto c = r.optional_child("points")) {
    o.points = c->integer();
    if (o.points < 21 || o.points > 2001)
      c->fail("must be in 21..2001 (got " + std::to_string(o.points) + ")");
  }
  if (auto c = r.optional_child("plots")) o.plots = c->boolean();
  if (auto c = r.optional_child("report")) o.report = c->boolean();
  if (auto c = r.optional_child("polars")) o.polars = c->boolean();
  if (auto cad = r.optional_child("cad")) {
    auto formats = cad->child("formats");
    for (const Reader& f : formats.array()) {
      const std::string name = f.string();
      try {
        cad::cad_format_from_string(name, f.path());
      } catch (const InputError& e) {
        f.fail(stated_rule(e.what()) + " (got \"" + name + "\")");
      }
      o.cad_formats.push_back(name);
    }
    if (o.cad_formats.empty()) formats.fail("must name at least one format");
    if (auto u = cad->optional_child("units")) {
      o.cad_units = u->string();
      try {
        cad::length_unit_from_string(o.cad_units);
      } catch (const InputError& e) {
        u->fail(stated_rule(e.what()) + " (got \"" + o.cad_units + "\")");
      }
    }
    if (auto ch = cad->optional_child("chord")) o.cad_chord = ch->positive();
    cad->finish();
  }
  r.finish();
  return o;
}

// Every flow the run will analyse (each design point and the landing point, under each
// transition scenario) as the viscous options of that analysis, checked by their Validate():
// what --check accepts, the run accepts.
void check_analysis_options(const Reader& r, const Case& c) {
  auto check = [&](const std::string& path, double reynolds, double mach) {
    for (std::size_t k = 0; k < c.scenarios.size(); ++k) {
      const TransitionScenario& s = c.scenarios[k];
      viscous::ViscousOptions o;
      o.reynolds = reynolds;
      o.mach = mach;
      o.n_crit = s.ncrit;
      o.trip_upper = s.trip_upper;
      o.trip_lower = s.trip_lower;
      try {
        o.Validate();
      } catch (const InputError& e) {
        r.fail_at(path, "with transition scenario \"" + s.name + "\": " + e.what());
      }
    }
  };
  for (std::size_t i = 0; i < c.points.size(); ++i)
    check("/design_points/" + std::to_string(i), c.points[i].reynolds, c.points[i].mach);
  if (c.landing.present) check("/landing", c.landing.reynolds, c.landing.mach);
}

}  // namespace case_detail

std::string to_string(Algorithm a) {
  return kAlgorithms.name(a);
}

Algorithm algorithm_from_string(const std::string& name, const std::string& where) {
  return kAlgorithms.parse(name, where, "algorithm");
}

void OptimizerOptions::Validate() const {
  if (max_evaluations < 1)
    throw InputError("optimizer.max_evaluations = " + std::to_string(max_evaluations) +
                     ": must be >= 1");
  if (!(xtol_rel >= 0 && xtol_rel < 1))
    throw InputError("optimizer.xtol_rel = " + general_text(xtol_rel) + ": must be in [0, 1)");
  if (!(ftol_rel >= 0 && ftol_rel < 1))
    throw InputError("optimizer.ftol_rel = " + general_text(ftol_rel) + ": must be in [0, 1)");
  if (!(time_limit_s > 0))
    throw InputError("optimizer.time_limit_s = " + general_text(time_limit_s) + ": must be > 0");
  if (starts < 1 || starts > 100)
    throw InputError("optimizer.starts = " + std::to_string(starts) + ": must be in 1..100");
  if (!(fd_step >= 1e-8 && fd_step <= 1e-2))
    throw InputError("optimizer.fd_step = " + general_text(fd_step) + ": must be in [1e-8, 1e-2]");
  if (!(constraint_tol >= 0 && constraint_tol <= 0.1))
    throw InputError("optimizer.constraint_tol = " + general_text(constraint_tol) +
                     ": must be in [0, 0.1]");
}

void AnalysisOptions::Validate() const {
  // Fewer than 60 panels cannot resolve the leading-edge suction peak; more than 600 buys nothing
  // for a section and costs time (common practice for panel methods).
  if (panels < 60 || panels > 600)
    throw InputError("analysis.panels = " + std::to_string(panels) + ": must be in 60..600");
  if (verify_panels < panels || verify_panels > 800)
    throw InputError("analysis.verify_panels = " + std::to_string(verify_panels) +
                     ": must be >= panels (" + std::to_string(panels) + ") and <= 800");
  if (!(search_cl_max_margin >= 0 && search_cl_max_margin <= 0.2))
    throw InputError("analysis.search_cl_max_margin = " + general_text(search_cl_max_margin) +
                     ": must be in [0, 0.2]");
  // The polars of the report: beyond +-30 deg a section is far past its stall.
  if (!(polar_alpha_min >= -30 && polar_alpha_min <= 30))
    throw InputError("analysis.polar_alpha.min = " + general_text(polar_alpha_min) +
                     ": must be in [-30, 30] deg");
  if (!(polar_alpha_max >= -30 && polar_alpha_max <= 30))
    throw InputError("analysis.polar_alpha.max = " + general_text(polar_alpha_max) +
                     ": must be in [-30, 30] deg");
  if (!(polar_alpha_step >= 0.05 && polar_alpha_step <= 5))
    throw InputError("analysis.polar_alpha.step = " + general_text(polar_alpha_step) +
                     ": must be in [0.05, 5] deg");
  if (!(polar_alpha_max > polar_alpha_min))
    throw InputError("analysis.polar_alpha.max = " + general_text(polar_alpha_max) +
                     ": must be > min " + general_text(polar_alpha_min));
  if (!(polar_alpha_step > 0) || (polar_alpha_max - polar_alpha_min) / polar_alpha_step > 400)
    throw InputError("analysis.polar_alpha.step = " + general_text(polar_alpha_step) +
                     ": must be > 0 and give at most 400 angles");
}

}  // namespace fulmar::optimize
