// Where the sea is: the union of a sea mask (an OGR polygon layer rasterised at cell centres,
// or a GDAL raster whose non-zero cells are sea, resampled nearest to the DEM grid), seed
// points, the DEM's edge cells at or below a level, and nodata cells declared sea. Vectors in
// another CRS are reprojected to the DEM's with OGR; rasters are warped.
#pragma once

#include <array>
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "tidewright/terrain/dem.hpp"

namespace tidewright::terrain {

struct SeaSource {
  std::string mask_path;                         // vector (polygons) or raster; empty = none
  std::vector<std::array<double, 2>> points_xy;  // in the DEM's CRS
  std::optional<double> edge_at_or_below_m;      // above the water-level datum
  bool nodata_is_sea = false;
};

struct SeaCells {
  std::vector<std::uint8_t> is_sea;  // one per DEM cell
  std::size_t count = 0;
  std::string description;  // for the metadata record
};

// Throws InputError when no sea source is given, a mask or point falls outside the DEM, or the
// sea found touches no valid DEM cell (nothing could flood).
[[nodiscard]] SeaCells find_sea_cells(const Dem& dem, const SeaSource& source,
                                      Connectivity connectivity);

}  // namespace tidewright::terrain
