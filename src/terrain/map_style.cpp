// OGC SLD 1.0 raster styles of the map products (include/tidewright/terrain/map_style.hpp).
#include "tidewright/terrain/map_style.hpp"

#include <cstdio>
#include <string>
#include <vector>

namespace tidewright::terrain {
namespace {

std::string xml_escape(std::string_view text) {
  std::string out;
  for (char c : text) {
    switch (c) {
      case '&': out += "&amp;"; break;
      case '<': out += "&lt;"; break;
      case '>': out += "&gt;"; break;
      case '"': out += "&quot;"; break;
      case '\'': out += "&apos;"; break;
      default: out += c;
    }
  }
  return out;
}

std::string number(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.9g", v);
  return buf;
}

struct Entry {
  std::string colour;
  double quantity;
  std::string label;
};

// `map_type`: "values" (one class per value), "intervals" (each entry colours the values below
// its quantity, from the previous one) or "ramp"; the attribute is the common extension of SLD
// 1.0 that desktop GIS and map servers read.
std::string sld(std::string_view layer_name, std::string_view title, std::string_view map_type,
                const std::vector<Entry>& entries) {
  std::string o = "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
                  "<StyledLayerDescriptor version=\"1.0.0\" xmlns=\"http://www.opengis.net/sld\"\n"
                  "    xmlns:ogc=\"http://www.opengis.net/ogc\">\n"
                  "  <NamedLayer>\n"
                  "    <Name>" + xml_escape(layer_name) + "</Name>\n"
                  "    <UserStyle>\n"
                  "      <Title>" + xml_escape(title) + "</Title>\n"
                  "      <FeatureTypeStyle>\n"
                  "        <Rule>\n"
                  "          <RasterSymbolizer>\n"
                  "            <Opacity>1.0</Opacity>\n"
                  "            <ColorMap type=\"" + std::string(map_type) + "\">\n";
  for (const auto& e : entries) {
    o += "              <ColorMapEntry color=\"" + e.colour + "\" quantity=\"" + number(e.quantity) + "\" label=\"" +
         xml_escape(e.label) + "\"/>\n";
  }
  o += "            </ColorMap>\n"
       "          </RasterSymbolizer>\n"
       "        </Rule>\n"
       "      </FeatureTypeStyle>\n"
       "    </UserStyle>\n"
       "  </NamedLayer>\n"
       "</StyledLayerDescriptor>\n";
  return o;
}

}  // namespace

std::string extent_sld(std::string_view layer_name) {
  std::vector<Entry> e;
  for (const auto& c : extent_classes) e.push_back({std::string(c.colour_hex), static_cast<double>(c.code), std::string(c.label)});
  return sld(layer_name, "Flood extent classes", "values", e);
}

std::string depth_sld(std::string_view layer_name) {
  // Shallow water light, deep water dark: viridis reversed (report/palette.hpp anchors 16, 13,
  // 10, 6, 3, 0), stops at 0, 0.5, 1, 2, 3 and 5 m.
  return sld(layer_name, "Flood depth (m)", "ramp",
             {{"#fde725", 0.0, "0 m"},
              {"#84d44b", 0.5, "0.5 m"},
              {"#28ae80", 1.0, "1 m"},
              {"#2c728e", 2.0, "2 m"},
              {"#424086", 3.0, "3 m"},
              {"#440154", 5.0, "5 m or more"}});
}

std::string aep_sld(std::string_view layer_name) {
  // Intervals: each entry colours the values from the previous quantity up to its own. A cell
  // the model never reaches has AEP 0 exactly, kept apart from tiny AEPs by the first bound.
  std::vector<Entry> e;
  e.push_back({std::string(aep_bands[4].colour_hex), 1e-300, std::string(aep_bands[4].label)});
  for (int i = 3; i >= 0; --i) {
    const double upper = i == 0 ? 1.000001 : aep_bands[static_cast<std::size_t>(i - 1)].lower_aep;
    e.push_back({std::string(aep_bands[static_cast<std::size_t>(i)].colour_hex), upper,
                 std::string(aep_bands[static_cast<std::size_t>(i)].label)});
  }
  return sld(layer_name, "Annual exceedance probability", "intervals", e);
}

}  // namespace tidewright::terrain
