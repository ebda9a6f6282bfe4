#include "optimize/case_file.h"

#include "cad/export.h"

#include <cmath>
#include <fstream>
#include <set>
#include <sstream>
#include <tuple>

#include "cad/placement.h"
#include "common/enum_names.h"
#include "common/error.h"
#include "common/json_text.h"
#include "common/number_text.h"
#include "common/rule_check.h"
#include "geometry/naca.h"
#include "solvers/viscous/viscous_solver.h"

namespace fulmar::optimize {
namespace {

using nlohmann::json;

std::string number_text(double v) {
  return general_text(v, 6);
}

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

const EnumNames<Algorithm> kAlgorithms{{Algorithm::slsqp, "slsqp"},
                                       {Algorithm::mma, "mma"},
                                       {Algorithm::cobyla, "cobyla"},
                                       {Algorithm::isres, "isres"},
                                       {Algorithm::multistart, "multistart"}};

// A JSON node with its pointer path; object readers record the keys they consume so that any key
// left over is reported as unknown.
class Reader {
 public:
  Reader(const json& node, std::string path, const std::string* label)
      : node_(&node), path_(std::move(path)), label_(label) {}

  [[noreturn]] void fail(const std::string& rule) const { fail_at(path_, rule); }
  [[noreturn]] void fail_at(const std::string& path, const std::string& rule) const {
    throw InputError(*label_ + ": " + (path.empty() ? "/" : path) + ": " + rule);
  }
  const std::string& path() const { return path_; }
  std::string where() const { return *label_ + ": " + path_; }
  const json& node() const { return *node_; }

  void expect_object() const {
    if (!node_->is_object())
      fail("must be an object (got " + std::string(node_->type_name()) + ")");
  }
  bool has(const std::string& key) {
    expect_object();
    return node_->contains(key);
  }
  Reader child(const std::string& key) {
    expect_object();
    if (!node_->contains(key)) fail_at(path_ + "/" + key, "missing required field");
    used_.insert(key);
    return Reader(node_->at(key), path_ + "/" + key, label_);
  }
  std::optional<Reader> optional_child(const std::string& key) {
    expect_object();
    if (!node_->contains(key) || node_->at(key).is_null()) {
      used_.insert(key);
      return std::nullopt;
    }
    return child(key);
  }
  // Reports the first key of this object that no reader asked for.
  void finish() const {
    for (auto it = node_->begin(); it != node_->end(); ++it) {
      if (!used_.count(it.key())) fail_at(path_ + "/" + it.key(), "unknown key");
    }
  }

  double number() const {
    if (!node_->is_number()) fail("must be a number (got " + std::string(node_->type_name()) + ")");
    const double v = node_->get<double>();
    if (!std::isfinite(v)) fail("must be a finite number");
    return v;
  }
  int integer() const {
    if (!node_->is_number_integer())
      fail("must be an integer (got " + std::string(node_->type_name()) + ")");
    return node_->get<int>();
  }
  std::string string() const {
    if (!node_->is_string()) fail("must be a string (got " + std::string(node_->type_name()) + ")");
    return node_->get<std::string>();
  }
  bool boolean() const {
    if (!node_->is_boolean())
      fail("must be true or false (got " + std::string(node_->type_name()) + ")");
    return node_->get<bool>();
  }
  std::vector<Reader> array() const {
    if (!node_->is_array()) fail("must be an array (got " + std::string(node_->type_name()) + ")");
    std::vector<Reader> items;
    for (size_t i = 0; i < node_->size(); ++i)
      items.emplace_back((*node_)[i], path_ + "/" + std::to_string(i), label_);
    return items;
  }

