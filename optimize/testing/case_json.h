#pragma once
// A valid case document and ways to read it, for the tests of the case-file reader
// (optimize/case_*_test.cpp).
#include <nlohmann/json.hpp>
#include <string>

#include "common/error.h"
#include "optimize/case_file.h"

namespace fulmar::optimize::testing {

// A fictional two-seat trainer at sea level: 600 kg, 11 m^2, 1.4 m chord, cruise 50 m/s.
inline nlohmann::json good_case() {
  return nlohmann::json::parse(R"({
    "schema_version": 1,
    "name": "trainer",
    "description": "test case",
    "airplane": {"mass": 600, "wing_area": 11.0, "chord": 1.4},
    "design_points": [
      {"name": "cruise", "speed": 50, "altitude": 0, "weight": 2},
      {"name": "climb", "cl": 0.8, "reynolds": 3e6, "mach": 0.08}
    ],
    "landing": {"stall_speed": 26, "altitude": 0},
    "constraints": {"cm": {"min": -0.1}, "thickness": {"min": 0.12},
                    "spar": [{"x": 0.3, "min": 0.1}]},
    "baseline": {"naca": "naca2412"}
  })");
}

inline Case parse(const nlohmann::json& j) {
  return parse_case(j.dump(), "case.json", ".");
}

inline std::string error_of(const nlohmann::json& j) {
  try {
    parse(j);
  } catch (const InputError& e) {
    return e.what();
  }
  return "no error";
}

}  // namespace fulmar::optimize::testing
