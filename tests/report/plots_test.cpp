// Plots read from the outside: SVG parsed as XML by Debian's Python (xml.etree), PNG decoded
// by PIL and by reading its IHDR header here (PNG specification, ISO/IEC 15948, 11.2.2).
#include "tidewright/report/plots.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>

#include "report/report_probe.hpp"
#include "support/run_cli.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/report/chart.hpp"
#include "tidewright/report/palette.hpp"

namespace tr = tidewright::report;
namespace tt = tidewright::testing;
using nlohmann::json;

namespace {

// Width and height from the IHDR chunk that must follow the 8-byte PNG signature.
std::pair<int, int> png_size(const std::string& png) {
  static const std::string signature = "\x89PNG\r\n\x1a\n";
  if (png.size() < 24 || png.compare(0, 8, signature) != 0 || png.compare(12, 4, "IHDR") != 0) {
    return {-1, -1};
  }
  auto be32 = [&](std::size_t at) {
    return (static_cast<unsigned char>(png[at]) << 24) |
           (static_cast<unsigned char>(png[at + 1]) << 16) |
           (static_cast<unsigned char>(png[at + 2]) << 8) | static_cast<unsigned char>(png[at + 3]);
  };
  return {static_cast<int>(be32(16)), static_cast<int>(be32(20))};
}

bool has_text(const json& summary, const std::string& text) {
  for (const auto& t : summary["texts"]) {
    if (t.get<std::string>() == text) return true;
  }
  return false;
}

json svg_summary(const tr::Canvas& c) {
  tt::TempDir tmp;
  const auto file = tmp / "plot.svg";
  tt::write_bytes(file, c.to_svg());
  return tt::probe_report_file("svg", file);
}

json png_summary(const tr::Canvas& c, const std::string& pixel = "") {
  tt::TempDir tmp;
  const auto file = tmp / "plot.png";
  tt::write_bytes(file, c.to_png());
  return tt::probe_report_file("png", file, pixel);
}

tr::ReturnLevelPlotInput sample_return_levels() {
  tr::ReturnLevelPlotInput in;
  in.datum = "CD";
  in.model_name = "GEV fit";
  for (int i = 0; i < 30; ++i) in.annual_maxima_m.push_back(2.0 + 0.013 * ((i * 7) % 30));
  in.annual_maxima_m[4] = NAN;  // a missing year: skipped, not plotted
  for (double t = 1.1; t <= 1000; t *= 1.25) {
    in.return_period_yr.push_back(t);
    in.level_m.push_back(2.0 + 0.1 * std::log(t));
    in.lower_m.push_back(1.95 + 0.09 * std::log(t));
    in.upper_m.push_back(2.05 + 0.11 * std::log(t));
  }
  return in;
}

}  // namespace

TEST(Gringorten, ReturnPeriodsFollowThePlottingPosition) {
  // Gringorten (1963): p_i = (i - 0.44) / (n + 0.12), i = 1 for the largest; T_i = 1/N_0 with
  // N_0 = -ln(1 - p_i) (the project's T, return_levels.hpp).
  const auto one = tr::gringorten_return_periods_yr(1);
  ASSERT_EQ(one.size(), 1U);
  EXPECT_DOUBLE_EQ(one[0], 1.0 / std::log(2.0));  // p = 0.5: 1.44 years
  const auto ten = tr::gringorten_return_periods_yr(10);
  EXPECT_DOUBLE_EQ(ten[0], -1.0 / std::log1p(-0.56 / 10.12));
  EXPECT_DOUBLE_EQ(ten[9], -1.0 / std::log1p(-9.56 / 10.12));  // 0.35 years: passed most years
  for (std::size_t i = 1; i < ten.size(); ++i) EXPECT_LT(ten[i], ten[i - 1]);
}

