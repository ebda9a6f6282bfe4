// Tests of the polar conditions and angles of a run (run_polars.h).
#include "optimize/run_polars.h"

#include <gtest/gtest.h>

namespace fulmar::optimize {
namespace {

using nlohmann::json;

Case two_points_at_one_reynolds() {
  json j = json::parse(R"({
    "schema_version": 1, "name": "polar conditions",
    "design_points": [{"name": "cruise", "cl": 0.3, "reynolds": 2e6},
                      {"name": "climb", "cl": 0.8, "reynolds": 2e6},
                      {"name": "fast", "cl": 0.2, "reynolds": 3e6}],
    "landing": {"reynolds": 1.5e6, "mach": 0.1},
    "constraints": {"cl_max": {"min": 1.3}},
    "analysis": {"polar_alpha": {"min": -2, "max": 3, "step": 0.5}},
    "baseline": {"naca": "0012"}
  })");
  return parse_case(j.dump(), "test.json", ".");
}

// One polar per distinct (Re, M): the climb point shares the cruise point's, so it is not run
// twice; the landing comes last.
TEST(RunPolars, OneConditionPerDistinctReynoldsAndTheLandingLast) {
  const auto conds = polar_conditions(two_points_at_one_reynolds());
  ASSERT_EQ(conds.size(), 3u);
  EXPECT_EQ(conds[0].name, "cruise");
  EXPECT_EQ(conds[1].name, "fast");
  EXPECT_EQ(conds[2].name, "landing");
  EXPECT_TRUE(conds[2].landing);
  EXPECT_FALSE(conds[0].landing);
  EXPECT_DOUBLE_EQ(conds[2].flow.reynolds, 1.5e6);
  EXPECT_DOUBLE_EQ(conds[2].flow.mach, 0.1);
}

// -2 .. 3 by 0.5 is 11 angles, the last exactly at the maximum (no rounding loss).
TEST(RunPolars, AnglesIncludeBothEnds) {
  const auto a = polar_angles(two_points_at_one_reynolds().analysis);
  ASSERT_EQ(a.size(), 11u);
  EXPECT_DOUBLE_EQ(a.front(), -2.0);
  EXPECT_DOUBLE_EQ(a.back(), 3.0);
}

}  // namespace
}  // namespace fulmar::optimize
