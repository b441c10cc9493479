#include "tidewright/report/palette.hpp"

#include <algorithm>
#include <array>
#include <cmath>

namespace tidewright::report {

Colour series_colour(std::size_t i, double alpha) {
  // Okabe & Ito (2008), CUD palette (hex values as published there).
  static constexpr std::array<const char*, 8> okabe_ito{"#0072b2", "#d55e00", "#009e73", "#e69f00",
                                                        "#cc79a7", "#56b4e9", "#f0e442", "#000000"};
  return Colour::from_hex(okabe_ito[i % okabe_ito.size()], alpha);
}

std::vector<double> series_dash(std::size_t i) {
  switch (i % 4) {
    case 0:
      return {};
    case 1:
      return {9, 4};
    case 2:
      return {4, 3};
    default:
      return {9, 3, 2, 3};
  }
}

Colour viridis(double t) {
  // viridis(k / 16), k = 0..16 (van der Walt & Smith 2015; matplotlib's listed colour map,
  // rounded to 8 bits). Linear interpolation between them stays within 5.3/255 of matplotlib's
  // 256-entry table (measured on 2001 points; checked by tests/report/plots_test.cpp).
  static constexpr std::array<const char*, 17> anchors{
      "#440154", "#48186a", "#472d7b", "#424086", "#3b528b", "#33638d",
      "#2c728e", "#26828e", "#21918c", "#1fa088", "#28ae80", "#3fbc73",
      "#5ec962", "#84d44b", "#addc30", "#d8e219", "#fde725"};
  if (!std::isfinite(t)) t = 0;
  t = std::clamp(t, 0.0, 1.0) * 16.0;
  const auto k = std::min<std::size_t>(15, static_cast<std::size_t>(t));
  const double f = t - static_cast<double>(k);
  const Colour a = Colour::from_hex(anchors[k]);
  const Colour b = Colour::from_hex(anchors[k + 1]);
  auto mix = [&](std::uint8_t x, std::uint8_t y) {
    return static_cast<std::uint8_t>(std::lround(x + (y - x) * f));
  };
  return Colour{mix(a.r, b.r), mix(a.g, b.g), mix(a.b, b.b), 1.0};
}

}  // namespace tidewright::report