  // Range checks that name the rule.
  double positive() const {
    const double v = number();
    if (!(v > 0)) fail("must be > 0 (got " + number_text(v) + ")");
    return v;
  }
  double in_range(double lo, double hi, bool lo_open, bool hi_open) const {
    const double v = number();
    const bool ok = (lo_open ? v > lo : v >= lo) && (hi_open ? v < hi : v <= hi);
    if (!ok)
      fail("must be in " + std::string(lo_open ? "(" : "[") + number_text(lo) + ", " +
           number_text(hi) + (hi_open ? ")" : "]") + " (got " + number_text(v) + ")");
    return v;
  }

  // The number here, accepted by `rule` (a callable taking the value that throws InputError, as
  // a Validate() does); its error is re-worded with this path and the value.
  template <class Rule>
  double number_by(Rule&& rule) const {
    const double v = number();
    try {
      rule(v);
    } catch (const InputError& e) {
      throw InputError(*label_ + ": " +
                       placed_rule(path_.empty() ? "/" : path_, number_text(v), e.what()));
    }
    return v;
  }

  // Runs `validate` on options read from this object; its InputError "<prefix>.<field> = value:
  // rule" is reported at this object's path / <field> (dots become slashes).
  template <class Validate>
  void validate_fields(const std::string& prefix, Validate&& validate) const {
    try {
      validate();
    } catch (const InputError& e) {
      const std::string m = e.what();
      const auto eq = m.find(" = ");
      if (m.rfind(prefix + ".", 0) != 0 || eq == std::string::npos) fail(m);
      std::string field = m.substr(prefix.size() + 1, eq - prefix.size() - 1);
      for (char& c : field)
        if (c == '.') c = '/';
      const auto colon = m.find(": ", eq);
      const std::string got = m.substr(eq + 3, colon == std::string::npos ? 0 : colon - eq - 3);
      fail_at(path_ + "/" + field, stated_rule(m) + " (got " + got + ")");
    }
  }

  double number_or(const std::string& key, double fallback) {
    auto c = optional_child(key);
    return c ? c->number() : fallback;
  }

 private:
  const json* node_;
  std::string path_;
  const std::string* label_;
  std::set<std::string> used_;
};

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
      r.fail_at(speed_path, std::string("gives a ") + name + " of " + number_text(value) +
                                "; the viscous analysis' " + stated_rule(e.what()));
    }
  }
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
      r.fail_at(r.path() + "/speed", "gives a cruise cl of " + number_text(p.cl) + ", above " +
                                         number_text(kDesignClMax) +
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
                "needs a section cl_max of " + number_text(l.cl_max_required) +
                    ", beyond what a clean section reaches (about 2.4 at most: common practice)");
  } else {
    l.reynolds = read_reynolds(r.child("reynolds"));
    l.mach = r.has("mach") ? read_mach(r.child("mach")) : 0.0;
  }
  r.finish();
  return l;
}

void read_min_max(Reader r, double& min, double& max, double lo, double hi) {
  if (auto c = r.optional_child("min")) min = c->in_range(lo, hi, false, false);
  if (auto c = r.optional_child("max")) max = c->in_range(lo, hi, false, false);
  if (std::isnan(min) && std::isnan(max)) r.fail("needs min or max");
  if (!std::isnan(min) && !std::isnan(max) && min > max)
    r.fail_at(r.path() + "/max",
              "must be >= min " + number_text(min) + " (got " + number_text(max) + ")");
  r.finish();
}

double read_min_only(Reader r, double lo, double hi, bool lo_open) {
  const double v = r.child("min").in_range(lo, hi, lo_open, false);
  r.finish();
  return v;
}