TEST(ReturnLevelPlot, SvgIsWellFormedWithLabelsLegendAndOneMarkerPerMaximum) {
  const auto s = svg_summary(tr::return_level_plot(sample_return_levels()));
  ASSERT_TRUE(s.contains("classes")) << "SVG did not parse";
  EXPECT_EQ(s["classes"].value("marker", 0), 29);  // 30 years, one missing
  EXPECT_EQ(s["classes"].value("legend-marker", 0), 1);
  EXPECT_EQ(s["classes"].value("band", 0), 1);
  EXPECT_TRUE(has_text(s, "Return period (years)"));
  EXPECT_TRUE(has_text(s, "Still-water level (m above CD)"));
  EXPECT_TRUE(has_text(s, "95% interval"));
  EXPECT_TRUE(has_text(s, "GEV fit"));
  EXPECT_TRUE(has_text(s, "Annual maxima (Gringorten positions)"));
  for (const char* label : {"1", "10", "100", "1000"}) EXPECT_TRUE(has_text(s, label)) << label;
  // The largest maximum sits furthest right, at its Gringorten return period 30.12/0.56 yr.
  const auto& cx = s["marker_cx"];
  ASSERT_EQ(cx.size(), 29U);
  EXPECT_GT(cx[0].get<double>(), cx[28].get<double>());
}

TEST(ReturnLevelPlot, PngHasReportSizeAndIsNotBlank) {
  const tr::Canvas c = tr::return_level_plot(sample_return_levels());
  EXPECT_EQ(png_size(c.to_png()), std::make_pair(720, 450));
  EXPECT_EQ(png_size(c.to_png(2.0)), std::make_pair(1440, 900));
  const auto p = png_summary(c);
  EXPECT_EQ(p.value("format", ""), "PNG");
  // A white page has standard deviation 0; grid, curve, band and text give far more.
  EXPECT_GT(p.value("std", 0.0), 10.0);
}

TEST(Chart, LogAxisPutsEachDecadeAnEqualDistanceApart) {
  tr::ChartSpec spec;
  spec.title = "log check";
  spec.x.label = "x";
  spec.x.log = true;
  spec.x.min = 1;
  spec.x.max = 100;
  spec.y.label = "y";
  spec.series.push_back(
      tr::Series{"points", tr::SeriesStyle::markers, {1, 10, 100, 3.16227766}, {1, 2, 3, 4}});
  const auto s = svg_summary(tr::render_chart(spec));
  const auto& clip = s["clip"];
  ASSERT_EQ(clip.size(), 4U);
  const double left = clip[0].get<double>(), width = clip[2].get<double>();
  const auto& cx = s["marker_cx"];
  ASSERT_EQ(cx.size(), 4U);
  // log10: 1 -> left edge, 10 -> middle, 100 -> right edge, sqrt(10) -> a quarter (SVG keeps
  // two decimals, hence 0.01 px).
  EXPECT_NEAR(cx[0].get<double>(), left, 0.01);
  EXPECT_NEAR(cx[1].get<double>(), left + width / 2, 0.01);
  EXPECT_NEAR(cx[2].get<double>(), left + width, 0.01);
  EXPECT_NEAR(cx[3].get<double>(), left + width / 4, 0.01);
}

TEST(Chart, LinearAxisMapsLimitsToThePlotEdges) {
  tr::ChartSpec spec;
  spec.x.label = "x";
  spec.y.label = "y";
  spec.y.min = 0;
  spec.y.max = 10;
  spec.series.push_back(tr::Series{"p", tr::SeriesStyle::markers, {0, 5, 10}, {0, 2.5, 10}});
  const auto s = svg_summary(tr::render_chart(spec));
  const auto& clip = s["clip"];
  const double top = clip[1].get<double>(), height = clip[3].get<double>();
  const auto& cy = s["marker_cy"];
  ASSERT_EQ(cy.size(), 3U);
  EXPECT_NEAR(cy[0].get<double>(), top + height, 0.01);         // y = 0 at the bottom
  EXPECT_NEAR(cy[1].get<double>(), top + 0.75 * height, 0.01);  // y = 2.5
  EXPECT_NEAR(cy[2].get<double>(), top, 0.01);                  // y = 10 at the top
}

