// Reading a DEM through GDAL and expressing it above the water-level datum.
//
// Nodata is only what the file or the user declares (negative elevations are real on coasts);
// NaN cells are always nodata. The vertical relation between the DEM's datum and the water-level
// datum must be stated: a constant offset, an offset raster (resampled bilinearly to the DEM
// grid with GDALWarp), or the statement that the datums are the same. In every case
//   z_water = z_dem + offset,
// where offset is the height of the DEM datum's zero above the water-level datum's zero (m).
#pragma once

#include <array>
#include <optional>
#include <string>
#include <vector>

#include "tidewright/terrain/geo_grid.hpp"

namespace tidewright::terrain {

struct DatumRelation {
  enum class Kind { unstated, same, constant, raster };
  Kind kind = Kind::unstated;
  double offset_m = 0.0;    // Kind::constant
  std::string raster_path;  // Kind::raster: GDAL-readable, any CRS and grid that covers the DEM
};

struct DemSource {
  std::string path;
  int band = 1;
  std::optional<double> nodata;  // declared by the user, in addition to the file's own
  std::string crs_override;      // used only when the file has no CRS ("EPSG:32633", WKT, ...)
  DatumRelation datum;
  // The vertical unit of the band's values (after GDAL's scale and offset): empty means the
  // band's unit type, else the vertical CRS's unit, else metres. Known: m, ft, us-ft, cm, mm.
  std::string z_units;
  std::optional<double> z_factor;  // metres per unit, instead of z_units
  // A window of the DEM to map, in its CRS: upper-left x, y and lower-right x, y (as
  // gdal_translate -projwin), widened to whole cells; it must lie inside the DEM.
  std::optional<std::array<double, 4>> window{};
  std::string window_name = "--projwin";
  // How the caller names these inputs in messages (a flag, or a site-file key).
  std::string z_units_name = "--z-units";
  std::string z_factor_name = "--z-factor";
  std::string crs_name = "--dem-crs";
  std::string nodata_name = "--dem-nodata";
  std::string datum_names = "--datum-offset M, --datum-offset-raster FILE, or --same-datum if they are the same";
  std::string recorded_as{};  // how descriptions and warnings name it (e.g. as a site file writes it); empty: path
};

// Metres per unit of a vertical unit's name (GDAL band unit types, PROJ unit names and the
// short forms of --z-units), case-insensitive; empty if unknown.
[[nodiscard]] std::optional<double> metres_per_vertical_unit(const std::string& name);

struct Dem {
  GeoGrid grid;
  std::vector<float> elevation_m;  // above the water-level datum; NaN = nodata
  std::vector<float> offset_m;     // the datum offset per cell (empty for a constant offset)
  double constant_offset_m = 0.0;  // used when offset_m is empty
  std::string description;         // for the outputs' metadata record
  std::string vertical_unit;       // how the values became metres, for the metadata record
  std::vector<std::string> warnings;  // e.g. values that look like centimetres with no unit
  [[nodiscard]] double offset_at(std::size_t cell) const noexcept {
    return offset_m.empty() ? constant_offset_m : static_cast<double>(offset_m[cell]);
  }
};

// Throws InputError: file unreadable, no CRS (unless crs_override), no geotransform, every cell
// nodata, datum relation unstated, an offset raster that does not cover the DEM's valid cells.
[[nodiscard]] Dem read_dem(const DemSource& source);

// Resamples band 1 of a GDAL raster onto `grid` (GDALWarp with the given resampling, "near" or
// "bilinear"); cells it does not cover are NaN. `role` names the input in messages.
[[nodiscard]] std::vector<float> resample_to_grid(const std::string& path, const GeoGrid& grid,
                                                  const std::string& resampling,
                                                  const std::string& role);

}  // namespace tidewright::terrain
