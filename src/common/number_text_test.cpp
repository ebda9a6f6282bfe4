#include "common/number_text.h"

#include <gtest/gtest.h>

#include <limits>

namespace fulmar {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr double kInf = std::numeric_limits<double>::infinity();

TEST(NumberText, FiniteValuesAsPrintfWritesThem) {
  EXPECT_EQ(fixed_text(0.123456, 4), "0.1235");
  EXPECT_EQ(fixed_text(-2.0, 1), "-2.0");
  EXPECT_EQ(fixed_text(-1e-7, 4), "0.0000");
  EXPECT_EQ(fixed_text(-0.00005, 4), "-0.0001");
  EXPECT_EQ(general_text(2e6, 4), "2e+06");
  EXPECT_EQ(general_text(0.5, 3), "0.5");
  EXPECT_EQ(csv_number(0.1), "0.1");
  EXPECT_EQ(csv_number(1.0 / 3.0), "0.3333333333");
}

TEST(NumberText, NonFiniteIsNotAvailableInTextEmptyInCsvNullInJson) {
  for (double v : {kNaN, kInf, -kInf}) {
    EXPECT_EQ(fixed_text(v, 3), "n/a");
    EXPECT_EQ(general_text(v), "n/a");
    EXPECT_EQ(csv_number(v), "");
    EXPECT_TRUE(json_number(v).is_null());
  }
  EXPECT_EQ(json_number(1.5).get<double>(), 1.5);
}

TEST(NumberText, PaddingCountsCodePointsNotBytes) {
  EXPECT_EQ(padded("ab", 4), "  ab");
  EXPECT_EQ(padded("ab", 4, true), "ab  ");
  EXPECT_EQ(padded("\xC2\xB0"
                   "C",
                   4),
            "  \xC2\xB0"
            "C");  // the degree sign is one column
  EXPECT_EQ(padded("toolong", 3), "toolong");
}

}  // namespace
}  // namespace fulmar
