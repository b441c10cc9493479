// demo_coast/README.md quotes the demo's fit: every figure between its `demo-fit` marks is
// checked here against a fit of the record the generator writes for the default seed, with the
// demo site file's record settings, so the README cannot drift from the run (invented data).
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>

#include <cstdio>
#include <string>
#include <vector>

#include "demo_inputs.hpp"
#include "support/run_cli.hpp"

namespace demo = tidewright::demo;
using tidewright::testing::read_all;
using tidewright::testing::run_cli;
using tidewright::testing::shell_quote;
using tidewright::testing::TempDir;

namespace {

std::vector<std::string> marked_snippets(const std::string& text) {
  const std::string open = "<!-- demo-fit -->";
  const std::string close = "<!-- /demo-fit -->";
  std::vector<std::string> out;
  for (std::size_t at = text.find(open); at != std::string::npos; at = text.find(open, at)) {
    at += open.size();
    const std::size_t end = text.find(close, at);
    if (end == std::string::npos) break;
    out.push_back(text.substr(at, end - at));
    at = end;
  }
  return out;
}

std::string format(const char* pattern, double a, double b = 0.0, double c = 0.0, double d = 0.0, double e = 0.0,
                   double f = 0.0) {
  char buf[256];
  std::snprintf(buf, sizeof buf, pattern, a, b, c, d, e, f);
  return buf;
}

}  // namespace

TEST(DemoReadme, QuotesTheFitOfTheDefaultSeed) {
  TempDir dir;
  const auto csv = dir / "gauge.csv";
  const auto record = demo::generate_tide_record(demo::TideRecordDesign::standard(), demo::demo_default_seed);
  demo::write_tide_record_csv(record, csv, false);
  // The record settings of demo_coast/site.toml (full variant), as the fit command's options.
  const auto fit_json = dir / "fit.json";
  const auto r = run_cli("fit " + shell_quote(csv.string()) +
                         " --level-column level_m --sentinel -99 --min-completeness 0.8 --year-start-month 7"
                         " --detrend linear --epoch 2024 --model gev --return-periods 100 --json " +
                         shell_quote(fit_json.string()) + " --quiet");
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const auto fit = nlohmann::json::parse(read_all(fit_json));
  const auto& p = fit["parameters"];
  const auto& se = fit["standard_errors"];
  const auto& rl = fit["return_levels"][0];
  ASSERT_EQ(rl["return_period"].get<double>(), 100.0);
  ASSERT_EQ(rl["method"], "profile");
  const std::vector<std::string> expected{
      std::to_string(fit["n"].get<int>()) + " annual maxima",
      format("location %.3f m (standard error %.3f), scale %.3f m (%.3f), shape %.3f (%.3f)",
             p["location"].get<double>(), se["location"].get<double>(), p["scale"].get<double>(),
             se["scale"].get<double>(), p["shape"].get<double>(), se["shape"].get<double>()),
      format("100-year still-water level of %.2f m above QCD (profile interval %.2f-%.2f m)", rl["level"].get<double>(),
             rl["lower"].get<double>(), rl["upper"].get<double>())};
  const auto quoted = marked_snippets(read_all(std::filesystem::path(TIDEWRIGHT_SOURCE_DIR) / "demo_coast" / "README.md"));
  ASSERT_EQ(quoted.size(), expected.size()) << "demo_coast/README.md should hold " << expected.size() << " demo-fit marks";
  for (std::size_t i = 0; i < expected.size(); ++i) EXPECT_EQ(quoted[i], expected[i]) << "demo-fit mark " << i + 1;
  // The reason the seed is the default (demo_coast/README.md): a shape typical of still water.
  EXPECT_GE(p["shape"].get<double>(), -0.2);
  EXPECT_LE(p["shape"].get<double>(), 0.05);
}
