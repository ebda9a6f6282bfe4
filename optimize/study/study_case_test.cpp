// The study block: one validation test per rule, sweep expansion and order, shard assignment and
// the warm-start chains, the per-point case, and the active-constraint rule.
#include "optimize/study/study_case.h"

#include <gtest/gtest.h>

#include <functional>
#include <set>

#include "common/error.h"
#include "optimize/study/study_test_case.h"

namespace fulmar::study {
namespace {

using nlohmann::json;

StudyDefinition parse(const json& j) {
  return study_from_json(j, "study.json", ".");
}

std::string error_of(const json& j) {
  try {
    parse(j);
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}

json& param0(json& j) {
  return j["study"]["parameters"][0];
}

struct Rule {
  std::string name;
  std::function<void(json&)> mutate;
  std::vector<std::string> expected;  // fragments the message must hold (path and rule)
};

const std::vector<Rule>& rules() {
  static const std::vector<Rule> r{
      {"NoStudyBlock", [](json& j) { j.erase("study"); }, {"/study: missing required field"}},
      {"StudyNotObject", [](json& j) { j["study"] = 3; }, {"/study: must be an object"}},
      {"UnknownStudyKey",
       [](json& j) { j["study"]["sweeps"] = 1; },
       {"/study/sweeps: unknown key"}},
      {"NoParameters",
       [](json& j) { j["study"].erase("parameters"); },
       {"/study/parameters: missing required field"}},
      {"ParametersNotArray",
       [](json& j) { j["study"]["parameters"] = json::object(); },
       {"/study/parameters: must be an array"}},
      {"NoParameter",
       [](json& j) { j["study"]["parameters"] = json::array(); },
       {"/study/parameters: must hold one or two"}},
      {"ThreeParameters",
       [](json& j) {
         json p = param0(j);
         j["study"]["parameters"] = json::array({p, p, p});
       },
       {"/study/parameters: must hold one or two parameters (got 3)"}},
      {"ParameterNotObject",
       [](json& j) { param0(j) = "x"; },
       {"/study/parameters/0: must be an object"}},
      {"UnknownParameterKey",
       [](json& j) { param0(j)["unit"] = "m"; },
       {"/study/parameters/0/unit: unknown key"}},
      {"NoPointer",
       [](json& j) { param0(j).erase("pointer"); },
       {"/study/parameters/0/pointer: missing required field"}},
      {"PointerNotString",
       [](json& j) { param0(j)["pointer"] = 4; },
       {"/study/parameters/0/pointer: must be a string"}},
      {"PointerSyntax",
       [](json& j) { param0(j)["pointer"] = "constraints/thickness/min"; },
       {"/pointer: \"constraints/thickness/min\" is not a JSON pointer"}},
      {"PointerWholeCase",
       [](json& j) { param0(j)["pointer"] = ""; },
       {"/pointer: must name a number"}},
      {"PointerMissingInCase",
       [](json& j) { param0(j)["pointer"] = "/constraints/area/min"; },
       {"/pointer: \"/constraints/area/min\" does not exist"}},
      {"PointerArrayOutOfRange",
       [](json& j) { param0(j)["pointer"] = "/design_points/3/cl"; },
       {"does not exist in the case"}},
      {"PointerNotNumber",
       [](json& j) { param0(j)["pointer"] = "/name"; },
       {"/pointer: \"/name\" must point at a number (it holds string)"}},
      {"PointerIntoStudy",
       [](json& j) { param0(j)["pointer"] = "/study/chain"; },
       {"cannot be swept"}},
      {"PointerSchemaVersion",
       [](json& j) { param0(j)["pointer"] = "/schema_version"; },
       {"\"/schema_version\" cannot be swept"}},
      {"NameEmpty",
       [](json& j) { param0(j)["name"] = ""; },
       {"/study/parameters/0/name: must be a non-empty string"}},
      {"ValuesAndRange",
       [](json& j) { param0(j)["values"] = {0.1}; },
       {"/study/parameters/0: give exactly one of values or range"}},
      {"NeitherValuesNorRange",
       [](json& j) { param0(j).erase("range"); },
       {"give exactly one of values or range"}},
      {"ValuesNotArray",
       [](json& j) {
         param0(j).erase("range");
         param0(j)["values"] = 0.1;
       },
       {"/study/parameters/0/values: must be an array"}},
      {"ValuesEmpty",
       [](json& j) {
         param0(j).erase("range");
         param0(j)["values"] = json::array();
       },
       {"/values: must hold at least one value"}},
      {"ValueNotNumber",
       [](json& j) {
         param0(j).erase("range");
         param0(j)["values"] = json::array({0.1, "0.12"});
       },
       {"/study/parameters/0/values/1: must be a number"}},
      {"ValueRepeated",
       [](json& j) {
         param0(j).erase("range");
         param0(j)["values"] = json::array({0.1, 0.12, 0.1});
       },
       {"/values/2: repeats the value 0.1"}},
      {"IntegerTargetFraction",
       [](json& j) {
         param0(j) = {{"pointer", "/parameterization/order_upper"}, {"values", {4, 4.5}}};
       },
       {"/values/1: must be a whole number", "holds an integer"}},
      {"RangeNotObject",
       [](json& j) {
         param0(j)["range"] = json::array({0.1, 0.2});
       },
       {"/range: must be an object"}},
      {"RangeUnknownKey",
       [](json& j) { param0(j)["range"]["by"] = 1; },
       {"/range/by: unknown key"}},
      {"RangeNoTo",
       [](json& j) { param0(j)["range"].erase("to"); },
       {"/range/to: missing required field"}},
      {"RangeToNotNumber",
       [](json& j) { param0(j)["range"]["to"] = "0.18"; },
       {"/range/to: must be a number"}},
      {"RangeEmpty",
       [](json& j) { param0(j)["range"]["to"] = 0.10; },
       {"/range/to: must differ from /from"}},
      {"RangeStepAndCount",
       [](json& j) { param0(j)["range"]["count"] = 5; },
       {"/range: give exactly one of step or count"}},
      {"RangeStepNotPositive",
       [](json& j) { param0(j)["range"]["step"] = -0.02; },
       {"/range/step: must be > 0"}},
      {"RangeStepNotDividing",
       [](json& j) { param0(j)["range"]["step"] = 0.03; },
       {"/range/step: must divide to - from"}},
      {"RangeCountTooSmall",
       [](json& j) {
         param0(j)["range"].erase("step");
         param0(j)["range"]["count"] = 1;
       },
       {"/range/count: must be in 2..1000"}},
      {"RangeCountNotInteger",
       [](json& j) {
         param0(j)["range"].erase("step");
         param0(j)["range"]["count"] = 2.5;
       },
       {"/range/count: must be an integer"}},
      {"TooManyPoints",
       [](json& j) {
         param0(j)["range"] = {{"from", 0.10}, {"to", 0.18}, {"count", 40}};
         j["study"]["parameters"].push_back(
             {{"pointer", "/design_points/0/cl"},
              {"range", {{"from", 0.3}, {"to", 0.7}, {"count", 30}}}});
       },
       {"/study/parameters: gives 1200 points, more than 1000"}},
      {"SamePointerTwice",
       [](json& j) { j["study"]["parameters"].push_back(param0(j)); },
       {"/study/parameters/1/pointer: sweeps the same value"}},
      {"ChainZero",
       [](json& j) { j["study"]["chain"] = 0; },
       {"/study/chain: must be in 1..1000 (got 0)"}},
      {"ChainNotInteger",
       [](json& j) { j["study"]["chain"] = "2"; },
       {"/study/chain: must be an integer"}},
      {"ActiveToleranceZero",
       [](json& j) { j["study"]["active_tolerance"] = 0; },
       {"/study/active_tolerance: must be in (0, 0.5]"}},
      {"ValueBreaksCase",
       [](json& j) {
         param0(j)["range"] = {{"from", 0.10}, {"to", 0.60}, {"step", 0.25}};
       },
       {"study.json at study point 3 (/constraints/thickness/min = 0.6)",
        "/constraints/thickness/min: must be in (0, 0.5]"}},
      {"CaseInvalidElsewhere",
       [](json& j) { j["optimizer"]["budget"] = 3; },
       {"/optimizer/budget: unknown key"}},
  };
  return r;
}

void PrintTo(const Rule& r, std::ostream* os) {
  *os << r.name;
}

class StudyValidation : public ::testing::TestWithParam<Rule> {};

TEST_P(StudyValidation, NamesPathAndRule) {
  json j = testing::study_case_json();
  GetParam().mutate(j);
  const std::string message = error_of(j);
  ASSERT_FALSE(message.empty()) << "accepted";
  EXPECT_EQ(message.rfind("study.json", 0), 0u) << message;
  for (const auto& fragment : GetParam().expected)
    EXPECT_NE(message.find(fragment), std::string::npos) << message;
}

INSTANTIATE_TEST_SUITE_P(EachRule, StudyValidation, ::testing::ValuesIn(rules()),
                         [](const ::testing::TestParamInfo<Rule>& i) { return i.param.name; });

TEST(StudyCase, TheTestCaseIsValid) {
  const StudyDefinition s = parse(testing::study_case_json());
  ASSERT_EQ(s.parameters.size(), 1u);
  EXPECT_EQ(s.parameters[0].name, "minimum t/c");
  EXPECT_EQ(s.chain, 2);
  EXPECT_DOUBLE_EQ(s.active_tolerance, 0.01);
  EXPECT_FALSE(s.base_case.contains("study"));
}

TEST(SweepExpansion, RangeByStepHitsTheEndsExactly) {
  const StudyDefinition s = parse(testing::study_case_json());
  // 0.10 + 4 x 0.02 in floating point is 0.18000000000000002; the tidied values are the decimal
  // ones.
  EXPECT_EQ(s.parameters[0].values, (std::vector<double>{0.10, 0.12, 0.14, 0.16, 0.18}));
}

TEST(SweepExpansion, RangeDownwardsAndByCount) {
  json j = testing::study_case_json();
  param0(j)["range"] = {{"from", 0.16}, {"to", 0.10}, {"step", 0.03}};
  EXPECT_EQ(parse(j).parameters[0].values, (std::vector<double>{0.16, 0.13, 0.10}));
  param0(j)["range"] = {{"from", 0.10}, {"to", 0.18}, {"count", 3}};
  EXPECT_EQ(parse(j).parameters[0].values, (std::vector<double>{0.10, 0.14, 0.18}));
}

TEST(SweepExpansion, ValuesKeepTheirOrderAndIntegersStayIntegers) {
  json j = testing::study_case_json();
  param0(j) = {{"pointer", "/parameterization/order_upper"}, {"values", {6, 4, 5}}};
  const StudyDefinition s = parse(j);
  EXPECT_TRUE(s.parameters[0].integer);
  EXPECT_EQ(s.parameters[0].values, (std::vector<double>{6, 4, 5}));
  const json c = point_case_json(s, sweep_points(s)[1], std::nullopt);
  EXPECT_TRUE(c["parameterization"]["order_upper"].is_number_integer());
  EXPECT_EQ(c["parameterization"]["order_upper"].get<int>(), 4);
}

TEST(SweepExpansion, TwoParametersInSerpentineOrder) {
  json j = testing::study_case_json();
  param0(j)["range"] = {{"from", 0.10}, {"to", 0.14}, {"step", 0.02}};
  j["study"]["parameters"].push_back({{"pointer", "/design_points/0/cl"}, {"values", {0.4, 0.5}}});
  j["study"]["chain"] = 3;
  const StudyDefinition s = parse(j);
  const auto pts = sweep_points(s);
  ASSERT_EQ(pts.size(), 6u);
  const std::vector<std::vector<double>> expected{{0.10, 0.4}, {0.10, 0.5}, {0.12, 0.5},
                                                  {0.12, 0.4}, {0.14, 0.4}, {0.14, 0.5}};
  for (size_t i = 0; i < pts.size(); ++i) {
    EXPECT_EQ(pts[i].values, expected[i]) << i;
    EXPECT_EQ(pts[i].index, int(i));
    EXPECT_EQ(pts[i].chain, int(i) / 3);
  }
  // Each predecessor is one grid step away: that is what makes it the nearest neighbour.
  for (const auto& p : pts) {
    if (p.predecessor >= 0) {
      const auto& q = pts[size_t(p.predecessor)];
      const int differ = int(p.values[0] != q.values[0]) + int(p.values[1] != q.values[1]);
      EXPECT_EQ(differ, 1) << p.index;
    }
  }
  EXPECT_EQ(pts[0].predecessor, -1);
  EXPECT_EQ(pts[2].predecessor, 1);
  EXPECT_EQ(pts[3].predecessor, -1);  // a new chain starts from the case baseline
  EXPECT_EQ(pts[0].dir, "points/p001");
  EXPECT_EQ(pts[5].dir, "points/p006");
}

TEST(ShardAssignment, EveryPointInExactlyOneShardWithItsWholeChain) {
  json j = testing::study_case_json();
  param0(j)["range"] = {{"from", 0.10}, {"to", 0.20}, {"count", 11}};
  j["study"]["chain"] = 3;
  const StudyDefinition s = parse(j);
  const auto pts = sweep_points(s);
  for (int n = 1; n <= 5; ++n) {
    std::vector<int> owner(pts.size(), 0);
    for (int k = 1; k <= n; ++k) {
      const Shard sh{k, n};
      for (const auto& p : pts)
        if (sh.takes(p)) owner[size_t(p.index)] += k * 100 + 1;
    }
    for (const auto& p : pts) {
      EXPECT_EQ(owner[size_t(p.index)] % 100, 1) << "point " << p.index << " of " << n << " shards";
      // The shard is a fixed function of the index: chain (index / 3) modulo N.
      EXPECT_EQ(owner[size_t(p.index)] / 100, (p.index / 3) % n + 1);
      if (p.predecessor >= 0) {
        EXPECT_EQ(owner[size_t(p.index)], owner[size_t(p.predecessor)]);
      }
    }
  }
}

TEST(ShardAssignment, ParsesKOfN) {
  const Shard s = shard_from_string("2/3", "--shard");
  EXPECT_EQ(s.k, 2);
  EXPECT_EQ(s.n, 3);
  for (const char* bad : {"0/2", "3/2", "2", "a/b", "1/0", "-1/2", "1/2/3", ""}) {
    try {
      shard_from_string(bad, "--shard");
      ADD_FAILURE() << bad << " accepted";
    } catch (const InputError& e) {
      EXPECT_NE(std::string(e.what()).find("--shard"), std::string::npos);
    }
  }
}

TEST(PointCase, SetsTheValuesAndTheWarmStart) {
  const StudyDefinition s = parse(testing::study_case_json());
  const auto pts = sweep_points(s);
  const json start =
      json::parse(R"({"kind": "fulmar-cst-section", "schema_version": 1, "name": "seed",
      "class_exponents": [0.5, 1.0], "upper": [0.2, 0.2, 0.2, 0.2, 0.2], "lower": [-0.2, -0.2, -0.2, -0.2, -0.2],
      "te_upper": 0.0, "te_lower": 0.0})");
  const json c = point_case_json(s, pts[3], start);
  EXPECT_DOUBLE_EQ(c["constraints"]["thickness"]["min"].get<double>(), 0.16);
  EXPECT_EQ(c["baseline"], json({{"cst", start}}));
  const optimize::Case parsed = point_case(s, pts[3], start);
  EXPECT_DOUBLE_EQ(parsed.constraints.thickness_min, 0.16);
  EXPECT_EQ(parsed.baseline.kind, optimize::Baseline::Kind::cst);
  // Without a start the case's own baseline stays.
  EXPECT_EQ(point_case_json(s, pts[0], std::nullopt)["baseline"], json({{"naca", "0018"}}));
}

TEST(ActiveConstraint, WithinTheToleranceOfTheLimitOnEitherSide) {
  EXPECT_TRUE(constraint_active(0.1200, 0.12, 0.01));
  EXPECT_TRUE(constraint_active(0.1211, 0.12, 0.01));  // 0.9 % above
  EXPECT_TRUE(constraint_active(0.1189, 0.12, 0.01));  // slightly violated still counts as pressing
  EXPECT_FALSE(constraint_active(0.1213, 0.12, 0.01));  // 1.1 % away
  // A limit at zero: the floor 0.01 makes the band 1e-4 wide.
  EXPECT_TRUE(constraint_active(-0.00009, 0.0, 0.01));
  EXPECT_FALSE(constraint_active(-0.0002, 0.0, 0.01));
  EXPECT_FALSE(constraint_active(std::nan(""), 0.12, 0.01));
}

}  // namespace
}  // namespace fulmar::study
