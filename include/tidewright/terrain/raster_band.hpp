// One band of a raster read back whole, as the report's map figures take it.
#pragma once

#include <filesystem>
#include <optional>
#include <vector>

namespace tidewright::terrain {

struct BandValues {
  int columns = 0;
  int rows = 0;
  double cell_size_m = 0.0;  // |pixel width| of the geotransform
  std::vector<float> values{};  // row-major, top row first
  std::optional<float> nodata{};
};

// Band `band_index` (0-based; -1: the last band; clamped to the bands there are) of a raster
// this program wrote. ComputationError when it cannot be read: a file just written must be.
[[nodiscard]] BandValues read_band_values(const std::filesystem::path& raster, int band_index = 0);

}  // namespace tidewright::terrain
