#include "common/rule_check.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>

namespace fulmar {
namespace {

// A stand-in for an options struct with one range rule, written the way the solvers write theirs.
struct Options {
  double n = 9.0;
  void Validate() const {
    if (!(n >= 0.5 && n <= 20.0))
      throw InputError("options: n = " + std::to_string(n) + ": must be in [0.5, 20]");
  }
};

TEST(RuleCheck, TheRuleIsTheMessageFromMustOn) {
  EXPECT_EQ(stated_rule("viscous option n_crit = 0.3: must be in [0.5, 20]"),
            "must be in [0.5, 20]");
  EXPECT_EQ(stated_rule("no rule words here"), "no rule words here");
  EXPECT_EQ(placed_rule("--altitude", "-5", "altitude -5 m is outside the range 0 to 20000 m"),
            "--altitude: altitude -5 m is outside the range 0 to 20000 m");
}

// The one message form of every Validate(): subject, value (6 significant digits, "n/a" when not
// finite, never "nan"), rule; nothing is thrown when the rule holds.
TEST(RuleCheck, RequireRuleNamesSubjectValueAndRule) {
  EXPECT_NO_THROW(require_rule(true, "polar options: alpha_step", 0.0, "must be > 0"));
  try {
    require_rule(false, "polar options: alpha_step", 0.0, "must be > 0");
    FAIL() << "no error";
  } catch (const InputError& e) {
    EXPECT_STREQ(e.what(), "polar options: alpha_step = 0: must be > 0");
    EXPECT_EQ(stated_rule(e.what()), "must be > 0");
  }
  try {
    require_rule(false, "viscous option n_crit", std::nan(""), "must be in [0.5, 20]");
    FAIL() << "no error";
  } catch (const InputError& e) {
    EXPECT_STREQ(e.what(), "viscous option n_crit = n/a: must be in [0.5, 20]");
  }
}

TEST(RuleCheck, ReWordsTheErrorWithThePlaceAndTheValue) {
  Options o;
  o.n = 0.3;
  try {
    check_at("/transition/ncrit", "0.3", [&] { o.Validate(); });
    FAIL() << "0.3 passed";
  } catch (const InputError& e) {
    EXPECT_STREQ(e.what(), "/transition/ncrit: must be in [0.5, 20] (got 0.3)");
  }
  o.n = 0.5;  // the bound itself is allowed
  EXPECT_NO_THROW(check_at("--ncrit", "0.5", [&] { o.Validate(); }));
}

TEST(RuleCheck, RuleOfABadValueForHelpTexts) {
  EXPECT_EQ(rule_of([] {
              Options o;
              o.n = std::numeric_limits<double>::quiet_NaN();
              o.Validate();
            }),
            "must be in [0.5, 20]");
  EXPECT_EQ(rule_of([] { Options{}.Validate(); }), "");
}

}  // namespace
}  // namespace fulmar
