// Reading a whole case document: defaults, messages, JSON syntax errors.
#include <gtest/gtest.h>

#include "optimize/testing/case_json.h"

namespace fulmar::optimize {
namespace {

using nlohmann::json;
using testing::error_of;
using testing::good_case;
using testing::parse;

TEST(CaseFile, DefaultsAreThoseDocumented) {
  const Case c = parse(good_case());
  EXPECT_EQ(c.optimizer.algorithm, Algorithm::slsqp);
  EXPECT_EQ(c.parameterization.order_upper, 5);
  EXPECT_EQ(c.analysis.panels, 160);
  ASSERT_EQ(c.scenarios.size(), 1u);
  EXPECT_DOUBLE_EQ(c.scenarios[0].ncrit, 9.0);
  EXPECT_DOUBLE_EQ(c.scenarios[0].trip_upper, 1.0);
}

TEST(CaseFile, MessagesNameFileJsonPathAndRule) {
  json j = good_case();
  j["airplane"]["mass"] = -600;
  EXPECT_EQ(error_of(j), "case.json: /airplane/mass: must be a positive number (got -600)");
  j = good_case();
  j["design_points"][1]["colour"] = "red";
  EXPECT_EQ(error_of(j), "case.json: /design_points/1/colour: unknown key");
  j = good_case();
  j["constraints"]["cl_max"] = {{"min", 0.5}};
  EXPECT_EQ(error_of(j).find("case.json: /constraints/cl_max/min: must be >= the cruise cl 0.8"),
            0u)
      << error_of(j);
}

TEST(CaseFile, NotJsonNamesLineColumnAndWhatIsWrong) {
  try {
    parse_case("{\n  \"schema_version\": 1,\n  oops\n}", "bad.json", ".");
    FAIL();
  } catch (const InputError& e) {
    EXPECT_STREQ(e.what(), "bad.json:3:3: expected a key in double quotes (found 'o')");
  }
}

}  // namespace
}  // namespace fulmar::optimize
