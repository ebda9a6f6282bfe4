// Tests of the checkpoint file: a round trip, the completion of version-1 records, and the
// refusals (missing file, not JSON, another case, another version, a missing key) with messages
// that name the file and the place.
#include "optimize/checkpoint.h"

#include <gtest/gtest.h>

#include <unistd.h>
#include <filesystem>
#include <fstream>
#include <string>

#include <nlohmann/json.hpp>

#include "common/error.h"

namespace fulmar::optimize {
namespace {

namespace fs = std::filesystem;
using nlohmann::json;

fs::path scratch(const std::string& tag) {
  fs::path d =
      fs::temp_directory_path() / ("fulmar_checkpoint_" + tag + "_" + std::to_string(::getpid()));
  fs::remove_all(d);
  fs::create_directories(d);
  return d;
}

Evaluation evaluation(double x0, bool ok) {
  Evaluation e;
  e.x = {x0, 2.0};
  e.objective = x0 * x0;
  e.constraints = {x0 - 1.0};
  e.status = ok ? Status::kConverged : Status::kFailed;
  e.reason = ok ? "" : "analysis failed: test";
  e.detail.panels = 120;
  ConstraintRecord c;
  c.id = "sum";
  c.name = "sum <= 0";
  c.value = x0 - 1.0;
  c.is_min = false;
  c.satisfied = x0 <= 1.0;
  e.detail.constraints.push_back(c);
  return e;
}

// Writes the checkpoint of two evaluations and returns its JSON.
json two_evaluations(const fs::path& file) {
  const Evaluation a = evaluation(0.5, true), b = evaluation(1.5, false);
  write_checkpoint(file, "case A", 12.5, 3, {&a, &b});
  std::ifstream in(file);
  return json::parse(in);
}

std::string message_of(const fs::path& file, const std::string& fingerprint) {
  try {
    read_checkpoint(file, fingerprint, {"sum"});
  } catch (const InputError& e) {
    return e.what();
  }
  return "(no error)";
}

TEST(Checkpoint, ReadsBackWhatItWrote) {
  const fs::path dir = scratch("round_trip");
  const json j = two_evaluations(dir / "c.json");
  EXPECT_EQ(j.at("version"), 3);
  EXPECT_EQ(j.at("iterations"), 3);
  EXPECT_EQ(j.at("evaluations")[1].at("status"), "analysis failed: test");  // as version 2
  EXPECT_EQ(j.at("evaluations")[1].at("outcome").at("status"), "failed");
  const Checkpoint c = read_checkpoint(dir / "c.json", "case A", {"sum"});
  EXPECT_EQ(c.fingerprint, "case A");
  EXPECT_EQ(c.elapsed_s, 12.5);
  ASSERT_EQ(c.evaluations.size(), 2u);
  EXPECT_EQ(c.evaluations[0].x, (std::vector<double>{0.5, 2.0}));
  EXPECT_TRUE(c.evaluations[0].ok());
  EXPECT_FALSE(c.evaluations[1].ok());
  EXPECT_EQ(c.evaluations[1].status, Status::kFailed);
  EXPECT_EQ(c.evaluations[1].reason, "analysis failed: test");
  EXPECT_EQ(c.evaluations[1].objective, 1.5 * 1.5);
  EXPECT_EQ(c.evaluations[1].detail.constraints.at(0).id, "sum");
  fs::remove_all(dir);
}

// A version-1 checkpoint (records without constraint ids, without results for designs that were
// not analysed, or null for an analysis that threw) is completed from the constraint ids given.
TEST(Checkpoint, CompletesVersion1Records) {
  const fs::path dir = scratch("v1");
  json v1 = two_evaluations(dir / "c.json");
  v1["version"] = 1;
  for (auto& e : v1["evaluations"]) {
    e.erase("outcome");
    e["detail"]["cl_max"].erase("status");
    e["detail"]["constraints"][0].erase("id");
    e["detail"]["points"] = json::array({{{"point", "a"},
                                          {"scenario", "free"},
                                          {"cl_target", 0.3},
                                          {"reynolds", 1e6},
                                          {"mach", 0}}});
  }
  v1["evaluations"][0]["detail"] = nullptr;
  std::ofstream(dir / "c.json") << v1.dump();
  const Checkpoint c = read_checkpoint(dir / "c.json", "case A", {"sum"});
  ASSERT_EQ(c.evaluations.size(), 2u);
  EXPECT_TRUE(c.evaluations[0].detail.points.empty());
  ASSERT_EQ(c.evaluations[1].detail.constraints.size(), 1u);
  EXPECT_EQ(c.evaluations[1].detail.constraints[0].id, "sum");
  ASSERT_EQ(c.evaluations[1].detail.points.size(), 1u);
  EXPECT_FALSE(c.evaluations[1].detail.points[0].result.converged());
  EXPECT_EQ(c.evaluations[1].detail.points[0].result.reason, "not analysed");
  EXPECT_EQ(c.evaluations[1].status, Status::kFailed);
  EXPECT_EQ(c.evaluations[1].reason, "analysis failed: test");
  fs::remove_all(dir);
}

// A version-2 checkpoint said how analyses ended in words of their own ("ok" and the "status"
// text, a point's "converged", cl_max's "found"); the shared outcome is derived from them.
TEST(Checkpoint, DerivesTheOutcomeOfVersion2Records) {
  const fs::path dir = scratch("v2");
  json v2 = two_evaluations(dir / "c.json");
  v2["version"] = 2;
  const json point{{"point", "a"},
                   {"scenario", "free"},
                   {"cl_target", 0.3},
                   {"reynolds", 1e6},
                   {"mach", 0},
                   {"converged", false},
                   {"reason", "not converged: max residual 1e-3"},
                   {"residual", 1e-3},
                   {"iterations", 30},
                   {"alpha", 2.0},
                   {"cl", 0.3},
                   {"cd", 0.01},
                   {"cd_friction", 0.006},
                   {"cd_pressure", 0.004},
                   {"cm", -0.05},
                   {"transition_upper", 0.4},
                   {"transition_lower", 0.6}};
  for (auto& e : v2["evaluations"]) {
    e.erase("outcome");
    e["detail"]["cl_max"] = {{"found", true}, {"reason", ""}, {"cl_max", 1.5}, {"alpha", 14.0}};
    e["detail"]["points"] = json::array({point});
  }
  v2["evaluations"][1]["detail"]["cl_max"]["found"] = false;
  std::ofstream(dir / "c.json") << v2.dump();
  const Checkpoint c = read_checkpoint(dir / "c.json", "case A", {"sum"});
  ASSERT_EQ(c.evaluations.size(), 2u);
  EXPECT_EQ(c.evaluations[0].status, Status::kConverged);
  EXPECT_EQ(c.evaluations[0].reason, "");
  EXPECT_EQ(c.evaluations[1].status, Status::kFailed);
  EXPECT_EQ(c.evaluations[1].reason, "analysis failed: test");
  EXPECT_EQ(c.evaluations[0].detail.points.at(0).result.status, Status::kNotConverged);
  EXPECT_EQ(c.evaluations[0].detail.points.at(0).result.reason, "not converged: max residual 1e-3");
  EXPECT_TRUE(c.evaluations[0].detail.cl_max.found());
  EXPECT_EQ(c.evaluations[1].detail.cl_max.status, Status::kFailed);
  fs::remove_all(dir);
}

TEST(Checkpoint, AMissingKeyIsAnErrorNamingItsPath) {
  const fs::path dir = scratch("missing_key");
  json j = two_evaluations(dir / "c.json");
  j["evaluations"][1]["detail"].erase("panels");
  std::ofstream(dir / "c.json") << j.dump();
  EXPECT_NE(message_of(dir / "c.json", "case A").find("/evaluations/1/detail/panels: missing"),
            std::string::npos)
      << message_of(dir / "c.json", "case A");
  fs::remove_all(dir);
}

TEST(Checkpoint, RefusesAnotherCaseAnotherVersionAMissingFileAndBrokenJson) {
  const fs::path dir = scratch("refusals");
  json j = two_evaluations(dir / "c.json");
  EXPECT_NE(message_of(dir / "c.json", "case B").find("another case"), std::string::npos);

  j["version"] = 4;
  std::ofstream(dir / "c.json") << j.dump();
  EXPECT_NE(message_of(dir / "c.json", "case A").find("not a fulmar checkpoint of version 3"),
            std::string::npos);

  EXPECT_NE(message_of(dir / "none.json", "case A").find("no checkpoint to resume from"),
            std::string::npos);

  std::ofstream(dir / "broken.json")
      << "{\n  \"format\": \"fulmar-checkpoint\",\n  \"version\" 2\n}";
  const std::string broken = message_of(dir / "broken.json", "case A");
  EXPECT_NE(broken.find((dir / "broken.json").string() + ":3:"), std::string::npos) << broken;
  fs::remove_all(dir);
}

}  // namespace
}  // namespace fulmar::optimize
