// The study results from hand-made point summaries (optimize::RunSummary): the CSV
// columns and their values, the active flags, empty fields for failed analyses, valid SVG for one
// and two parameters, and the report's caution.
#include "optimize/study/study_results.h"

#include <gtest/gtest.h>

#include <cmath>
#include <sstream>

#include "common/error.h"
#include "geometry/cst.h"
#include "geometry/naca.h"
#include "optimize/study/study_test_case.h"

namespace fulmar::study {
namespace {

using nlohmann::json;

optimize::ConstraintRecord constraint(const std::string& id, const std::string& name, double value,
                                      double limit, bool is_min, bool satisfied) {
  optimize::ConstraintRecord c;
  c.id = id;
  c.name = name;
  c.value = value;
  c.limit = limit;
  c.is_min = is_min;
  c.satisfied = satisfied;
  return c;
}

optimize::RunSummary summary(double cd, double tc, double limit, bool feasible,
                             bool converged = true) {
  optimize::RunSummary s;
  s.feasible = feasible;
  s.search.outcome = {Status::kConverged, ""};
  s.search.evaluations = 42;
  s.optimized.name = "opt";
  s.optimized.outcome = {converged ? Status::kConverged : Status::kFailed, ""};
  s.optimized.weighted_cd = converged ? cd : std::nan("");
  s.optimized.geometry.thickness = tc;
  s.optimized.cl_max = 1.4;
  s.optimized.cst = fit_cst(naca_section("2412", 101), 4, 4).shape;
  optimize::DesignPointRecord p;
  p.point = "cruise";
  p.scenario = "nominal";
  p.result.status = converged ? Status::kConverged : Status::kFailed;
  p.result.cd = cd;
  p.result.cl = 0.5;
  s.optimized.points = {p};
  s.constraints = {constraint("reversal_upper", "curvature reversal, upper surface (strength, 1/c)",
                              0, 0.05, false, true),
                   constraint("thickness_min", "t/c", tc, limit, true, feasible),
                   constraint("cm_cruise", "cm at cruise", -0.05, -0.08, true, true)};
  return s;
}

// Constraints are told apart by their id, not by their text: two with the same display text (the
// trailing-edge gap's min and max share theirs) stay two.
TEST(StudyResults, ConstraintStatesAreIdentifiedById) {
  optimize::RunSummary s = summary(0.006, 0.12, 0.12, true);
  const auto states = constraint_states(s, 0.01);
  ASSERT_EQ(states.size(), 3u);
  EXPECT_EQ(states[1].id, "thickness_min");
  EXPECT_EQ(states[1].key, "t/c >=");
  EXPECT_TRUE(states[1].active);
  s.constraints.push_back(constraint("te_gap_min", "trailing-edge gap", 0.002, 0.001, true, true));
  s.constraints.push_back(constraint("te_gap_max", "trailing-edge gap", 0.002, 0.003, false, true));
  const auto gaps = constraint_states(s, 0.01);
  ASSERT_EQ(gaps.size(), 5u);
  EXPECT_EQ(gaps[3].id, "te_gap_min");
  EXPECT_EQ(gaps[4].id, "te_gap_max");
}

std::vector<PointRecord> records(const StudyDefinition& s) {
  const auto pts = sweep_points(s);
  return {{pts[0], "baseline", summary(0.0061, 0.1000, 0.10, true)},
          {pts[1], "point 1", summary(0.0064, 0.1250, 0.12, true)},
          {pts[2], "baseline", summary(0.0070, 0.1399, 0.14, false, false)}};
}

std::vector<std::string> lines(const std::string& text) {
  std::vector<std::string> out;
  std::istringstream in(text);
  for (std::string l; std::getline(in, l);) out.push_back(l);
  return out;
}

TEST(StudyCsv, ColumnsAndValues) {
  const StudyDefinition s = study_from_json(testing::study_case_json(), "study.json", ".");
  const auto l = lines(study_csv(s, records(s)));
  ASSERT_EQ(l.size(), 4u);
  EXPECT_EQ(
      l[0],
      "point,minimum t/c,start,feasible,converged,evaluations,weighted_cd,cd cruise,cl_max,t_c,"
      "\"curvature reversal, upper surface (strength, 1/c) <= value\","
      "\"curvature reversal, upper surface (strength, 1/c) <= limit\","
      "\"curvature reversal, upper surface (strength, 1/c) <= active\","
      "\"curvature reversal, upper surface (strength, 1/c) <= met\","
      "t/c >= value,t/c >= limit,t/c >= active,t/c >= met,"
      "cm at cruise >= value,cm at cruise >= limit,cm at cruise >= active,cm at cruise >= met,"
      "coordinates,coordinates_csv,cst");
  // Point 1 presses on t/c (0 % off); the curvature-reversal strength 0 is far below its 0.05.
  EXPECT_EQ(
      l[1],
      "1,0.1,baseline,true,true,42,0.0061,0.0061,1.4,0.1,0,0.05,false,true,0.1,0.1,true,true,-0.05,"
      "-0.08,false,"
      "true,points/p001/optimized.dat,points/p001/optimized.csv,points/p001/optimized_cst.json");
  // Point 2: t/c 0.125 is 4 % above 0.12, outside the 1 % band.
  EXPECT_NE(l[2].find(",0.125,0.12,false,true,"), std::string::npos) << l[2];
  EXPECT_NE(l[2].find(",point 1,"), std::string::npos);
  // Point 3's analysis failed: no cd figures, not a NaN.
  EXPECT_EQ(l[3].find("nan"), std::string::npos) << l[3];
  EXPECT_NE(l[3].find("3,0.14,baseline,false,true,42,,,1.4,"), std::string::npos) << l[3];
}

TEST(StudyPlots, OneParameterTradeAndSections) {
  const StudyDefinition s = study_from_json(testing::study_case_json(), "study.json", ".");
  const std::string trade = trade_svg(s, records(s));
  EXPECT_EQ(trade.rfind("<?xml", 0), 0u);
  EXPECT_NE(trade.find("</svg>"), std::string::npos);
  EXPECT_NE(trade.find("1: t/c &gt;="), std::string::npos);  // the active constraint's strip row
  EXPECT_EQ(trade.find("nan"), std::string::npos);
  const std::string sections = sections_svg(s, records(s));
  EXPECT_NE(sections.find("minimum t/c = 0.12"), std::string::npos);
  EXPECT_NE(sections.find("</svg>"), std::string::npos);
  // No points yet: still a valid document.
  EXPECT_NE(trade_svg(s, {}).find("</svg>"), std::string::npos);
}

TEST(StudyPlots, TwoParameterHeatMap) {
  json j = testing::study_case_json();
  j["study"]["parameters"][0]["range"] = {{"from", 0.10}, {"to", 0.12}, {"step", 0.02}};
  j["study"]["parameters"].push_back({{"pointer", "/design_points/0/cl"}, {"values", {0.4, 0.5}}});
  const StudyDefinition s = study_from_json(j, "study.json", ".");
  const auto pts = sweep_points(s);
  std::vector<PointRecord> r{{pts[0], "baseline", summary(0.0061, 0.1, 0.10, true)},
                             {pts[1], "point 1", summary(0.0066, 0.1, 0.10, true)}};
  const std::string heat = trade_svg(s, r);
  EXPECT_EQ(heat.rfind("<?xml", 0), 0u);
  EXPECT_NE(heat.find("0.00610"), std::string::npos);
  EXPECT_NE(heat.find("not run"), std::string::npos);  // the two missing cells
  EXPECT_NE(heat.find("1: t/c &gt;="), std::string::npos);
  EXPECT_EQ(heat.find("nan"), std::string::npos);
}

TEST(StudyReport, CarriesTheCautionAndTheRules) {
  const StudyDefinition s = study_from_json(testing::study_case_json(), "study.json", ".");
  const std::string m = study_report(s, records(s), "Caution: test caution.");
  EXPECT_NE(m.find("> **Caution: test caution.**"), std::string::npos);
  EXPECT_NE(m.find("points finished: 3 of 5"), std::string::npos);
  EXPECT_NE(m.find("Not finished: 4 5"), std::string::npos);
  EXPECT_NE(m.find("within 1 % of its limit"), std::string::npos);
  EXPECT_NE(m.find("chains of 2"), std::string::npos);
  EXPECT_NE(m.find("| 3 | 0.14 | n/a |"),
            std::string::npos);  // failed analysis: "n/a" (number_text.h)
}

}  // namespace
}  // namespace fulmar::study
