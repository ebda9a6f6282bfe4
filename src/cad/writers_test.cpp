// The number format shared by the CAD writers and the UTC timestamp of their headers.
#include "cad/writers.h"

#include <gtest/gtest.h>

#include <regex>
#include <string>

namespace fulmar::cad {
namespace {

TEST(FormatReal, AlwaysHasADecimalPoint) {
  EXPECT_EQ(format_real(1.0), "1.");
  EXPECT_EQ(format_real(-0.25), "-0.25");
  EXPECT_EQ(format_real(0.0), "0.");
  EXPECT_EQ(format_real(-0.0), "0.");
  EXPECT_EQ(format_real(1e-5), "1.E-05");
  EXPECT_EQ(format_real(2.5e20), "2.5E+20");
  EXPECT_DOUBLE_EQ(std::stod(format_real(0.1234567890123456)), 0.123456789012346);
}

TEST(UtcTimestamp, IsIsoSecondsWithoutZone) {
  EXPECT_TRUE(
      std::regex_match(utc_timestamp(), std::regex(R"(\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2})")));
}

}  // namespace
}  // namespace fulmar::cad
