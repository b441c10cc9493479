// Every row of docs/bad-inputs.md is run here, so the catalogue and the tool cannot drift apart.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <regex>
#include <sstream>

#include "support/run_cli.hpp"
#include "tidewright/common/atomic_output.hpp"

using tidewright::testing::count_lines;
using tidewright::testing::read_all;
using tidewright::testing::run_cli;
using tidewright::testing::shell_quote;
using tidewright::testing::TempDir;

namespace {

struct Case {
  std::string id, command, input;
  bool has_input = true;
  int exit_code = 2;
  std::string message;
};

std::string unescape(const std::string& s) {
  std::string out;
  for (std::size_t i = 0; i < s.size(); ++i) {
    if (s[i] != '\\' || i + 1 >= s.size()) {
      out += s[i];
      continue;
    }
    const char c = s[++i];
    if (c == 'n') out += '\n';
    else if (c == 'r') out += '\r';
    else if (c == 't') out += '\t';
    else if (c == 'x' && i + 2 < s.size() + 1) {
      out += static_cast<char>(std::stoi(s.substr(i + 1, 2), nullptr, 16));
      i += 2;
    } else out += c;
  }
  return out;
}

std::string between_backticks(const std::string& cell) {
  const auto a = cell.find('`');
  const auto b = cell.rfind('`');
  return (a == std::string::npos || b <= a) ? cell : cell.substr(a + 1, b - a - 1);
}

std::vector<Case> catalogue() {
  std::istringstream in(read_all(std::string(TIDEWRIGHT_SOURCE_DIR) + "/docs/bad-inputs.md"));
  std::vector<Case> cases;
  const std::regex row(R"(^\| (\d+) \| (.*) \| (.*) \| (\d) \| (.*) \|$)");
  for (std::string line; std::getline(in, line);) {
    std::smatch m;
    if (!std::regex_match(line, m, row)) continue;
    Case c;
    c.id = m[1];
    c.command = between_backticks(m[2]);
    const std::string input = between_backticks(m[3]);
    if (input == "(none)") c.has_input = false;
    else if (input == "(empty)") c.input.clear();
    else c.input = unescape(input);
    c.exit_code = std::stoi(m[4]);
    c.message = between_backticks(m[5]);
    cases.push_back(c);
  }
  return cases;
}

std::string replace_all(std::string s, const std::string& from, const std::string& to) {
  for (std::size_t p = s.find(from); p != std::string::npos; p = s.find(from, p + to.size())) s.replace(p, from.size(), to);
  return s;
}

}  // namespace

TEST(BadInputCatalogue, HasAtLeastFortyCases) { EXPECT_GE(catalogue().size(), 40U); }

TEST(BadInputCatalogue, EveryCaseGetsItsMessage) {
  TempDir shared;
  const std::string pp = std::string(TIDEWRIGHT_SOURCE_DIR) + "/tests/reference/data/portpirie.csv";
  const std::string fit = (shared / "fit.json").string();
  const std::string members = (shared / "members.csv").string();
  ASSERT_EQ(run_cli("fit " + shell_quote(pp) + " --level-column level_m --quiet --json " + shell_quote(fit)).exit_code, 0);
  ASSERT_EQ(run_cli("project --pathway midway --samples 50 --last-year 2120 --quiet --members " + shell_quote(members))
                .exit_code,
            0);
  const auto cases = catalogue();
  ASSERT_FALSE(cases.empty());
  for (const auto& c : cases) {
    TempDir dir;
    const std::string in = (dir / "input.txt").string();
    if (c.has_input) tidewright::write_text_file(in, c.input, true);
    std::string cmd = c.command;
    cmd = replace_all(cmd, "{in}", shell_quote(in));
    cmd = replace_all(cmd, "{dir}", dir.path().string());
    cmd = replace_all(cmd, "{pp}", shell_quote(pp));
    cmd = replace_all(cmd, "{fit}", shell_quote(fit));
    cmd = replace_all(cmd, "{members}", shell_quote(members));
    const auto r = run_cli(cmd);
    EXPECT_EQ(r.exit_code, c.exit_code) << "case " << c.id << ": " << c.command << "\n" << r.err;
    if (c.exit_code != 0) {
      EXPECT_THAT(r.err, ::testing::HasSubstr(c.message)) << "case " << c.id << ": " << c.command;
      EXPECT_EQ(count_lines(r.err), 1U) << "case " << c.id << ": " << r.err;
    }
  }
}
