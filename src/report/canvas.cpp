#include "tidewright/report/canvas.hpp"

#include <cairo.h>
#include <fontconfig/fontconfig.h>

#include <array>
#include <charconv>
#include <cmath>
#include <cstdlib>
#include <memory>
#include <numbers>
#include <stdexcept>

#include "tidewright/common/atomic_output.hpp"
#include "tidewright/common/error.hpp"

namespace tidewright::report {
namespace {

// Coordinates with at most two decimals, no trailing zeros, never "-0": the same numbers give
// the same bytes on every run and locale (std::to_chars ignores the locale).
std::string num(double v) {
  if (!std::isfinite(v)) v = 0;
  const double r = std::round(v * 100.0) / 100.0;
  std::array<char, 48> buf{};
  auto res = std::to_chars(buf.data(), buf.data() + buf.size(), r == 0.0 ? 0.0 : r,
                           std::chars_format::fixed, 2);
  std::string s(buf.data(), res.ptr);
  while (!s.empty() && s.back() == '0') s.pop_back();
  if (!s.empty() && s.back() == '.') s.pop_back();
  return s;
}

std::string opacity_attr(const char* name, double alpha) {
  if (alpha >= 1.0) return "";
  return std::string(" ") + name + "=\"" + num(alpha) + "\"";
}

struct CairoSurfaceDeleter {
  void operator()(cairo_surface_t* s) const { cairo_surface_destroy(s); }
};
struct CairoDeleter {
  void operator()(cairo_t* c) const { cairo_destroy(c); }
};
using SurfacePtr = std::unique_ptr<cairo_surface_t, CairoSurfaceDeleter>;
using ContextPtr = std::unique_ptr<cairo_t, CairoDeleter>;

// Cairo and fontconfig keep font caches for the life of the process. Releasing them at exit
// keeps leak checkers quiet (the asan preset's LeakSanitizer); cairo's documentation allows
// cairo_debug_reset_static_data only when no cairo object remains, hence no cached contexts.
void release_font_caches() {
  cairo_debug_reset_static_data();
  FcFini();
}

void register_font_cache_release() {
  static const bool registered = [] { return std::atexit(release_font_caches) == 0; }();
  (void)registered;
}

// Unhinted outlines with unhinted metrics: widths measured for layout are the widths drawn,
// and the result does not depend on the screen's hinting settings.
void set_font(cairo_t* cr, double size_px, bool bold) {
  register_font_cache_release();
  const std::string family(chart_font_family);
  cairo_select_font_face(cr, family.c_str(), CAIRO_FONT_SLANT_NORMAL,
                         bold ? CAIRO_FONT_WEIGHT_BOLD : CAIRO_FONT_WEIGHT_NORMAL);
  cairo_set_font_size(cr, size_px);
  cairo_font_options_t* opts = cairo_font_options_create();
  cairo_font_options_set_hint_style(opts, CAIRO_HINT_STYLE_NONE);
  cairo_font_options_set_hint_metrics(opts, CAIRO_HINT_METRICS_OFF);
  cairo_font_options_set_antialias(opts, CAIRO_ANTIALIAS_GRAY);
  cairo_set_font_options(cr, opts);
  cairo_font_options_destroy(opts);
}

void set_colour(cairo_t* cr, const Colour& c) {
  cairo_set_source_rgba(cr, c.r / 255.0, c.g / 255.0, c.b / 255.0, c.alpha);
}

cairo_status_t append_to_string(void* closure, const unsigned char* data, unsigned int length) {
  static_cast<std::string*>(closure)->append(reinterpret_cast<const char*>(data), length);
  return CAIRO_STATUS_SUCCESS;
}

std::string surface_png(cairo_surface_t* surface) {
  std::string out;
  if (cairo_surface_write_to_png_stream(surface, append_to_string, &out) != CAIRO_STATUS_SUCCESS) {
    throw ComputationError("PNG output", "cairo could not encode the image",
                           "check that the image is not empty");
  }
  return out;
}

// Cairo's ARGB32 is premultiplied and native-endian 32-bit words.
SurfacePtr rgba_surface(int columns, int rows, const std::vector<std::uint8_t>& rgba) {
  if (columns <= 0 || rows <= 0 ||
      rgba.size() != static_cast<std::size_t>(columns) * static_cast<std::size_t>(rows) * 4) {
    throw std::invalid_argument("RGBA image size does not match its columns and rows");
  }
  SurfacePtr s(cairo_image_surface_create(CAIRO_FORMAT_ARGB32, columns, rows));
  cairo_surface_flush(s.get());
  unsigned char* data = cairo_image_surface_get_data(s.get());
  const int stride = cairo_image_surface_get_stride(s.get());
  for (int r = 0; r < rows; ++r) {
    auto* row = reinterpret_cast<std::uint32_t*>(data + static_cast<std::ptrdiff_t>(r) * stride);
    for (int c = 0; c < columns; ++c) {
      const std::size_t i = (static_cast<std::size_t>(r) * columns + c) * 4;
      const std::uint32_t a = rgba[i + 3];
      auto pre = [&](std::uint8_t v) { return (static_cast<std::uint32_t>(v) * a + 127) / 255; };
      row[c] = (a << 24) | (pre(rgba[i]) << 16) | (pre(rgba[i + 1]) << 8) | pre(rgba[i + 2]);
    }
  }
  cairo_surface_mark_dirty(s.get());
  return s;
}

void trace_marker(cairo_t* cr, const MarkerItem& m) {
  const double h = m.size_px / 2;
  const double x = m.centre.x, y = m.centre.y;
  switch (m.shape) {
    case MarkerShape::circle:
      cairo_new_sub_path(cr);
      cairo_arc(cr, x, y, h, 0, 2 * std::numbers::pi);
      break;
    case MarkerShape::square:
      cairo_rectangle(cr, x - h, y - h, m.size_px, m.size_px);
      break;
    case MarkerShape::triangle:
      cairo_move_to(cr, x, y - h);
      cairo_line_to(cr, x + h, y + h);
      cairo_line_to(cr, x - h, y + h);
      cairo_close_path(cr);
      break;
    case MarkerShape::diamond:
      cairo_move_to(cr, x, y - h);
      cairo_line_to(cr, x + h, y);
      cairo_line_to(cr, x, y + h);
      cairo_line_to(cr, x - h, y);
      cairo_close_path(cr);
      break;
  }
}

std::vector<Point> marker_outline(const MarkerItem& m) {
  const double h = m.size_px / 2;
  const double x = m.centre.x, y = m.centre.y;
  if (m.shape == MarkerShape::triangle) return {{x, y - h}, {x + h, y + h}, {x - h, y + h}};
  return {{x, y - h}, {x + h, y}, {x, y + h}, {x - h, y}};
}

std::string path_data(const std::vector<Point>& pts, bool closed) {
  std::string d;
  for (std::size_t i = 0; i < pts.size(); ++i) {
    d += (i == 0 ? "M" : "L") + num(pts[i].x) + " " + num(pts[i].y);
  }
  if (closed) d += "Z";
  return d;
}

}  // namespace

std::string Colour::hex() const {
  static constexpr char digits[] = "0123456789abcdef";
  std::string s = "#";
  for (std::uint8_t v : {r, g, b}) {
    s += digits[v >> 4];
    s += digits[v & 15];
  }
  return s;
}

Colour Colour::from_hex(std::string_view hex, double alpha) {
  if (hex.size() != 7 || hex[0] != '#') throw std::invalid_argument("colour must be #rrggbb");
  auto byte = [&](std::size_t at) {
    unsigned v = 0;
    std::from_chars(hex.data() + at, hex.data() + at + 2, v, 16);
    return static_cast<std::uint8_t>(v);
  };
  return Colour{byte(1), byte(3), byte(5), alpha};
}

Canvas::Canvas(int width_px, int height_px, std::string title)
    : width_(width_px), height_(height_px), title_(std::move(title)) {
  if (width_px <= 0 || height_px <= 0) throw std::invalid_argument("canvas size must be positive");
}

void Canvas::set_clip(double x, double y, double w, double h) { clip_ = {x, y, w, h}; }
void Canvas::add(PathItem item) { items_.emplace_back(std::move(item)); }
void Canvas::add(MarkerItem item) { items_.emplace_back(std::move(item)); }
void Canvas::add(TextItem item) { items_.emplace_back(std::move(item)); }
void Canvas::add(ImageItem item) { items_.emplace_back(std::move(item)); }

void Canvas::line(std::vector<Point> points, const Colour& stroke, double width_px,
                  std::string role, bool clipped, std::vector<double> dash_px) {
  add(PathItem{std::move(points), false, stroke, width_px, std::move(dash_px), std::nullopt,
               clipped, std::move(role)});
}

void Canvas::polygon(std::vector<Point> points, std::optional<Colour> fill, const Colour& stroke,
                     double stroke_width_px, std::string role, bool clipped) {
  add(PathItem{
      std::move(points), true, stroke, stroke_width_px, {}, fill, clipped, std::move(role)});
}

void Canvas::text(Point at, std::string text, double size_px, TextAnchor anchor,
                  const Colour& colour, std::string role, double rotation_deg, bool bold) {
  add(TextItem{at, std::move(text), size_px, anchor, rotation_deg, bold, colour, std::move(role)});
}

void Canvas::marker(Point centre, double size_px, MarkerShape shape, const Colour& fill,
                    const Colour& stroke, std::string role, bool clipped) {
  add(MarkerItem{centre, size_px, shape, fill, stroke, 1.0, clipped, std::move(role)});
}

double Canvas::text_width_px(std::string_view text, double size_px, bool bold) {
  const SurfacePtr surface(cairo_image_surface_create(CAIRO_FORMAT_ARGB32, 1, 1));
  const ContextPtr cr(cairo_create(surface.get()));
  set_font(cr.get(), size_px, bold);
  const std::string s(text);
  cairo_text_extents_t ext;
  cairo_text_extents(cr.get(), s.c_str(), &ext);
  return ext.x_advance;
}

std::string Canvas::to_svg(std::string_view id_prefix, bool standalone) const {
  const std::string clip_id = std::string(id_prefix) + "-plot-area";
  std::string o;
  if (standalone) o += "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n";
  o += "<svg";
  if (standalone) o += " xmlns=\"http://www.w3.org/2000/svg\"";
  o += " width=\"" + std::to_string(width_) + "\" height=\"" + std::to_string(height_) +
       "\" viewBox=\"0 0 " + std::to_string(width_) + " " + std::to_string(height_) +
       "\" role=\"img\" aria-label=\"" + xml_escape(title_) + "\" font-family=\"" +
       std::string(chart_font_family) + ", Verdana, sans-serif\">\n";
  o += "<title>" + xml_escape(title_) + "</title>\n";
  o += "<rect width=\"100%\" height=\"100%\" fill=\"#ffffff\"/>\n";
  if (clip_) {
    const auto& c = *clip_;
    o += "<defs><clipPath id=\"" + clip_id + "\"><rect x=\"" + num(c[0]) + "\" y=\"" + num(c[1]) +
         "\" width=\"" + num(c[2]) + "\" height=\"" + num(c[3]) + "\"/></clipPath></defs>\n";
  }
  auto clip_attr = [&](bool clipped) {
    return clipped && clip_ ? " clip-path=\"url(#" + clip_id + ")\"" : std::string();
  };
  auto class_attr = [](const std::string& role) {
    return role.empty() ? std::string() : " class=\"" + xml_escape(role) + "\"";
  };
  for (const auto& item : items_) {
    if (const auto* p = std::get_if<PathItem>(&item)) {
      o += "<path" + class_attr(p->role) + " d=\"" + path_data(p->points, p->closed) + "\"";
      if (p->fill) {
        o += " fill=\"" + p->fill->hex() + "\"" + opacity_attr("fill-opacity", p->fill->alpha);
      } else {
        o += " fill=\"none\"";
      }
      if (p->stroke_width_px > 0) {
        o += " stroke=\"" + p->stroke.hex() + "\"" +
             opacity_attr("stroke-opacity", p->stroke.alpha) + " stroke-width=\"" +
             num(p->stroke_width_px) + "\" stroke-linejoin=\"round\"";
        if (!p->dash_px.empty()) {
          o += " stroke-dasharray=\"";
          for (std::size_t i = 0; i < p->dash_px.size(); ++i)
            o += (i ? "," : "") + num(p->dash_px[i]);
          o += "\"";
        }
      }
      o += clip_attr(p->clipped) + "/>\n";
    } else if (const auto* m = std::get_if<MarkerItem>(&item)) {
      const std::string paint = " fill=\"" + m->fill.hex() + "\"" +
                                opacity_attr("fill-opacity", m->fill.alpha) + " stroke=\"" +
                                m->stroke.hex() + "\" stroke-width=\"" + num(m->stroke_width_px) +
                                "\"" + clip_attr(m->clipped);
      const double h = m->size_px / 2;
      if (m->shape == MarkerShape::circle) {
        o += "<circle" + class_attr(m->role) + " cx=\"" + num(m->centre.x) + "\" cy=\"" +
             num(m->centre.y) + "\" r=\"" + num(h) + "\"" + paint + "/>\n";
      } else if (m->shape == MarkerShape::square) {
        o += "<rect" + class_attr(m->role) + " x=\"" + num(m->centre.x - h) + "\" y=\"" +
             num(m->centre.y - h) + "\" width=\"" + num(m->size_px) + "\" height=\"" +
             num(m->size_px) + "\"" + paint + "/>\n";
      } else {
        o += "<path" + class_attr(m->role) + " d=\"" + path_data(marker_outline(*m), true) + "\"" +
             paint + "/>\n";
      }
    } else if (const auto* t = std::get_if<TextItem>(&item)) {
      static constexpr const char* anchors[] = {"start", "middle", "end"};
      o += "<text" + class_attr(t->role) + " x=\"" + num(t->position.x) + "\" y=\"" +
           num(t->position.y) + "\" font-size=\"" + num(t->size_px) + "\"";
      if (t->anchor != TextAnchor::start) {
        o += std::string(" text-anchor=\"") + anchors[static_cast<int>(t->anchor)] + "\"";
      }
      if (t->bold) o += " font-weight=\"bold\"";
      o += " fill=\"" + t->colour.hex() + "\"";
      if (t->rotation_deg != 0) {
        o += " transform=\"rotate(" + num(t->rotation_deg) + " " + num(t->position.x) + " " +
             num(t->position.y) + ")\"";
      }
      o += ">" + xml_escape(t->text) + "</text>\n";
    } else if (const auto* im = std::get_if<ImageItem>(&item)) {
      o += "<image x=\"" + num(im->x) + "\" y=\"" + num(im->y) + "\" width=\"" + num(im->width_px) +
           "\" height=\"" + num(im->height_px) +
           "\" preserveAspectRatio=\"none\" style=\"image-rendering:pixelated\" "
           "href=\"data:image/png;base64," +
           base64(encode_png(im->columns, im->rows, im->rgba)) + "\"/>\n";
    }
  }
  o += "</svg>\n";
  return o;
}

std::string Canvas::to_png(double scale) const {
  if (!(scale > 0)) throw std::invalid_argument("PNG scale must be positive");
  const int w = static_cast<int>(std::lround(width_ * scale));
  const int h = static_cast<int>(std::lround(height_ * scale));
  SurfacePtr surface(cairo_image_surface_create(CAIRO_FORMAT_ARGB32, w, h));
  ContextPtr ctx(cairo_create(surface.get()));
  cairo_t* cr = ctx.get();
  cairo_scale(cr, scale, scale);
  cairo_set_source_rgb(cr, 1, 1, 1);
  cairo_paint(cr);
  cairo_set_line_join(cr, CAIRO_LINE_JOIN_ROUND);
  auto begin_clip = [&](bool clipped) {
    cairo_save(cr);
    if (clipped && clip_) {
      const auto& c = *clip_;
      cairo_rectangle(cr, c[0], c[1], c[2], c[3]);
      cairo_clip(cr);
    }
  };
  for (const auto& item : items_) {
    if (const auto* p = std::get_if<PathItem>(&item)) {
      if (p->points.empty()) continue;
      begin_clip(p->clipped);
      cairo_new_path(cr);
      cairo_move_to(cr, p->points[0].x, p->points[0].y);
      for (std::size_t i = 1; i < p->points.size(); ++i)
        cairo_line_to(cr, p->points[i].x, p->points[i].y);
      if (p->closed) cairo_close_path(cr);
      if (p->fill) {
        set_colour(cr, *p->fill);
        cairo_fill_preserve(cr);
      }
      if (p->stroke_width_px > 0) {
        set_colour(cr, p->stroke);
        cairo_set_line_width(cr, p->stroke_width_px);
        cairo_set_dash(cr, p->dash_px.data(), static_cast<int>(p->dash_px.size()), 0);
        cairo_stroke(cr);
      }
      cairo_new_path(cr);
      cairo_restore(cr);
    } else if (const auto* m = std::get_if<MarkerItem>(&item)) {
      begin_clip(m->clipped);
      cairo_new_path(cr);
      trace_marker(cr, *m);
      set_colour(cr, m->fill);
      cairo_fill_preserve(cr);
      set_colour(cr, m->stroke);
      cairo_set_line_width(cr, m->stroke_width_px);
      cairo_stroke(cr);
      cairo_restore(cr);
    } else if (const auto* t = std::get_if<TextItem>(&item)) {
      cairo_save(cr);
      set_font(cr, t->size_px, t->bold);
      const double tw = text_width_px(t->text, t->size_px, t->bold);
      const double dx = t->anchor == TextAnchor::start    ? 0
                        : t->anchor == TextAnchor::middle ? -tw / 2
                                                          : -tw;
      cairo_translate(cr, t->position.x, t->position.y);
      cairo_rotate(cr, t->rotation_deg * std::numbers::pi / 180.0);
      cairo_move_to(cr, dx, 0);
      set_colour(cr, t->colour);
      cairo_show_text(cr, t->text.c_str());
      cairo_new_path(cr);
      cairo_restore(cr);
    } else if (const auto* im = std::get_if<ImageItem>(&item)) {
      SurfacePtr img = rgba_surface(im->columns, im->rows, im->rgba);
      cairo_save(cr);
      cairo_translate(cr, im->x, im->y);
      cairo_scale(cr, im->width_px / im->columns, im->height_px / im->rows);
      cairo_set_source_surface(cr, img.get(), 0, 0);
      cairo_pattern_set_filter(cairo_get_source(cr), CAIRO_FILTER_NEAREST);
      cairo_rectangle(cr, 0, 0, im->columns, im->rows);
      cairo_fill(cr);
      cairo_restore(cr);
    }
  }
  cairo_surface_flush(surface.get());
  return surface_png(surface.get());
}

void Canvas::write_files(const std::filesystem::path& stem, bool force) const {
  std::filesystem::path svg = stem;
  svg += ".svg";
  std::filesystem::path png = stem;
  png += ".png";
  write_text_file(svg, to_svg(stem.filename().string(), true), force);
  write_text_file(png, to_png(), force);
}

std::string encode_png(int columns, int rows, const std::vector<std::uint8_t>& rgba) {
  SurfacePtr s = rgba_surface(columns, rows, rgba);
  return surface_png(s.get());
}

// Hand-written: eight lines, and none of the project's libraries exposes a public encoder.
std::string base64(std::string_view bytes) {
  static constexpr char alphabet[] =
      "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/";  // RFC 4648, table 1
  std::string out;
  out.reserve((bytes.size() + 2) / 3 * 4);
  for (std::size_t i = 0; i < bytes.size(); i += 3) {
    std::uint32_t v = static_cast<std::uint8_t>(bytes[i]) << 16;
    if (i + 1 < bytes.size())
      v |= static_cast<std::uint32_t>(static_cast<std::uint8_t>(bytes[i + 1])) << 8;
    if (i + 2 < bytes.size()) v |= static_cast<std::uint8_t>(bytes[i + 2]);
    out += alphabet[(v >> 18) & 63];
    out += alphabet[(v >> 12) & 63];
    out += i + 1 < bytes.size() ? alphabet[(v >> 6) & 63] : '=';
    out += i + 2 < bytes.size() ? alphabet[v & 63] : '=';
  }
  return out;
}

std::string xml_escape(std::string_view text) {
  std::string out;
  out.reserve(text.size());
  for (char c : text) {
    switch (c) {
      case '&':
        out += "&amp;";
        break;
      case '<':
        out += "&lt;";
        break;
      case '>':
        out += "&gt;";
        break;
      case '"':
        out += "&quot;";
        break;
      case '\'':
        out += "&#39;";
        break;
      default:
        out += c;
    }
  }
  return out;
}

}  // namespace tidewright::report
