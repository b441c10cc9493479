// Writing result rasters as GeoTIFF: tiled 256 x 256, compressed (DEFLATE or ZSTD with the
// predictor suited to the cell type: 3 floating point, 2 integer), nodata set, one description
// and unit per band, a metadata record, the DEM's CRS and geotransform; optionally converted to a
// Cloud-Optimized GeoTIFF (GDAL's COG driver) when finished. Rows are written block by block.
// The file is written where asked; the caller makes that path atomic (an AtomicPath folder).
#pragma once

#include <cstddef>
#include <cstdint>
#include <filesystem>
#include <memory>
#include <string>
#include <utility>
#include <vector>

#include "tidewright/terrain/geo_grid.hpp"
#include "tidewright/terrain/map_style.hpp"

namespace tidewright::terrain {

enum class Compression { deflate, zstd };
enum class CellType { byte, int16, float32 };

struct RasterFormat {
  Compression compression = Compression::deflate;  // DEFLATE: read by every GIS (common practice)
  bool cloud_optimized = false;
  // Internal overviews (factors 2, 4, ... to one tile). On by default: a GIS draws a large map
  // at once. A 20-level run on 25 million cells spends about a third of its time on them
  // (docs/performance.md, "Maps"), so big batch runs may leave them out (map --no-overviews).
  bool overviews = true;
  // Creation options (KEY, VALUE) given by the user, over the defaults below and `compression`:
  // the GTiff driver's, or with cloud_optimized the COG driver's. Checked against the driver's
  // list before anything is written.
  std::vector<std::pair<std::string, std::string>> creation_options{};
  // Threads compressing tiles (GDAL's NUM_THREADS creation option): 0 every core (ALL_CPUS),
  // 1 none besides the writing thread. Default every core, chosen here: compressing the depth
  // bands is most of a many-level map run (docs/performance.md, "Maps"). The values written,
  // and the bytes, do not depend on it (GDAL writes the compressed tiles in order).
  unsigned compression_threads = 0;
};

struct BandInfo {
  std::string description;
  std::string units;  // "m", "1" (probability), "year", "" (classes)
  std::vector<std::pair<std::string, std::string>> metadata;
  // A class raster's category names and colour table. A GeoTIFF palette belongs to the whole
  // file, so only a single-band Byte raster takes them; empty for measurement bands.
  std::vector<MapClass> classes{};
};

// The GTiff creation options every map output is written with (name, value), in the order
// given to GDAL. Benchmarks pass the same list to gdal_translate, so that their I/O floors are
// written as the outputs are.
// `palette`: a single-band class raster with a colour table (PHOTOMETRIC=PALETTE).
[[nodiscard]] std::vector<std::pair<std::string, std::string>> geotiff_creation_options(
    CellType type, const RasterFormat& format, bool palette = false);

class GeoTiffWriter {
 public:
  GeoTiffWriter(std::filesystem::path path, const GeoGrid& grid, CellType type, double nodata,
                const std::vector<BandInfo>& bands,
                const std::vector<std::pair<std::string, std::string>>& metadata,
                RasterFormat format);
  GeoTiffWriter(const GeoTiffWriter&) = delete;
  GeoTiffWriter& operator=(const GeoTiffWriter&) = delete;
  ~GeoTiffWriter();

  // `rows` full rows starting at `first_row` of band `band` (0-based), values of the cell type.
  // The rows are flushed to the file at once, so memory stays at one block of rows whatever the
  // size of the raster and the number of bands.
  void write_rows(std::size_t band, std::size_t first_row, std::size_t rows, const void* values);
  // Sets each band's exact statistics (gathered as the rows passed), flushes and closes the
  // file, adds internal overviews (factors 2, 4, ... down to one tile; nearest for classes and
  // years, average for measurements) and converts it to COG when asked; throws InputError on a
  // write failure.
  void finish();

 private:
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

// Block height used by the streamed passes: one row of 256 x 256 tiles.
inline constexpr std::size_t block_rows = 256;

}  // namespace tidewright::terrain
