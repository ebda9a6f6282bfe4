// Tests of the shared status vocabulary: every status survives a round trip through its name
// and through JSON, and unknown or missing text is refused with the place named.
#include "common/status.h"

#include <gtest/gtest.h>

#include <string>

#include "common/error.h"

namespace fulmar {
namespace {

std::string error_of(const nlohmann::json& j) {
  try {
    outcome_from_json(j, "run/summary.json: /search");
  } catch (const InputError& e) {
    return e.what();
  }
  return "(no error)";
}

TEST(Status, EveryNameReadsBackAsItsStatus) {
  for (Status s : {Status::kConverged, Status::kNotConverged, Status::kFailed, Status::kStopped})
    EXPECT_EQ(status_from_string(to_string(s), "test"), s);
  EXPECT_EQ(to_string(Status::kNotConverged), "not_converged");
  EXPECT_EQ(status_names().list(), "converged, not_converged, failed, stopped");
}

TEST(Status, OnlyAConvergedOutcomeIsUsable) {
  EXPECT_TRUE((Outcome{Status::kConverged, ""}.usable()));
  EXPECT_FALSE((Outcome{Status::kNotConverged, "residual 1e-6"}.usable()));
  EXPECT_FALSE((Outcome{Status::kFailed, "singular"}.usable()));
  EXPECT_FALSE((Outcome{Status::kStopped, "time limit"}.usable()));
}

TEST(Status, AnOutcomeSurvivesJson) {
  const Outcome o{Status::kStopped, "time limit of 60 s reached"};
  const nlohmann::json j = to_json(o);
  EXPECT_EQ(j.at("status"), "stopped");
  EXPECT_EQ(j.at("reason"), "time limit of 60 s reached");
  EXPECT_EQ(outcome_from_json(j, "test"), o);
}

TEST(Status, UnknownOrMissingTextIsRefusedNamingWhere) {
  const std::string unknown = error_of({{"status", "done"}, {"reason", ""}});
  EXPECT_NE(unknown.find("run/summary.json: /search/status: unknown status \"done\""),
            std::string::npos)
      << unknown;
  EXPECT_NE(unknown.find("converged, not_converged, failed, stopped"), std::string::npos);
  EXPECT_NE(error_of({{"status", "failed"}}).find("/search/reason: missing"), std::string::npos);
  EXPECT_NE(error_of({{"status", 1}, {"reason", ""}}).find("/search/status: not a text"),
            std::string::npos);
  EXPECT_THROW(status_from_string("Converged", "x"), InputError);
}

}  // namespace
}  // namespace fulmar
