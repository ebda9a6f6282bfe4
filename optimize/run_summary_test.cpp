// Tests of summary.json's content and its one conversion each way (run_summary.h), and of the
// report built from it (run_report.h), with the analytic stand-in.
#include "optimize/run_summary.h"

#include <gtest/gtest.h>

#include <memory>
#include <set>

#include "common/error.h"
#include "optimize/run_report.h"
#include "optimize/testing/analytic_evaluator.h"

namespace fulmar::optimize {
namespace {

using nlohmann::json;

struct Fixture {
  Case c;
  testing::AnalyticEvaluator ev;
  BaselineShape b;
  std::unique_ptr<SectionProblem> p;
  SearchResult r;
  VerifiedOptimum v;
  Fixture() {
    json j = json::parse(R"({
      "schema_version": 1, "name": "summary",
      "design_points": [{"name": "cruise", "cl": 0.4, "reynolds": 2e6, "weight": 2},
                        {"name": "climb", "cl": 0.8, "reynolds": 1e6}],
      "landing": {"reynolds": 1.5e6},
      "constraints": {"cl_max": {"min": 1.2}, "thickness": {"min": 0.12}, "cm": {"min": -0.1}},
      "parameterization": {"order_upper": 3, "order_lower": 3},
      "baseline": {"naca": "0015"}
    })");
    c = parse_case(j.dump(), "test.json", ".");
    b = resolve_baseline(c);
    p = std::make_unique<SectionProblem>(c, ev, design_space(c, b.shape));
    Evaluation failed;
    failed.x = p->space().start;
    failed.x[0] += 0.01;
    failed.reason = "failed";
    r.history = {p->evaluate(p->space().start, c.analysis.panels), failed};
    r.reason = "test";
    r.best_any = 0;
    v = verify_optimum(c, *p, r, p->space().start, nullptr);
  }
};

TEST(RunSummary, HoldsTheVerifiedFiguresUnderTheirKeys) {
  Fixture f;
  const json s = to_json(run_summary(f.c, f.r, f.v, f.b.name, f.b.shape, f.b.fit_deviation, "opt",
                                     f.b.shape, f.ev.description()));
  ASSERT_TRUE(f.v.baseline.ok()) << f.v.baseline.reason;
  EXPECT_DOUBLE_EQ(s.at("baseline").at("weighted_cd").get<double>(),
                   f.v.baseline.objective / 100.0);
  EXPECT_EQ(s.at("baseline").at("points").size(), 2u);
  EXPECT_EQ(s.at("baseline").at("panels"), f.c.analysis.verify_panels);
  EXPECT_DOUBLE_EQ(s.at("baseline").at("t_c").get<double>(),
                   f.v.baseline.detail.geometry.thickness);
  EXPECT_TRUE(s.at("baseline").contains("fit_max_deviation"));
  EXPECT_FALSE(s.at("optimized").contains("fit_max_deviation"));
  EXPECT_EQ(s.at("failed_evaluations"), 1);
  EXPECT_EQ(s.at("evaluations"), 2);
  EXPECT_EQ(s.at("design_points").at(1).at("cm_min"), -0.1);
  // Every constraint row has its stable id beside the display name.
  std::set<std::string> ids;
  for (const auto& row : s.at("constraints")) ids.insert(row.at("id").get<std::string>());
  for (const char* id : {"thickness_min", "cl_max", "cm_cruise", "cm_climb"})
    EXPECT_TRUE(ids.count(id)) << id;
}

// The summary as written (with its files) reads back to the same document.
json written_summary(const Fixture& f) {
  RunSummary s = run_summary(f.c, f.r, f.v, f.b.name, f.b.shape, f.b.fit_deviation, "opt",
                             f.b.shape, f.ev.description());
  s.files = {{"report", "out/report.md"}, {"summary", "out/summary.json"}};
  return json::parse(to_json(s).dump(2));
}

TEST(RunSummary, ReadsBackToTheSameDocument) {
  Fixture f;
  const json j = written_summary(f);
  const RunSummary s = run_summary_from_json(j, "summary.json");
  EXPECT_EQ(to_json(s), j);
  EXPECT_EQ(s.search.failed_evaluations, 1);
  EXPECT_EQ(s.search.outcome.reason, "test");
  EXPECT_EQ(s.baseline.points.size(), 2u);
  ASSERT_TRUE(s.run_case.landing.has_value());
  EXPECT_FALSE(s.run_case.airplane.has_value());
  EXPECT_TRUE(s.baseline.fit_max_deviation.has_value());
  EXPECT_FALSE(s.optimized.fit_max_deviation.has_value());
}

// Reading `j` fails with exactly `message`.
void expect_rejected(const json& j, const std::string& message) {
  try {
    run_summary_from_json(j, "p003/summary.json");
    ADD_FAILURE() << "accepted; expected: " << message;
  } catch (const InputError& e) {
    EXPECT_EQ(std::string(e.what()), message);
  }
}

TEST(RunSummary, AMissingKeyIsAnErrorNamingItsPath) {
  Fixture f;
  json j = written_summary(f);
  j.erase("feasible");
  expect_rejected(j, "p003/summary.json/feasible: missing");
  j = written_summary(f);
  j["optimized"]["points"][1].erase("cd");
  expect_rejected(j, "p003/summary.json/optimized/points/1/cd: missing");
  j = written_summary(f);
  j["baseline"].erase("fit_max_deviation");
  expect_rejected(j, "p003/summary.json/baseline/fit_max_deviation: missing");
  j = written_summary(f);
  j.erase("files");
  expect_rejected(j, "p003/summary.json/files: missing");
}

TEST(RunSummary, AMistypedKeyIsAnErrorNamingItsPath) {
  Fixture f;
  json j = written_summary(f);
  j["evaluations"] = "2";
  expect_rejected(j, "p003/summary.json/evaluations: not an integer");
  j = written_summary(f);
  j["constraints"][0]["satisfied"] = 1;
  expect_rejected(j, "p003/summary.json/constraints/0/satisfied: not true or false");
  j = written_summary(f);
  j["status"] = "finished";
  try {
    run_summary_from_json(j, "p003/summary.json");
    ADD_FAILURE() << "accepted an unknown search status";
  } catch (const InputError& e) {
    EXPECT_EQ(std::string(e.what()).rfind("p003/summary.json/status: ", 0), 0u) << e.what();
  }
  j = written_summary(f);
  j["landing"]["reynolds"] = json::array();
  expect_rejected(j, "p003/summary.json/landing/reynolds: not a number");
}

TEST(RunReport, SaysWhetherTheConstraintsAreMetAndRepeatsTheCaution) {
  Fixture f;
  const RunSummary s = run_summary(f.c, f.r, f.v, f.b.name, f.b.shape, f.b.fit_deviation, "opt",
                                   f.b.shape, f.ev.description());
  const std::string m =
      report_markdown(f.c, s, f.r, f.v, f.b.name, f.ev.description(), "CAUTION TEXT");
  EXPECT_EQ(m.rfind("# summary: section design report", 0), 0u);
  EXPECT_NE(m.find(f.v.feasible ? "meets every constraint" : "does NOT meet"), std::string::npos);
  EXPECT_NE(m.find("(1 failed)"), std::string::npos);
  size_t cautions = 0;
  for (size_t p = m.find("CAUTION TEXT"); p != std::string::npos; p = m.find("CAUTION TEXT", p + 1))
    ++cautions;
  EXPECT_EQ(cautions, 2u);
  EXPECT_NE(m.find("| cruise | baseline |"), std::string::npos);
  EXPECT_NE(m.find("| climb | optimized |"), std::string::npos);
}

}  // namespace
}  // namespace fulmar::optimize
