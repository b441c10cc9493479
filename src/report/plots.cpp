// Glossary: T = return period (years), p = annual exceedance probability of a plotting
// position, n = number of annual maxima, i = rank from the largest (Gringorten 1963);
// cell_size_m = raster cell edge (m), px_per_cell = display scale of a map.
#include "tidewright/report/plots.hpp"

#include <algorithm>
#include <cmath>
#include <functional>
#include <limits>

#include "tidewright/common/error.hpp"
#include "tidewright/report/axis_ticks.hpp"
#include "tidewright/report/palette.hpp"
#include "tidewright/report/text_table.hpp"
#include "tidewright/terrain/map_style.hpp"

namespace tidewright::report {
namespace {

std::string level_label(const std::string& what, const std::string& datum) {
  return what + (datum.empty() ? " (m)" : " (m above " + datum + ")");
}

AxisSpec year_axis() {
  AxisSpec a;
  a.label = "Year";
  a.tight = true;
  a.target_ticks = 8;
  return a;
}

void check_lengths(const std::string& plot, std::size_t n, const std::vector<NamedSeries>& s) {
  for (const auto& one : s) {
    if (one.values.size() != n) {
      throw InputError("plot '" + plot + "'",
                       "series '" + one.name + "' has " + std::to_string(one.values.size()) +
                           " values for " + std::to_string(n) + " x values",
                       "give one value per year or height");
    }
  }
}

Canvas lines_by_x(const std::string& title, AxisSpec x, AxisSpec y, const std::vector<double>& xs,
                  const std::vector<NamedSeries>& per, std::vector<ReferenceLine> refs = {}) {
  check_lengths(title, xs.size(), per);
  ChartSpec spec;
  spec.title = title;
  spec.x = std::move(x);
  spec.y = std::move(y);
  for (std::size_t i = 0; i < per.size(); ++i) {
    Series s;
    s.name = per[i].name;
    s.x = xs;
    s.y = per[i].values;
    s.colour = series_colour(i);
    s.dash_px = series_dash(i);
    s.line_width_px = 2.2;
    spec.series.push_back(std::move(s));
  }
  spec.reference_lines = std::move(refs);
  return render_chart(spec);
}

// Greedy word wrap to `room` px at `size` px.
std::vector<std::string> wrap(const std::string& text, double size, double room, bool bold) {
  std::vector<std::string> lines;
  std::string line;
  std::size_t pos = 0;
  while (pos <= text.size()) {
    std::size_t end = text.find(' ', pos);
    if (end == std::string::npos) end = text.size();
    const std::string word = text.substr(pos, end - pos);
    std::string trial = line;
    if (!trial.empty()) trial += ' ';
    trial += word;
    if (!line.empty() && Canvas::text_width_px(trial, size, bold) > room) {
      lines.push_back(line);
      line = word;
    } else {
      line = trial;
    }
    pos = end + 1;
  }
  if (!line.empty()) lines.push_back(line);
  return lines;
}

bool is_nodata(const RasterView& r, float v) {
  return std::isnan(v) || (r.nodata && v == *r.nodata);
}

void check_raster(const std::string& title, const RasterView& r) {
  const std::string where = "map '" + title + "'";
  if (r.columns <= 0 || r.rows <= 0 ||
      r.values.size() != static_cast<std::size_t>(r.columns) * static_cast<std::size_t>(r.rows)) {
    throw InputError(where,
                     "raster has " + std::to_string(r.values.size()) + " values for " +
                         std::to_string(r.columns) + " x " + std::to_string(r.rows) + " cells",
                     "pass the values row-major, columns times rows");
  }
  if (!(r.cell_size_m > 0) || !std::isfinite(r.cell_size_m)) {
    throw InputError(where, "cell size must be a positive number of metres",
                     "give the raster's cell size in metres (project geographic rasters first)");
  }
}

struct MapFrame {
  double x, y, w, h;  // map rectangle on the canvas
  double px_per_cell;
  int canvas_height_px;
};

// Maps are 720 px wide; the raster fills the room left of a legend column of `legend_w` px,
// and the canvas height follows the raster's shape (at least 300 px and enough for a legend of
// `legend_h` px, at most 560 px).
constexpr int map_canvas_width_px = 720;
MapFrame fit_map(const RasterView& r, double legend_w, double legend_h) {
  const double left = 14, top = 44, bottom_margin = 14;
  const double room_w = map_canvas_width_px - left - legend_w - 36;
  const double room_h = 560 - top - bottom_margin;
  const double s = std::min(room_w / r.columns, room_h / r.rows);
  const double h = s * r.rows;
  const double canvas_h =
      std::max({top + h + bottom_margin, top + legend_h + bottom_margin, 300.0});
  return {left, top, s * r.columns, h, s, static_cast<int>(std::ceil(canvas_h))};
}

// Nearest-neighbour resampling to at most twice the display size (keeps the inlined PNG small
// for rasters of millions of cells), then colours per cell; `colour_of` returns nullopt for
// blank cells.
ImageItem map_image(const RasterView& r, const MapFrame& f,
                    const std::function<std::optional<Colour>(float)>& colour_of) {
  const int out_c = std::max(1, std::min(r.columns, static_cast<int>(std::ceil(2 * f.w))));
  const int out_r = std::max(1, std::min(r.rows, static_cast<int>(std::ceil(2 * f.h))));
  ImageItem im{f.x, f.y, f.w, f.h, out_c, out_r, {}};
  im.rgba.resize(static_cast<std::size_t>(out_c) * static_cast<std::size_t>(out_r) * 4, 0);
  for (int i = 0; i < out_r; ++i) {
    const auto src_r = static_cast<std::size_t>((i + 0.5) * r.rows / out_r);
    for (int j = 0; j < out_c; ++j) {
      const auto src_c = static_cast<std::size_t>((j + 0.5) * r.columns / out_c);
      const float v = r.values[src_r * static_cast<std::size_t>(r.columns) + src_c];
      const std::optional<Colour> c = colour_of(v);
      if (!c) continue;
      const std::size_t k = (static_cast<std::size_t>(i) * out_c + j) * 4;
      im.rgba[k] = c->r;
      im.rgba[k + 1] = c->g;
      im.rgba[k + 2] = c->b;
      im.rgba[k + 3] = static_cast<std::uint8_t>(std::lround(c->alpha * 255));
    }
  }
  return im;
}

std::vector<Point> rect(double x, double y, double w, double h) {
  return {{x, y}, {x + w, y}, {x + w, y + h}, {x, y + h}};
}

const Colour white{0xff, 0xff, 0xff};

void add_title(Canvas& c, const std::string& title) {
  if (title.empty()) return;
  double size = 16;
  while (size > 11 && Canvas::text_width_px(title, size, true) > c.width_px() - 28) size -= 0.5;
  c.text({14, 26}, title, size, TextAnchor::start, ink, "title", 0, true);
}

std::string length_text(double m) {
  if (m >= 1000) return tick_label(m / 1000, m >= 10000 || std::fmod(m, 1000) == 0 ? 0 : 1) + " km";
  return tick_label(m, m >= 1 ? 0 : 2) + " m";
}

// Frame, scale bar (bottom left) and north arrow (top right) over the map image.
void add_map_furniture(Canvas& c, const RasterView& r, const MapFrame& f) {
  c.polygon(rect(f.x, f.y, f.w, f.h), std::nullopt, axis_grey, 1.0, "map-frame");
  const double map_width_m = r.columns * r.cell_size_m;
  const double bar_m = scale_bar_length_m(map_width_m / 4);
  const double bar_px = bar_m / r.cell_size_m * f.px_per_cell;
  const std::string label = length_text(bar_m);
  const double label_w = Canvas::text_width_px(label, 11);
  const double bx = f.x + 14, by = f.y + f.h - 14;
  c.polygon(rect(bx - 10, by - 20, bar_px + label_w / 2 + 20, 32), Colour{0xff, 0xff, 0xff, 0.85},
            Colour{0xbb, 0xbb, 0xbb}, 0.8, "scale-bar");
  c.polygon(rect(bx, by, bar_px / 2, 6), ink, ink, 1.0, "scale-bar");
  c.polygon(rect(bx + bar_px / 2, by, bar_px / 2, 6), white, ink, 1.0, "scale-bar");
  c.text({bx, by - 5}, "0", 11, TextAnchor::middle, ink, "scale-label");
  c.text({bx + bar_px, by - 5}, label, 11, TextAnchor::middle, ink, "scale-label");
  // North arrow: rows run north to south, so north is up the page.
  const double nx = f.x + f.w - 22, ny = f.y + 10;
  c.polygon(rect(nx - 12, ny - 2, 24, 42), Colour{0xff, 0xff, 0xff, 0.85}, Colour{0xbb, 0xbb, 0xbb},
            0.8, "north-arrow");
  c.polygon({{nx, ny + 2}, {nx + 7, ny + 22}, {nx, ny + 17}, {nx - 7, ny + 22}}, ink, ink, 1.0,
            "north-arrow");
  c.text({nx, ny + 36}, "N", 12, TextAnchor::middle, ink, "north-label", 0, true);
}

}  // namespace

std::vector<double> gringorten_return_periods_yr(std::size_t n) {
  std::vector<double> t(n);
  for (std::size_t i = 0; i < n; ++i) {
    // Gringorten (1963): p_i = (i - 0.44) / (n + 0.12), i = 1 for the largest.
    const double p = (static_cast<double>(i + 1) - 0.44) / (static_cast<double>(n) + 0.12);
    t[i] = -1.0 / std::log1p(-p);  // N_0 = -ln(1 - p) = 1/T
  }
  return t;
}

Canvas return_level_plot(const ReturnLevelPlotInput& in) {
  const std::string where = "plot '" + in.title + "'";
  const std::size_t n = in.return_period_yr.size();
  if (in.level_m.size() != n || (!in.lower_m.empty() && in.lower_m.size() != n) ||
      (!in.upper_m.empty() && in.upper_m.size() != n) || in.lower_m.empty() != in.upper_m.empty()) {
    throw InputError(where,
                     "the curve's return periods, levels and interval bounds differ in length",
                     "give one level (and one lower and upper bound) per return period");
  }
  std::vector<double> maxima;
  for (double v : in.annual_maxima_m) {
    if (std::isfinite(v)) maxima.push_back(v);
  }
  std::sort(maxima.begin(), maxima.end(), std::greater<>());
  ChartSpec spec;
  spec.title = in.title;
  spec.x.label = "Return period (years)";
  spec.x.log = true;
  spec.y.label = level_label("Still-water level", in.datum);
  if (!in.lower_m.empty()) {
    spec.series.push_back(Series{"95% interval",
                                 SeriesStyle::band,
                                 in.return_period_yr,
                                 in.lower_m,
                                 in.upper_m,
                                 series_colour(0),
                                 0,
                                 {},
                                 MarkerShape::circle,
                                 0,
                                 0.22});
  }
  if (n > 0) {
    spec.series.push_back(Series{in.model_name,
                                 SeriesStyle::line,
                                 in.return_period_yr,
                                 in.level_m,
                                 {},
                                 series_colour(0),
                                 2.4,
                                 {},
                                 MarkerShape::circle,
                                 0,
                                 0});
  }
  if (!maxima.empty()) {
    spec.series.push_back(Series{"Annual maxima (Gringorten positions)",
                                 SeriesStyle::markers,
                                 gringorten_return_periods_yr(maxima.size()),
                                 maxima,
                                 {},
                                 series_colour(1),
                                 0,
                                 {},
                                 MarkerShape::circle,
                                 7,
                                 0});
  }
  return render_chart(spec);
}

Canvas projection_fan_chart(const FanChartInput& in) {
  const std::size_t n = in.years.size();
  for (const auto* q : {&in.q05_m, &in.q17_m, &in.q50_m, &in.q83_m, &in.q95_m}) {
    if (q->size() != n) {
      throw InputError("plot '" + in.title + "'",
                       "a quantile series differs in length from the years",
                       "give the 5, 17, 50, 83 and 95% quantiles for every year");
    }
  }
  check_lengths(in.title, n, in.component_medians_m);
  ChartSpec spec;
  spec.title = in.title;
  spec.x = year_axis();
  spec.y.label =
      "Relative sea-level rise" + (in.baseline.empty() ? "" : " " + in.baseline) + " (m)";
  spec.y.include_zero = true;
  const Colour c = series_colour(0);
  spec.series.push_back(Series{"5\u201395% range",
                               SeriesStyle::band,
                               in.years,
                               in.q05_m,
                               in.q95_m,
                               c,
                               0,
                               {},
                               MarkerShape::circle,
                               0,
                               0.16});
  spec.series.push_back(Series{"17\u201383% range",
                               SeriesStyle::band,
                               in.years,
                               in.q17_m,
                               in.q83_m,
                               c,
                               0,
                               {},
                               MarkerShape::circle,
                               0,
                               0.32});
  spec.series.push_back(Series{"Total (median)",
                               SeriesStyle::line,
                               in.years,
                               in.q50_m,
                               {},
                               c,
                               2.6,
                               {},
                               MarkerShape::circle,
                               0,
                               0});
  for (std::size_t i = 0; i < in.component_medians_m.size(); ++i) {
    const auto& comp = in.component_medians_m[i];
    spec.series.push_back(Series{comp.name + " (median)",
                                 SeriesStyle::line,
                                 in.years,
                                 comp.values,
                                 {},
                                 series_colour(i + 1),
                                 1.6,
                                 series_dash(i + 1),
                                 MarkerShape::circle,
                                 0,
                                 0});
  }
  return render_chart(spec);
}

Canvas allowance_plot(const std::vector<double>& years,
                      const std::vector<NamedSeries>& per_scenario_m, const std::string& title) {
  AxisSpec y;
  y.label = "Allowance (m)";
  y.include_zero = true;
  return lines_by_x(title, year_axis(), y, years, per_scenario_m);
}

Canvas design_height_plot(const std::vector<double>& years,
                          const std::vector<NamedSeries>& per_scenario_m, const std::string& datum,
                          std::optional<double> present_level_m, const std::string& present_label,
                          const std::string& title) {
  AxisSpec y;
  y.label = level_label("Design height", datum);
  std::vector<ReferenceLine> refs;
  if (present_level_m) refs.push_back(ReferenceLine{true, *present_level_m, present_label});
  return lines_by_x(title, year_axis(), y, years, per_scenario_m, refs);
}

Canvas amplification_plot(const std::vector<double>& years, const std::vector<NamedSeries>& factors,
                          const std::string& title) {
  AxisSpec y;
  y.label = "Amplification factor (times present frequency)";
  y.log = true;
  return lines_by_x(title, year_axis(), y, years, factors);
}

Canvas design_life_risk_plot(const std::vector<double>& heights_m,
                             const std::vector<NamedSeries>& probability_per_scenario,
                             const std::string& datum, const std::string& design_life,
                             std::optional<double> target_risk, const std::string& title) {
  AxisSpec x;
  x.label = level_label("Height", datum);
  x.tight = true;
  x.target_ticks = 9;
  AxisSpec y;
  y.label = "Chance of one or more exceedances" + (design_life.empty() ? "" : ", " + design_life) +
            " (%)";
  y.min = 0;
  y.max = 1;
  y.label_scale = 100;
  std::vector<ReferenceLine> refs;
  if (target_risk) {
    refs.push_back(
        ReferenceLine{true, *target_risk, "target " + fixed(*target_risk * 100, 0) + "%"});
  }
  return lines_by_x(title, x, y, heights_m, probability_per_scenario, refs);
}

double scale_bar_length_m(double max_length_m) {
  if (!(max_length_m > 0) || !std::isfinite(max_length_m)) {
    throw std::invalid_argument("scale bar needs a positive length");
  }
  const double p = std::pow(10.0, std::floor(std::log10(max_length_m)));
  for (double m : {5.0, 2.0, 1.0}) {
    if (m * p <= max_length_m * (1 + 1e-12)) return m * p;
  }
  return p;
}

Canvas continuous_map(const ContinuousMapInput& in) {
  check_raster(in.title, in.raster);
  const RasterView& r = in.raster;
  double lo = std::numeric_limits<double>::infinity(), hi = -lo;
  for (float v : r.values) {
    if (is_nodata(r, v)) continue;
    lo = std::min(lo, static_cast<double>(v));
    hi = std::max(hi, static_cast<double>(v));
  }
  if (in.min) lo = *in.min;
  if (in.max) hi = *in.max;
  if (!std::isfinite(lo) || !std::isfinite(hi)) {
    throw InputError("map '" + in.title + "'", "every cell is nodata",
                     "check the raster and its nodata value");
  }
  if (hi <= lo) hi = lo + 1;
  constexpr double legend_w = 150;
  const auto title_lines = wrap(in.value_label, 12, legend_w, true);
  const double title_h = 16.0 * static_cast<double>(title_lines.size());
  const MapFrame f = fit_map(r, legend_w, title_h + 120 + 50);
  Canvas c(map_canvas_width_px, f.canvas_height_px, in.title);
  c.add(map_image(r, f, [&](float v) -> std::optional<Colour> {
    if (is_nodata(r, v)) return std::nullopt;
    return viridis((v - lo) / (hi - lo));
  }));
  add_map_furniture(c, r, f);
  add_title(c, in.title);
  // Colour bar with the value label above it and the blank swatch below.
  const double lx = f.x + f.w + 24;
  double ly = f.y + 14;
  for (const auto& line : title_lines) {
    c.text({lx, ly}, line, 12, TextAnchor::start, ink, "legend-title", 0, true);
    ly += 16;
  }
  const double bar_top = ly + 4, bar_w = 18;
  const double bar_h = std::clamp(f.h - title_h - 60, 120.0, 240.0);
  ImageItem ramp{lx, bar_top, bar_w, bar_h, 1, 256, {}};
  for (int i = 0; i < 256; ++i) {
    const Colour col = viridis(1.0 - i / 255.0);
    ramp.rgba.insert(ramp.rgba.end(), {col.r, col.g, col.b, 255});
  }
  c.add(std::move(ramp));
  c.polygon(rect(lx, bar_top, bar_w, bar_h), std::nullopt, axis_grey, 0.8, "legend");
  if (!in.blank_label.empty()) {
    const double sy = bar_top + bar_h + 16;
    c.polygon(rect(lx, sy, bar_w, 12), white, axis_grey, 0.8, "legend-swatch");
    c.text({lx + bar_w + 7, sy + 10}, in.blank_label, 11, TextAnchor::start, ink, "legend-label");
  }
  const AxisTicks t = linear_ticks(lo * in.label_scale, hi * in.label_scale, 5);
  for (std::size_t i = 0; i < t.major.size(); ++i) {
    const double v = t.major[i] / in.label_scale;
    if (v < lo - 1e-9 * std::abs(hi - lo) || v > hi + 1e-9 * std::abs(hi - lo)) continue;
    const double y = bar_top + bar_h * (1 - (v - lo) / (hi - lo));
    c.line({{lx + bar_w, y}, {lx + bar_w + 4, y}}, axis_grey, 1.0, "tick");
    c.text({lx + bar_w + 7, y + 4}, t.labels[i], 11, TextAnchor::start, ink, "legend-label");
  }
  return c;
}

std::vector<MapCategory> extent_categories() {
  // One definition with the map rasters' colour tables and SLD styles (terrain/map_style.hpp).
  std::vector<MapCategory> out;
  for (const auto& c : terrain::extent_classes) {
    out.push_back({c.code, std::string(c.label), Colour::from_hex(c.colour_hex)});
  }
  return out;
}

std::vector<MapCategory> aep_categories() {
  std::vector<MapCategory> out;
  for (const auto& b : terrain::aep_bands) {
    out.push_back({b.code, std::string(b.label), Colour::from_hex(b.colour_hex)});
  }
  return out;
}

RasterView aep_classes(const RasterView& aep) {
  RasterView out = aep;
  out.nodata = -1.0F;
  for (float& v : out.values) {
    const bool blank = std::isnan(v) || (aep.nodata && v == *aep.nodata);
    if (blank) {
      v = -1.0F;
      continue;
    }
    const double p = static_cast<double>(v);
    const auto band = std::find_if(terrain::aep_bands.begin(), terrain::aep_bands.end(),
                                   [p](const terrain::AepBand& b) { return p >= b.lower_aep; });
    v = static_cast<float>(band->code);
  }
  return out;
}

Canvas categorical_map(const CategoricalMapInput& in) {
  check_raster(in.title, in.raster);
  if (in.categories.empty()) {
    throw InputError("map '" + in.title + "'", "no categories given",
                     "pass the map's classes with labels");
  }
  const RasterView& r = in.raster;
  double legend_w = Canvas::text_width_px(in.legend_title, 12, true);
  for (const auto& cat : in.categories) {
    legend_w = std::max(legend_w, 22 + Canvas::text_width_px(cat.label, 12));
  }
  legend_w = std::min(legend_w, 220.0);
  double legend_h = 26;
  for (const auto& cat : in.categories) {
    legend_h += std::max(
        22.0, 15.0 * static_cast<double>(wrap(cat.label, 12, legend_w - 22, false).size()) + 7);
  }
  const MapFrame f = fit_map(r, legend_w, legend_h);
  Canvas c(map_canvas_width_px, f.canvas_height_px, in.title);
  c.add(map_image(r, f, [&](float v) -> std::optional<Colour> {
    if (is_nodata(r, v)) return std::nullopt;
    const long code = std::lround(v);
    for (const auto& cat : in.categories) {
      if (cat.code == code) return cat.colour;
    }
    return std::nullopt;
  }));
  add_map_furniture(c, r, f);
  add_title(c, in.title);
  const double lx = f.x + f.w + 24;
  double ly = f.y + 14;
  c.text({lx, ly}, in.legend_title, 12, TextAnchor::start, ink, "legend-title", 0, true);
  ly += 12;
  for (const auto& cat : in.categories) {
    const auto lines = wrap(cat.label, 12, legend_w - 22, false);
    c.polygon(rect(lx, ly, 14, 14), cat.colour, axis_grey, 0.8, "legend-swatch");
    double ty = ly + 11;
    for (const auto& line : lines) {
      c.text({lx + 22, ty}, line, 12, TextAnchor::start, ink, "legend-label");
      ty += 15;
    }
    ly += std::max(22.0, 15.0 * static_cast<double>(lines.size()) + 7);
  }
  return c;
}

}  // namespace tidewright::report
