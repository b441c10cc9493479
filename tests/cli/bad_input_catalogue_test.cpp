// Every row of docs/bad-inputs.md is run here, so the catalogue and the tool cannot drift apart.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <algorithm>
#include <cctype>
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
  for (std::string line; std::getline(in, line);) {
    // A data row: "| N | command | input | exit | message |" (cells hold no " | ").
    if (line.size() < 4 || line.rfind("| ", 0) != 0 || line.compare(line.size() - 2, 2, " |") != 0) continue;
    std::vector<std::string> cells;
    const std::string body = line.substr(2, line.size() - 4);
    for (std::size_t start = 0;;) {
      const auto bar = body.find(" | ", start);
      cells.push_back(body.substr(start, bar == std::string::npos ? std::string::npos : bar - start));
      if (bar == std::string::npos) break;
      start = bar + 3;
    }
    if (cells.size() != 5 || cells[0].empty() ||
        !std::all_of(cells[0].begin(), cells[0].end(), [](char ch) { return std::isdigit(static_cast<unsigned char>(ch)); })) {
      continue;
    }
    Case c;
    c.id = cells[0];
    c.command = between_backticks(cells[1]);
    const std::string input = between_backticks(cells[2]);
    if (input == "(none)") c.has_input = false;
    else if (input == "(empty)") c.input.clear();
    else c.input = unescape(input);
    c.exit_code = std::stoi(cells[3]);
    c.message = between_backticks(cells[4]);
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
