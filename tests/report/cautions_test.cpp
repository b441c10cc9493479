// The cautions are written once (src/report/cautions.cpp); the README must carry the same words.
#include "tidewright/report/cautions.hpp"

#include <gtest/gtest.h>

#include <sstream>

#include "support/run_cli.hpp"

namespace {
std::string squeeze(const std::string& s) {
  std::string out;
  bool space = false;
  for (char c : s) {
    if (c == ' ' || c == '\n' || c == '\t') {
      space = true;
    } else {
      if (space && !out.empty()) out += ' ';
      out += c;
      space = false;
    }
  }
  return out;
}
}  // namespace

TEST(Cautions, ReadmeCarriesEveryCaution) {
  const std::string readme =
      squeeze(tidewright::testing::read_all(std::string(TIDEWRIGHT_SOURCE_DIR) + "/README.md"));
  ASSERT_FALSE(readme.empty());
  for (const auto& c : tidewright::report::safety_cautions()) {
    EXPECT_NE(readme.find(squeeze(std::string(c))), std::string::npos) << c;
  }
}

TEST(Cautions, WrappedTextKeepsEveryWordAndWidth) {
  const std::string text = tidewright::report::cautions_text("  - ", 60);
  std::istringstream in(text);
  std::string line;
  while (std::getline(in, line)) EXPECT_LE(line.size(), 60U) << line;
  EXPECT_EQ(squeeze(text), squeeze("- " + [] {
              std::string s;
              bool first = true;
              for (const auto& c : tidewright::report::safety_cautions()) {
                s += (first ? "" : " - ") + std::string(c);
                first = false;
              }
              return s;
            }()));
}