Constraints read_constraints(Reader r, const std::vector<DesignPoint>& points,
                             const LandingPoint& landing, std::vector<DesignPoint>& points_out) {
  Constraints c;
  points_out = points;
  double max_cl = -1e9;
  for (const auto& p : points) max_cl = std::max(max_cl, p.cl);

  if (auto cm = r.optional_child("cl_max")) {
    if (!landing.present) cm->fail("a cl_max limit needs the landing point (missing /landing)");
    if (auto m = cm->optional_child("min")) {
      c.cl_max_min = m->in_range(0, 3, true, false);
      if (c.cl_max_min < max_cl)
        m->fail("must be >= the cruise cl " + number_text(max_cl) +
                " (the section must reach the largest design cl with margin)");
      if (!std::isnan(landing.cl_max_required) && c.cl_max_min < landing.cl_max_required)
        m->fail("must be >= " + number_text(landing.cl_max_required) +
                ", the cl_max the stall speed requires (omit min to use that value)");
    }
    cm->finish();
  }
  if (std::isnan(c.cl_max_min) && landing.present) {
    if (std::isnan(landing.cl_max_required))
      r.fail_at(r.path() + "/cl_max/min",
                "missing required field (the landing point gives no stall speed)");
    c.cl_max_min = landing.cl_max_required;
    if (c.cl_max_min < max_cl)
      r.fail_at("/landing/stall_speed", "gives a required cl_max of " + number_text(c.cl_max_min) +
                                            ", below the cruise cl " + number_text(max_cl));
  }
  if (auto cm = r.optional_child("cm")) {
    const double v = read_min_only(*cm, -1, 1, false);
    for (auto& p : points_out)
      if (std::isnan(p.cm_min)) p.cm_min = v;
  }
  if (auto t = r.optional_child("thickness")) c.thickness_min = read_min_only(*t, 0, 0.5, true);
  if (auto s = r.optional_child("spar")) {
    for (Reader item : s->array()) {
      SparLimit l;
      l.x = item.child("x").in_range(0, 1, true, true);
      l.min = item.child("min").in_range(0, 0.5, true, false);
      if (!std::isnan(c.thickness_min) && l.min > c.thickness_min + 1e-12)
        item.fail_at(item.path() + "/min", "must be <= the maximum-thickness limit " +
                                               number_text(c.thickness_min) +
                                               " (no section can be deeper at the spar)");
      item.finish();
      c.spars.push_back(l);
    }
  }
  if (auto g = r.optional_child("te_gap")) read_min_max(*g, c.te_gap_min, c.te_gap_max, 0, 0.05);
  if (auto a = r.optional_child("te_angle_deg"))
    c.te_angle_min_deg = read_min_only(*a, 0, 60, false);
  if (auto le = r.optional_child("le_radius")) c.le_radius_min = read_min_only(*le, 0, 0.1, true);
  if (auto a = r.optional_child("area")) c.area_min = read_min_only(*a, 0, 0.4, true);
  if (auto x = r.optional_child("thickness_x"))
    read_min_max(*x, c.thickness_x_min, c.thickness_x_max, 0.05, 0.8);
  if (auto v = r.optional_child("curvature_reversals")) {
    if (auto u = v->optional_child("upper_max")) {
      c.max_reversals_upper = u->integer();
      if (c.max_reversals_upper < 0 || c.max_reversals_upper > 4) u->fail("must be in 0..4");
    }
    if (auto l = v->optional_child("lower_max")) {
      c.max_reversals_lower = l->integer();
      if (c.max_reversals_lower < 0 || c.max_reversals_lower > 4) l->fail("must be in 0..4");
    }
    v->finish();
  }
  r.finish();
  return c;
}

Parameterization read_parameterization(Reader r) {
  Parameterization p;
  for (const char* key : {"order_upper", "order_lower"}) {
    if (auto c = r.optional_child(key)) {
      const int n = c->integer();
      // Below 2 a surface cannot hold a realistic section; above 12 the Bernstein basis gets
      // ill-conditioned and invites waviness (Kulfan 2008 uses orders up to about 10).
      if (n < 2 || n > 12) c->fail("must be in 2..12 (got " + std::to_string(n) + ")");
      (std::string(key) == "order_upper" ? p.order_upper : p.order_lower) = n;
    }
  }
  if (auto b = r.optional_child("bounds")) {
    if (auto m = b->optional_child("margin")) p.margin = m->in_range(0, 1, true, false);
    if (auto u = b->optional_child("upper")) read_min_max(*u, p.upper_min, p.upper_max, -2, 2);
    if (auto l = b->optional_child("lower")) read_min_max(*l, p.lower_min, p.lower_max, -2, 2);
    b->finish();
  }
  if (auto t = r.optional_child("te_gap")) p.te_gap = t->in_range(0, 0.05, false, false);
  r.finish();
  return p;
}

