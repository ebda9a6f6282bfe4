#pragma once
// summary.json of an optimization run as a typed result: the case's conditions, how the search
// went, the baseline and the optimum as verified (section blocks), the constraint table and the
// files written. Its keys are a contract with the programs that read it (trade studies, scripts):
// add, never rename. One conversion each way: to_json writes exactly the keys below;
// run_summary_from_json reads them strictly (a missing or mistyped key is an InputError naming
// the file and the JSON path, never a default). Numbers that are unknown are NaN here and null in
// the file.
#include <limits>
#include <map>
#include <optional>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "common/status.h"
#include "geometry/cst.h"
#include "optimize/case_file.h"
#include "optimize/driver.h"
#include "optimize/evaluation_record.h"
#include "optimize/run_verify.h"

namespace fulmar::optimize {

// "airplane": the airplane the design points were derived from.
struct SummaryAirplane {
  double mass = 0;       // kg ("mass")
  double wing_area = 0;  // m² ("wing_area")
  double chord = 0;      // mean chord, m ("chord")
};

// One entry of "design_points".
struct SummaryDesignPoint {
  std::string name;
  double cl = 0;        // the cl asked for
  double reynolds = 0;  // chord Reynolds number
  double mach = 0;      // free-stream Mach number
  double weight = 0;    // weight in the objective
  // Minimum cm about the quarter chord; NaN: no moment constraint (key "cm_min" absent).
  double cm_min = std::numeric_limits<double>::quiet_NaN();
  // Flight condition when derived from the airplane: keys "speed" (m/s) and "altitude" (m),
  // absent otherwise.
  std::optional<double> speed, altitude;
};

// One entry of "transition_scenarios".
struct SummaryScenario {
  std::string name;
  double ncrit = 0;       // critical amplification exponent N of the e^N criterion
  double trip_upper = 0;  // forced transition x/c on the upper surface
  double trip_lower = 0;  // same, lower surface
  double weight = 0;      // weight in the objective
};

// "landing": the condition of the maximum-lift constraint.
struct SummaryLanding {
  double reynolds = 0;
  double mach = 0;
  double stall_speed = std::numeric_limits<double>::quiet_NaN();      // m/s; NaN: key absent
  double cl_max_required = std::numeric_limits<double>::quiet_NaN();  // NaN: key absent
};

// The case as run (top-level keys "case", "case_file", "description", "evaluator", "airplane",
// "design_points", "transition_scenarios", "landing").
struct SummaryCase {
  std::string name;  // "case"
  std::string file;  // "case_file": the case file's path as given
  std::string description;
  std::string evaluator;                    // the analysis' description
  std::optional<SummaryAirplane> airplane;  // key absent when the case has none
  std::vector<SummaryDesignPoint> design_points;
  std::vector<SummaryScenario> scenarios;  // "transition_scenarios"
  std::optional<SummaryLanding> landing;   // key absent when there is no landing condition
};

// How the search went (top-level keys).
struct SummarySearch {
  // "status" (status.h names) and "stop_reason"; "converged" is derived from the status.
  Outcome outcome;
  int evaluations = 0;         // designs analysed ("evaluations")
  int failed_evaluations = 0;  // of those, analyses that failed
  int iterations = 0;
  bool interrupted = false;          // stopped by a signal
  int replayed_from_checkpoint = 0;  // evaluations taken from the checkpoint on resume
  double elapsed_s = 0;              // wall time, s, summed over resumed runs
  std::string algorithm;             // the optimizer's algorithm name
  int search_panels = 0;             // panels of the search's analyses
  int verify_panels = 0;             // panels of the verification
};

// One entry of "verified_candidates": a design of the search analysed again with the
// verification panels, in the order verified.
struct SummaryCandidate {
  int evaluation = 0;  // 1-based index in the search history; 0: the baseline
  double search_objective = std::numeric_limits<double>::quiet_NaN();    // NaN: the baseline
  double verified_objective = std::numeric_limits<double>::quiet_NaN();  // NaN: analysis failed
  bool feasible = false;
  std::string status;  // Evaluation::status_text(): "ok" or what failed
};

// The geometry figures of a section block (fractions of the chord unless stated).
struct SummaryGeometry {
  double thickness = 0;     // max t/c (also written as "t_c")
  double thickness_x = 0;   // its x/c
  double camber = 0;        // max camber / c
  double camber_x = 0;      // its x/c
  double le_radius = 0;     // leading-edge radius / c
  double te_gap = 0;        // trailing-edge gap / c
  double te_angle_deg = 0;  // trailing-edge angle, degrees
  double area = 0;          // section area / c²
};

// "baseline" and "optimized": one section as verified.
struct SummarySection {
  std::string name;  // also the "name" of its "cst"
  // The analysis' outcome ("outcome"); "analysis_ok" and "status" (Evaluation::status_text) are
  // derived from it.
  Outcome outcome;
  int panels = 0;                                                 // panels of the analysis
  double weighted_cd = std::numeric_limits<double>::quiet_NaN();  // NaN: analysis failed
  std::vector<DesignPointRecord> points;  // design points x scenarios, scenario fastest
  double cl_max = std::numeric_limits<double>::quiet_NaN();        // NaN: not found
  double alpha_cl_max = std::numeric_limits<double>::quiet_NaN();  // degrees; NaN: not found
  SummaryGeometry geometry;                                        // flat in the block
  CstShape cst;
  // Baseline only: the CST fit's largest deviation from the given coordinates (/c; NaN written
  // as null); key absent in the optimized block.
  std::optional<double> fit_max_deviation;
  bool analysis_ok() const { return outcome.status == Status::kConverged; }
};

struct RunSummary {
  SummaryCase run_case;
  SummarySearch search;
  SummarySection baseline;
  SummarySection optimized;
  // 100 (1 - cd_opt / cd_base) of the weighted cd; NaN when either is unknown.
  double drag_reduction_percent = std::numeric_limits<double>::quiet_NaN();
  std::vector<ConstraintRecord> constraints;  // of the verified optimum, with stable ids
  bool feasible = false;                      // the verified optimum meets every constraint
  bool optimum_is_start = false;              // the start was kept: no candidate verified better
  std::vector<SummaryCandidate> verified_candidates;
  // "files": key -> path of each file written (empty until run_optimization has written them;
  // always written, as {} when empty).
  std::map<std::string, std::string> files;
};

// The summary of a finished search and its verification (without its files).
RunSummary run_summary(const Case& c, const SearchResult& r, const VerifiedOptimum& v,
                       const std::string& baseline_name, const CstShape& baseline_shape,
                       double fit_deviation, const std::string& optimum_name,
                       const CstShape& optimum_shape, const std::string& evaluator_description);

// The one JSON form (summary.json).
nlohmann::json to_json(const RunSummary& s);
// Throws InputError "<where>/<json path>: missing" (or "not a number", ...) for a key that is
// absent or of the wrong type; `where` names the file (e.g. "points/p003/summary.json").
RunSummary run_summary_from_json(const nlohmann::json& j, const std::string& where);

}  // namespace fulmar::optimize
