// `fulmar flight` end to end.
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>

#include "cli_run.h"

namespace fulmar::testing {
namespace {

// The "Kittiwake K-3" worked example of src/flight/flight_conditions_test.cpp (a fictional airplane
// of our own), through the command line: the same hand-calculated figures (exact solution of the
// lift equation on the ISO 2533:1975 atmosphere), 1e-4 relative because they carry five figures.
TEST(CliFlight, KittiwakeJson) {
  const CliResult r =
      run_fulmar({"flight", "--mass", "780", "--wing-area", "11.6", "--chord", "1.30", "--speed",
                  "62", "--altitude", "2500", "--stall-speed", "25", "--json"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const auto j = nlohmann::json::parse(r.out);
  for (const char* key :
       {"temperature", "pressure", "density", "viscosity", "speed_of_sound", "dynamic_pressure",
        "cl", "reynolds", "mach", "cl_max_required", "stall_reynolds"}) {
    EXPECT_TRUE(j.contains(key)) << key;
  }
  EXPECT_NEAR(j["cl"].get<double>(), 0.35856, 1e-4 * 0.35856);
  EXPECT_NEAR(j["reynolds"].get<double>(), 4.5104e6, 1e-4 * 4.5104e6);
  EXPECT_NEAR(j["cl_max_required"].get<double>(), 1.91394, 1e-4 * 1.91394);
  EXPECT_NEAR(j["stall_reynolds"].get<double>(), 2.22493e6, 1e-4 * 2.22493e6);
}

TEST(CliFlight, NoStallKeysWithoutStallSpeed) {
  const CliResult r = run_fulmar({"flight", "--mass", "780", "--wing-area", "11.6", "--chord",
                                  "1.30", "--speed", "62", "--altitude", "2500", "--json"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_FALSE(nlohmann::json::parse(r.out).contains("cl_max_required"));
}

TEST(CliFlight, BadValuesAreExitTwoWithTheOptionNamed) {
  const CliResult neg = run_fulmar({"flight", "--mass", "-780", "--wing-area", "11.6", "--chord",
                                    "1.3", "--speed", "62", "--altitude", "2500"});
  EXPECT_EQ(neg.exit_code, 2);
  EXPECT_NE(neg.err.find("--mass"), std::string::npos) << neg.err;
  const CliResult high = run_fulmar({"flight", "--mass", "780", "--wing-area", "11.6", "--chord",
                                     "1.3", "--speed", "62", "--altitude", "25000"});
  EXPECT_EQ(high.exit_code, 2);
  EXPECT_NE(high.err.find("--altitude"), std::string::npos) << high.err;
  const CliResult missing = run_fulmar({"flight", "--mass", "780"});
  EXPECT_EQ(missing.exit_code, 2);
  const CliResult lone =
      run_fulmar({"flight", "--mass", "780", "--wing-area", "11.6", "--chord", "1.3", "--speed",
                  "62", "--altitude", "0", "--stall-altitude", "100"});
  EXPECT_EQ(lone.exit_code, 2);
  EXPECT_NE(lone.err.find("--stall-speed"), std::string::npos) << lone.err;
}

TEST(CliFlight, HelpNamesUnitsAndCaution) {
  const CliResult r = run_fulmar({"flight", "--help"});
  EXPECT_EQ(r.exit_code, 0);
  EXPECT_NE(r.out.find("m/s"), std::string::npos);
  EXPECT_NE(r.out.find("Confirm every result by test"), std::string::npos);
}

}  // namespace
}  // namespace fulmar::testing