Baseline read_baseline(Reader r, const std::filesystem::path& base_dir) {
  Baseline b;
  b.json_path = r.path();
  const int kinds = int(r.has("naca")) + int(r.has("file")) + int(r.has("cst"));
  if (kinds != 1) r.fail("give exactly one of naca, file or cst");
  if (auto n = r.optional_child("naca")) {
    b.kind = Baseline::Kind::naca;
    try {
      b.naca = parse_naca(n->string()).digits;
    } catch (const InputError& e) {
      n->fail(e.what());
    }
  }
  if (auto f = r.optional_child("file")) {
    b.kind = Baseline::Kind::file;
    std::filesystem::path p = f->string();
    if (p.is_relative()) p = base_dir / p;
    if (!std::filesystem::is_regular_file(p)) f->fail("no such file: " + p.string());
    b.file = p;
  }
  if (auto c = r.optional_child("cst")) {
    b.kind = Baseline::Kind::cst;
    c->expect_object();
    b.cst = c->node();
  }
  r.finish();
  return b;
}

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

}  // namespace

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
    throw InputError("optimizer.xtol_rel = " + number_text(xtol_rel) + ": must be in [0, 1)");
  if (!(ftol_rel >= 0 && ftol_rel < 1))
    throw InputError("optimizer.ftol_rel = " + number_text(ftol_rel) + ": must be in [0, 1)");
  if (!(time_limit_s > 0))
    throw InputError("optimizer.time_limit_s = " + number_text(time_limit_s) + ": must be > 0");
  if (starts < 1 || starts > 100)
    throw InputError("optimizer.starts = " + std::to_string(starts) + ": must be in 1..100");
  if (!(fd_step >= 1e-8 && fd_step <= 1e-2))
    throw InputError("optimizer.fd_step = " + number_text(fd_step) + ": must be in [1e-8, 1e-2]");
  if (!(constraint_tol >= 0 && constraint_tol <= 0.1))
    throw InputError("optimizer.constraint_tol = " + number_text(constraint_tol) +
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
    throw InputError("analysis.search_cl_max_margin = " + number_text(search_cl_max_margin) +
                     ": must be in [0, 0.2]");
  // The polars of the report: beyond +-30 deg a section is far past its stall.
  if (!(polar_alpha_min >= -30 && polar_alpha_min <= 30))
    throw InputError("analysis.polar_alpha.min = " + number_text(polar_alpha_min) +
                     ": must be in [-30, 30] deg");
  if (!(polar_alpha_max >= -30 && polar_alpha_max <= 30))
    throw InputError("analysis.polar_alpha.max = " + number_text(polar_alpha_max) +
                     ": must be in [-30, 30] deg");
  if (!(polar_alpha_step >= 0.05 && polar_alpha_step <= 5))
    throw InputError("analysis.polar_alpha.step = " + number_text(polar_alpha_step) +
                     ": must be in [0.05, 5] deg");
  if (!(polar_alpha_max > polar_alpha_min))
    throw InputError("analysis.polar_alpha.max = " + number_text(polar_alpha_max) +
                     ": must be > min " + number_text(polar_alpha_min));
  if (!(polar_alpha_step > 0) || (polar_alpha_max - polar_alpha_min) / polar_alpha_step > 400)
    throw InputError("analysis.polar_alpha.step = " + number_text(polar_alpha_step) +
                     ": must be > 0 and give at most 400 angles");
}

