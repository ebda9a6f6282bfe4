// Running studies with the analytic test stand-in (optimize/testing/analytic_evaluator.h: not
// physics): the trade follows the stand-in's known trend, shards merged give exactly the single
// run, resume skips finished points, and bad directories are refused with nothing written.
#include "optimize/study/study_run.h"

#include <gtest/gtest.h>

#include <unistd.h>

#include <fstream>
#include <sstream>

#include "common/error.h"
#include "optimize/study/study_test_case.h"
#include "optimize/testing/analytic_evaluator.h"

namespace fulmar::study {
namespace {

namespace fs = std::filesystem;
using nlohmann::json;

fs::path scratch(const std::string& tag) {
  const fs::path d =
      fs::temp_directory_path() / ("fulmar_study_" + tag + "_" + std::to_string(::getpid()));
  fs::remove_all(d);
  fs::create_directories(d);
  return d;
}

std::string slurp(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::stringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

StudyDefinition test_study() {
  return study_from_json(testing::study_case_json(), "study.json", ".");
}

StudyOutcome run(const StudyDefinition& s, const fs::path& dir, Shard shard = {},
                 bool resume = false, int jobs = 2) {
  optimize::testing::AnalyticEvaluator ev;
  StudyRunOptions o;
  o.output_dir = dir;
  o.jobs = jobs;
  o.cores = 2;
  o.shard = shard;
  o.resume = resume;
  o.caution = "Caution: test.";
  return run_study(s, ev, o);
}

// The single run, once for the whole suite (every test compares against it).
const fs::path& single_run() {
  static const fs::path dir = [] {
    const fs::path d = scratch("single") / "study";
    run(test_study(), d);
    return d;
  }();
  return dir;
}

TEST(StudyRun, DragRisesWithTheThicknessBoundWhichIsActiveEverywhere) {
  const StudyDefinition s = test_study();
  const auto recs = finished_points(s, single_run());
  ASSERT_EQ(recs.size(), 5u);
  double previous = 0;
  for (const auto& r : recs) {
    EXPECT_TRUE(r.summary.feasible) << r.point.index;
    const double cd = weighted_cd(r);
    // The stand-in's friction term grows as 0.02 x t/c with nothing to gain from extra thickness,
    // so every optimum sits on the bound and each 0.02 of bound costs 0.02 x 0.02 = 4e-4 in cd
    // (the pressure term is the same at every point: it depends on camber only, capped by cm).
    if (r.point.index > 0) {
      EXPECT_NEAR(cd - previous, 4e-4, 4e-5) << r.point.index;
    }
    previous = cd;
    bool thickness_active = false;
    for (const auto& c : constraint_states(r.summary, s.active_tolerance))
      if (c.key == "t/c >=") thickness_active = c.active;
    EXPECT_TRUE(thickness_active) << r.point.index;
  }
  // Chains of 2: points 1, 3, 5 start from the baseline, 2 and 4 from their predecessor.
  EXPECT_EQ(recs[0].start, "baseline");
  EXPECT_EQ(recs[1].start, "point 1");
  EXPECT_EQ(recs[2].start, "baseline");
  EXPECT_EQ(recs[3].start, "point 3");
  const json point2 = json::parse(slurp(single_run() / "points/p002/point.json"));
  EXPECT_EQ(point2["case"]["baseline"]["cst"],
            json::parse(slurp(single_run() / "points/p001/optimized_cst.json")));
  for (const char* f : {"study.csv", "trade.svg", "sections.svg", "report.md", "study.json"})
    EXPECT_TRUE(fs::exists(single_run() / f)) << f;
}

TEST(StudyRun, ShardsMergedGiveExactlyTheSingleRun) {
  const StudyDefinition s = test_study();
  const fs::path base = scratch("shards");
  const StudyOutcome a = run(s, base / "a", {1, 2}, false, 1);
  const StudyOutcome b = run(s, base / "b", {2, 2}, false, 1);
  EXPECT_EQ(a.points_in_shard, 3);  // chains {1,2} and {5}
  EXPECT_EQ(b.points_in_shard, 2);  // chain {3,4}
  EXPECT_FALSE(a.complete);
  merge_studies({base / "a", base / "b"}, base / "merged", "Caution: test.");
  for (const char* f : {"study.csv", "trade.svg", "sections.svg", "report.md"})
    EXPECT_EQ(slurp(base / "merged" / f), slurp(single_run() / f)) << f;
  for (const auto& p : sweep_points(s))
    EXPECT_EQ(slurp(base / "merged" / p.dir / "optimized_cst.json"),
              slurp(single_run() / p.dir / "optimized_cst.json"))
        << p.dir;
  // Merging into one of the shard directories works too.
  merge_studies({base / "a", base / "b"}, base / "a", "Caution: test.");
  EXPECT_EQ(slurp(base / "a" / "study.csv"), slurp(single_run() / "study.csv"));
}

TEST(StudyRun, MergeRefusesMissingPointsAndOtherStudiesWritingNothing) {
  const StudyDefinition s = test_study();
  const fs::path base = scratch("merge_bad");
  run(s, base / "a", {1, 2}, false, 1);
  try {
    merge_studies({base / "a"}, base / "out", "");
    ADD_FAILURE() << "merged with points missing";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("point(s) 3, 4 of 5"), std::string::npos) << e.what();
  }
  EXPECT_FALSE(fs::exists(base / "out"));
  json other = testing::study_case_json();
  other["study"]["chain"] = 3;
  run(study_from_json(other, "other.json", "."), base / "c", {2, 2}, false, 1);
  try {
    merge_studies({base / "a", base / "c"}, base / "out", "");
    ADD_FAILURE() << "merged two studies";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("holds a different study"), std::string::npos) << e.what();
  }
  EXPECT_FALSE(fs::exists(base / "out"));
}

TEST(StudyRun, ResumeKeepsFinishedPointsAndRefusesWithoutIt) {
  const StudyDefinition s = test_study();
  const fs::path base = scratch("resume");
  fs::copy(single_run(), base / "study", fs::copy_options::recursive);
  // An interrupted point: remove the last point's summary, keep its checkpoint.
  fs::remove(base / "study/points/p005/summary.json");
  const StudyOutcome r = run(s, base / "study", {}, true);
  EXPECT_EQ(r.points_skipped, 4);
  EXPECT_EQ(r.points_run, 1);
  EXPECT_TRUE(r.complete);
  EXPECT_EQ(slurp(base / "study/study.csv"), slurp(single_run() / "study.csv"));
  try {
    run(s, base / "study");
    ADD_FAILURE() << "ran over existing points without --resume";
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("exists already"), std::string::npos) << e.what();
  }
}

