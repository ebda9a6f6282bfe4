#pragma once
// What the analysis of one design found (Evaluation::detail): its geometry, every design-point
// result, cl_max, the panels used and the unscaled constraint table. Kept in the search history,
// the checkpoint and summary.json, with one JSON conversion. The JSON keys are a contract with
// the files already written: add, never rename.
#include <limits>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "geometry/cst_measures.h"
#include "optimize/section_evaluator.h"

namespace fulmar::optimize {

// One design point under one transition scenario.
struct DesignPointRecord {
  std::string point;     // the design point's name
  std::string scenario;  // the transition scenario's name
  double cl_target = 0;  // the cl asked for
  double reynolds = 0;   // chord Reynolds number
  double mach = 0;       // free-stream Mach number
  PointResult result;    // not converged, reason "not analysed", when no analysis ran
};

// One row of the constraint table. `id` is stable and identifies the constraint in programs
// ("thickness_positive", "reversal_upper", "reversal_lower", "thickness_min", "spar_<x>",
// "te_gap_min", "te_gap_max", "te_angle_min", "le_radius_min", "area_min", "thickness_x_min",
// "thickness_x_max", "cl_max", "cm_<point>[/<scenario>]"); `name` is the display text.
struct ConstraintRecord {
  std::string id;
  std::string name;
  double value = std::numeric_limits<double>::quiet_NaN();  // NaN: unknown (analysis failed)
  double limit = 0;
  bool is_min = true;      // the value must be >= limit (JSON kind "min"), else <= ("max")
  bool satisfied = false;  // within the optimizer's constraint tolerance
};

struct EvaluationRecord {
  CstMeasures geometry;
  std::vector<DesignPointRecord> points;  // design points x scenarios, scenario fastest
  ClMaxResult cl_max;                     // reason "not analysed" when not asked for
  int panels = 0;                         // panels of the analysis
  std::vector<ConstraintRecord> constraints;
};

// The stable id of the maximum-lift constraint.
inline constexpr const char* kClMaxId = "cl_max";

// JSON conversions. Readers throw InputError "<where>/<key>: missing" (or "...: not a number"
// etc.) for a key that is absent or of the wrong type; a null number reads as NaN (NaN is written
// as null).
nlohmann::json to_json(const CstMeasures& g);
CstMeasures cst_measures_from_json(const nlohmann::json& j, const std::string& where);
nlohmann::json to_json(const DesignPointRecord& p);
DesignPointRecord design_point_record_from_json(const nlohmann::json& j, const std::string& where);
nlohmann::json to_json(const ConstraintRecord& c);
ConstraintRecord constraint_record_from_json(const nlohmann::json& j, const std::string& where);
nlohmann::json to_json(const EvaluationRecord& r);
EvaluationRecord evaluation_record_from_json(const nlohmann::json& j, const std::string& where);

// Strict readers of one key of a JSON object, shared by the typed results' conversions.
namespace json_read {
const nlohmann::json& member(const nlohmann::json& j, const std::string& key,
                             const std::string& where);
double number(const nlohmann::json& j, const std::string& key, const std::string& where);
int integer(const nlohmann::json& j, const std::string& key, const std::string& where);
bool boolean(const nlohmann::json& j, const std::string& key, const std::string& where);
std::string text(const nlohmann::json& j, const std::string& key, const std::string& where);
}  // namespace json_read

}  // namespace fulmar::optimize
