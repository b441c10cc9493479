// Colours of the report's plots and maps, chosen to stay distinct for the common forms of
// colour-vision deficiency:
// - series colours: the eight-colour set of Okabe & Ito (2008), "Color Universal Design (CUD):
//   how to make figures and presentations that are friendly to colorblind people"
//   (jfly.uni-koeln.de/color/), in an order of the project's own;
// - continuous rasters: the viridis ramp of van der Walt & Smith (2015, matplotlib; released
//   CC0), as 17 anchors (viridis at 0, 1/16, ..., 1), linearly interpolated in sRGB between
//   them; a test compares it with Debian's python3-matplotlib.
#pragma once

#include <cstddef>

#include "tidewright/report/canvas.hpp"

namespace tidewright::report {

// Series colour number i (cycles after eight): blue, vermillion, bluish green, orange,
// reddish purple, sky blue, yellow, black.
[[nodiscard]] Colour series_colour(std::size_t i, double alpha = 1.0);
// Dash pattern number i (cycles): solid, long dash, short dash, dash-dot; so that series stay
// apart in grey print too.
[[nodiscard]] std::vector<double> series_dash(std::size_t i);
// Viridis at t in [0, 1] (clamped).
[[nodiscard]] Colour viridis(double t);

// Neutral tones of the chart furniture.
inline const Colour ink{0x22, 0x22, 0x22};
inline const Colour axis_grey{0x55, 0x55, 0x55};
inline const Colour grid_grey{0xdd, 0xdd, 0xdd};
inline const Colour minor_grid_grey{0xee, 0xee, 0xee};

}  // namespace tidewright::report
