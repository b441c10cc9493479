// The flood-threshold raster: for each cell, the lowest still-water level at which the sea
// reaches it over land no higher than that level (the minimax path height from the sea).
// Computed once per DEM by a priority-flood from the sea cells (Barnes, Lehman & Mulla 2014,
// "Priority-flood: An optimal depression-filling and watershed-labeling algorithm for digital
// elevation models", Computers & Geosciences 62:117-127, doi:10.1016/j.cageo.2013.04.024,
// Algorithm 2 "improved priority-flood": cells inside a filled depression go through a plain
// FIFO queue instead of the priority queue). Every extent, depth and probability raster is then
// a per-cell comparison against this one raster (see inundation.hpp).
//
// Glossary: z(c) elevation of cell c above the water-level datum (m); T(c) flood threshold of
// c (m, the paper's filled elevation when seeded from the sea); S the set of sea cells.
//   T(c) = min over paths p from S to c of max over cells q of p (q not in S) of z(q).
//
// Conventions (docs/methods-terrain.md):
//   - a sea cell has T = -inf: it is water at every level, whatever the DEM says there;
//   - a nodata cell (NaN elevation) that is not sea is a barrier and has T = NaN;
//   - a valid cell that no path of valid cells joins to the sea has T = +inf.
// Memory: the caller's elevation (4 bytes/cell) + the padded threshold (4 bytes/cell, stored in
// 8 x 8 tiles while the pass runs, returned row-major) + one open bit per cell + the priority
// queue (a radix heap, 8 bytes per queued cell, at most the number of cells on the flood front)
// + the FIFO (4 bytes per queued cell).
#pragma once

#include <cstddef>
#include <cstdint>
#include <span>
#include <vector>

namespace tidewright::terrain {

// Neighbourhood of a cell. 8-connectivity is the default (docs/methods-terrain.md, "Connectivity"):
// water passes between diagonal neighbours, which floods at least as much land as 4-connectivity
// (the cautious side for flood maps); defences must then be burned with no diagonal gap
// (GDALRasterize ALL_TOUCHED=TRUE, see defences.hpp).
enum class Connectivity { four = 4, eight = 8 };

// A row-major grid of cells: index = row * cols + col.
struct GridShape {
  std::size_t cols = 0;
  std::size_t rows = 0;
  [[nodiscard]] std::size_t cells() const noexcept { return cols * rows; }
};

// T(c) for every cell (see the conventions above). `elevation_m` holds z with NaN for nodata;
// `is_sea` is nonzero for sea cells. T is unique (a minimax path height), so the result does
// not depend on the order in which cells at equal levels are processed; that order is itself a
// function of the input alone. Throws InputError if the spans do not match `shape`.
[[nodiscard]] std::vector<float> flood_threshold_barnes2014(GridShape shape,
                                                            std::span<const float> elevation_m,
                                                            std::span<const std::uint8_t> is_sea,
                                                            Connectivity connectivity);

}  // namespace tidewright::terrain
