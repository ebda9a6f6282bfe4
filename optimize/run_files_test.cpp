// Tests of the run's data files (run_files.h): the history table and the record of files.
#include "optimize/run_files.h"

#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <sstream>

#include <unistd.h>

namespace fulmar::optimize {
namespace {

namespace fs = std::filesystem;

TEST(RunFiles, HistoryHasOneRowPerEvaluationAndItsColumns) {
  SearchResult r;
  Evaluation a;
  a.x = {0.1, 0.2};
  a.ok = true;
  a.status = "ok";
  a.objective = 0.55;
  a.constraints = {-0.5, 0.25};
  Evaluation b = a;
  b.ok = false;
  b.status = "failed, badly";  // a comma: the field is quoted
  r.history = {a, b};
  const std::string csv = history_csv(r, {"t/c >= 0.12", "cl_max"}, 1e-6);
  std::istringstream in(csv);
  std::string header, first, second;
  std::getline(in, header);
  std::getline(in, first);
  std::getline(in, second);
  EXPECT_EQ(header,
            "evaluation,status,objective_100cd,worst_constraint,feasible,x0,x1,t/c >= 0.12,cl_max");
  // Worst constraint 0.25 > tolerance: not feasible though the analysis is ok.
  EXPECT_EQ(first, "1,ok,0.55,0.25,false,0.10000000000000001,0.20000000000000001,-0.5,0.25");
  EXPECT_EQ(second.rfind("2,\"failed, badly\",", 0), 0u) << second;
}

TEST(RunFiles, PutWritesTheFileAndRecordsItsPath) {
  const fs::path dir =
      fs::temp_directory_path() / ("fulmar_run_files_" + std::to_string(::getpid()));
  fs::create_directories(dir);
  OutputFiles files(dir);
  files.put("history", "history.csv", "a,b\n");
  files.record("checkpoint", "checkpoint.json");
  std::ifstream in(dir / "history.csv");
  std::string line;
  std::getline(in, line);
  EXPECT_EQ(line, "a,b");
  EXPECT_EQ(files.paths().at("history"), (dir / "history.csv").string());
  EXPECT_EQ(files.paths().at("checkpoint"), (dir / "checkpoint.json").string());
  fs::remove_all(dir);
}

}  // namespace
}  // namespace fulmar::optimize