TEST(Chart, LegendGoesInAnEmptyCornerOrBesideThePlot) {
  tr::ChartSpec spec;
  spec.x.label = "x";
  spec.y.label = "y";
  spec.x.min = spec.y.min = 0;
  spec.x.max = spec.y.max = 1;
  // Data only near the bottom right: the legend fits in the top left.
  spec.series.push_back(
      tr::Series{"points", tr::SeriesStyle::markers, {0.8, 0.9, 1.0}, {0.0, 0.1, 0.2}});
  auto s = svg_summary(tr::render_chart(spec));
  const double left = s["clip"][0].get<double>();
  const double right = left + s["clip"][2].get<double>();
  EXPECT_LT(s["legend_marker_cx"].get<double>(), left + (right - left) / 2);
  // A zigzag through all four corners: the legend moves right of a narrower plot area.
  spec.series.push_back(tr::Series{"zigzag", tr::SeriesStyle::line, {0, 1, 0, 1}, {0, 1, 1, 0}});
  s = svg_summary(tr::render_chart(spec));
  const double right2 = s["clip"][0].get<double>() + s["clip"][2].get<double>();
  EXPECT_LT(right2, right);
  EXPECT_GT(s["legend_marker_cx"].get<double>(), right2);
}

TEST(Chart, TextIsEscapedAndReadsBackUnchanged) {
  tr::ChartSpec spec;
  spec.title = "Levels <above> \"datum\" & 'chart'";
  spec.x.label = "x";
  spec.y.label = "y";
  spec.series.push_back(tr::Series{"a < b & c", tr::SeriesStyle::line, {0, 1}, {0, 1}});
  const tr::Canvas c = tr::render_chart(spec);
  const std::string svg = c.to_svg();
  EXPECT_EQ(svg.find("<above>"), std::string::npos);
  const auto s = svg_summary(c);
  EXPECT_TRUE(has_text(s, spec.title));
  EXPECT_TRUE(has_text(s, "a < b & c"));
}

TEST(Chart, BadSeriesAreInputErrors) {
  tr::ChartSpec spec;
  spec.title = "bad";
  spec.series.push_back(tr::Series{"short", tr::SeriesStyle::line, {1, 2, 3}, {1, 2}});
  EXPECT_THROW((void)tr::render_chart(spec), tidewright::InputError);
  spec.series = {tr::Series{"nan", tr::SeriesStyle::line, {1, 2}, {NAN, NAN}}};
  EXPECT_THROW((void)tr::render_chart(spec), tidewright::InputError);
  spec.series = {tr::Series{"neg", tr::SeriesStyle::line, {-1, -2}, {1, 2}}};
  spec.x.log = true;
  EXPECT_THROW((void)tr::render_chart(spec), tidewright::InputError);
  EXPECT_THROW((void)tr::allowance_plot({2050, 2100}, {{"s", {0.1}}}), tidewright::InputError);
}

TEST(Plots, SameInputGivesByteIdenticalOutput) {
  const auto a = tr::return_level_plot(sample_return_levels());
  const auto b = tr::return_level_plot(sample_return_levels());
  EXPECT_EQ(a.to_svg(), b.to_svg());
  EXPECT_EQ(a.to_png(), b.to_png());
  tr::RasterView r{40, 30, std::vector<float>(1200, 0.5F), 10.0, std::nullopt};
  for (std::size_t i = 0; i < r.values.size(); ++i)
    r.values[i] = static_cast<float>(i % 97) / 97.0F;
  const auto m1 = tr::continuous_map({"m", r, "Depth (m)"});
  const auto m2 = tr::continuous_map({"m", r, "Depth (m)"});
  EXPECT_EQ(m1.to_svg(), m2.to_svg());
  EXPECT_EQ(m1.to_png(), m2.to_png());
}

TEST(FanChart, BandsMedianAndComponentsAreLabelled) {
  tr::FanChartInput in;
  in.baseline = "since 2020";
  for (int y = 2020; y <= 2100; y += 10) {
    const double m = 0.005 * (y - 2020);
    in.years.push_back(y);
    in.q05_m.push_back(0.6 * m);
    in.q17_m.push_back(0.8 * m);
    in.q50_m.push_back(m);
    in.q83_m.push_back(1.2 * m);
    in.q95_m.push_back(1.5 * m);
  }
  in.component_medians_m = {{"thermal expansion", in.q50_m}, {"glaciers", in.q50_m}};
  const auto s = svg_summary(tr::projection_fan_chart(in));
  EXPECT_EQ(s["classes"].value("band", 0), 2);
  EXPECT_EQ(s["classes"].value("series", 0), 3);
  EXPECT_TRUE(has_text(s, "Relative sea-level rise since 2020 (m)"));
  EXPECT_TRUE(has_text(s, "Total (median)"));
  EXPECT_TRUE(has_text(s, "thermal expansion (median)"));
  EXPECT_TRUE(has_text(s, "5\u201395% range"));
  EXPECT_TRUE(has_text(s, "2020"));
  EXPECT_TRUE(has_text(s, "2100"));
  in.q83_m.pop_back();
  EXPECT_THROW((void)tr::projection_fan_chart(in), tidewright::InputError);
}

