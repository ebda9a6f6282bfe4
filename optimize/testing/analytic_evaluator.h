#pragma once
// TEST-ONLY. An analytic stand-in for the flow analysis, for exercising the optimizer machinery
// (validation, NLopt driving, caching, failure handling, checkpoint/resume, outputs) without the
// viscous solver. Its "aerodynamics" are invented smooth formulas of the section's thickness and
// camber, chosen so that the constrained optimum is interior and known in outline: drag grows with
// thickness and with the distance of the design cl from 12 x camber; cm = -4 x camber; cl_max grows
// with thickness and camber. None of it is physics; never use it outside tests.
#include <atomic>
#include <cmath>
#include <numbers>

#include "geometry/metrics.h"
#include "optimize/section_evaluator.h"

namespace fulmar::optimize::testing {

class AnalyticEvaluator : public SectionEvaluator {
 public:
  double fail_above_thickness = 1.0;  // analyses of thicker sections "do not converge"
  mutable std::atomic<int> analyses{0};

  std::string description() const override { return "analytic test stand-in (not physics)"; }

  SectionAnalysis analyse(const Section& s, const AnalysisRequest& request) const override {
    ++analyses;
    const SectionMetrics m = section_metrics(s);
    SectionAnalysis a;
    for (const auto& t : request.points) a.points.push_back(at_cl(m, t.flow, t.cl));
    if (request.cl_max_at) {
      a.cl_max.status = m.thickness <= fail_above_thickness ? Status::kConverged : Status::kFailed;
      a.cl_max.cl_max = 0.6 + 5 * m.thickness + 12 * m.camber;
      a.cl_max.alpha_deg = alpha_deg(m, a.cl_max.cl_max) + 2;
      if (!a.cl_max.found()) a.cl_max.reason = "test: no peak";
    }
    return a;
  }

  std::vector<PointResult> polar(const Section& s, const FlowCondition& flow,
                                 const std::vector<double>& alphas, int) const override {
    const SectionMetrics m = section_metrics(s);
    std::vector<PointResult> out;
    for (double al : alphas) {
      const double cl = (al * std::numbers::pi / 180 - alpha0(m)) * slope(m);
      out.push_back(at_cl(m, flow, cl));
    }
    return out;
  }

  Points pressure(const Section&, const FlowCondition&, double, int) const override { return {}; }

 private:
  static double alpha0(const SectionMetrics& m) { return -1.8 * m.camber; }
  static double slope(const SectionMetrics& m) {
    return 2 * std::numbers::pi * (1 + 0.77 * m.thickness);
  }
  static double alpha_deg(const SectionMetrics& m, double cl) {
    return (cl / slope(m) + alpha0(m)) * 180 / std::numbers::pi;
  }
  PointResult at_cl(const SectionMetrics& m, const FlowCondition& f, double cl) const {
    PointResult p;
    p.status = m.thickness <= fail_above_thickness ? Status::kConverged : Status::kNotConverged;
    if (!p.converged()) p.reason = "test: injected failure";
    p.cl = cl;
    p.alpha_deg = alpha_deg(m, cl);
    const double re = std::pow(3e6 / f.reynolds, 0.2);
    p.cd_friction = (0.0035 + 0.02 * m.thickness) * re;
    p.cd_pressure = 0.008 * std::pow(cl - 12 * m.camber, 2);
    p.cd = p.cd_friction + p.cd_pressure;
    p.cm = -4 * m.camber;
    p.transition_upper = 0.4;
    p.transition_lower = 0.6;
    return p;
  }
};

}  // namespace fulmar::optimize::testing