Case parse_case(const std::string& text, const std::string& label,
                const std::filesystem::path& base_dir) {
  const json root = parse_json_text(text, label);
  Case c;
  c.source = root;
  Reader r(root, "", &label);
  r.expect_object();
  {
    Reader v = r.child("schema_version");
    const int version = v.integer();
    if (version != kCaseSchemaVersion)
      v.fail("unsupported schema version " + std::to_string(version) + " (this fulmar reads " +
             std::to_string(kCaseSchemaVersion) + ")");
  }
  c.name = r.child("name").string();
  if (auto d = r.optional_child("description")) c.description = d->string();
  if (auto n = r.optional_child("notes")) {
    if (!c.description.empty()) c.description += "\n";
    c.description += n->string();
  }
  double factor = kWingToSectionFactor;
  if (auto a = r.optional_child("airplane")) c.airplane = read_airplane(*a, factor);

  TransitionScenario nominal;
  if (auto t = r.optional_child("transition")) {
    read_transition_values(*t, nominal);
    nominal.name = "nominal";
    if (auto s = t->optional_child("scenarios")) {
      const auto items = s->array();
      if (items.empty()) s->fail("must hold at least one scenario");
      for (const Reader& item : items) c.scenarios.push_back(read_scenario(item, nominal));
    }
    t->finish();
  }
  if (c.scenarios.empty()) c.scenarios.push_back(nominal);

  {
    Reader pts = r.child("design_points");
    const auto items = pts.array();
    if (items.empty()) pts.fail("must hold at least one design point");
    if (items.size() > 8) pts.fail("at most 8 design points");
    for (size_t i = 0; i < items.size(); ++i)
      c.points.push_back(read_point(items[i], c.airplane, i));
  }
  if (auto l = r.optional_child("landing")) c.landing = read_landing(*l, c.airplane, factor);
  check_analysis_options(r, c);

  {
    std::vector<DesignPoint> points;
    const json empty = json::object();
    auto k = r.optional_child("constraints");
    c.constraints = read_constraints(k ? *k : Reader(empty, "/constraints", &label), c.points,
                                     c.landing, points);
    c.points = points;
  }
  if (auto p = r.optional_child("parameterization")) c.parameterization = read_parameterization(*p);
  {
    const Parameterization& p = c.parameterization;
    if (!std::isnan(p.te_gap)) {
      if (!std::isnan(c.constraints.te_gap_min) && p.te_gap < c.constraints.te_gap_min)
        r.fail_at("/parameterization/te_gap",
                  "must be >= the te_gap limit " + number_text(c.constraints.te_gap_min));
      if (!std::isnan(c.constraints.te_gap_max) && p.te_gap > c.constraints.te_gap_max)
        r.fail_at("/parameterization/te_gap",
                  "must be <= the te_gap limit " + number_text(c.constraints.te_gap_max));
    }
  }
  c.baseline = read_baseline(r.child("baseline"), base_dir);
  if (auto s = r.optional_child("second_start")) c.second_start = read_baseline(*s, base_dir);
  if (auto o = r.optional_child("optimizer")) c.optimizer = read_optimizer(*o);
  if (auto a = r.optional_child("analysis")) c.analysis = read_analysis(*a);
  if (auto o = r.optional_child("outputs")) {
    c.outputs = read_outputs(*o);
    if (!c.outputs.cad_formats.empty() && c.outputs.cad_chord == 0 && !c.airplane)
      o->fail_at(o->path() + "/cad/chord",
                 "missing required field (no airplane gives the chord for the CAD files)");
  }
  r.finish();
  return c;
}

std::filesystem::path folder_of(const std::filesystem::path& file) {
  return file.has_parent_path() ? file.parent_path() : std::filesystem::path(".");
}

Case load_case(const std::filesystem::path& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path.string() + ": cannot read the case file");
  std::stringstream ss;
  ss << in.rdbuf();
  Case c = parse_case(ss.str(), path.string(), folder_of(path));
  c.path = path;
  return c;
}

}  // namespace fulmar::optimize
