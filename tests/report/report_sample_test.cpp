// A sample report built from invented numbers, with every plot the study's report uses: the
// documented example of the report API (docs/report.md). With the environment variable
// TIDEWRIGHT_REPORT_SAMPLE_DIR set, the sample is written there (replacing an earlier one) to
// be looked at, e.g. rendered with headless Chromium; otherwise into a temporary folder.
//
// The numbers are invented for the sample and carry no meaning for any real place. The
// curves follow the closed forms of docs/design.md (Gumbel return level, Hunter's allowance)
// so that the pictures look like real ones.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdlib>
#include <random>

#include "report/report_probe.hpp"
#include "support/run_cli.hpp"
#include "tidewright/report/document.hpp"
#include "tidewright/report/plots.hpp"
#include "tidewright/report/text_table.hpp"

namespace tr = tidewright::report;
namespace fs = std::filesystem;

namespace {

constexpr double gumbel_location_m = 2.10;  // invented
constexpr double gumbel_scale_m = 0.12;     // invented

// Gumbel quantile of the T-year level: z_T = mu - lambda ln(-ln(1 - 1/T)).
double gumbel_level_m(double t_yr) {
  return gumbel_location_m - gumbel_scale_m * std::log(-std::log(1 - 1 / t_yr));
}

struct Scenario {
  std::string name;
  double rate_m_per_yr, acceleration_m_per_yr2, spread;  // invented shape of the median and spread
};
const std::vector<Scenario> scenarios{{"Low emissions", 0.0035, 0.00002, 0.25},
                                      {"Intermediate", 0.0040, 0.00004, 0.30},
                                      {"High emissions", 0.0045, 0.00006, 0.35}};

double median_rise_m(const Scenario& s, double year) {
  const double t = year - 2020;
  return s.rate_m_per_yr * t + s.acceleration_m_per_yr2 * t * t;
}
double sd_rise_m(const Scenario& s, double year) {
  return s.spread * median_rise_m(s, year) + 0.002 * (year - 2020) / 10;
}

tr::RasterView sample_depth_raster(bool extents) {
  tr::RasterView r;
  r.columns = 640;
  r.rows = 420;
  r.cell_size_m = 5.0;
  r.nodata = -9999.0F;
  r.values.resize(static_cast<std::size_t>(r.columns) * r.rows);
  for (int i = 0; i < r.rows; ++i) {
    for (int j = 0; j < r.columns; ++j) {
      const double x = j / 640.0, y = i / 420.0;
      // Invented terrain: rising inland (east), a ridge at x = 0.55, a hollow behind it.
      const double ground =
          0.2 + 4.5 * x + 1.6 * std::exp(-std::pow((x - 0.55) / 0.05, 2)) -
          1.8 * std::exp(-(std::pow((x - 0.72) / 0.08, 2) + std::pow((y - 0.5) / 0.2, 2))) +
          0.3 * std::sin(9 * y);
      const double level = 2.6;
      float& v = r.values[static_cast<std::size_t>(i) * r.columns + j];
      if (x < 0.08) {
        v = -9999.0F;  // the sea: no data on the map
      } else if (extents) {
        v = ground >= level ? 0.0F : (x < 0.55 ? 1.0F : 2.0F);
      } else {
        v = ground < level && x < 0.55 ? static_cast<float>(level - ground) : NAN;
      }
    }
  }
  return r;
}

tr::ReportDocument sample_document() {
  tr::ReportDocument doc;
  doc.site_name = "Sample Harbour (invented)";
  doc.date = "2026-12-01";
  doc.tool_version = "tidewright 0.1.0";
  doc.summary =
      "A sample report from invented numbers, to show every part of the report. "
      "Levels are in metres above the invented chart datum SD.";

  const std::vector<double> years{2020, 2030, 2040, 2050, 2060, 2070, 2080,
                                  2090, 2100, 2110, 2120, 2130, 2140, 2150};
  // --- answers ----------------------------------------------------------------------------
  tr::Section answers{"Answers", {}};
  tr::Table heights{"design_heights",
                    "Allowance and design height of the present 100-year level, "
                    "by year and scenario (sample numbers).",
                    {{"Year", ""},
                     {"Scenario", ""},
                     {"Allowance", "m"},
                     {"Design height", "m above SD"},
                     {"Amplification factor", "\u00d7"}},
                    {}};
  std::vector<tr::NamedSeries> allowance, design, amplification;
  const double z100 = gumbel_level_m(100);
  for (const auto& s : scenarios) {
    tr::NamedSeries a{s.name, {}}, d{s.name, {}}, f{s.name, {}};
    for (double y : years) {
      const double mu = median_rise_m(s, y), sd = sd_rise_m(s, y);
      const double allowance_m =
          mu + sd * sd / (2 * gumbel_scale_m);  // Hunter (2012), Gumbel + normal
      a.values.push_back(allowance_m);
      d.values.push_back(z100 + allowance_m);
      f.values.push_back(std::exp(allowance_m / gumbel_scale_m));  // N_t/N_0 for Gumbel tails
      if (static_cast<int>(y) % 50 == 0) {
        heights.add_row({tr::fixed(y, 0), s.name, tr::fixed(allowance_m, 2),
                         tr::fixed(z100 + allowance_m, 2),
                         tr::significant(std::exp(allowance_m / gumbel_scale_m), 3)});
      }
    }
    allowance.push_back(a);
    design.push_back(d);
    amplification.push_back(f);
  }
  answers.blocks.emplace_back(
      tr::Paragraph{"Design heights add the allowance to today's 100-year "
                    "still-water level of " +
                    tr::fixed(z100, 2) + " m above SD."});
  answers.blocks.emplace_back(std::move(heights));
  answers.blocks.emplace_back(tr::Figure{"allowance",
                                         "Allowance by year and scenario (Hunter 2012).",
                                         tr::allowance_plot(years, allowance)});
  answers.blocks.emplace_back(
      tr::Figure{"design_heights", "Design height by year and scenario.",
                 tr::design_height_plot(years, design, "SD", z100, "present 100-year level")});
  answers.blocks.emplace_back(tr::Figure{"amplification",
                                         "How many times more often today's 100-year "
                                         "level is reached, by year and scenario.",
                                         tr::amplification_plot(years, amplification)});
  std::vector<double> h;
  for (double z = 2.4; z <= 4.0001; z += 0.02) h.push_back(z);
  std::vector<tr::NamedSeries> risk;
  for (const auto& s : scenarios) {
    tr::NamedSeries p{s.name, {}};
    for (double z : h) {
      double sum = 0;
      for (int y = 2030; y <= 2080; ++y) {
        // Gumbel annual exceedance rate N_0(z) = exp(-(z - mu)/lambda), shifted by the median rise.
        sum += std::exp(-(z - median_rise_m(s, y) - gumbel_location_m) / gumbel_scale_m);
      }
      p.values.push_back(1 - std::exp(-sum));
    }
    risk.push_back(p);
  }
  answers.blocks.emplace_back(
      tr::Figure{"design_life_risk",
                 "Chance that still water exceeds a "
                 "height at least once in 2030-2080.",
                 tr::design_life_risk_plot(h, risk, "SD", "2030\u20132080", 0.1)});
  doc.sections.push_back(std::move(answers));

  // --- evidence ---------------------------------------------------------------------------
  tr::Section evidence{"Evidence", {}};
  std::mt19937 gen(20261201);
  std::vector<double> maxima;
  for (int i = 0; i < 48; ++i) {
    const double u = (static_cast<double>(gen()) + 0.5) / 4294967296.0;
    maxima.push_back(gumbel_location_m - gumbel_scale_m * std::log(-std::log(u)));
  }
  tr::ReturnLevelPlotInput rl;
  rl.datum = "SD";
  rl.annual_maxima_m = maxima;
  rl.model_name = "Gumbel fit";
  for (double t = 1.05; t <= 1000.01; t *= 1.1) {
    const double se = 0.02 + 0.012 * std::log(t);  // invented interval width
    rl.return_period_yr.push_back(t);
    rl.level_m.push_back(gumbel_level_m(t));
    rl.lower_m.push_back(gumbel_level_m(t) - 1.96 * se);
    rl.upper_m.push_back(gumbel_level_m(t) + 1.96 * se);
  }
  evidence.blocks.emplace_back(tr::Subheading{"Extreme still-water levels"});
  evidence.blocks.emplace_back(tr::Figure{"return_levels",
                                          "Annual maxima at Gringorten plotting positions, "
                                          "the fitted curve and its 95% interval.",
                                          tr::return_level_plot(rl)});
  tr::FanChartInput fan;
  fan.title = "Projected relative sea-level rise, intermediate scenario";
  fan.baseline = "since 2020";
  fan.years = years;
  const Scenario& mid = scenarios[1];
  for (double y : years) {
    const double mu = median_rise_m(mid, y), sd = sd_rise_m(mid, y);
    fan.q05_m.push_back(mu - 1.645 * sd);
    fan.q17_m.push_back(mu - 0.954 * sd);
    fan.q50_m.push_back(mu);
    fan.q83_m.push_back(mu + 0.954 * sd);
    fan.q95_m.push_back(mu + 1.645 * sd);
  }
  for (const auto& [name, share] :
       std::vector<std::pair<std::string, double>>{{"thermal expansion", 0.35},
                                                   {"glaciers", 0.22},
                                                   {"ice sheets", 0.33},
                                                   {"land motion", 0.10}}) {
    tr::NamedSeries c{name, {}};
    for (double m : fan.q50_m) c.values.push_back(share * m);
    fan.component_medians_m.push_back(c);
  }
  evidence.blocks.emplace_back(tr::Subheading{"Projections"});
  evidence.blocks.emplace_back(tr::Figure{"projection_fan",
                                          "Total rise: median and 17-83% and 5-95% "
                                          "ranges; components as medians.",
                                          tr::projection_fan_chart(fan)});
  evidence.blocks.emplace_back(tr::Subheading{"Maps"});
  evidence.blocks.emplace_back(
      tr::Figure{"flood_depth",
                 "Still-water depth at 2.6 m above SD, "
                 "connected cells only.",
                 tr::continuous_map({"Flood depth at 2.6 m above SD", sample_depth_raster(false),
                                     "Depth (m)", 0.0, std::nullopt, 1.0, "Dry, or sea"})});
  tr::CategoricalMapInput ext;
  ext.title = "Flood extent at 2.6 m above SD";
  ext.raster = sample_depth_raster(true);
  evidence.blocks.emplace_back(tr::Figure{"flood_extent",
                                          "Cells below 2.6 m above SD, by connection "
                                          "to the sea.",
                                          tr::categorical_map(ext)});
  doc.sections.push_back(std::move(evidence));

  doc.inputs = {{"Record", "invented annual maxima, 48 years"},
                {"Datum", "SD (sample datum), metres"},
                {"Scenarios", "three invented scenarios"}};
  doc.assumptions = {"The record is stationary after removing the mean-sea-level trend.",
                     "Storm statistics do not change with sea level."};
  doc.methods = {
      {"Gumbel fit of annual maxima", "Return levels and their intervals.",
       "Coles (2001), An Introduction to Statistical Modeling of Extreme Values, Springer."},
      {"Plotting positions", "Empirical return periods of the annual maxima.",
       "Gringorten (1963), J. Geophys. Res. 68(3):813-814."},
      {"Sea-level allowance", "Height that keeps the expected number of exceedances.",
       "Hunter (2012), Climatic Change 113:239-252."}};
  doc.extra_cautions = {"This sample report is built from invented numbers."};
  return doc;
}

}  // namespace