TEST(ByYearPlots, AxesCarryUnitsAndDatum) {
  const std::vector<double> years{2030, 2050, 2100};
  const std::vector<tr::NamedSeries> s{{"Scenario A", {0.1, 0.2, 0.5}},
                                       {"Scenario B", {0.2, 0.3, 0.8}}};
  const auto design =
      svg_summary(tr::design_height_plot(years, s, "CD", 2.1, "present 100-year level"));
  EXPECT_TRUE(has_text(design, "Design height (m above CD)"));
  EXPECT_TRUE(has_text(design, "present 100-year level"));
  EXPECT_TRUE(has_text(design, "Scenario B"));
  const auto allowance = svg_summary(tr::allowance_plot(years, s));
  EXPECT_TRUE(has_text(allowance, "Allowance (m)"));
  const auto amp = svg_summary(tr::amplification_plot(years, {{"100-year level", {3, 20, 900}}}));
  EXPECT_TRUE(has_text(amp, "Amplification factor (times present frequency)"));
  // 3..900 spans under three decades: 1-2-5 labels from 2 (the nearest step below 3) to 1000.
  for (const char* label : {"2", "5", "10", "100", "1000"})
    EXPECT_TRUE(has_text(amp, label)) << label;
  EXPECT_FALSE(has_text(amp, "1"));
  const auto risk = svg_summary(tr::design_life_risk_plot(
      {2.0, 2.5, 3.0}, {{"A", {0.9, 0.3, 0.05}}}, "CD", "2030\u20132080", 0.1));
  EXPECT_TRUE(has_text(risk, "Height (m above CD)"));
  EXPECT_TRUE(has_text(risk, "target 10%"));
  EXPECT_TRUE(has_text(risk, "100"));  // probability axis in percent
}

TEST(Maps, ScaleBarLengthIsOneTwoOrFiveTimesAPowerOfTen) {
  EXPECT_DOUBLE_EQ(tr::scale_bar_length_m(2300), 2000);
  EXPECT_DOUBLE_EQ(tr::scale_bar_length_m(4999), 2000);
  EXPECT_DOUBLE_EQ(tr::scale_bar_length_m(5000), 5000);
  EXPECT_DOUBLE_EQ(tr::scale_bar_length_m(1), 1);
  EXPECT_DOUBLE_EQ(tr::scale_bar_length_m(0.7), 0.5);
}

TEST(Maps, ContinuousMapIsDownsampledAndCarriesLegendScaleAndNorth) {
  tr::RasterView r;
  r.columns = 3000;
  r.rows = 2000;
  r.cell_size_m = 2.0;
  r.nodata = -9999.0F;
  r.values.resize(static_cast<std::size_t>(r.columns) * r.rows);
  for (int i = 0; i < r.rows; ++i) {
    for (int j = 0; j < r.columns; ++j) {
      r.values[static_cast<std::size_t>(i) * r.columns + j] =
          j < 300 ? -9999.0F : static_cast<float>(j) / 1000.0F;
    }
  }
  const tr::Canvas c = tr::continuous_map({"Depth map", r, "Flood depth (m)"});
  const auto s = svg_summary(c);
  ASSERT_EQ(s["images"].size(), 2U);  // the map and the colour bar
  const auto& map = s["images"][0];
  EXPECT_LE(map[0].get<int>(), 2 * static_cast<int>(std::ceil(map[4].get<double>())));
  EXPECT_LT(map[0].get<int>(), 3000);
  EXPECT_EQ(s["images"][1][1].get<int>(), 256);  // colour bar: 1 x 256 ramp
  // 3000 cells x 2 m = 6 km wide; a quarter of it gives a 1 km bar.
  EXPECT_TRUE(has_text(s, "1 km"));
  EXPECT_TRUE(has_text(s, "N"));
  EXPECT_TRUE(has_text(s, "Flood depth (m)"));
  EXPECT_TRUE(has_text(s, "No value"));
  EXPECT_EQ(png_size(c.to_png()).first, 720);
}

