// `fulmar study` and `fulmar study merge` end to end: help and caution, validation errors (exit 2,
// nothing written), the plan of --check, the example study cases, and two shards run as separate
// processes and merged, compared with the single run.
#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>

#include <nlohmann/json.hpp>

#include "cli_run.h"

namespace fulmar::testing {
namespace {

namespace fs = std::filesystem;
using nlohmann::json;

// A deliberately small study (two points, one per chain, so two shards of one point each): few
// analyses and coarse panels keep it quick with the real analysis.
json tiny_study() {
  return json::parse(R"({
    "schema_version": 1, "name": "cli study glider",
    "design_points": [{"name": "cruise", "cl": 0.5, "reynolds": 3e6}],
    "landing": {"reynolds": 2e6},
    "constraints": {"cl_max": {"min": 1.3}, "cm": {"min": -0.08}, "thickness": {"min": 0.12}},
    "parameterization": {"order_upper": 4, "order_lower": 4, "bounds": {"margin": 0.2}},
    "optimizer": {"max_evaluations": 12, "seed": 3},
    "analysis": {"panels": 60, "verify_panels": 60, "polar_alpha": {"min": -4, "max": 12, "step": 4}},
    "outputs": {"polars": false},
    "baseline": {"naca": "0015"},
    "study": {"parameters": [{"pointer": "/constraints/thickness/min", "name": "minimum t/c",
                              "values": [0.12, 0.14]}],
              "chain": 1}
  })");
}

fs::path write_case(const fs::path& dir, const json& j) {
  const fs::path p = dir / "study_case.json";
  std::ofstream(p) << j.dump(2);
  return p;
}

TEST(CliStudy, HelpCarriesTheCaution) {
  for (const std::vector<std::string>& args :
       {std::vector<std::string>{"study", "--help"},
        std::vector<std::string>{"study", "merge", "--help"}}) {
    const CliResult r = run_fulmar(args);
    EXPECT_EQ(r.exit_code, 0);
    EXPECT_NE(r.out.find("Caution:"), std::string::npos) << r.out;
  }
}

TEST(CliStudy, InvalidStudyIsExitTwoWithThePathAndNothingWritten) {
  const fs::path dir = fresh_directory("study_invalid");
  json j = tiny_study();
  j["study"]["parameters"][0]["pointer"] = "/constraints/area/min";
  const fs::path c = write_case(dir, j);
  const CliResult r = run_fulmar({"study", c.string(), "-o", (dir / "out").string()});
  EXPECT_EQ(r.exit_code, 2);
  EXPECT_NE(r.err.find("/study/parameters/0/pointer"), std::string::npos) << r.err;
  EXPECT_NE(r.err.find("does not exist in the case"), std::string::npos) << r.err;
  EXPECT_FALSE(fs::exists(dir / "out"));
  // A swept value that breaks a rule of the case names both.
  j = tiny_study();
  j["study"]["parameters"][0]["values"] = {0.12, 0.7};
  const CliResult v =
      run_fulmar({"study", write_case(dir, j).string(), "-o", (dir / "out").string()});
  EXPECT_EQ(v.exit_code, 2);
  EXPECT_NE(v.err.find("study point 2 (/constraints/thickness/min = 0.7)"), std::string::npos)
      << v.err;
  EXPECT_FALSE(fs::exists(dir / "out"));
}

TEST(CliStudy, BadShardAndBadMergeAreExitTwo) {
  const fs::path dir = fresh_directory("study_bad_args");
  const fs::path c = write_case(dir, tiny_study());
  const CliResult s =
      run_fulmar({"study", c.string(), "--shard", "3/2", "-o", (dir / "out").string()});
  EXPECT_EQ(s.exit_code, 2);
  EXPECT_NE(s.err.find("--shard"), std::string::npos) << s.err;
  EXPECT_FALSE(fs::exists(dir / "out"));
  const CliResult m = run_fulmar({"study", "merge", dir.string(), "-o", (dir / "merged").string()});
  EXPECT_EQ(m.exit_code, 2);
  EXPECT_NE(m.err.find("no study here"), std::string::npos) << m.err;
  EXPECT_FALSE(fs::exists(dir / "merged"));
}

TEST(CliStudy, CheckListsPointsChainsAndShards) {
  const CliResult r = run_fulmar({"study", (source_dir() / "cases/study_thickness.json").string(),
                                  "--check", "--shard", "1/2"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  // The shipped study runs its five points in one chain, thickest bound first.
  EXPECT_NE(r.out.find("5 points in chains of 5"), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("point 1  minimum t/c = 0.18  chain 1, starts from the baseline, shard 1/2"),
            std::string::npos)
      << r.out;
  EXPECT_NE(r.out.find("point 5  minimum t/c = 0.1  chain 1, starts from point 4, shard 1/2"),
            std::string::npos)
      << r.out;
}

TEST(CliStudy, ExampleStudyCasesAreValid) {
  int found = 0;
  for (const auto& e : fs::directory_iterator(source_dir() / "cases")) {
    const std::string name = e.path().filename().string();
    if (name.rfind("study_", 0) != 0 || e.path().extension() != ".json") continue;
    ++found;
    const CliResult r = run_fulmar({"study", e.path().string(), "--check"});
    EXPECT_EQ(r.exit_code, 0) << name << ": " << r.err;
  }
  EXPECT_GE(found, 2);
}

// Two shards as separate processes, merged, against one process running the whole study. This
// needs the flow analysis: a build without it refuses to run (exit 2, stated reason, nothing
// written), and then the comparison is skipped with that reason.
TEST(CliStudy, TwoShardProcessesMergeToExactlyTheSingleRun) {
  const fs::path dir = fresh_directory("study_shards");
  const fs::path c = write_case(dir, tiny_study());
  // The single run names its case as a bare file name in the working directory (its folder
  // is then the empty path, which once failed when the manifest made it absolute).
  const CliResult single =
      run_fulmar({"study", c.filename().string(), "-o", "single", "--jobs", "1"}, dir);
  if (single.exit_code == 2 &&
      single.err.find("not available in this build") != std::string::npos) {
    EXPECT_FALSE(fs::exists(dir / "single"));
    GTEST_SKIP() << "no flow analysis in this build: " << single.err;
  }
  ASSERT_EQ(single.exit_code, 0) << single.err;
  const CliResult a =
      run_fulmar({"study", c.string(), "--shard", "1/2", "-o", (dir / "a").string()});
  const CliResult b =
      run_fulmar({"study", c.string(), "--shard", "2/2", "-o", (dir / "b").string()});
  ASSERT_EQ(a.exit_code, 0) << a.err;
  ASSERT_EQ(b.exit_code, 0) << b.err;
  const CliResult m = run_fulmar({"study", "merge", (dir / "a").string(), (dir / "b").string(),
                                  "-o", (dir / "merged").string()});
  ASSERT_EQ(m.exit_code, 0) << m.err;
  for (const char* f : {"study.csv", "trade.svg", "sections.svg", "report.md",
                        "points/p001/optimized_cst.json", "points/p002/optimized_cst.json"})
    EXPECT_EQ(read_file(dir / "merged" / f), read_file(dir / "single" / f)) << f;
}

}  // namespace
}  // namespace fulmar::testing
