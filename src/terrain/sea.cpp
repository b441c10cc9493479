// Finding the sea cells of a DEM (include/tidewright/terrain/sea.hpp).
#include "tidewright/terrain/sea.hpp"

#include <gdal_alg.h>

#include <cmath>
#include <limits>
#include <stdexcept>

#include "tidewright/common/error.hpp"
#include "gdal_support.hpp"

namespace tidewright::terrain {
namespace {

std::string layer_names(GDALDataset& ds) {
  std::string names;
  for (auto* layer : ds.GetLayers()) names += (names.empty() ? "'" : ", '") + std::string(layer->GetName()) + "'";
  return names;
}

// The one layer that holds the sea: the named one, or the file's only layer. A file of several
// layers (a GeoPackage often holds land, rivers and sea) needs a name: reading them all once
// turned 95 % of a DEM into sea.
OGRLayer& sea_layer(GDALDataset& ds, const SeaSource& source) {
  if (!source.layer.empty()) {
    OGRLayer* layer = ds.GetLayerByName(source.layer.c_str());
    if (layer == nullptr) {
      throw InputError(source.mask_path, "has no layer '" + source.layer + "'",
                       "name one of its layers with " + source.layer_input + ": " + layer_names(ds));
    }
    return *layer;
  }
  if (ds.GetLayerCount() > 1) {
    throw InputError(source.mask_path,
                     "holds " + std::to_string(ds.GetLayerCount()) + " layers (" + layer_names(ds) +
                         ") and none is named as the sea",
                     "name the sea's layer with " + source.layer_input);
  }
  return *ds.GetLayer(0);
}

// Rasterises the sea layer's polygons (after the filter) at cell centres (GDAL's default rule).
std::vector<std::uint8_t> rasterise_sea_polygons(const SeaSource& source, const GeoGrid& grid,
                                                 std::string& description) {
  const std::string& path = source.mask_path;
  auto ds = gdal::open_vector(path, "sea mask");
  OGRLayer& layer = sea_layer(*ds, source);
  const std::string name = layer.GetName();
  const auto bad_filter = [&] {
    return InputError(source.where_input + " '" + source.where + "'",
                      "is not an attribute filter of layer '" + name + "' (" + gdal::last_error() + ")",
                      "write an OGR SQL condition on its fields, e.g. \"kind = 'sea'\" (ogrinfo -so " + path + ")");
  };
  CPLErrorReset();
  if (!source.where.empty() && layer.SetAttributeFilter(source.where.c_str()) != OGRERR_NONE) throw bad_filter();
  std::vector<gdal::LayerGeometry> geometries = gdal::layer_geometries(layer, grid, path);
  // Some drivers (GeoPackage) accept any filter and fail only while reading.
  if (!source.where.empty() && geometries.empty() && CPLGetLastErrorType() >= CE_Failure) throw bad_filter();
  if (geometries.empty()) {
    throw InputError(path, "layer '" + name + "' holds no feature" + (source.where.empty() ? "" : " that passes the filter"),
                     source.where.empty() ? "check the file with ogrinfo" : "check " + source.where_input);
  }
  for (const auto& g : geometries) {
    if (g.geometry->getDimension() < 2) {
      throw InputError(path + ": feature " + std::to_string(g.fid),
                       "is a " + std::string(OGRGeometryTypeToName(g.geometry->getGeometryType())) +
                           ", but the sea is an area: lines and points are not sea polygons",
                       "give polygons of the sea (a coastline closed into a polygon seaward), or sea points with "
                       "their own option");
    }
  }
  description = "sea polygons " + (source.mask_recorded_as.empty() ? path : source.mask_recorded_as) + " layer '" +
                name + "'" +
                (source.where.empty() ? std::string() : " where " + source.where) + ", " +
                std::to_string(geometries.size()) + " features (cell centres)";
  auto mem = gdal::mem_raster(grid, GDT_Byte, 1, 0.0);
  std::vector<OGRGeometryH> handles;
  handles.reserve(geometries.size());
  for (auto& g : geometries) handles.push_back(OGRGeometry::ToHandle(g.geometry.get()));
  const std::vector<double> burn(handles.size(), 1.0);
  int band = 1;
  if (!handles.empty() &&
      GDALRasterizeGeometries(GDALDataset::ToHandle(mem.get()), 1, &band,
                              static_cast<int>(handles.size()), handles.data(), nullptr, nullptr,
                              burn.data(), nullptr, nullptr, nullptr) != CE_None) {
    throw InputError(path, "rasterising the sea mask failed (" + gdal::last_error() + ")",
                     "check its geometries with ogrinfo");
  }
  std::vector<std::uint8_t> out(grid.shape.cells());
  if (mem->GetRasterBand(1)->RasterIO(
          GF_Read, 0, 0, static_cast<int>(grid.shape.cols), static_cast<int>(grid.shape.rows),
          out.data(), static_cast<int>(grid.shape.cols), static_cast<int>(grid.shape.rows),
          GDT_Byte, 0, 0, nullptr) != CE_None) {
    throw InputError(path, "reading the rasterised sea mask failed", "check the file");
  }
  return out;
}

// The nodata cells that a path of nodata cells (4-neighbours) joins to the DEM's frame: what
// lies beyond the survey, as against holes inside it.
std::vector<std::uint8_t> outer_nodata(const std::vector<float>& z, GridShape shape) {
  const std::size_t n = shape.cells();
  std::vector<std::uint8_t> outer(n, 0);
  if (n == 0) return outer;  // an empty grid has no edge (and no column count to divide by)
  std::vector<std::size_t> stack;
  const auto seed = [&](std::size_t i) {
    if (std::isnan(z[i]) && outer[i] == 0) {
      outer[i] = 1;
      stack.push_back(i);
    }
  };
  for (std::size_t c = 0; c < shape.cols; ++c) {
    seed(c);
    seed((shape.rows - 1) * shape.cols + c);
  }
  for (std::size_t r = 0; r < shape.rows; ++r) {
    seed(r * shape.cols);
    seed(r * shape.cols + shape.cols - 1);
  }
  while (!stack.empty()) {
    const std::size_t i = stack.back();
    stack.pop_back();
    const std::size_t r = i / shape.cols;
    const std::size_t c = i % shape.cols;
    if (c > 0) seed(i - 1);
    if (c + 1 < shape.cols) seed(i + 1);
    if (r > 0) seed(i - shape.cols);
    if (r + 1 < shape.rows) seed(i + shape.cols);
  }
  return outer;
}

std::size_t inland_nodata_cells(const std::vector<float>& z, const std::vector<std::uint8_t>& outer) {
  std::size_t inland = 0;
  for (std::size_t i = 0; i < z.size(); ++i) inland += std::isnan(z[i]) && outer[i] == 0;
  return inland;
}

// A valid cell on the edge of the data: on the DEM's frame, or beside nodata that reaches the
// frame (a DEM clipped to a coastline has its seaward edge there, not at the frame).
bool on_data_edge(std::size_t i, GridShape shape, const std::vector<std::uint8_t>& outer) {
  const std::size_t r = i / shape.cols;
  const std::size_t c = i % shape.cols;
  if (r == 0 || c == 0 || r + 1 == shape.rows || c + 1 == shape.cols) return true;
  return outer[i - 1] != 0 || outer[i + 1] != 0 || outer[i - shape.cols] != 0 || outer[i + shape.cols] != 0;
}

// The cells of a sea mask (polygons rasterised, or a raster's non-zero cells); returns how.
std::string mark_mask(SeaCells& sea, const Dem& dem, const SeaSource& source) {
  const std::size_t n = dem.grid.shape.cells();
  std::vector<std::uint8_t> mask;
  std::string description;
  if (gdal::is_vector(source.mask_path)) {
    mask = rasterise_sea_polygons(source, dem.grid, description);
  } else {
    if (!source.layer.empty() || !source.where.empty()) {
      throw InputError(source.layer.empty() ? source.where_input : source.layer_input,
                       "applies to a vector sea mask, but " + source.mask_path + " is a raster",
                       "leave it out, or give the sea as polygons");
    }
    const auto values = resample_to_grid(source.mask_path, dem.grid, "near", "sea mask");
    mask.resize(n);
    for (std::size_t i = 0; i < n; ++i) mask[i] = !std::isnan(values[i]) && values[i] != 0.0F ? 1 : 0;
    description = "sea raster " + (source.mask_recorded_as.empty() ? source.mask_path : source.mask_recorded_as) +
                  " (non-zero cells, nearest resampling)";
  }
  std::size_t in_mask = 0;
  for (std::size_t i = 0; i < n; ++i) {
    if (mask[i] != 0) {
      sea.is_sea[i] = 1;
      ++in_mask;
    }
  }
  if (in_mask == 0) {
    throw InputError(source.mask_path, "the sea mask covers no cell of the DEM",
                     "check that it overlaps the DEM (ogrinfo -so / gdalinfo) and has the right CRS");
  }
  return description;
}

// The cells under the seed points; InputError for a point outside the DEM.
void mark_points(SeaCells& sea, const Dem& dem, const SeaSource& source) {
  const GridShape shape = dem.grid.shape;
  std::array<double, 6> inverse{};
  std::array<double, 6> gt = dem.grid.geotransform;
  if (GDALInvGeoTransform(gt.data(), inverse.data()) == 0) {
    throw InputError("DEM", "the geotransform cannot be inverted", "check the DEM's georeferencing");
  }
  for (const auto& p : source.points_xy) {
    const double col = inverse[0] + p[0] * inverse[1] + p[1] * inverse[2];
    const double row = inverse[3] + p[0] * inverse[4] + p[1] * inverse[5];
    const std::string where = "--sea-point " + gdal::number_text(p[0]) + "," + gdal::number_text(p[1]);
    if (!(col >= 0.0 && row >= 0.0 && col < static_cast<double>(shape.cols) && row < static_cast<double>(shape.rows))) {
      throw InputError(where, "the point lies outside the DEM",
                       "give x,y in the DEM's CRS inside its extent (gdalinfo shows it)");
    }
    sea.is_sea[static_cast<std::size_t>(row) * shape.cols + static_cast<std::size_t>(col)] = 1;
  }
}

// Nodata cells declared sea, with a warning for those inside the DEM (a survey gap).
void mark_nodata_sea(SeaCells& sea, const Dem& dem, const std::vector<std::uint8_t>& outer) {
  for (std::size_t i = 0; i < sea.is_sea.size(); ++i) {
    if (std::isnan(dem.elevation_m[i])) sea.is_sea[i] = 1;
  }
  const std::size_t inland = inland_nodata_cells(dem.elevation_m, outer);
  if (inland > 0) {
    sea.warnings.push_back(std::to_string(inland) +
                           " nodata cells lie inside the DEM, joined to its edge by no other nodata cell, and are "
                           "declared sea with the rest: a gap in the survey there floods the land around it at every "
                           "level; fill such gaps (e.g. gdal_fillnodata) or give the sea another way");
  }
}

// True when some sea cell has a valid land neighbour (under the connectivity), so water can
// leave the sea at all.
bool touches_valid_land(const SeaCells& sea, const Dem& dem, Connectivity connectivity) {
  const auto cols = static_cast<std::ptrdiff_t>(dem.grid.shape.cols);
  const auto rows = static_cast<std::ptrdiff_t>(dem.grid.shape.rows);
  for (std::size_t i = 0; i < sea.is_sea.size(); ++i) {
    if (sea.is_sea[i] == 0) continue;
    const auto x = static_cast<std::ptrdiff_t>(i) % cols;
    const auto y = static_cast<std::ptrdiff_t>(i) / cols;
    for (std::ptrdiff_t dy = -1; dy <= 1; ++dy) {
      for (std::ptrdiff_t dx = -1; dx <= 1; ++dx) {
        if (connectivity == Connectivity::four && dx != 0 && dy != 0) continue;
        const auto nx = x + dx;
        const auto ny = y + dy;
        if (nx < 0 || ny < 0 || nx >= cols || ny >= rows) continue;
        const auto m = static_cast<std::size_t>(ny * cols + nx);
        if (sea.is_sea[m] == 0 && !std::isnan(dem.elevation_m[m])) return true;
      }
    }
  }
  return false;
}

}  // namespace

SeaCells find_sea_cells(const Dem& dem, const SeaSource& source, Connectivity connectivity) {
  const GridShape shape = dem.grid.shape;
  SeaCells sea;
  sea.is_sea.assign(shape.cells(), 0);
  std::string parts;
  const auto add_part = [&](const std::string& s) { parts += (parts.empty() ? "" : "; ") + s; };
  if (!source.mask_path.empty()) add_part(mark_mask(sea, dem, source));
  if (!source.points_xy.empty()) {
    mark_points(sea, dem, source);
    add_part(std::to_string(source.points_xy.size()) + " seed point(s)");
  }
  std::vector<std::uint8_t> outer;
  if (source.edge_at_or_below_m || source.nodata_is_sea) outer = outer_nodata(dem.elevation_m, shape);
  if (source.edge_at_or_below_m) {
    const double limit = *source.edge_at_or_below_m;
    for (std::size_t i = 0; i < shape.cells(); ++i) {
      const float z = dem.elevation_m[i];
      if (!std::isnan(z) && static_cast<double>(z) <= limit && on_data_edge(i, shape, outer)) sea.is_sea[i] = 1;
    }
    add_part("cells at or below " + gdal::number_text(limit) +
             " m on the edge of the valid data (the DEM's frame, or nodata joined to it)");
  }
  if (source.nodata_is_sea) {
    mark_nodata_sea(sea, dem, outer);
    add_part("nodata cells declared sea");
  }
  if (parts.empty()) {
    throw InputError("sea", "no sea is given", "give " + source.ways);
  }
  for (auto s : sea.is_sea) sea.count += s;
  if (sea.count == 0) {
    throw InputError("sea", "no sea cell found in the DEM (" + parts + ")",
                     "check the sea sources against the DEM's extent and elevations");
  }
  if (!touches_valid_land(sea, dem, connectivity)) {
    throw InputError("sea", "the sea (" + parts + ") touches no valid land cell, so nothing can flood",
                     "check the sea mask and the DEM's nodata");
  }
  sea.description = parts + "; " + std::to_string(sea.count) + " sea cells";
  return sea;
}

void check_spread_level(double level_m, const std::string& input) {
  if (!std::isfinite(level_m)) {
    throw InputError(input, "the level is not a finite number",
                     "give today's high-water level in metres above the water-level datum");
  }
}

std::size_t spread_sea(SeaCells& sea, std::span<float> threshold_m, double level_m, const std::string& input) {
  if (threshold_m.size() != sea.is_sea.size()) {
    throw std::logic_error("spread_sea: the threshold raster and the sea mask differ in size");
  }
  check_spread_level(level_m, input);
  std::size_t added = 0;
  bool land_left = false;
  for (std::size_t i = 0; i < threshold_m.size(); ++i) {
    const float t = threshold_m[i];
    if (!std::isfinite(t)) continue;
    if (static_cast<double>(t) <= level_m) {
      threshold_m[i] = -std::numeric_limits<float>::infinity();
      sea.is_sea[i] = 1;
      ++added;
    } else {
      land_left = true;
    }
  }
  if (!land_left) {
    throw InputError(input,
                     "the sea spread to " + gdal::number_text(level_m) +
                         " m covers all the land it can reach, so nothing is left to flood",
                     "give today's high-water level in metres above the water-level datum");
  }
  sea.count += added;
  sea.description += "; spread over the " + std::to_string(added) +
                     " cells it reaches at or below " + gdal::number_text(level_m) + " m";
  return added;
}

}  // namespace tidewright::terrain
