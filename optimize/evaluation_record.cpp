#include "optimize/evaluation_record.h"

#include <cmath>

#include "common/error.h"

namespace fulmar::optimize {

using nlohmann::json;

namespace json_read {

const json& member(const json& j, const std::string& key, const std::string& where) {
  if (!j.is_object()) throw InputError(where + ": not a JSON object");
  const auto it = j.find(key);
  if (it == j.end()) throw InputError(where + "/" + key + ": missing");
  return *it;
}

double number(const json& j, const std::string& key, const std::string& where) {
  const json& v = member(j, key, where);
  if (v.is_null()) return std::numeric_limits<double>::quiet_NaN();
  if (!v.is_number()) throw InputError(where + "/" + key + ": not a number");
  return v.get<double>();
}

int integer(const json& j, const std::string& key, const std::string& where) {
  const json& v = member(j, key, where);
  if (!v.is_number_integer()) throw InputError(where + "/" + key + ": not an integer");
  return v.get<int>();
}

bool boolean(const json& j, const std::string& key, const std::string& where) {
  const json& v = member(j, key, where);
  if (!v.is_boolean()) throw InputError(where + "/" + key + ": not true or false");
  return v.get<bool>();
}

std::string text(const json& j, const std::string& key, const std::string& where) {
  const json& v = member(j, key, where);
  if (!v.is_string()) throw InputError(where + "/" + key + ": not a string");
  return v.get<std::string>();
}

}  // namespace json_read

namespace {

using namespace json_read;

json finite_or_null(double v) {
  return std::isfinite(v) ? json(v) : json(nullptr);
}

}  // namespace

json to_json(const CstMeasures& g) {
  return json{{"thickness", g.thickness},
              {"thickness_x", g.thickness_x},
              {"camber", g.camber},
              {"camber_x", g.camber_x},
              {"spar_thickness", g.spar_thickness},
              {"te_gap", g.te_gap},
              {"te_angle_deg", g.te_angle_deg},
              {"le_radius", g.le_radius},
              {"area", g.area},
              {"min_shape_gap", g.min_shape_gap},
              {"curvature_reversals_upper", g.reversals_upper},
              {"curvature_reversals_lower", g.reversals_lower},
              {"excess_reversal_upper", g.excess_reversal_upper},
              {"excess_reversal_lower", g.excess_reversal_lower}};
}

CstMeasures cst_measures_from_json(const json& j, const std::string& where) {
  CstMeasures g;
  g.thickness = number(j, "thickness", where);
  g.thickness_x = number(j, "thickness_x", where);
  g.camber = number(j, "camber", where);
  g.camber_x = number(j, "camber_x", where);
  const json& spars = member(j, "spar_thickness", where);
  if (!spars.is_array()) throw InputError(where + "/spar_thickness: not a list");
  for (size_t i = 0; i < spars.size(); ++i) {
    if (!spars[i].is_number())
      throw InputError(where + "/spar_thickness/" + std::to_string(i) + ": not a number");
    g.spar_thickness.push_back(spars[i].get<double>());
  }
  g.te_gap = number(j, "te_gap", where);
  g.te_angle_deg = number(j, "te_angle_deg", where);
  g.le_radius = number(j, "le_radius", where);
  g.area = number(j, "area", where);
  g.min_shape_gap = number(j, "min_shape_gap", where);
  g.reversals_upper = integer(j, "curvature_reversals_upper", where);
  g.reversals_lower = integer(j, "curvature_reversals_lower", where);
  g.excess_reversal_upper = number(j, "excess_reversal_upper", where);
  g.excess_reversal_lower = number(j, "excess_reversal_lower", where);
  return g;
}

json to_json(const DesignPointRecord& p) {
  json j = to_json(p.result);
  j["point"] = p.point;
  j["scenario"] = p.scenario;
  j["cl_target"] = p.cl_target;
  j["reynolds"] = p.reynolds;
  j["mach"] = p.mach;
  return j;
}

DesignPointRecord design_point_record_from_json(const json& j, const std::string& where) {
  DesignPointRecord p;
  p.point = text(j, "point", where);
  p.scenario = text(j, "scenario", where);
  p.cl_target = number(j, "cl_target", where);
  p.reynolds = number(j, "reynolds", where);
  p.mach = number(j, "mach", where);
  PointResult& r = p.result;
  r.converged = boolean(j, "converged", where);
  r.reason = text(j, "reason", where);
  r.residual = number(j, "residual", where);
  r.iterations = integer(j, "iterations", where);
  r.alpha_deg = number(j, "alpha", where);
  r.cl = number(j, "cl", where);
  r.cd = number(j, "cd", where);
  r.cd_friction = number(j, "cd_friction", where);
  r.cd_pressure = number(j, "cd_pressure", where);
  r.cm = number(j, "cm", where);
  r.transition_upper = number(j, "transition_upper", where);
  r.transition_lower = number(j, "transition_lower", where);
  return p;
}

json to_json(const ConstraintRecord& c) {
  return json{{"id", c.id},
              {"name", c.name},
              {"value", finite_or_null(c.value)},
              {"limit", c.limit},
              {"kind", c.is_min ? "min" : "max"},
              {"satisfied", c.satisfied}};
}

ConstraintRecord constraint_record_from_json(const json& j, const std::string& where) {
  ConstraintRecord c;
  c.id = text(j, "id", where);
  c.name = text(j, "name", where);
  c.value = number(j, "value", where);
  c.limit = number(j, "limit", where);
  const std::string kind = text(j, "kind", where);
  if (kind != "min" && kind != "max")
    throw InputError(where + "/kind: \"" + kind + "\" is neither \"min\" nor \"max\"");
  c.is_min = kind == "min";
  c.satisfied = boolean(j, "satisfied", where);
  return c;
}

json to_json(const EvaluationRecord& r) {
  json points = json::array();
  for (const auto& p : r.points) points.push_back(to_json(p));
  json constraints = json::array();
  for (const auto& c : r.constraints) constraints.push_back(to_json(c));
  return json{{"geometry", to_json(r.geometry)},
              {"points", std::move(points)},
              {"cl_max", to_json(r.cl_max)},
              {"panels", r.panels},
              {"constraints", std::move(constraints)}};
}

EvaluationRecord evaluation_record_from_json(const json& j, const std::string& where) {
  EvaluationRecord r;
  r.geometry = cst_measures_from_json(member(j, "geometry", where), where + "/geometry");
  const json& points = member(j, "points", where);
  if (!points.is_array()) throw InputError(where + "/points: not a list");
  for (size_t i = 0; i < points.size(); ++i)
    r.points.push_back(
        design_point_record_from_json(points[i], where + "/points/" + std::to_string(i)));
  const json& clm = member(j, "cl_max", where);
  const std::string cw = where + "/cl_max";
  r.cl_max.found = boolean(clm, "found", cw);
  r.cl_max.reason = text(clm, "reason", cw);
  r.cl_max.cl_max = number(clm, "cl_max", cw);
  r.cl_max.alpha_deg = number(clm, "alpha", cw);
  r.panels = integer(j, "panels", where);
  const json& constraints = member(j, "constraints", where);
  if (!constraints.is_array()) throw InputError(where + "/constraints: not a list");
  for (size_t i = 0; i < constraints.size(); ++i)
    r.constraints.push_back(
        constraint_record_from_json(constraints[i], where + "/constraints/" + std::to_string(i)));
  return r;
}

}  // namespace fulmar::optimize
