// The polar CSV schema: header, number format, empty fields for non-finite numbers, quoting.
#include "solvers/viscous/polar_csv.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <string>

namespace fulmar::viscous {
namespace {

TEST(PolarCsv, HeaderAndOneRowPerPoint) {
  ViscousResult r;
  r.alpha = 2.5;
  r.cl = 0.3;
  r.cd = 0.0061234567891;  // 10 significant digits are kept
  r.cd_friction = 0.005;
  r.cd_pressure = 0.0011234567891;
  r.cm = -0.05;
  r.transition_upper = 0.4;
  r.transition_lower = 0.75;
  r.converged = true;
  r.iterations = 7;
  PolarCsvRow row = polar_csv_row(r, 3e6, 0.1);
  row.section = "NACA 2412";
  row.condition = "cruise";
  const std::string csv = polar_csv({row});
  EXPECT_EQ(csv,
            "re,mach,alpha,cl,cd,cd_friction,cd_pressure,cm,transition_upper,transition_lower,"
            "converged,iterations,section,condition\n"
            "3000000,0.1,2.5,0.3,0.006123456789,0.005,0.001123456789,-0.05,0.4,0.75,1,7,"
            "NACA 2412,cruise\n");
}

TEST(PolarCsv, NoNaNAndQuotedNames) {
  PolarCsvRow row;
  row.re = 2e5;
  row.cl = std::numeric_limits<double>::quiet_NaN();
  row.cd = std::numeric_limits<double>::infinity();
  row.section = "a, \"b\"";
  const std::string csv = polar_csv({row});
  const std::string line = csv.substr(csv.find('\n') + 1);
  EXPECT_EQ(line, "200000,0,0,,,0,0,0,1,1,0,0,\"a, \"\"b\"\"\",\n");
  EXPECT_EQ(csv.find("nan"), std::string::npos);
  EXPECT_EQ(csv.find("inf"), std::string::npos);
}

}  // namespace
}  // namespace fulmar::viscous
