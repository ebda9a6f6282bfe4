#include "optimize/run_summary.h"

#include <cmath>

#include "optimize/section_problem.h"

namespace fulmar::optimize {
namespace {

using nlohmann::json;

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
  b["panels"] = e.detail.panels;
  const double wcd = weighted_cd(c, e);
  b["weighted_cd"] = std::isfinite(wcd) ? json(wcd) : json(nullptr);
  json points = json::array();
  for (const auto& p : e.detail.points) points.push_back(to_json(p));
  b["points"] = std::move(points);
  const ClMaxResult& clm = e.detail.cl_max;
  b["cl_max"] = clm.found ? json(clm.cl_max) : json(nullptr);
  b["alpha_cl_max"] = clm.found ? json(clm.alpha_deg) : json(nullptr);
  const CstMeasures& g = e.detail.geometry;
  b["thickness"] = g.thickness;
  b["thickness_x"] = g.thickness_x;
  b["camber"] = g.camber;
  b["camber_x"] = g.camber_x;
  b["le_radius"] = g.le_radius;
  b["te_gap"] = g.te_gap;
  b["te_angle_deg"] = g.te_angle_deg;
  b["area"] = g.area;
  b["t_c"] = g.thickness;
  b["cst"] = cst_to_json(shape, name);
  return b;
}

}  // namespace

json run_summary(const Case& c, const SearchResult& r, const VerifiedOptimum& v,
                 const std::string& baseline_name, const CstShape& baseline_shape,
                 double fit_deviation, const std::string& optimum_name,
                 const CstShape& optimum_shape, const std::string& evaluator_description) {
  int failed = 0;
  for (const auto& e : r.history) failed += e.ok ? 0 : 1;
  json summary;
  summary["case"] = c.name;
  summary["case_file"] = c.path.string();
  summary["description"] = c.description;
  summary["evaluator"] = evaluator_description;
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
  summary["baseline"] = section_block(c, v.baseline, baseline_name, baseline_shape);
  summary["baseline"]["fit_max_deviation"] = fit_deviation;
  summary["optimized"] = section_block(c, v.optimum, optimum_name, optimum_shape);
  const double cd0 = weighted_cd(c, v.baseline), cd1 = weighted_cd(c, v.optimum);
  summary["drag_reduction_percent"] = std::isfinite(cd0) && std::isfinite(cd1) && cd0 > 0
                                          ? json(100.0 * (1 - cd1 / cd0))
                                          : json(nullptr);
  json constraints = json::array();
  for (const auto& row : SectionProblem::constraint_table(v.optimum))
    constraints.push_back(to_json(row));
  summary["constraints"] = std::move(constraints);
  summary["feasible"] = v.feasible;
  summary["evaluations"] = r.history.size();
  summary["verified_candidates"] = v.candidates;
  summary["optimum_is_start"] = v.kept_start;
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
  return summary;
}

}  // namespace fulmar::optimize
