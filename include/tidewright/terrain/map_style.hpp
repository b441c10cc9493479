// The classes and colours of the map products, defined once: the single-band class rasters'
// colour tables and category names, the OGC SLD 1.0 styles written beside the rasters, and the
// report's map figures (report/plots.hpp) all read them.
#pragma once

#include <array>
#include <string>
#include <string_view>

namespace tidewright::terrain {

struct MapClass {
  int code = 0;
  std::string_view label;
  std::string_view colour_hex;  // "#rrggbb"
};

// The extent classes (inundation.hpp, ExtentClass). Colours chosen here: a light warm grey for
// dry land, Okabe & Ito (2008) blue and reddish purple for the two flooded kinds (they stay
// apart for colour-blind readers), a pale cool blue for today's water.
inline constexpr std::array<MapClass, 4> extent_classes{{{0, "Dry", "#ebe7df"},
                                                         {1, "Flooded, connected to the sea", "#0072b2"},
                                                         {2, "Low ground cut off from the sea", "#cc79a7"},
                                                         {3, "Sea (today's water)", "#dbe6ee"}}};

// Bands of annual exceedance probability, from the most likely; a cell is in the first band
// whose lower bound its AEP reaches (10 %, 1 %, 0.1 %: common practice in flood mapping). The
// colours are viridis (van der Walt & Smith 2015) at 0.05, 0.35 and 0.65 (report/palette.hpp),
// then a pale yellow and the dry grey.
struct AepBand {
  int code = 0;
  double lower_aep = 0.0;  // the band holds lower_aep <= AEP (< the previous band's bound)
  std::string_view label;
  std::string_view colour_hex;
};
inline constexpr std::array<AepBand, 5> aep_bands{{{1, 0.1, "10 % or more (1 in 10 years or more often)", "#471366"},
                                                   {2, 0.01, "1 % to 10 %", "#2f6c8e"},
                                                   {3, 0.001, "0.1 % to 1 %", "#31b47b"},
                                                   {4, 1e-300, "below 0.1 %", "#f4f0c8"},
                                                   {5, 0.0, "never (above the model's range)", "#ebe7df"}}};

// OGC Styled Layer Descriptor 1.0 documents (raster colour maps) for extent.tif and its
// single-band class rasters, depth.tif and aep.tif; well-formed XML, layer named `layer_name`.
[[nodiscard]] std::string extent_sld(std::string_view layer_name);
[[nodiscard]] std::string depth_sld(std::string_view layer_name);
[[nodiscard]] std::string aep_sld(std::string_view layer_name);

}  // namespace tidewright::terrain
