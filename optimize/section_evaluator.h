#pragma once
// The optimizer asks one question of aerodynamics: for this section, what are cd, cm, alpha and
// transition at each design cl, and what is cl_max at the landing condition? SectionEvaluator is
// that question as an interface, so that the search machinery does not depend on one solver. The
// production implementation (viscous_evaluator.h) runs the viscous-inviscid analysis.
#include <optional>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "common/status.h"
#include "geometry/section.h"

namespace fulmar::optimize {

// What the section sees: Reynolds and Mach number and the transition model.
struct FlowCondition {
  double reynolds = 1e6;
  double mach = 0;
  double ncrit = 9;         // critical amplification factor (e^N)
  double trip_upper = 1.0;  // forced transition x/c, 1 = free
  double trip_lower = 1.0;
};

// One converged (or not) operating point.
// How the analysis ended (Outcome: the viscous solve's status; the reason says why it did not
// converge and is empty when it did), then the values.
struct PointResult : Outcome {
  bool converged() const { return status == Status::kConverged; }
  double residual = 0;  // final residual of the solver
  int iterations = 0;
  double alpha_deg = 0;
  double cl = 0, cd = 0, cd_friction = 0, cd_pressure = 0, cm = 0;  // cm about c/4
  double transition_upper = 1, transition_lower = 1;                // x/c
};

// The maximum lift coefficient: converged when found (a peak bracketed and refined, or the last
// converged lift before the solutions stop converging); failed with the reason when not.
struct ClMaxResult : Outcome {
  bool found() const { return status == Status::kConverged; }
  double cl_max = 0;
  double alpha_deg = 0;
};

// A lift coefficient to reach under a flow condition.
struct TargetPoint {
  double cl = 0;
  FlowCondition flow;
};

struct AnalysisRequest {
  std::vector<TargetPoint> points;         // solved at target cl, in this order
  std::optional<FlowCondition> cl_max_at;  // cl_max wanted here (landing)
  int panels = 160;
};

struct SectionAnalysis {
  std::vector<PointResult> points;  // one per request point
  ClMaxResult cl_max;               // when requested
};

// Implementations must be safe to call from several threads at once (the optimizer evaluates
// finite-difference designs in parallel) and must not keep state between calls: every analysis is
// fresh (no warm start from a previous design), so results depend on the section alone, which
// makes caching and resuming exact. A point that does not converge is reported in its result,
// never thrown.
class SectionEvaluator {
 public:
  virtual ~SectionEvaluator() = default;
  // A short description for reports, e.g. "viscous-inviscid, 160 panels".
  virtual std::string description() const = 0;
  // Solves every point of `request` and cl_max when asked. `section` is chord-normalised.
  virtual SectionAnalysis analyse(const Section& section, const AnalysisRequest& request) const = 0;
  // A polar: one result per angle (degrees), in order.
  virtual std::vector<PointResult> polar(const Section& section, const FlowCondition& flow,
                                         const std::vector<double>& alphas_deg,
                                         int panels) const = 0;
  // Surface pressure at target `cl`: #nodes by 2 of (x/c, Cp) from the trailing edge over the
  // upper surface to the lower; empty when unavailable.
  virtual Points pressure(const Section& section, const FlowCondition& flow, double cl,
                          int panels) const = 0;
};

// JSON: the values, "status" and "reason" (to_json(Outcome)), and "converged" (PointResult) or
// "found" (ClMaxResult) derived from the status. The strict readers are in evaluation_record.h.
nlohmann::json to_json(const PointResult& p);
nlohmann::json to_json(const ClMaxResult& c);

}  // namespace fulmar::optimize
