// Tests of the typed evaluation record and its one JSON conversion (evaluation_record.h).
#include "optimize/evaluation_record.h"

#include <gtest/gtest.h>

#include <cmath>

#include "common/error.h"

namespace fulmar::optimize {
namespace {

using nlohmann::json;

EvaluationRecord sample() {
  EvaluationRecord r;
  r.geometry.thickness = 0.15;
  r.geometry.thickness_x = 0.31;
  r.geometry.camber = -0.012;
  r.geometry.spar_thickness = {0.13, 0.09};
  r.geometry.reversals_lower = 1;
  r.geometry.excess_reversal_upper = 0.07;
  DesignPointRecord p;
  p.point = "cruise";
  p.scenario = "free";
  p.cl_target = 0.34;
  p.reynolds = 4.88e6;
  p.mach = 0.186;
  p.result.converged = true;
  p.result.cl = 0.34;
  p.result.cd = 0.0051;
  p.result.cm = -0.05;
  p.result.alpha_deg = 2.5;
  r.points = {p};
  r.cl_max.found = true;
  r.cl_max.cl_max = 1.52;
  r.cl_max.alpha_deg = 15.5;
  r.panels = 200;
  ConstraintRecord c;
  c.id = kClMaxId;
  c.name = "cl_max at landing";
  c.value = std::nan("");  // an unknown value goes out as null and comes back as NaN
  c.limit = 1.52;
  c.is_min = true;
  r.constraints = {c};
  return r;
}

TEST(EvaluationRecord, JsonRoundTripKeepsEveryField) {
  const EvaluationRecord r = sample();
  const json j = to_json(r);
  const EvaluationRecord back = evaluation_record_from_json(j, "test");
  EXPECT_EQ(to_json(back), j);
  EXPECT_EQ(back.points.at(0).point, "cruise");
  EXPECT_DOUBLE_EQ(back.points.at(0).result.cd, 0.0051);
  EXPECT_EQ(back.geometry.spar_thickness, r.geometry.spar_thickness);
  EXPECT_EQ(back.constraints.at(0).id, "cl_max");
  EXPECT_TRUE(std::isnan(back.constraints.at(0).value));
  EXPECT_TRUE(j.at("constraints").at(0).at("value").is_null());
  // The keys the files already hold are kept (a contract: add, never rename).
  for (const char* k : {"geometry", "points", "cl_max", "panels", "constraints"})
    EXPECT_TRUE(j.contains(k)) << k;
  for (const char* k : {"name", "value", "limit", "kind", "satisfied", "id"})
    EXPECT_TRUE(j.at("constraints").at(0).contains(k)) << k;
}

// A missing key is an error naming its path, never a silent default.
TEST(EvaluationRecord, AMissingKeyIsAnErrorNamingItsPath) {
  const json whole = to_json(sample());
  const std::vector<std::pair<json::json_pointer, std::string>> cases = {
      {json::json_pointer("/panels"), "test/panels: missing"},
      {json::json_pointer("/geometry/thickness"), "test/geometry/thickness: missing"},
      {json::json_pointer("/points/0/cd"), "test/points/0/cd: missing"},
      {json::json_pointer("/cl_max/found"), "test/cl_max/found: missing"},
      {json::json_pointer("/constraints/0/id"), "test/constraints/0/id: missing"}};
  for (const auto& [ptr, message] : cases) {
    json j = whole;
    j.at(ptr.parent_pointer()).erase(ptr.back());
    try {
      evaluation_record_from_json(j, "test");
      ADD_FAILURE() << "no error for " << ptr.to_string();
    } catch (const InputError& e) {
      EXPECT_EQ(std::string(e.what()), message);
    }
  }
}

TEST(EvaluationRecord, AWrongKindIsAnError) {
  json j = to_json(sample());
  j["constraints"][0]["kind"] = "above";
  EXPECT_THROW(evaluation_record_from_json(j, "test"), InputError);
  j = to_json(sample());
  j["panels"] = "many";
  EXPECT_THROW(evaluation_record_from_json(j, "test"), InputError);
}

}  // namespace
}  // namespace fulmar::optimize
