// Limits, parameterization and start shapes of a case file.
#include <gtest/gtest.h>

#include "optimize/testing/case_json.h"

namespace fulmar::optimize {
namespace {

using nlohmann::json;
using testing::error_of;
using testing::good_case;
using testing::parse;

TEST(CaseLimits, SecondStartIsReadLikeTheBaseline) {
  json j = good_case();
  EXPECT_FALSE(parse(j).second_start.has_value());
  j["second_start"] = {{"naca", "0015"}};
  const Case c = parse(j);
  ASSERT_TRUE(c.second_start.has_value());
  EXPECT_EQ(c.second_start->naca, "0015");
  EXPECT_EQ(c.second_start->json_path, "/second_start");
  j["second_start"] = {{"naca", "0015"}, {"file", "x.dat"}};
  EXPECT_EQ(error_of(j), "case.json: /second_start: give exactly one of naca, file or cst");
}

TEST(CaseLimits, SparDepthCannotExceedTheThicknessLimit) {
  json j = good_case();
  j["constraints"]["spar"] = {{{"x", 0.3}, {"min", 0.13}}};
  EXPECT_EQ(error_of(j),
            "case.json: /constraints/spar/0/min: must be <= the maximum-thickness "
            "limit 0.12 (no section can be deeper at the spar)");
}

TEST(CaseLimits, MinMaxPairsNeedOneAndKeepTheirOrder) {
  json j = good_case();
  j["constraints"]["te_gap"] = json::object();
  EXPECT_EQ(error_of(j), "case.json: /constraints/te_gap: needs min or max");
  j["constraints"]["te_gap"] = {{"min", 0.01}, {"max", 0.005}};
  EXPECT_EQ(error_of(j), "case.json: /constraints/te_gap/max: must be >= min 0.01 (got 0.005)");
  j["constraints"]["te_gap"] = {{"min", 0.002}, {"max", 0.005}};
  const Case c = parse(j);
  EXPECT_DOUBLE_EQ(c.constraints.te_gap_min, 0.002);
  EXPECT_DOUBLE_EQ(c.constraints.te_gap_max, 0.005);
}

TEST(CaseLimits, ParameterizationOrdersAreBounded) {
  json j = good_case();
  j["parameterization"] = {{"order_upper", 13}};
  EXPECT_EQ(error_of(j), "case.json: /parameterization/order_upper: must be in 2..12 (got 13)");
  j["parameterization"] = {{"order_upper", 8}, {"order_lower", 6}};
  const Case c = parse(j);
  EXPECT_EQ(c.parameterization.order_upper, 8);
  EXPECT_EQ(c.parameterization.order_lower, 6);
}

}  // namespace
}  // namespace fulmar::optimize
