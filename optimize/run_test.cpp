// The whole optimization run with the test-only analytic evaluator (not physics; see
// optimize/testing/analytic_evaluator.h): every output file, interruption by a signal, and resume.
#include "optimize/run.h"

#include <gtest/gtest.h>
#include <unistd.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "common/error.h"
#include "geometry/cst.h"
#include "geometry/naca.h"
#include "optimize/section_problem.h"
#include "optimize/testing/analytic_evaluator.h"

namespace fulmar::optimize {
namespace {

namespace fs = std::filesystem;
using nlohmann::json;

Case small_case(int budget = 200) {
  json j = json::parse(R"({
    "schema_version": 1, "name": "test glider",
    "airplane": {"mass": 420, "wing_area": 12.5, "chord": 0.9},
    "design_points": [{"name": "cruise", "speed": 38, "altitude": 1000},
                      {"name": "climb", "cl": 0.9, "reynolds": 1.6e6, "weight": 0.5}],
    "landing": {"stall_speed": 21},
    "transition": {"scenarios": [{"name": "free", "weight": 3}, {"name": "tripped", "trip_upper": 0.1}]},
    "constraints": {"cm": {"min": -0.1}, "thickness": {"min": 0.13}, "spar": [{"x": 0.3, "min": 0.12}]},
    "parameterization": {"order_upper": 3, "order_lower": 3},
    "analysis": {"polar_alpha": {"min": -4, "max": 12, "step": 1}},
    "outputs": {"points": 101},
    "baseline": {"naca": "0018"}
  })");
  j["optimizer"]["max_evaluations"] = budget;
  return parse_case(j.dump(), "test.json", ".");
}

fs::path scratch(const std::string& tag) {
  fs::path d = fs::temp_directory_path() / ("fulmar_run_" + tag + "_" + std::to_string(::getpid()));
  fs::remove_all(d);
  return d;
}

std::string slurp(const fs::path& p) {
  std::ifstream in(p);
  std::stringstream s;
  s << in.rdbuf();
  return s.str();
}

// Sets the stop flag after a number of analyses, as a signal handler would.
class StoppingEvaluator : public testing::AnalyticEvaluator {
 public:
  std::atomic<bool>* stop = nullptr;
  int stop_after = 0;
  SectionAnalysis analyse(const Section& s, const AnalysisRequest& r) const override {
    SectionAnalysis a = AnalyticEvaluator::analyse(s, r);
    if (stop && analyses.load() >= stop_after) stop->store(true);
    return a;
  }
};

TEST(Run, WritesEveryResultFile) {
  const fs::path dir = scratch("all");
  testing::AnalyticEvaluator ev;
  RunOptions o;
  o.output_dir = dir;
  o.threads = 2;
  o.caution = "CAUTION TEXT";
  const RunOutcome out = run_optimization(small_case(), ev, o);
  for (const char* f :
       {"optimized.dat", "optimized.csv", "optimized_cst.json", "polar_baseline.csv",
        "polar_optimized.csv", "history.csv", "summary.json", "report.md", "sections.svg",
        "polars.svg", "lift_moment.svg", "cp_cruise.svg", "convergence.svg", "checkpoint.json"}) {
    ASSERT_TRUE(fs::exists(dir / f)) << f;
    EXPECT_EQ(slurp(dir / f).find("nan"), std::string::npos) << f;
  }
  // summary.json is the summary's one JSON form, and reads back to the same document.
  const json written = json::parse(slurp(dir / "summary.json"));
  EXPECT_EQ(written, to_json(out.summary));
  EXPECT_EQ(to_json(run_summary_from_json(written, "summary.json")), written);
  const json& s = written;
  // The CST JSON is a SHAPE fulmar reads back.
  const CstShape shape =
      cst_from_json(json::parse(slurp(dir / "optimized_cst.json")), "optimized_cst.json");
  EXPECT_EQ(shape.upper.size(), 4);
  // 101 points asked for: 51 per surface, the leading edge shared, plus the name line.
  std::istringstream dat(slurp(dir / "optimized.dat"));
  int lines = 0;
  for (std::string l; std::getline(dat, l);) lines += l.empty() ? 0 : 1;
  EXPECT_EQ(lines, 102);
  for (const char* block : {"baseline", "optimized"}) {
    ASSERT_TRUE(s.contains(block));
    ASSERT_EQ(s[block]["points"].size(), 4u);  // 2 design points x 2 transition scenarios
    for (const auto& p : s[block]["points"])
      for (const char* k : {"cd", "cl", "cm", "alpha", "transition_upper", "transition_lower"})
        EXPECT_TRUE(p.contains(k)) << k;
    EXPECT_TRUE(s[block]["cl_max"].is_number());
    EXPECT_TRUE(s[block]["t_c"].is_number());
  }
  ASSERT_TRUE(s["constraints"].is_array());
  for (const auto& k : s["constraints"])
    for (const char* key : {"name", "value", "limit", "satisfied"})
      EXPECT_TRUE(k.contains(key)) << key;
  const std::string history = slurp(dir / "history.csv");
  EXPECT_EQ(s["evaluations"].get<size_t>(),
            size_t(std::count(history.begin(), history.end(), '\n') - 1));
  EXPECT_TRUE(s["feasible"].get<bool>());
  EXPECT_GT(s["drag_reduction_percent"].get<double>(), 10.0);
  EXPECT_EQ(s["verify_panels"].get<int>(), 240);
  EXPECT_TRUE(s["files"].contains("coordinates"));
  const std::string report = slurp(dir / "report.md");
  EXPECT_NE(report.find("CAUTION TEXT"), std::string::npos);
  EXPECT_NE(report.find("| constraint | value | limit | met |"), std::string::npos);
  fs::remove_all(dir);
}

// The optimized section is also written for CAD when the case asks for it, at the airplane's
// chord by default (0.9 m = 900 mm here). The files themselves are checked against the section by
// independent readers in src/cad and tests/cad; here: written, named in the summary, right scale.
TEST(Run, WritesCadFilesWhenAsked) {
  const fs::path dir = scratch("cad");
  testing::AnalyticEvaluator ev;
  RunOptions o;
  o.output_dir = dir;
  o.threads = 2;
  Case c = small_case(60);
  c.outputs.cad_formats = {"step", "dxf", "csv"};
  const RunOutcome out = run_optimization(c, ev, o);
  for (const char* f : {"optimized_cad.step", "optimized_cad.dxf", "optimized_cad.csv"}) {
    ASSERT_TRUE(fs::exists(dir / f)) << f;
  }
  EXPECT_TRUE(out.summary.files.count("cad_step"));
  EXPECT_TRUE(out.summary.files.count("cad_dxf"));
  EXPECT_NE(slurp(dir / "optimized_cad.step").find("B_SPLINE_CURVE_WITH_KNOTS"), std::string::npos);
  // The CAD CSV is placed at the chord in mm: its largest x is 900.
  double x_max = 0;
  std::istringstream csv(slurp(dir / "optimized_cad.csv"));
  std::string line;
  std::getline(csv, line);  // header
  while (std::getline(csv, line)) {
    if (line.empty()) continue;
    x_max = std::max(x_max, std::stod(line.substr(0, line.find(','))));
  }
  EXPECT_NEAR(x_max, 900.0, 1e-6 * 900.0);
  fs::remove_all(dir);
}

TEST(Run, InterruptWritesTheBestDesignAndResumeReachesTheSameOptimum) {
  const fs::path whole_dir = scratch("whole"), dir = scratch("interrupted");
  testing::AnalyticEvaluator ev;
  RunOptions o;
  o.threads = 2;
  o.output_dir = whole_dir;
  const RunOutcome whole = run_optimization(small_case(), ev, o);

  std::atomic<bool> stop{false};
  StoppingEvaluator stopping;
  stopping.stop = &stop;
  stopping.stop_after = 30;
  RunOptions o1 = o;
  o1.output_dir = dir;
  o1.stop = &stop;
  const RunOutcome first = run_optimization(small_case(), stopping, o1);
  EXPECT_TRUE(first.interrupted);
  EXPECT_TRUE(first.summary.search.interrupted);
  EXPECT_TRUE(fs::exists(dir / "optimized.dat"));
  EXPECT_LT(first.summary.search.evaluations, whole.summary.search.evaluations);

  testing::AnalyticEvaluator fresh;
  RunOptions o2 = o;
  o2.output_dir = dir;
  o2.resume = true;
  const RunOutcome resumed = run_optimization(small_case(), fresh, o2);
  EXPECT_FALSE(resumed.interrupted);
  EXPECT_EQ(resumed.summary.search.evaluations, whole.summary.search.evaluations);
  EXPECT_EQ(to_json(resumed.summary)["optimized"]["cst"],
            to_json(whole.summary)["optimized"]["cst"]);
  EXPECT_EQ(resumed.summary.optimized.weighted_cd, whole.summary.optimized.weighted_cd);
  EXPECT_GT(resumed.summary.search.replayed_from_checkpoint, 0);
  fs::remove_all(whole_dir);
  fs::remove_all(dir);
}

TEST(Run, ResumeWithoutCheckpointWritesNothing) {
  const fs::path dir = scratch("nockpt");
  testing::AnalyticEvaluator ev;
  RunOptions o;
  o.output_dir = dir;
  o.resume = true;
  EXPECT_THROW(run_optimization(small_case(), ev, o), InputError);
  EXPECT_FALSE(fs::exists(dir));
  EXPECT_EQ(ev.analyses.load(), 0);
}

TEST(Run, StartsWhereToldAndKeepsTheBaselineAsReference) {
  const fs::path dir = scratch("start"), dir2 = scratch("start_bad");
  testing::AnalyticEvaluator ev;
  const Case c = small_case();
  CstShape start = fit_cst(naca_section("2414", 201), 3, 3).shape;
  RunOptions o;
  o.output_dir = dir;
  o.threads = 2;
  o.start_shape = start;
  const RunOutcome out = run_optimization(c, ev, o);
  const std::string history = slurp(dir / "history.csv");
  const std::string first_row = history.substr(history.find('\n') + 1);
  char buf[48];
  std::snprintf(buf, sizeof buf, "%.17g", start.upper[0]);
  EXPECT_NE(first_row.substr(0, first_row.find('\n')).find(buf), std::string::npos)
      << first_row.substr(0, 200);
  EXPECT_EQ(out.summary.baseline.name, "NACA 0018");
  CstShape wrong = fit_cst(naca_section("2414", 201), 5, 5).shape;
  o.output_dir = dir2;
  o.start_shape = wrong;
  EXPECT_THROW(run_optimization(c, ev, o), InputError);
  EXPECT_FALSE(fs::exists(dir2));
  fs::remove_all(dir);
}

// Verification (finer panels) that charges every departure from the start's thickness: the
// search's gains do not survive it, as when a search exploits a coarse-panel error.
class StartFavouringVerification : public testing::AnalyticEvaluator {
 public:
  int verify_panels = 0;
  double start_thickness = 0;
  SectionAnalysis analyse(const Section& s, const AnalysisRequest& r) const override {
    SectionAnalysis a = AnalyticEvaluator::analyse(s, r);
    if (r.panels == verify_panels) {
      const double dt = std::abs(section_metrics(s).thickness - start_thickness);
      for (PointResult& p : a.points) p.cd += 0.5 * dt;
    }
    return a;
  }
};

TEST(Run, KeepsAFeasibleStartThatVerifiesBetterThanEverySearchCandidate) {
  const fs::path dir = scratch("keep_start");
  StartFavouringVerification ev;
  const Case c = small_case(60);
  ev.verify_panels = c.analysis.verify_panels;
  ev.start_thickness = section_metrics(naca_section("0018", 201)).thickness;
  RunOptions o;
  o.output_dir = dir;
  o.threads = 2;
  const RunOutcome out = run_optimization(c, ev, o);
  // The search itself improves on the start (at its own panels), so without the rule a worse
  // design would be returned.
  ASSERT_GT(out.summary.verified_candidates.size(), 0u);
  const SummaryCandidate& first = out.summary.verified_candidates[0];
  ASSERT_TRUE(std::isfinite(first.search_objective));
  EXPECT_TRUE(out.summary.optimum_is_start);
  EXPECT_TRUE(out.feasible);
  EXPECT_DOUBLE_EQ(out.summary.optimized.weighted_cd, out.summary.baseline.weighted_cd);
  EXPECT_LT(out.summary.baseline.weighted_cd, first.verified_objective / 100.0);
  EXPECT_NE(slurp(dir / "report.md").find("better than the start"), std::string::npos);
  fs::remove_all(dir);
}

TEST(Run, AnOrdinarySearchDoesNotKeepItsStart) {
  const fs::path dir = scratch("no_keep_start");
  testing::AnalyticEvaluator ev;
  RunOptions o;
  o.output_dir = dir;
  o.threads = 2;
  const RunOutcome out = run_optimization(small_case(60), ev, o);
  EXPECT_FALSE(out.summary.optimum_is_start);
  EXPECT_LT(out.summary.optimized.weighted_cd, out.summary.baseline.weighted_cd);
  fs::remove_all(dir);
}

TEST(Run, ASecondStartIsSearchedFromToo) {
  const fs::path dir = scratch("second_start");
  testing::AnalyticEvaluator ev;
  Case c = small_case(80);
  Baseline b;
  b.kind = Baseline::Kind::naca;
  b.naca = "2412";
  b.json_path = "/second_start";
  c.second_start = b;
  RunOptions o;
  o.output_dir = dir;
  o.threads = 2;
  const RunOutcome out = run_optimization(c, ev, o);
  const std::string reason = out.summary.search.outcome.reason;
  EXPECT_NE(reason.find("from start 2"), std::string::npos) << reason;
  // Its first design is the NACA 2412 fitted at the case's orders.
  const CstShape s = resolve_shape(c, b).shape;
  char buf[48];
  std::snprintf(buf, sizeof buf, "%.17g", s.upper[0]);
  EXPECT_NE(slurp(dir / "history.csv").find(buf), std::string::npos);
  fs::remove_all(dir);
}

TEST(Run, MissingParentDirectoryIsAnInputError) {
  testing::AnalyticEvaluator ev;
  RunOptions o;
  o.output_dir = scratch("noparent") / "deeper" / "out";
  EXPECT_THROW(run_optimization(small_case(), ev, o), InputError);
}

}  // namespace
}  // namespace fulmar::optimize
