#include "optimize/run_summary.h"

#include <cmath>

#include "common/error.h"
#include "common/number_text.h"
#include "optimize/section_problem.h"

namespace fulmar::optimize {
namespace {

using nlohmann::json;
using namespace json_read;

double weighted_cd(const Evaluation& e) {
  if (!e.ok()) return std::nan("");
  return e.objective / 100.0;
}

SummarySection section_summary(const Evaluation& e, const std::string& name,
                               const CstShape& shape) {
  SummarySection b;
  b.name = name;
  b.outcome = static_cast<const Outcome&>(e);
  b.panels = e.detail.panels;
  b.weighted_cd = weighted_cd(e);
  b.points = e.detail.points;
  const ClMaxResult& clm = e.detail.cl_max;
  if (clm.found()) {
    b.cl_max = clm.cl_max;
    b.alpha_cl_max = clm.alpha_deg;
  }
  const CstMeasures& g = e.detail.geometry;
  b.geometry = {g.thickness, g.thickness_x, g.camber,       g.camber_x,
                g.le_radius, g.te_gap,      g.te_angle_deg, g.area};
  b.cst = shape;
  return b;
}

// A list under `key`, each element read by `read(element, its path)`.
template <class Read>
auto list(const json& j, const std::string& key, const std::string& where, Read read) {
  const json& a = member(j, key, where);
  if (!a.is_array()) throw InputError(where + "/" + key + ": not a list");
  std::vector<decltype(read(a[0], where))> out;
  for (size_t i = 0; i < a.size(); ++i)
    out.push_back(read(a[i], where + "/" + key + "/" + std::to_string(i)));
  return out;
}

// A number that is written only when known: NaN when the key is absent.
double optional_number(const json& j, const std::string& key, const std::string& where) {
  return j.contains(key) ? number(j, key, where) : std::nan("");
}

json to_json(const SummarySection& b) {
  json j;
  j["name"] = b.name;
  j["analysis_ok"] = b.analysis_ok();
  j["status"] = b.analysis_ok() ? std::string("ok") : b.outcome.reason;
  j["outcome"] = to_json(b.outcome);
  j["panels"] = b.panels;
  j["weighted_cd"] = json_number(b.weighted_cd);
  json points = json::array();
  for (const auto& p : b.points) points.push_back(to_json(p));
  j["points"] = std::move(points);
  j["cl_max"] = json_number(b.cl_max);
  j["alpha_cl_max"] = json_number(b.alpha_cl_max);
  const SummaryGeometry& g = b.geometry;
  j["thickness"] = g.thickness;
  j["thickness_x"] = g.thickness_x;
  j["camber"] = g.camber;
  j["camber_x"] = g.camber_x;
  j["le_radius"] = g.le_radius;
  j["te_gap"] = g.te_gap;
  j["te_angle_deg"] = g.te_angle_deg;
  j["area"] = g.area;
  j["t_c"] = g.thickness;
  j["cst"] = cst_to_json(b.cst, b.name);
  if (b.fit_max_deviation) j["fit_max_deviation"] = *b.fit_max_deviation;
  return j;
}

SummarySection section_from_json(const json& j, const std::string& where, bool with_fit) {
  SummarySection b;
  b.name = text(j, "name", where);
  b.outcome = outcome_from_json(member(j, "outcome", where), where + "/outcome");
  // The derived keys must be there and of their type; their values follow from the outcome.
  boolean(j, "analysis_ok", where);
  text(j, "status", where);
  b.panels = integer(j, "panels", where);
  b.weighted_cd = number(j, "weighted_cd", where);
  b.points = list(j, "points", where, design_point_record_from_json);
  b.cl_max = number(j, "cl_max", where);
  b.alpha_cl_max = number(j, "alpha_cl_max", where);
  SummaryGeometry& g = b.geometry;
  g.thickness = number(j, "thickness", where);
  number(j, "t_c", where);
  g.thickness_x = number(j, "thickness_x", where);
  g.camber = number(j, "camber", where);
  g.camber_x = number(j, "camber_x", where);
  g.le_radius = number(j, "le_radius", where);
  g.te_gap = number(j, "te_gap", where);
  g.te_angle_deg = number(j, "te_angle_deg", where);
  g.area = number(j, "area", where);
  b.cst = cst_from_json(member(j, "cst", where), where + "/cst");
  if (with_fit) b.fit_max_deviation = number(j, "fit_max_deviation", where);
  return b;
}

SummaryDesignPoint design_point_from_json(const json& j, const std::string& where) {
  SummaryDesignPoint p;
  p.name = text(j, "name", where);
  p.cl = number(j, "cl", where);
  p.reynolds = number(j, "reynolds", where);
  p.mach = number(j, "mach", where);
  p.weight = number(j, "weight", where);
  p.cm_min = optional_number(j, "cm_min", where);
  if (j.contains("speed") || j.contains("altitude")) {
    p.speed = number(j, "speed", where);
    p.altitude = number(j, "altitude", where);
  }
  return p;
}

SummaryScenario scenario_from_json(const json& j, const std::string& where) {
  return {text(j, "name", where), number(j, "ncrit", where), number(j, "trip_upper", where),
          number(j, "trip_lower", where), number(j, "weight", where)};
}

SummaryCandidate candidate_from_json(const json& j, const std::string& where) {
  return {integer(j, "evaluation", where), number(j, "search_objective", where),
          number(j, "verified_objective", where), boolean(j, "feasible", where),
          text(j, "status", where)};
}

}  // namespace

RunSummary run_summary(const Case& c, const SearchResult& r, const VerifiedOptimum& v,
                       const std::string& baseline_name, const CstShape& baseline_shape,
                       double fit_deviation, const std::string& optimum_name,
                       const CstShape& optimum_shape, const std::string& evaluator_description) {
  RunSummary s;
  SummaryCase& k = s.run_case;
  k.name = c.name;
  k.file = c.path.string();
  k.description = c.description;
  k.evaluator = evaluator_description;
  if (c.airplane)
    k.airplane = SummaryAirplane{c.airplane->mass, c.airplane->wing_area, c.airplane->chord};
  for (const auto& p : c.points) {
    SummaryDesignPoint d{p.name, p.cl, p.reynolds, p.mach, p.weight, p.cm_min, {}, {}};
    if (p.from_airplane) d.speed = p.speed, d.altitude = p.altitude;
    k.design_points.push_back(d);
  }
  for (const auto& sc : c.scenarios)
    k.scenarios.push_back({sc.name, sc.ncrit, sc.trip_upper, sc.trip_lower, sc.weight});
  if (c.landing.present)
    k.landing = SummaryLanding{c.landing.reynolds, c.landing.mach, c.landing.stall_speed,
                               c.landing.cl_max_required};

  SummarySearch& q = s.search;
  q.outcome = static_cast<const Outcome&>(r);
  q.evaluations = static_cast<int>(r.history.size());
  for (const auto& e : r.history) q.failed_evaluations += e.ok() ? 0 : 1;
  q.iterations = r.iterations;
  q.interrupted = r.interrupted;
  q.replayed_from_checkpoint = r.replayed;
  q.elapsed_s = r.elapsed_s;
  q.algorithm = to_string(c.optimizer.algorithm);
  q.search_panels = c.analysis.panels;
  q.verify_panels = c.analysis.verify_panels;

  s.baseline = section_summary(v.baseline, baseline_name, baseline_shape);
  s.baseline.fit_max_deviation = fit_deviation;
  s.optimized = section_summary(v.optimum, optimum_name, optimum_shape);
  const double cd0 = s.baseline.weighted_cd, cd1 = s.optimized.weighted_cd;
  if (std::isfinite(cd0) && std::isfinite(cd1) && cd0 > 0)
    s.drag_reduction_percent = 100.0 * (1 - cd1 / cd0);
  s.constraints = SectionProblem::constraint_table(v.optimum);
  s.feasible = v.feasible;
  s.optimum_is_start = v.kept_start;
  // run_verify keeps its candidates as JSON; read through the one reader so that the types agree.
  s.verified_candidates = list(json{{"verified_candidates", v.candidates}}, "verified_candidates",
                               "verification", candidate_from_json);
  return s;
}

json to_json(const RunSummary& s) {
  json j;
  const SummaryCase& k = s.run_case;
  j["case"] = k.name;
  j["case_file"] = k.file;
  j["description"] = k.description;
  j["evaluator"] = k.evaluator;
  if (k.airplane)
    j["airplane"] = {{"mass", k.airplane->mass},
                     {"wing_area", k.airplane->wing_area},
                     {"chord", k.airplane->chord}};
  json dps = json::array();
  for (const auto& p : k.design_points) {
    json d{{"name", p.name},
           {"cl", p.cl},
           {"reynolds", p.reynolds},
           {"mach", p.mach},
           {"weight", p.weight}};
    if (!std::isnan(p.cm_min)) d["cm_min"] = p.cm_min;
    if (p.speed) d["speed"] = *p.speed;
    if (p.altitude) d["altitude"] = *p.altitude;
    dps.push_back(d);
  }
  j["design_points"] = dps;
  json scen = json::array();
  for (const auto& sc : k.scenarios)
    scen.push_back({{"name", sc.name},
                    {"ncrit", sc.ncrit},
                    {"trip_upper", sc.trip_upper},
                    {"trip_lower", sc.trip_lower},
                    {"weight", sc.weight}});
  j["transition_scenarios"] = scen;
  if (k.landing) {
    json l{{"reynolds", k.landing->reynolds}, {"mach", k.landing->mach}};
    if (!std::isnan(k.landing->stall_speed)) l["stall_speed"] = k.landing->stall_speed;
    if (!std::isnan(k.landing->cl_max_required)) l["cl_max_required"] = k.landing->cl_max_required;
    j["landing"] = l;
  }
  j["baseline"] = to_json(s.baseline);
  j["optimized"] = to_json(s.optimized);
  j["drag_reduction_percent"] = json_number(s.drag_reduction_percent);
  json constraints = json::array();
  for (const auto& row : s.constraints) constraints.push_back(to_json(row));
  j["constraints"] = std::move(constraints);
  j["feasible"] = s.feasible;
  json candidates = json::array();
  for (const auto& cd : s.verified_candidates)
    candidates.push_back({{"evaluation", cd.evaluation},
                          {"search_objective", json_number(cd.search_objective)},
                          {"verified_objective", json_number(cd.verified_objective)},
                          {"feasible", cd.feasible},
                          {"status", cd.status}});
  j["verified_candidates"] = std::move(candidates);
  j["optimum_is_start"] = s.optimum_is_start;
  const SummarySearch& q = s.search;
  j["evaluations"] = q.evaluations;
  j["failed_evaluations"] = q.failed_evaluations;
  j["iterations"] = q.iterations;
  j["converged"] = q.outcome.status == Status::kConverged;
  j["status"] = to_string(q.outcome.status);  // of the search; its reason is "stop_reason"
  j["stop_reason"] = q.outcome.reason;
  j["interrupted"] = q.interrupted;
  j["replayed_from_checkpoint"] = q.replayed_from_checkpoint;
  j["elapsed_s"] = q.elapsed_s;
  j["algorithm"] = q.algorithm;
  j["search_panels"] = q.search_panels;
  j["verify_panels"] = q.verify_panels;
  j["files"] = json(s.files);
  return j;
}

RunSummary run_summary_from_json(const json& j, const std::string& where) {
  if (!j.is_object()) throw InputError(where + ": not a JSON object");
  RunSummary s;
  SummaryCase& k = s.run_case;
  k.name = text(j, "case", where);
  k.file = text(j, "case_file", where);
  k.description = text(j, "description", where);
  k.evaluator = text(j, "evaluator", where);
  if (j.contains("airplane")) {
    const json& a = j.at("airplane");
    const std::string w = where + "/airplane";
    k.airplane =
        SummaryAirplane{number(a, "mass", w), number(a, "wing_area", w), number(a, "chord", w)};
  }
  k.design_points = list(j, "design_points", where, design_point_from_json);
  k.scenarios = list(j, "transition_scenarios", where, scenario_from_json);
  if (j.contains("landing")) {
    const json& l = j.at("landing");
    const std::string w = where + "/landing";
    k.landing = SummaryLanding{number(l, "reynolds", w), number(l, "mach", w),
                               optional_number(l, "stall_speed", w),
                               optional_number(l, "cl_max_required", w)};
  }
  s.baseline = section_from_json(member(j, "baseline", where), where + "/baseline", true);
  s.optimized = section_from_json(member(j, "optimized", where), where + "/optimized", false);
  s.drag_reduction_percent = number(j, "drag_reduction_percent", where);
  s.constraints = list(j, "constraints", where, constraint_record_from_json);
  s.feasible = boolean(j, "feasible", where);
  s.verified_candidates = list(j, "verified_candidates", where, candidate_from_json);
  s.optimum_is_start = boolean(j, "optimum_is_start", where);
  SummarySearch& q = s.search;
  q.evaluations = integer(j, "evaluations", where);
  q.failed_evaluations = integer(j, "failed_evaluations", where);
  q.iterations = integer(j, "iterations", where);
  boolean(j, "converged", where);  // derived from "status"
  q.outcome.status = status_from_string(text(j, "status", where), where + "/status");
  q.outcome.reason = text(j, "stop_reason", where);
  q.interrupted = boolean(j, "interrupted", where);
  q.replayed_from_checkpoint = integer(j, "replayed_from_checkpoint", where);
  q.elapsed_s = number(j, "elapsed_s", where);
  q.algorithm = text(j, "algorithm", where);
  q.search_panels = integer(j, "search_panels", where);
  q.verify_panels = integer(j, "verify_panels", where);
  const json& f = member(j, "files", where);
  if (!f.is_object()) throw InputError(where + "/files: not a JSON object");
  for (const auto& item : f.items()) s.files[item.key()] = text(f, item.key(), where + "/files");
  return s;
}

}  // namespace fulmar::optimize
