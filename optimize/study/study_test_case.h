#pragma once
// TEST-ONLY. A small study case shared by the study tests: the test glider of the optimizer's
// tests with a sweep of its minimum-thickness bound. Run with the analytic test stand-in
// (optimize/testing/analytic_evaluator.h), whose drag grows with thickness and whose cm limit
// caps the camber, so the thickness and cm limits bind at every optimum.
#include <string>

#include <nlohmann/json.hpp>

namespace fulmar::study::testing {

inline nlohmann::json study_case_json() {
  return nlohmann::json::parse(R"({
    "schema_version": 1, "name": "study test glider",
    "design_points": [{"name": "cruise", "cl": 0.5, "reynolds": 3e6}],
    "landing": {"reynolds": 2e6},
    "constraints": {"cl_max": {"min": 1.3}, "cm": {"min": -0.08}, "thickness": {"min": 0.12}},
    "parameterization": {"order_upper": 4, "order_lower": 4, "bounds": {"margin": 0.2}},
    "optimizer": {"max_evaluations": 300, "seed": 3},
    "analysis": {"panels": 60, "verify_panels": 60, "polar_alpha": {"min": -4, "max": 12, "step": 2}},
    "baseline": {"naca": "0018"},
    "study": {
      "parameters": [{"pointer": "/constraints/thickness/min", "name": "minimum t/c",
                      "range": {"from": 0.10, "to": 0.18, "step": 0.02}}],
      "chain": 2
    }
  })");
}

}  // namespace fulmar::study::testing
