// Reading a DEM and its datum relation (include/tidewright/terrain/dem.hpp).
#include "tidewright/terrain/dem.hpp"

#include <gdal_utils.h>

#include <unistd.h>

#include <algorithm>
#include <cmath>
#include <fstream>
#include <limits>
#include <sstream>

#include "tidewright/common/error.hpp"
#include "gdal_support.hpp"

namespace tidewright::terrain {
namespace {

constexpr float nan_f = std::numeric_limits<float>::quiet_NaN();

std::string number(double v) { return gdal::number_text(v); }

// Bytes a map run holds per DEM cell: about 9.1 for the threshold pass plus the queues
// (docs/methods-terrain.md, "Memory"); the measured peak is 2.8x the DEM's 4 bytes/cell
// (docs/performance.md, "Maps"), so 12 leaves a little room.
constexpr double map_bytes_per_cell = 12.0;

// Memory the kernel says a new allocation can get (MemAvailable), else physical memory.
double available_memory_bytes() {
  std::ifstream meminfo("/proc/meminfo");
  for (std::string line; std::getline(meminfo, line);) {
    if (line.rfind("MemAvailable:", 0) == 0) {
      std::istringstream fields(line.substr(13));
      double kib = 0.0;
      if (fields >> kib) return kib * 1024.0;
    }
  }
  const long pages = ::sysconf(_SC_PHYS_PAGES);
  const long page = ::sysconf(_SC_PAGESIZE);
  return pages > 0 && page > 0 ? static_cast<double>(pages) * static_cast<double>(page)
                               : std::numeric_limits<double>::infinity();
}

// Refuses, before any allocation, a DEM whose map run cannot fit in memory: one clear line
// instead of an out-of-memory failure half-way through.
void check_fits_in_memory(const std::string& path, std::size_t cols, std::size_t rows) {
  const double need = static_cast<double>(cols) * static_cast<double>(rows) * map_bytes_per_cell;
  const double have = available_memory_bytes();
  if (need > have) {
    const auto gib = [](double b) { return number(std::round(b / 1073741824.0 * 10.0) / 10.0); };
    throw InputError(path,
                     "the DEM has " + std::to_string(cols) + " x " + std::to_string(rows) +
                         " cells; mapping it needs about " + gib(need) + " GiB of memory, more than the " +
                         gib(have) + " GiB available",
                     "crop it (gdal_translate -projwin) or resample it coarser (gdalwarp -tr); tiled "
                     "mapping of larger DEMs is planned (docs/methods-terrain.md)");
  }
}

}  // namespace

std::vector<float> resample_to_grid(const std::string& path, const GeoGrid& grid,
                                    const std::string& resampling, const std::string& role) {
  auto src = gdal::open_raster(path, role);
  if (src->GetSpatialRef() == nullptr) {
    throw InputError(path, "the " + role + " has no coordinate reference system",
                     "assign one (gdal_edit.py -a_srs EPSG:XXXX " + path + ")");
  }
  auto dst = gdal::mem_raster(grid, GDT_Float32, 1, std::numeric_limits<double>::quiet_NaN());
  // Band 1 into the one-band grid; "-et 0": exact coordinate transformation for every cell
  // (GDAL's default approximates it to 1/8 pixel).
  std::vector<std::string> args{"-r", resampling, "-et", "0", "-wo", "INIT_DEST=NO_DATA"};
  std::vector<char*> argv;
  argv.reserve(args.size() + 1);
  for (auto& a : args) argv.push_back(a.data());
  argv.push_back(nullptr);
  GDALWarpAppOptions* options = GDALWarpAppOptionsNew(argv.data(), nullptr);
  if (options == nullptr) {
    throw ComputationError("GDALWarp",
                           "the resampling options were refused (" + gdal::last_error() + ")",
                           "report this with the GDAL version");
  }
  if (src->GetRasterCount() != 1) {
    throw InputError(path,
                     "the " + role + " has " + std::to_string(src->GetRasterCount()) + " bands",
                     "give a one-band raster (gdal_translate -b N to extract one)");
  }
  GDALDatasetH sources[] = {GDALDataset::ToHandle(src.get())};
  int usage_error = 0;
  CPLErrorReset();
  CPLPushErrorHandler(CPLQuietErrorHandler);
  GDALDatasetH result =
      GDALWarp(nullptr, GDALDataset::ToHandle(dst.get()), 1, sources, options, &usage_error);
  CPLPopErrorHandler();
  GDALWarpAppOptionsFree(options);
  if (result == nullptr) {
    throw InputError(
        path, "the " + role + " cannot be resampled to the DEM grid (" + gdal::last_error() + ")",
        "check its CRS and extent with gdalinfo");
  }
  std::vector<float> values(grid.shape.cells());
  if (dst->GetRasterBand(1)->RasterIO(
          GF_Read, 0, 0, static_cast<int>(grid.shape.cols), static_cast<int>(grid.shape.rows),
          values.data(), static_cast<int>(grid.shape.cols), static_cast<int>(grid.shape.rows),
          GDT_Float32, 0, 0, nullptr) != CE_None) {
    throw InputError(path, "reading the resampled " + role + " failed (" + gdal::last_error() + ")",
                     "check the file with gdalinfo");
  }
  return values;
}

Dem read_dem(const DemSource& source) {
  auto ds = gdal::open_raster(source.path, "DEM");
  if (source.band < 1 || source.band > ds->GetRasterCount()) {
    throw InputError(source.path, "has no band " + std::to_string(source.band),
                     "choose a band between 1 and " + std::to_string(ds->GetRasterCount()));
  }
  Dem dem;
  dem.grid.shape = {static_cast<std::size_t>(ds->GetRasterXSize()),
                    static_cast<std::size_t>(ds->GetRasterYSize())};
  if (ds->GetGeoTransform(dem.grid.geotransform.data()) != CE_None) {
    throw InputError(source.path, "the DEM has no geotransform (no cell size or position)",
                     "georeference it (gdal_translate -a_ullr / gdal_edit.py) first");
  }
  const OGRSpatialReference* srs = ds->GetSpatialRef();
  OGRSpatialReference chosen;
  if (srs != nullptr) {
    chosen = *srs;
  } else if (!source.crs_override.empty()) {
    if (chosen.SetFromUserInput(source.crs_override.c_str()) != OGRERR_NONE) {
      throw InputError("--dem-crs", "'" + source.crs_override + "' is not a CRS GDAL knows",
                       "give an EPSG code such as EPSG:32633 or a WKT string");
    }
  } else {
    throw InputError(source.path,
                     "the DEM has no coordinate reference system, so neither areas nor the sea "
                     "and defence layers can be placed on it",
                     "assign one (gdal_edit.py -a_srs EPSG:XXXX) or pass --dem-crs EPSG:XXXX");
  }
  char* wkt = nullptr;
  const char* wkt_options[] = {"FORMAT=WKT2_2019", nullptr};
  chosen.exportToWkt(&wkt, wkt_options);
  dem.grid.crs_wkt = wkt != nullptr ? wkt : "";
  CPLFree(wkt);

  GDALRasterBand* band = ds->GetRasterBand(source.band);
  check_fits_in_memory(source.path, dem.grid.shape.cols, dem.grid.shape.rows);
  const std::size_t n = dem.grid.shape.cells();
  dem.elevation_m.resize(n);
  // Read a block of rows at a time and drop GDAL's cached copy of it, so reading does not hold
  // the DEM twice (our grid plus GDAL's block cache).
  const int cols = ds->GetRasterXSize();
  const int rows = ds->GetRasterYSize();
  constexpr int rows_per_read = 256;
  for (int r0 = 0; r0 < rows; r0 += rows_per_read) {
    const int h = std::min(rows_per_read, rows - r0);
    float* dest =
        dem.elevation_m.data() + static_cast<std::size_t>(r0) * static_cast<std::size_t>(cols);
    if (band->RasterIO(GF_Read, 0, r0, cols, h, dest, cols, h, GDT_Float32, 0, 0, nullptr) !=
        CE_None) {
      throw InputError(source.path, "reading the DEM failed (" + gdal::last_error() + ")",
                       "check the file with gdalinfo -checksum");
    }
    band->FlushCache(false);
  }
  int has_nodata = 0;
  const double file_nodata = band->GetNoDataValue(&has_nodata);
  // Nodata compared after conversion to float32, as the values were read (exact for integers).
  const auto is_declared = [&](float v) {
    return (has_nodata != 0 && v == static_cast<float>(file_nodata)) ||
           (source.nodata && v == static_cast<float>(*source.nodata));
  };
  std::size_t valid = 0;
  for (auto& v : dem.elevation_m) {
    if (std::isnan(v) || is_declared(v)) {
      v = nan_f;
    } else {
      ++valid;
    }
  }
  if (valid == 0) {
    throw InputError(source.path, "every cell of the DEM is nodata",
                     "check the nodata value (gdalinfo -stats) or choose another band");
  }

  std::string datum;
  switch (source.datum.kind) {
    case DatumRelation::Kind::unstated:
      throw InputError("DEM datum",
                       "the relation between the DEM's vertical datum and the water-level datum is "
                       "not stated",
                       "give --datum-offset M, --datum-offset-raster FILE, or --same-datum if they "
                       "are the same");
    case DatumRelation::Kind::same:
      datum = "DEM datum = water-level datum (stated by the user)";
      break;
    case DatumRelation::Kind::constant:
      dem.constant_offset_m = source.datum.offset_m;
      datum = "z_water = z_dem + " + number(source.datum.offset_m) + " m (constant offset)";
      break;
    case DatumRelation::Kind::raster: {
      dem.offset_m =
          resample_to_grid(source.datum.raster_path, dem.grid, "bilinear", "datum offset raster");
      std::size_t uncovered = 0;
      for (std::size_t i = 0; i < n; ++i) {
        if (!std::isnan(dem.elevation_m[i]) && std::isnan(dem.offset_m[i])) ++uncovered;
      }
      if (uncovered > 0) {
        throw InputError(source.datum.raster_path,
                         "the datum offset raster does not cover " + std::to_string(uncovered) +
                             " valid DEM cells",
                         "give an offset raster whose extent covers the whole DEM");
      }
      datum = "z_water = z_dem + offset from " + source.datum.raster_path +
              " (bilinear resampling to the DEM grid)";
      break;
    }
  }
  for (std::size_t i = 0; i < n; ++i) {
    if (!std::isnan(dem.elevation_m[i])) {
      dem.elevation_m[i] =
          static_cast<float>(static_cast<double>(dem.elevation_m[i]) + dem.offset_at(i));
    }
  }
  dem.description =
      source.path + " band " + std::to_string(source.band) + " (" +
      std::to_string(dem.grid.shape.cols) + " x " + std::to_string(dem.grid.shape.rows) +
      " cells, " + std::to_string(valid) + " valid; nodata: " +
      (has_nodata != 0 ? number(file_nodata) + " from the file" : "none in the file") +
      (source.nodata ? ", " + number(*source.nodata) + " declared" : "") + "); " + datum;
  return dem;
}

}  // namespace tidewright::terrain
