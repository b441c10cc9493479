// An x-y chart of the project's own: axes (linear, or log for return periods and
// amplification factors) with nice ticks and gridlines, axis labels with units, a title, a
// legend placed in the emptiest corner of the plot area, lines, markers, shaded bands and
// reference lines. render_chart() turns the description into a Canvas, which writes SVG and
// PNG. Sizes default to report size (720 x 450 px), where the text is 12-16 px.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "tidewright/report/canvas.hpp"

namespace tidewright::report {

struct AxisSpec {
  std::string label{};  // with units (and datum for levels), e.g. "Still-water level (m above CD)"
  bool log = false;
  std::optional<double> min{}, max{};  // fixed limits; otherwise from the data, widened to ticks
  bool include_zero = false;           // linear axes: keep 0 in range
  bool tight = false;  // linear axes: the range is the data's, ticks fall inside (year axes)
  int target_ticks = 8;  // about 45 px between ticks on a 450 px chart (common practice)
  double label_scale = 1.0;  // tick labels show value * label_scale (e.g. 100 for percent)
};

enum class SeriesStyle { line, markers, band };

struct Series {
  std::string name{};  // legend entry; empty = not in the legend
  SeriesStyle style = SeriesStyle::line;
  std::vector<double> x{};
  std::vector<double> y{};        // line and markers; for a band its lower edge
  std::vector<double> y_upper{};  // band only: upper edge
  Colour colour{};
  double line_width_px = 2.0;
  std::vector<double> dash_px{};
  MarkerShape marker = MarkerShape::circle;
  double marker_size_px = 7.0;
  double band_alpha = 0.25;  // fill opacity of a band
};

struct ReferenceLine {
  bool horizontal = true;  // y = value; otherwise x = value
  double value = 0;
  std::string label{};  // written along the line, inside the plot area
  Colour colour{0x55, 0x55, 0x55};
  std::vector<double> dash_px{6, 4};
};

struct ChartSpec {
  std::string title{};
  AxisSpec x{};
  AxisSpec y{};
  std::vector<Series> series{};
  std::vector<ReferenceLine> reference_lines{};
  int width_px = 720;
  int height_px = 450;
};

// Throws InputError when a series has mismatched lengths or no series has a finite value
// (a log axis counts only positive values).
[[nodiscard]] Canvas render_chart(const ChartSpec& spec);

}  // namespace tidewright::report
