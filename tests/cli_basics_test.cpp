// The command-line contract common to every subcommand.
#include <gtest/gtest.h>

#include "cli_run.h"

namespace fulmar::testing {
namespace {

TEST(CliBasics, VersionPrintsNameAndNumber) {
  const CliResult r = run_fulmar({"--version"});
  EXPECT_EQ(r.exit_code, 0);
  EXPECT_NE(r.out.find("fulmar " FULMAR_VERSION), std::string::npos) << r.out;
}

TEST(CliBasics, HelpCarriesTheCaution) {
  const CliResult r = run_fulmar({"--help"});
  EXPECT_EQ(r.exit_code, 0);
  EXPECT_NE(r.out.find("Confirm every result by test"), std::string::npos) << r.out;
}

TEST(CliBasics, UnknownSubcommandIsExitTwo) {
  const CliResult r = run_fulmar({"no-such-command"});
  EXPECT_EQ(r.exit_code, 2);
  EXPECT_FALSE(r.err.empty());
}

}  // namespace
}  // namespace fulmar::testing
