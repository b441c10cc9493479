#include "tidewright/report/chart.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

#include "tidewright/common/error.hpp"
#include "tidewright/report/axis_ticks.hpp"
#include "tidewright/report/palette.hpp"

namespace tidewright::report {
namespace {

// Type sizes in px at report size (720 x 450); layout distances below follow from them.
// Common practice for screen charts: 12 px is the smallest comfortable size.
constexpr double title_px = 16;
constexpr double axis_label_px = 13;
constexpr double tick_px = 12;
constexpr double legend_px = 12;
constexpr double tick_length_px = 5;

struct Scale {
  double lo = 0, hi = 1;
  bool log = false;
  double p0 = 0, p1 = 1;  // pixel positions of lo and hi
  [[nodiscard]] double f(double v) const { return log ? std::log10(v) : v; }
  [[nodiscard]] double operator()(double v) const {
    return p0 + (f(v) - f(lo)) / (f(hi) - f(lo)) * (p1 - p0);
  }
  [[nodiscard]] bool valid(double v) const { return std::isfinite(v) && (!log || v > 0); }
};

AxisTicks ticks_for(const AxisSpec& axis, double lo, double hi) {
  if (axis.log) return log_ticks(lo, hi);
  const double s = axis.label_scale;
  AxisTicks t = linear_ticks(lo * s, hi * s, axis.target_ticks);
  t.min /= s;
  t.max /= s;
  for (double& v : t.major) v /= s;
  return t;
}

AxisTicks axis_ticks(const AxisSpec& axis, const std::vector<double>& values,
                     const std::string& what) {
  double lo = std::numeric_limits<double>::infinity(), hi = -lo;
  for (double v : values) {
    if (!std::isfinite(v) || (axis.log && v <= 0)) continue;
    lo = std::min(lo, v);
    hi = std::max(hi, v);
  }
  if (axis.min) lo = *axis.min;
  if (axis.max) hi = *axis.max;
  if (!std::isfinite(lo) || !std::isfinite(hi)) {
    throw InputError("plot '" + what + "'",
                     "no finite value to plot on the " + axis.label + " axis",
                     axis.log ? "a log axis needs positive values" : "check the plotted series");
  }
  if (!axis.log && axis.include_zero) {
    lo = std::min(lo, 0.0);
    hi = std::max(hi, 0.0);
  }
  AxisTicks t = ticks_for(axis, lo, hi);
  // Fixed (or tight) limits are kept exactly; ticks outside them are dropped.
  const bool tight = axis.tight && !axis.log && hi > lo;
  if (axis.min || axis.max || tight) {
    if (axis.min || tight) t.min = lo;
    if (axis.max || tight) t.max = hi;
    AxisTicks kept;
    kept.min = t.min;
    kept.max = t.max;
    const double eps = 1e-9 * std::max(std::abs(t.min), std::abs(t.max));
    for (std::size_t i = 0; i < t.major.size(); ++i) {
      if (t.major[i] >= t.min - eps && t.major[i] <= t.max + eps) {
        kept.major.push_back(t.major[i]);
        kept.labels.push_back(t.labels[i]);
      }
    }
    for (double v : t.minor) {
      if (v > t.min && v < t.max) kept.minor.push_back(v);
    }
    t = kept;
  }
  return t;
}

// Largest size, from `size` down to 10 px, at which `text` fits in `room` px.
double fitted_size(const std::string& text, double size, double room, bool bold = false) {
  while (size > 10 && Canvas::text_width_px(text, size, bold) > room) size -= 0.5;
  return size;
}

std::vector<std::vector<Point>> runs(const Series& s, const std::vector<double>& ys,
                                     const Scale& sx, const Scale& sy) {
  std::vector<std::vector<Point>> out(1);
  for (std::size_t i = 0; i < s.x.size(); ++i) {
    if (sx.valid(s.x[i]) && sy.valid(ys[i])) {
      out.back().push_back({sx(s.x[i]), sy(ys[i])});
    } else if (!out.back().empty()) {
      out.emplace_back();
    }
  }
  if (out.back().empty()) out.pop_back();
  return out;
}

// Points along everything the series draw (vertices, seven points along each segment, both
// edges of bands), for finding where a legend would hide data.
std::vector<Point> drawn_points(const std::vector<Series>& series, const Scale& sx,
                                const Scale& sy) {
  std::vector<Point> samples;
  auto add_run = [&](const std::vector<Point>& run) {
    for (std::size_t i = 0; i < run.size(); ++i) {
      samples.push_back(run[i]);
      if (i + 1 == run.size()) continue;
      for (int k = 1; k < 8; ++k) {
        const double f = k / 8.0;
        samples.push_back(
            {run[i].x + (run[i + 1].x - run[i].x) * f, run[i].y + (run[i + 1].y - run[i].y) * f});
      }
    }
  };
  for (const auto& s : series) {
    for (const auto& run : runs(s, s.y, sx, sy)) add_run(run);
    if (s.style == SeriesStyle::band) {
      for (const auto& run : runs(s, s.y_upper, sx, sy)) add_run(run);
    }
  }
  return samples;
}

// Legend box metrics (px).
constexpr double legend_pad = 8, legend_row = 18, legend_swatch = 26, legend_gap = 6, legend_inset = 8;

struct ChartLayout {
  double left = 0, top = 0, right = 0, bottom = 0;  // the plot area
  Scale sx, sy;
  std::vector<const Series*> entries;  // the named series, in the legend's order
  double box_x = 0, box_y = 0, box_w = 0, box_h = 0;  // the legend box
};

// The plot area from the tick labels' sizes, and the legend: in the corner of the plot area
// that hides no data, else right of it (the plot area then narrows).
ChartLayout layout_chart(const ChartSpec& spec, const AxisTicks& xt, const AxisTicks& yt) {
  const double W = spec.width_px, H = spec.height_px;
  ChartLayout l;
  double ytick_w = 0;
  for (const auto& label : yt.labels) ytick_w = std::max(ytick_w, Canvas::text_width_px(label, tick_px));
  l.left = 12 + axis_label_px + 10 + ytick_w + tick_length_px + 4;
  l.top = spec.title.empty() ? 16 : 44;
  l.right = W - 16;
  if (!xt.labels.empty()) {
    l.right = std::min(l.right, W - 6 - Canvas::text_width_px(xt.labels.back(), tick_px) / 2);
  }
  l.bottom = H - (tick_length_px + 4 + tick_px + 12 + axis_label_px + 8);
  l.sx = Scale{xt.min, xt.max, spec.x.log, l.left, l.right};
  l.sy = Scale{yt.min, yt.max, spec.y.log, l.bottom, l.top};
  for (const auto& s : spec.series) {
    if (!s.name.empty()) l.entries.push_back(&s);
  }
  if (l.entries.empty()) return l;
  double text_w = 0;
  for (const auto* s : l.entries) text_w = std::max(text_w, Canvas::text_width_px(s->name, legend_px));
  l.box_w = legend_pad + legend_swatch + legend_gap + text_w + legend_pad;
  l.box_h = legend_pad + legend_row * static_cast<double>(l.entries.size()) + legend_pad - 4;
  const std::vector<Point> samples = drawn_points(spec.series, l.sx, l.sy);
  const Point corners[] = {{l.left + legend_inset, l.top + legend_inset},
                           {l.right - legend_inset - l.box_w, l.top + legend_inset},
                           {l.right - legend_inset - l.box_w, l.bottom - legend_inset - l.box_h},
                           {l.left + legend_inset, l.bottom - legend_inset - l.box_h}};
  std::size_t best = 0, best_count = std::numeric_limits<std::size_t>::max();
  for (std::size_t c = 0; c < 4; ++c) {
    const auto count = static_cast<std::size_t>(std::count_if(samples.begin(), samples.end(), [&](const Point& p) {
      return p.x >= corners[c].x - 4 && p.x <= corners[c].x + l.box_w + 4 && p.y >= corners[c].y - 4 &&
             p.y <= corners[c].y + l.box_h + 4;
    }));
    if (count < best_count) {
      best = c;
      best_count = count;
    }
  }
  const bool fits_inside = l.box_w <= (l.right - l.left) / 2 - legend_inset && l.box_h <= (l.bottom - l.top) / 2;
  if (best_count == 0 && fits_inside) {
    l.box_x = corners[best].x;
    l.box_y = corners[best].y;
  } else {
    // Every corner would hide data: narrow the plot and put the legend beside it.
    const double half_last_label = xt.labels.empty() ? 0 : Canvas::text_width_px(xt.labels.back(), tick_px) / 2;
    l.right = W - 12 - l.box_w - std::max(12.0, half_last_label + 6);
    l.sx = Scale{xt.min, xt.max, spec.x.log, l.left, l.right};
    l.box_x = l.right + 12;
    l.box_y = l.top;
  }
  return l;
}

void draw_grid(Canvas& canvas, const ChartLayout& l, const AxisTicks& xt, const AxisTicks& yt) {
  auto vline = [&](double x, const Colour& c, const std::string& role) {
    canvas.line({{x, l.top}, {x, l.bottom}}, c, 1.0, role);
  };
  auto hline = [&](double y, const Colour& c, const std::string& role) {
    canvas.line({{l.left, y}, {l.right, y}}, c, 1.0, role);
  };
  for (double v : xt.minor) vline(l.sx(v), minor_grid_grey, "grid-minor");
  for (double v : yt.minor) hline(l.sy(v), minor_grid_grey, "grid-minor");
  for (double v : xt.major) vline(l.sx(v), grid_grey, "grid");
  for (double v : yt.major) hline(l.sy(v), grid_grey, "grid");
}

void draw_band(Canvas& canvas, const Series& s, const Scale& sx, const Scale& sy) {
  Colour fill = s.colour;
  fill.alpha = s.band_alpha;
  std::vector<Point> poly_hi, poly_lo;
  auto flush = [&] {
    if (poly_hi.size() >= 2) {
      std::vector<Point> pts = poly_hi;
      pts.insert(pts.end(), poly_lo.rbegin(), poly_lo.rend());
      canvas.polygon(pts, fill, s.colour, 0.0, "band", true);
    }
    poly_hi.clear();
    poly_lo.clear();
  };
  for (std::size_t i = 0; i < s.x.size(); ++i) {
    if (sx.valid(s.x[i]) && sy.valid(s.y[i]) && sy.valid(s.y_upper[i])) {
      poly_hi.push_back({sx(s.x[i]), sy(s.y_upper[i])});
      poly_lo.push_back({sx(s.x[i]), sy(s.y[i])});
    } else {
      flush();
    }
  }
  flush();
}

// Bands, then lines, then markers, then reference lines with their labels.
void draw_series(Canvas& canvas, const ChartSpec& spec, const ChartLayout& l) {
  for (const auto& s : spec.series) {
    if (s.style == SeriesStyle::band) draw_band(canvas, s, l.sx, l.sy);
  }
  for (const auto& s : spec.series) {
    if (s.style != SeriesStyle::line) continue;
    for (auto& run : runs(s, s.y, l.sx, l.sy)) {
      canvas.line(std::move(run), s.colour, s.line_width_px, "series", true, s.dash_px);
    }
  }
  for (const auto& s : spec.series) {
    if (s.style != SeriesStyle::markers) continue;
    Colour fill = s.colour;
    fill.alpha = 0.55;
    for (std::size_t i = 0; i < s.x.size(); ++i) {
      if (!l.sx.valid(s.x[i]) || !l.sy.valid(s.y[i])) continue;
      canvas.marker({l.sx(s.x[i]), l.sy(s.y[i])}, s.marker_size_px, s.marker, fill, s.colour, "marker", true);
    }
  }
  for (const auto& r : spec.reference_lines) {
    const Scale& sc = r.horizontal ? l.sy : l.sx;
    if (!sc.valid(r.value)) continue;
    const double p = sc(r.value);
    std::vector<Point> pts = r.horizontal ? std::vector<Point>{{l.left, p}, {l.right, p}}
                                          : std::vector<Point>{{p, l.top}, {p, l.bottom}};
    canvas.line(pts, r.colour, 1.5, "reference", true, r.dash_px);
    if (r.label.empty()) continue;
    if (r.horizontal) {
      canvas.text({l.right - 6, p - 5}, r.label, 11, TextAnchor::end, r.colour, "reference-label");
    } else {
      canvas.text({p - 5, l.top + 6}, r.label, 11, TextAnchor::end, r.colour, "reference-label", -90);
    }
  }
}

// Axis lines, ticks and their labels (an x label that would overlap its left neighbour is left
// out), the axis labels and the title.
void draw_axes(Canvas& canvas, const ChartSpec& spec, const ChartLayout& l, const AxisTicks& xt, const AxisTicks& yt) {
  const double pw = l.right - l.left, ph = l.bottom - l.top;
  canvas.line({{l.left, l.top}, {l.left, l.bottom}, {l.right, l.bottom}}, axis_grey, 1.2, "axis");
  double last_label_right = -1e9;
  for (std::size_t i = 0; i < xt.major.size(); ++i) {
    const double x = l.sx(xt.major[i]);
    canvas.line({{x, l.bottom}, {x, l.bottom + tick_length_px}}, axis_grey, 1.0, "tick");
    const double w = Canvas::text_width_px(xt.labels[i], tick_px);
    if (x - w / 2 < last_label_right + 8) continue;
    canvas.text({x, l.bottom + tick_length_px + 4 + tick_px}, xt.labels[i], tick_px, TextAnchor::middle, ink,
                "tick-label");
    last_label_right = x + w / 2;
  }
  for (std::size_t i = 0; i < yt.major.size(); ++i) {
    const double y = l.sy(yt.major[i]);
    canvas.line({{l.left - tick_length_px, y}, {l.left, y}}, axis_grey, 1.0, "tick");
    canvas.text({l.left - tick_length_px - 4, y + tick_px * 0.35}, yt.labels[i], tick_px, TextAnchor::end, ink,
                "tick-label");
  }
  if (!spec.x.label.empty()) {
    const double size = fitted_size(spec.x.label, axis_label_px, pw);
    canvas.text({l.left + pw / 2, static_cast<double>(spec.height_px) - 10}, spec.x.label, size, TextAnchor::middle, ink, "axis-label");
  }
  if (!spec.y.label.empty()) {
    const double size = fitted_size(spec.y.label, axis_label_px, ph + l.top - 8);
    canvas.text({12 + axis_label_px, l.top + ph / 2}, spec.y.label, size, TextAnchor::middle, ink, "axis-label", -90);
  }
  if (!spec.title.empty()) {
    const double size = fitted_size(spec.title, title_px, static_cast<double>(spec.width_px) - 24, true);
    canvas.text({l.left, 26}, spec.title, size, TextAnchor::start, ink, "title", 0, true);
  }
}

void draw_legend(Canvas& canvas, const ChartLayout& l) {
  if (l.entries.empty()) return;
  const double bx = l.box_x, by = l.box_y;
  canvas.polygon({{bx, by}, {bx + l.box_w, by}, {bx + l.box_w, by + l.box_h}, {bx, by + l.box_h}},
                 Colour{0xff, 0xff, 0xff, 0.9}, Colour{0xbb, 0xbb, 0xbb}, 1.0, "legend");
  for (std::size_t i = 0; i < l.entries.size(); ++i) {
    const Series& s = *l.entries[i];
    const double cy = by + legend_pad + legend_row * static_cast<double>(i) + legend_row / 2 - 2;
    const double sx0 = bx + legend_pad;
    switch (s.style) {
      case SeriesStyle::line:
        canvas.line({{sx0, cy}, {sx0 + legend_swatch, cy}}, s.colour, s.line_width_px, "legend-swatch", false,
                    s.dash_px);
        break;
      case SeriesStyle::markers: {
        Colour fill = s.colour;
        fill.alpha = 0.55;
        canvas.marker({sx0 + legend_swatch / 2, cy}, s.marker_size_px, s.marker, fill, s.colour, "legend-marker");
        break;
      }
      case SeriesStyle::band: {
        Colour fill = s.colour;
        fill.alpha = s.band_alpha;
        canvas.polygon({{sx0, cy - 6}, {sx0 + legend_swatch, cy - 6}, {sx0 + legend_swatch, cy + 6}, {sx0, cy + 6}},
                       fill, s.colour, 0.0, "legend-swatch");
        break;
      }
    }
    canvas.text({sx0 + legend_swatch + legend_gap, cy + legend_px * 0.35}, s.name, legend_px, TextAnchor::start, ink,
                "legend-label");
  }
}

}  // namespace

Canvas render_chart(const ChartSpec& spec) {
  const std::string& what = spec.title;
  std::vector<double> xs, ys;
  for (const auto& s : spec.series) {
    const bool band = s.style == SeriesStyle::band;
    if (s.x.size() != s.y.size() || (band && s.y_upper.size() != s.x.size())) {
      throw InputError("plot '" + what + "'",
                       "series '" + s.name + "' has x and y of different lengths",
                       "give one y value (and one upper value for a band) per x value");
    }
    xs.insert(xs.end(), s.x.begin(), s.x.end());
    ys.insert(ys.end(), s.y.begin(), s.y.end());
    ys.insert(ys.end(), s.y_upper.begin(), s.y_upper.end());
  }
  for (const auto& r : spec.reference_lines) (r.horizontal ? ys : xs).push_back(r.value);
  const AxisTicks xt = axis_ticks(spec.x, xs, what);
  const AxisTicks yt = axis_ticks(spec.y, ys, what);
  Canvas canvas(spec.width_px, spec.height_px, spec.title);
  const ChartLayout layout = layout_chart(spec, xt, yt);
  canvas.set_clip(layout.left, layout.top, layout.right - layout.left, layout.bottom - layout.top);
  draw_grid(canvas, layout, xt, yt);
  draw_series(canvas, spec, layout);
  draw_axes(canvas, spec, layout, xt, yt);
  draw_legend(canvas, layout);
  return canvas;
}

}  // namespace tidewright::report
