// Where the sea is: the union of a sea mask (an OGR polygon layer rasterised at cell centres,
// or a GDAL raster whose non-zero cells are sea, resampled nearest to the DEM grid), seed
// points, the DEM's edge cells at or below a level, and nodata cells declared sea. Vectors in
// another CRS are reprojected to the DEM's with OGR; rasters are warped. Optionally the sea
// then spreads over every cell it reaches at or below a stated level (today's water), so that
// seeds stand for the whole water body rather than for a few cells of it.
#pragma once

#include <array>
#include <cstdint>
#include <optional>
#include <span>
#include <string>
#include <vector>

#include "tidewright/terrain/dem.hpp"

namespace tidewright::terrain {

struct SeaSource {
  std::string mask_path;                         // vector (polygons) or raster; empty = none
  std::string mask_recorded_as{};                // how the description names it; empty: mask_path
  // For a vector mask: the layer that is the sea (empty: the file's only layer; a file of
  // several layers is refused without one) and an OGR SQL attribute filter (empty: every
  // feature). Lines and points are refused: the sea is an area, not a coastline.
  std::string layer;
  std::string where;
  // How the caller names these two inputs in errors (a flag, or a site-file key).
  std::string layer_input = "the sea layer";
  std::string where_input = "the sea filter";
  std::string spread_input = "--sea-spread-to";
  std::string ways = "--sea FILE, --sea-point X,Y, --sea-edge-below M or --nodata-is-sea";  // to give a sea
  std::vector<std::array<double, 2>> points_xy;  // in the DEM's CRS
  std::optional<double> edge_at_or_below_m;      // above the water-level datum
  bool nodata_is_sea = false;
  // The sea also covers every cell it reaches at or below this level (m above the water-level
  // datum), e.g. a high-water mark: such cells are today's water, not flooded land, so they
  // count in no flooded area, volume or depth, and have no AEP or first year (sea is blank).
  // Mapped levels must not lie below it. Empty: the sea is the cells above and no more.
  std::optional<double> spread_to_m;
};

struct SeaCells {
  std::vector<std::uint8_t> is_sea;  // one per DEM cell
  std::size_t count = 0;
  std::string description;  // for the metadata record
  std::vector<std::string> warnings{};  // e.g. inland nodata declared sea
};

// Throws InputError when no sea source is given, a mask or point falls outside the DEM, or the
// sea found touches no valid DEM cell (nothing could flood).
[[nodiscard]] SeaCells find_sea_cells(const Dem& dem, const SeaSource& source,
                                      Connectivity connectivity);

// Throws InputError unless `level_m`, a sea spread level, is a finite number. Called before
// any work (make_flood_maps) and again by spread_sea.
void check_spread_level(double level_m, const std::string& input = "--sea-spread-to");

// Spreads the sea over every cell whose flood threshold T (flood_threshold.hpp) is finite and at
// most `level_m`: such a cell becomes sea (is_sea 1, T = -inf). Relabelling after the pass gives
// every other cell the T that a pass seeded from the spread sea would: a path from the spread
// sea to c with highest cell m extends to one from the seeds with highest max(level_m, m), and
// any path from the seeds has a suffix from the spread sea no higher (tested against a re-seeded
// pass in tests/terrain/flood_threshold_test.cpp). Returns the number of cells added; updates
// the count and the description. Throws InputError when no land with a finite T is left.
std::size_t spread_sea(SeaCells& sea, std::span<float> threshold_m, double level_m,
                       const std::string& input = "--sea-spread-to");

}  // namespace tidewright::terrain
