// The report's plots, each a function of plain values (vectors of numbers and labels) that
// returns a Canvas (write it with Canvas::write_files, or put it in a report Figure).
// Levels are in metres on the datum the caller names; years are calendar years.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "tidewright/report/canvas.hpp"
#include "tidewright/report/chart.hpp"

namespace tidewright::report {

struct NamedSeries {
  std::string name{};            // legend entry (a scenario, a component, a level)
  std::vector<double> values{};  // one per x value of the plot
};

// --- return levels ------------------------------------------------------------------------

// Return periods (years) of the n annual maxima sorted from largest to smallest, from the
// Gringorten (1963, J. Geophys. Res. 68(3):813) plotting position for rank i (1 = largest):
// exceedance probability p_i = (i - 0.44) / (n + 0.12), return period T_i = -1 / ln(1 - p_i),
// the project's one meaning of T (N_0 = 1/T with N_0 = -ln F for annual maxima; the fit's
// plot points use the same).
[[nodiscard]] std::vector<double> gringorten_return_periods_yr(std::size_t n);

struct ReturnLevelPlotInput {
  std::string title = "Return levels of still water";
  std::string datum{};                     // e.g. "CD": the y label reads "(m above CD)"
  std::vector<double> annual_maxima_m{};   // any order; NaN entries are skipped
  std::vector<double> return_period_yr{};  // the fitted curve ...
  std::vector<double> level_m{};           // ... its return levels
  std::vector<double> lower_m{};           // 95% interval, lower (may be empty)
  std::vector<double> upper_m{};           // 95% interval, upper (may be empty)
  std::string model_name = "Fitted model";
};
// Markers: the annual maxima at their Gringorten return periods; line: the fitted curve;
// band: its 95% interval; x on a log axis of return period.
[[nodiscard]] Canvas return_level_plot(const ReturnLevelPlotInput& in);

// --- projections --------------------------------------------------------------------------

struct FanChartInput {
  std::string title = "Projected relative sea-level rise";
  std::string baseline{};  // e.g. "since 2020": the y label reads "... since 2020 (m)"
  std::vector<double> years{};
  // Quantiles of total relative rise per year (m): 5, 17, 50, 83, 95%.
  std::vector<double> q05_m, q17_m, q50_m, q83_m, q95_m{};
  std::vector<NamedSeries> component_medians_m{};  // optional, drawn as thinner dashed lines
};
[[nodiscard]] Canvas projection_fan_chart(const FanChartInput& in);

// Allowance (m) by year, one line per scenario.
[[nodiscard]] Canvas allowance_plot(const std::vector<double>& years,
                                    const std::vector<NamedSeries>& per_scenario_m,
                                    const std::string& title = "Sea-level allowance");
// Design height (m above datum) by year, one line per scenario; `present_level_m`, when
// given, is drawn as a reference line labelled `present_label`.
[[nodiscard]] Canvas design_height_plot(const std::vector<double>& years,
                                        const std::vector<NamedSeries>& per_scenario_m,
                                        const std::string& datum,
                                        std::optional<double> present_level_m = std::nullopt,
                                        const std::string& present_label = "present-day level",
                                        const std::string& title = "Design height");
// Amplification factor N_t(z)/N_0(z) by year on a log y axis, one line per series (a level
// or a scenario).
[[nodiscard]] Canvas amplification_plot(
    const std::vector<double>& years, const std::vector<NamedSeries>& factors,
    const std::string& title = "Amplification of exceedance frequency");

// Probability (0..1, shown in percent) of at least one exceedance over the design life, as a
// function of height (m above datum), one line per scenario; `target_risk` (0..1) is drawn
// as a horizontal reference line.
[[nodiscard]] Canvas design_life_risk_plot(
    const std::vector<double>& heights_m, const std::vector<NamedSeries>& probability_per_scenario,
    const std::string& datum, const std::string& design_life,
    std::optional<double> target_risk = std::nullopt,
    const std::string& title = "Design-life exceedance risk");

// --- maps ---------------------------------------------------------------------------------

// A north-up raster (row 0 is the northern edge, as GDAL's north-up geotransforms give it):
// values row-major, columns x rows; NaN and `nodata` cells are left blank.
struct RasterView {
  int columns = 0;
  int rows = 0;
  std::vector<float> values{};
  double cell_size_m = 0;  // square cells
  std::optional<float> nodata{};
};

struct ContinuousMapInput {
  std::string title{};
  RasterView raster{};
  std::string
      value_label{};  // with units, e.g. "Flood depth (m)" or "Annual exceedance probability"
  std::optional<double> min{}, max{};    // colour-ramp limits; from the data when not given
  double label_scale = 1.0;              // legend labels show value * label_scale (100 for percent)
  std::string blank_label = "No value";  // legend text of blank (nodata) cells; empty = none
};
// Maps are 720 px wide, and as tall as the raster's shape needs (300 to 560 px).
// Viridis colour ramp with a labelled colour bar, a scale bar and a north arrow.
[[nodiscard]] Canvas continuous_map(const ContinuousMapInput& in);

struct MapCategory {
  int code = 0;  // raster value (rounded)
  std::string label{};
  Colour colour{};
};
// The extent classes: 0 dry, 1 flooded and connected to the sea, 2 low ground cut off
// from the sea (below the level, behind higher ground or defences), 3 sea.
[[nodiscard]] std::vector<MapCategory> extent_categories();

// Annual exceedance probability in the bands planners read it by (common practice: the 10 %,
// 1 % and 0.1 % AEP events): 1 at least 10 %, 2 from 1 % to 10 %, 3 from 0.1 % to 1 %, 4 above 0
// and below 0.1 %, 5 never (0: above the model's upper end point or never reached by the sea).
// A linear colour ramp would show nearly all land as 0 % or 100 %.
[[nodiscard]] std::vector<MapCategory> aep_categories();
[[nodiscard]] RasterView aep_classes(const RasterView& aep);

struct CategoricalMapInput {
  std::string title{};
  RasterView raster{};
  std::vector<MapCategory> categories = extent_categories();
  std::string legend_title = "Extent";
};
// Categories as colours with a legend of swatches, a scale bar and a north arrow; cells whose
// code is not a category are left blank.
[[nodiscard]] Canvas categorical_map(const CategoricalMapInput& in);

// Length of a scale bar (m): the largest 1, 2 or 5 times a power of ten not above
// `max_length_m`.
[[nodiscard]] double scale_bar_length_m(double max_length_m);

}  // namespace tidewright::report
