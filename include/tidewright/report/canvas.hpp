// A drawing as a list of primitives in pixel coordinates (origin top left, y down), written
// out by two back ends from the same list: SVG text of the project's own (text stays text,
// so it is searchable and scales in the browser) and a PNG painted by cairo. Charts and maps
// build a Canvas; nothing else draws.
#pragma once

#include <cstdint>
#include <filesystem>
#include <optional>
#include <string>
#include <string_view>
#include <variant>
#include <vector>

namespace tidewright::report {

struct Colour {
  std::uint8_t r = 0, g = 0, b = 0;
  double alpha = 1.0;                     // 0 transparent .. 1 opaque
  [[nodiscard]] std::string hex() const;  // "#rrggbb"
  [[nodiscard]] static Colour from_hex(std::string_view hex, double alpha = 1.0);
  friend bool operator==(const Colour&, const Colour&) = default;
};

struct Point {
  double x = 0, y = 0;
};

enum class MarkerShape { circle, square, triangle, diamond };
enum class TextAnchor { start, middle, end };

// A polyline or polygon; no stroke when stroke_width_px is 0, no fill when fill is empty.
struct PathItem {
  std::vector<Point> points{};
  bool closed = false;
  Colour stroke{};
  double stroke_width_px = 1.0;
  std::vector<double> dash_px{};  // on/off lengths; empty = solid
  std::optional<Colour> fill{};
  bool clipped = false;  // clipped to the canvas's clip rectangle (the plot area)
  std::string role{};    // written as the SVG class, for tests and styling ("grid", "series")
};

struct MarkerItem {
  Point centre{};
  double size_px = 6;  // width of the shape
  MarkerShape shape = MarkerShape::circle;
  Colour fill{};
  Colour stroke{};
  double stroke_width_px = 1.0;
  bool clipped = false;
  std::string role = "marker";
};

// `position` is the baseline point of the text; rotation in degrees, clockwise (SVG sense).
struct TextItem {
  Point position{};
  std::string text{};  // UTF-8, unescaped
  double size_px = 12;
  TextAnchor anchor = TextAnchor::start;
  double rotation_deg = 0;
  bool bold = false;
  Colour colour{};
  std::string role{};
};

// An RGBA raster (row-major, 4 bytes a pixel, not premultiplied) stretched over a rectangle
// with nearest-neighbour sampling.
struct ImageItem {
  double x = 0, y = 0, width_px = 0, height_px = 0;
  int columns = 0, rows = 0;
  std::vector<std::uint8_t> rgba{};
};

// The font every chart uses: DejaVu Sans is in Debian's fonts-dejavu-core (installed with
// cairo's font stack); the SVG names generic sans-serif after it for other machines.
inline constexpr std::string_view chart_font_family = "DejaVu Sans";

class Canvas {
 public:
  Canvas(int width_px, int height_px, std::string title);

  [[nodiscard]] int width_px() const noexcept { return width_; }
  [[nodiscard]] int height_px() const noexcept { return height_; }
  [[nodiscard]] const std::string& title() const noexcept { return title_; }

  void set_clip(double x, double y, double w, double h);
  void add(PathItem item);
  void add(MarkerItem item);
  void add(TextItem item);
  void add(ImageItem item);
  // Shorthands for the common cases of the primitives above.
  void line(std::vector<Point> points, const Colour& stroke, double width_px, std::string role,
            bool clipped = false, std::vector<double> dash_px = {});
  void polygon(std::vector<Point> points, std::optional<Colour> fill, const Colour& stroke,
               double stroke_width_px, std::string role, bool clipped = false);
  void text(Point at, std::string text, double size_px, TextAnchor anchor, const Colour& colour,
            std::string role, double rotation_deg = 0, bool bold = false);
  void marker(Point centre, double size_px, MarkerShape shape, const Colour& fill,
              const Colour& stroke, std::string role, bool clipped = false);

  // Advance width of `text` at `size_px` in the chart font, measured with cairo, so that
  // labels and legends can be laid out before drawing.
  [[nodiscard]] static double text_width_px(std::string_view text, double size_px,
                                            bool bold = false);

  // SVG 1.1 text. `id_prefix` makes element ids unique when several drawings are inlined in
  // one HTML page; `standalone` adds the XML declaration for a file of its own.
  [[nodiscard]] std::string to_svg(std::string_view id_prefix = "tw", bool standalone = true) const;
  // PNG bytes painted by cairo at `scale` times the canvas size.
  [[nodiscard]] std::string to_png(double scale = 1.0) const;

  // Both files through common/atomic_output.hpp: `<stem>.svg` and `<stem>.png`.
  void write_files(const std::filesystem::path& stem, bool force) const;

 private:
  int width_, height_;
  std::string title_{};
  std::optional<std::vector<double>> clip_{};                                     // x, y, w, h
  std::vector<std::variant<PathItem, MarkerItem, TextItem, ImageItem>> items_{};  // drawing order
};

// PNG bytes of an RGBA raster (through cairo), and base64 of any bytes (RFC 4648), for
// images inlined as data: URIs.
[[nodiscard]] std::string encode_png(int columns, int rows, const std::vector<std::uint8_t>& rgba);
[[nodiscard]] std::string base64(std::string_view bytes);
// XML/HTML text escaping of & < > " '.
[[nodiscard]] std::string xml_escape(std::string_view text);

}  // namespace tidewright::report