TEST(ReportSample, WritesEveryPartOfTheReport) {
  tidewright::testing::TempDir tmp;
  const char* env = std::getenv("TIDEWRIGHT_REPORT_SAMPLE_DIR");
  const fs::path dir = env != nullptr && *env != '\0' ? fs::path(env) : tmp.path();
  fs::create_directories(dir / "plots");
  fs::create_directories(dir / "tables");
  const tr::ReportDocument doc = sample_document();
  tr::write_html(doc, dir / "report.html", true);
  tr::write_markdown(doc, dir / "report.md", true);
  const auto csvs = tr::write_tables_csv(doc, dir / "tables", true);
  const auto plots = tr::write_figures(doc, dir / "plots", true);
  EXPECT_EQ(csvs.size(), 1U);
  EXPECT_EQ(plots.size(), 16U);  // eight figures, SVG and PNG each
  for (const auto& p : plots) EXPECT_TRUE(fs::exists(p)) << p;

  const auto html = tidewright::testing::probe_report_file("html", dir / "report.html");
  ASSERT_TRUE(html.contains("errors"));
  EXPECT_TRUE(html["errors"].empty()) << html["errors"].dump();
  EXPECT_EQ(html["svgs"].size(), 8U);
  // Every PNG at report size and not blank.
  for (const auto& p : plots) {
    if (p.extension() != ".png") continue;
    const auto png = tidewright::testing::probe_report_file("png", p);
    const bool map = p.stem().string().rfind("flood_", 0) == 0;
    EXPECT_EQ(png.value("width", 0), 720) << p;
    if (map) {
      // 640 x 420 cells fitted into 720 - 14 - legend - 36 px of width, plus title and margin.
      EXPECT_GE(png.value("height", 0), 300) << p;
      EXPECT_LE(png.value("height", 0), 560) << p;
    } else {
      EXPECT_EQ(png.value("height", 0), 450) << p;
    }
    EXPECT_GT(png.value("std", 0.0), 10.0) << p;
  }
}
