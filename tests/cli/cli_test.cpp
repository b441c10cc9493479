// The command-line conventions of DEVELOPERS.md: help, version, one-line errors, exit codes.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include "support/run_cli.hpp"

using tidewright::testing::count_lines;
using tidewright::testing::run_cli;
using ::testing::HasSubstr;
using ::testing::StartsWith;

TEST(Cli, HelpListsCautionsAndExitsZero) {
  const auto r = run_cli("--help");
  EXPECT_EQ(r.exit_code, 0);
  EXPECT_THAT(r.out, HasSubstr("Usage:"));
  EXPECT_THAT(r.out, HasSubstr("licensed coastal engineer"));
  EXPECT_THAT(r.out, HasSubstr("Not for navigation"));
}

// A command's help lists its options and points to the cautions in one line, instead of
// repeating the whole block on every page.
TEST(Cli, CommandHelpPointsToTheCautionsInOneLine) {
  for (const char* command : {"fit", "project", "allowance", "amplify", "map", "study", "demo"}) {
    const auto r = run_cli(std::string(command) + " --help");
    EXPECT_EQ(r.exit_code, 0) << command;
    EXPECT_THAT(r.out, HasSubstr("--help")) << command;
    EXPECT_THAT(r.out, HasSubstr("'tidewright --help' lists the cautions")) << command;
    EXPECT_THAT(r.out, ::testing::Not(HasSubstr("Not for navigation"))) << command;
  }
}

TEST(Cli, VersionPrintsProjectVersion) {
  const auto r = run_cli("--version");
  EXPECT_EQ(r.exit_code, 0);
  EXPECT_THAT(r.out, StartsWith("tidewright 0."));
}

TEST(Cli, NoArgumentsPrintsHelp) {
  const auto r = run_cli("");
  EXPECT_EQ(r.exit_code, 0);
  EXPECT_THAT(r.out, HasSubstr("Usage:"));
}

TEST(Cli, UnknownOptionIsOneLineExitTwo) {
  const auto r = run_cli("--no-such-option");
  EXPECT_EQ(r.exit_code, 2);
  EXPECT_THAT(r.err, StartsWith("tidewright: error: usage: "));
  EXPECT_EQ(count_lines(r.err), 1U) << r.err;
  EXPECT_TRUE(r.out.empty());
}

TEST(Cli, UnknownSubcommandIsOneLineExitTwo) {
  const auto r = run_cli("frobnicate");
  EXPECT_EQ(r.exit_code, 2);
  EXPECT_THAT(r.err, StartsWith("tidewright: error: "));
  EXPECT_EQ(count_lines(r.err), 1U) << r.err;
}