// A point's summary.json that lacks a key is an error naming the file and the key, not a
// default value (and not a point to run again).
TEST(StudyRun, ResumeRefusesASummaryWithAKeyMissing) {
  const fs::path base = scratch("bad_summary");
  fs::copy(single_run(), base / "study", fs::copy_options::recursive);
  const fs::path file = base / "study/points/p003/summary.json";
  json j = json::parse(slurp(file));
  j["optimized"].erase("weighted_cd");
  std::ofstream(file) << j.dump(2);
  try {
    run(test_study(), base / "study", {}, true);
    ADD_FAILURE() << "read a summary without optimized/weighted_cd";
  } catch (const InputError& e) {
    EXPECT_EQ(std::string(e.what()), file.string() + "/optimized/weighted_cd: missing");
  }
}

TEST(StudyRun, RefusesADirectoryOfAnotherStudyBeforeWriting) {
  json other = testing::study_case_json();
  other["study"]["parameters"][0]["range"]["to"] = 0.14;
  const fs::path dir = scratch("foreign") / "study";
  fs::copy(single_run(), dir, fs::copy_options::recursive);
  const std::string before = slurp(dir / "study.json");
  EXPECT_THROW(run(study_from_json(other, "other.json", "."), dir, {}, true), InputError);
  EXPECT_EQ(slurp(dir / "study.json"), before);
  EXPECT_THROW(run(test_study(), "/nonexistent-parent/x/y"), InputError);
}

TEST(StudyRun, StudyOfDirectoryReadsTheManifest) {
  const StudyDefinition s = study_of_directory(single_run());
  EXPECT_EQ(s.source, testing::study_case_json());
  EXPECT_THROW(study_of_directory(scratch("empty")), InputError);
}

}  // namespace
}  // namespace fulmar::study
