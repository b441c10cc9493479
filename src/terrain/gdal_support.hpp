// Internal to the terrain module: the few GDAL/OGR helpers its adapters share (opening with a
// clear InputError, in-memory grids, reading a vector layer reprojected to a grid's CRS).
// Included by src/terrain/*.cpp only; the rest of the project sees GDAL-free headers.
#pragma once

#include <gdal_priv.h>
#include <ogrsf_frmts.h>

#include <memory>
#include <string>
#include <vector>

#include "tidewright/terrain/geo_grid.hpp"

namespace tidewright::terrain::gdal {

void register_drivers();
// A number as short text for messages and metadata ("0.5", "100", "-2.25"), 10 significant digits.
[[nodiscard]] std::string number_text(double value);  // GDALAllRegister once, thread-safe
// The last GDAL error message (trimmed), or "no reason given".
[[nodiscard]] std::string last_error();
// Flushes and closes `ds`; GDAL 3.6 reports write failures of the flush and close through the
// error state only, so that is checked: InputError(shown, "<what> failed (<reason>)", hint).
void close_checked(GDALDatasetUniquePtr& ds, const std::string& shown, const std::string& what);

// Throws InputError(path, "GDAL cannot open it as a raster/vector: <reason>", hint).
[[nodiscard]] GDALDatasetUniquePtr open_raster(const std::string& path, const std::string& role);
[[nodiscard]] GDALDatasetUniquePtr open_vector(const std::string& path, const std::string& role);
// True if GDAL opens the file as a vector dataset with at least one layer.
[[nodiscard]] bool is_vector(const std::string& path);

// A MEM dataset on `grid`, every band filled with `fill` and that value set as nodata.
[[nodiscard]] GDALDatasetUniquePtr mem_raster(const GeoGrid& grid, GDALDataType type, int bands,
                                              double fill);
[[nodiscard]] OGRSpatialReference grid_srs(const GeoGrid& grid);

// The geometries of a layer, each with its feature id, transformed to the grid's CRS. Throws
// InputError if the layer has no CRS or cannot be transformed.
struct LayerGeometry {
  std::unique_ptr<OGRGeometry> geometry;
  GIntBig fid = 0;
};
[[nodiscard]] std::vector<LayerGeometry> layer_geometries(OGRLayer& layer, const GeoGrid& grid,
                                                          const std::string& path);

}  // namespace tidewright::terrain::gdal