TEST(Maps, CategoricalMapPaintsEachClassItsColour) {
  tr::RasterView r;
  r.columns = 100;
  r.rows = 50;
  r.cell_size_m = 10.0;
  r.values.resize(5000);
  for (int i = 0; i < 50; ++i) {
    for (int j = 0; j < 100; ++j)
      r.values[static_cast<std::size_t>(i) * 100 + j] = j < 40 ? 1.0F : (j < 80 ? 2.0F : 3.0F);
  }
  tr::CategoricalMapInput in;
  in.title = "Extent";
  in.raster = r;
  const tr::Canvas c = tr::categorical_map(in);
  const auto s = svg_summary(c);
  for (const auto& cat : tr::extent_categories()) EXPECT_TRUE(has_text(s, cat.label)) << cat.label;
  ASSERT_EQ(s["images"].size(), 1U);
  const auto& im = s["images"][0];
  const double x = im[2].get<double>(), y = im[3].get<double>(), w = im[4].get<double>(),
               h = im[5].get<double>();
  const auto at = [&](double fx, double fy) {
    return std::to_string(static_cast<int>(x + fx * w)) + " " +
           std::to_string(static_cast<int>(y + fy * h));
  };
  const auto left = png_summary(c, at(0.3, 0.4))["pixel"];
  const auto right = png_summary(c, at(0.7, 0.4))["pixel"];
  const auto sea = png_summary(c, at(0.9, 0.4))["pixel"];
  const tr::Colour c1 = tr::extent_categories()[1].colour, c2 = tr::extent_categories()[2].colour,
                   c3 = tr::extent_categories()[3].colour;
  EXPECT_EQ(left, json({c1.r, c1.g, c1.b}));
  EXPECT_EQ(right, json({c2.r, c2.g, c2.b}));
  EXPECT_EQ(sea, json({c3.r, c3.g, c3.b}));
}

TEST(Palette, ViridisFollowsMatplotlib) {
  // Computed with Debian python3-matplotlib 3.6.3: round(255 * cm.viridis(t)[:3]).
  const std::vector<std::pair<double, std::array<int, 3>>> reference{
      {0.0, {68, 1, 84}},    {0.03125, {71, 13, 96}}, {0.3, {53, 95, 141}},
      {0.5, {33, 145, 140}}, {0.77, {105, 205, 91}},  {0.90625, {194, 223, 35}},
      {1.0, {253, 231, 37}}};
  for (const auto& [t, rgb] : reference) {
    const tr::Colour c = tr::viridis(t);
    // Interpolating 17 anchors: within 5.3/255 of the 256-entry table (measured; see palette.cpp).
    EXPECT_NEAR(c.r, rgb[0], 6) << t;
    EXPECT_NEAR(c.g, rgb[1], 6) << t;
    EXPECT_NEAR(c.b, rgb[2], 6) << t;
  }
  EXPECT_EQ(tr::viridis(0.5).hex(), "#21918c");      // an anchor: exact
  EXPECT_EQ(tr::series_colour(0).hex(), "#0072b2");  // Okabe & Ito (2008) blue
  EXPECT_EQ(tr::series_colour(8), tr::series_colour(0));
}

TEST(AepClasses, BandsFollowTheAepThresholds) {
  tr::RasterView v;
  v.columns = 7;
  v.rows = 1;
  v.cell_size_m = 10;
  v.values = {0.5F, 0.1F, 0.05F, 0.005F, 0.0005F, 0.0F, std::numeric_limits<float>::quiet_NaN()};
  const auto c = tr::aep_classes(v);
  EXPECT_EQ(c.values, (std::vector<float>{1, 1, 2, 3, 4, 5, -1}));
  ASSERT_TRUE(c.nodata.has_value());
  EXPECT_EQ(*c.nodata, -1.0F);
  EXPECT_EQ(tr::aep_categories().size(), 5U);
}
