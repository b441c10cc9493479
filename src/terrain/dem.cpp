// Reading a DEM and its datum relation (include/tidewright/terrain/dem.hpp).
#include "tidewright/terrain/dem.hpp"

#include <gdal_utils.h>

#include <unistd.h>

#include <algorithm>
#include <cctype>
#include <cmath>
#include <fstream>
#include <limits>
#include <optional>
#include <sstream>
#include <utility>
#include <vector>

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

namespace {

std::string lower(std::string s) {
  std::transform(s.begin(), s.end(), s.begin(),
                 [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
  return s;
}

struct VerticalScale {
  double metres_per_unit = 1.0;
  std::string text;    // for the metadata record
  bool stated = true;  // false: no unit anywhere, metres assumed
};

// The vertical unit: the caller's statement, else the band's unit type, else the vertical part
// of a compound CRS; an unknown unit is refused rather than read as metres.
VerticalScale vertical_scale(const DemSource& source, GDALRasterBand& band,
                             const OGRSpatialReference& crs) {
  if (!source.z_units.empty() && source.z_factor) {
    throw InputError(source.z_units_name, "is given together with " + source.z_factor_name,
                     "give one: a unit name or the metres per unit");
  }
  if (source.z_factor) {
    if (!std::isfinite(*source.z_factor) || *source.z_factor <= 0.0) {
      throw InputError(source.z_factor_name, "must be a positive number of metres per unit",
                       "e.g. 0.3048 for feet, 0.01 for centimetres");
    }
    return {*source.z_factor, number(*source.z_factor) + " m per unit (stated)"};
  }
  if (!source.z_units.empty()) {
    const auto f = metres_per_vertical_unit(source.z_units);
    if (!f) {
      throw InputError(source.z_units_name, "'" + source.z_units + "' is not a vertical unit tidewright knows",
                       "give m, ft, us-ft, cm or mm, or the metres per unit with " +
                           source.z_factor_name);
    }
    return {*f, source.z_units + " (stated)"};
  }
  const char* band_unit = band.GetUnitType();
  if (band_unit != nullptr && *band_unit != '\0') {
    const auto f = metres_per_vertical_unit(band_unit);
    if (!f) {
      throw InputError(source.path,
                       "the band's vertical unit '" + std::string(band_unit) + "' is not one tidewright knows",
                       "state it with " + source.z_units_name + " (m, ft, us-ft, cm, mm) or " +
                           source.z_factor_name + " M_PER_UNIT");
    }
    return {*f, std::string(band_unit) + " (the band's unit)"};
  }
  if (crs.IsCompound()) {
    const char* name = nullptr;
    const double f = crs.GetTargetLinearUnits("VERT_CS", &name);
    if (f > 0.0 && std::isfinite(f)) {
      return {f, std::string(name != nullptr ? name : "unit") + " (the vertical CRS's unit)"};
    }
  }
  return {1.0, "metres (assumed: neither the band nor the CRS names a vertical unit)", false};
}

// Values that look like centimetres or feet where no unit was given: an integer band without a
// scale factor spanning more than 100 units (metre DEMs are stored as floats or scaled integers;
// whole metres cannot resolve a coast), or valid values spanning more than 1,000 units (no
// coastal DEM in metres spans a kilometre of height): common practice.
// Fill values that DEM producers write for "no data" (common practice): when one of them sits on
// more than max_undeclared_fill_cells cells without being declared nodata, the cells are
// elevations of thousands of metres or deep holes, and the map is wrong. Judged on stored values.
constexpr float common_fill_values[] = {-9999.0F, -32768.0F, -32767.0F, -99999.0F, 9999.0F, 32767.0F,
                                        -3.4028234663852886e38F, 3.4028234663852886e38F};
constexpr std::size_t max_undeclared_fill_cells = 3;

std::optional<std::string> undeclared_fill(const std::vector<float>& stored, const std::string& nodata_name) {
  for (const float fill : common_fill_values) {
    const auto n = static_cast<std::size_t>(std::count(stored.begin(), stored.end(), fill));
    if (n > max_undeclared_fill_cells) {
      return std::to_string(n) + " cells hold " + number(static_cast<double>(fill)) +
             ", a common no-data value, but it is not declared nodata: they are mapped as elevations "
             "(declare it with " + nodata_name + " " + number(static_cast<double>(fill)) + ")";
    }
  }
  return std::nullopt;
}

std::optional<std::string> unit_suspicion(const std::vector<float>& z, GDALDataType type, bool scaled,
                                          const std::string& z_units_name) {
  float lo = std::numeric_limits<float>::infinity();
  float hi = -lo;
  for (const float v : z) {
    if (!std::isnan(v)) {
      lo = std::min(lo, v);
      hi = std::max(hi, v);
    }
  }
  constexpr double integer_span_limit = 100.0;
  constexpr double span_limit = 1000.0;
  const double span = static_cast<double>(hi) - static_cast<double>(lo);
  const bool integer = GDALDataTypeIsInteger(type) != 0 && !scaled && span > integer_span_limit;
  const bool wide = span > span_limit;
  if (!integer && !wide) return std::nullopt;
  return std::string("no vertical unit is recorded, so elevations are read as metres, but they "
                     "look like centimetres or feet (") +
         (integer ? "an integer band with no scale factor spanning more than 100 units" : "") +
         (integer && wide ? ", " : "") +
         (wide ? "values spanning " + number(static_cast<double>(hi) - static_cast<double>(lo)) +
                     " units, more than 1000"
               : "") +
         "); state the unit with " + z_units_name + " (m, ft, us-ft, cm, mm) to be sure";
}

}  // namespace

std::optional<double> metres_per_vertical_unit(const std::string& name) {
  // Foot definitions: international foot 0.3048 m exactly; US survey foot 1200/3937 m
  // (NIST Handbook 44, Appendix C).
  static const std::vector<std::pair<std::vector<std::string>, double>> units = {
      {{"m", "metre", "meter", "metres", "meters"}, 1.0},
      {{"ft", "foot", "feet", "international foot"}, 0.3048},
      {{"us-ft", "us_ft", "ftus", "us survey foot", "foot_us", "us-foot"}, 1200.0 / 3937.0},
      {{"cm", "centimetre", "centimeter", "centimetres", "centimeters"}, 0.01},
      {{"mm", "millimetre", "millimeter", "millimetres", "millimeters"}, 0.001},
  };
  const std::string key = lower(name);
  for (const auto& [names, factor] : units) {
    if (std::find(names.begin(), names.end(), key) != names.end()) return factor;
  }
  return std::nullopt;
}

namespace {

// The horizontal part of a compound CRS: outputs hold metres above the water-level datum,
// so they must not carry the DEM's vertical datum.
std::string horizontal_wkt(OGRSpatialReference crs) {
  if (crs.IsCompound()) crs.StripVertical();
  char* wkt = nullptr;
  const char* wkt_options[] = {"FORMAT=WKT2_2019", nullptr};
  crs.exportToWkt(&wkt, wkt_options);
  std::string text = wkt != nullptr ? wkt : "";
  CPLFree(wkt);
  return text;
}

}  // namespace

namespace {

const std::string& recorded_name(const DemSource& s) { return s.recorded_as.empty() ? s.path : s.recorded_as; }

struct PixelWindow {
  int col0 = 0;
  int row0 = 0;
  int cols = 0;
  int rows = 0;
};

// The cells of the DEM's grid (its full size on entry) that a window in its CRS covers, widened
// to whole cells; the whole grid without a window.
PixelWindow pixel_window(const DemSource& source, const GeoGrid& grid) {
  const auto& gt = grid.geotransform;
  PixelWindow all{0, 0, static_cast<int>(grid.shape.cols), static_cast<int>(grid.shape.rows)};
  if (!source.window) return all;
  const auto [ulx, uly, lrx, lry] = *source.window;
  const std::string where = source.window_name + " " + number(ulx) + " " + number(uly) + " " + number(lrx) + " " +
                            number(lry);
  if (gt[2] != 0.0 || gt[4] != 0.0) {
    throw InputError(where, "the DEM's grid is rotated, so a window in its CRS is not a block of cells",
                     "warp the DEM north-up first (gdalwarp)");
  }
  if (!(ulx < lrx) || !((uly - lry) * -gt[5] > 0.0)) {
    throw InputError(where, "is not upper-left then lower-right", "give ULX ULY LRX LRY with ULX < LRX and ULY > LRY");
  }
  const double c0 = std::floor((ulx - gt[0]) / gt[1] + 1e-9);
  const double c1 = std::ceil((lrx - gt[0]) / gt[1] - 1e-9);
  const double r0 = std::floor((uly - gt[3]) / gt[5] + 1e-9);
  const double r1 = std::ceil((lry - gt[3]) / gt[5] - 1e-9);
  if (c0 < 0.0 || r0 < 0.0 || c1 > static_cast<double>(all.cols) || r1 > static_cast<double>(all.rows)) {
    const double x1 = gt[0] + gt[1] * all.cols;
    const double y1 = gt[3] + gt[5] * all.rows;
    throw InputError(where, "reaches outside the DEM (" + number(gt[0]) + " " + number(gt[3]) + " " + number(x1) + " " +
                                number(y1) + ")",
                     "give a window inside the DEM's extent (gdalinfo shows it)");
  }
  return {static_cast<int>(c0), static_cast<int>(r0), static_cast<int>(c1 - c0), static_cast<int>(r1 - r0)};
}

// The DEM's CRS: the file's own, else the caller's override; InputError without either.
OGRSpatialReference dem_crs(GDALDataset& ds, const DemSource& source) {
  const OGRSpatialReference* srs = ds.GetSpatialRef();
  OGRSpatialReference chosen;
  if (srs != nullptr) return *srs;
  if (!source.crs_override.empty()) {
    if (chosen.SetFromUserInput(source.crs_override.c_str()) != OGRERR_NONE) {
      throw InputError(source.crs_name, "'" + source.crs_override + "' is not a CRS GDAL knows",
                       "give an EPSG code such as EPSG:32633 or a WKT string");
    }
    return chosen;
  }
  throw InputError(source.path,
                   "the DEM has no coordinate reference system, so neither areas nor the sea "
                   "and defence layers can be placed on it",
                   "assign one (gdal_edit.py -a_srs EPSG:XXXX) or give one with " + source.crs_name);
}

// The window's values as float32, a block of rows at a time, dropping GDAL's cached copy of
// each so that reading does not hold the DEM twice (our grid plus GDAL's block cache).
void read_elevations(GDALRasterBand& band, const PixelWindow& win, const std::string& path, std::vector<float>& out) {
  const int cols = win.cols;
  const int rows = win.rows;
  constexpr int rows_per_read = 256;
  for (int r0 = 0; r0 < rows; r0 += rows_per_read) {
    const int h = std::min(rows_per_read, rows - r0);
    float* dest = out.data() + static_cast<std::size_t>(r0) * static_cast<std::size_t>(cols);
    if (band.RasterIO(GF_Read, win.col0, win.row0 + r0, cols, h, dest, cols, h, GDT_Float32, 0, 0, nullptr) !=
        CE_None) {
      throw InputError(path, "reading the DEM failed (" + gdal::last_error() + ")",
                       "check the file with gdalinfo -checksum");
    }
    band.FlushCache(false);
  }
}

struct NodataCount {
  bool file_has_nodata = false;
  double file_nodata = 0.0;
  std::size_t valid = 0;
};

// The file's and the caller's nodata become NaN (compared after conversion to float32, as the
// values were read: exact for integers); a warning for a common fill value left undeclared.
NodataCount mark_nodata(Dem& dem, GDALRasterBand& band, const DemSource& source) {
  NodataCount n;
  int has_nodata = 0;
  n.file_nodata = band.GetNoDataValue(&has_nodata);
  n.file_has_nodata = has_nodata != 0;
  const auto is_declared = [&](float v) {
    return (n.file_has_nodata && v == static_cast<float>(n.file_nodata)) ||
           (source.nodata && v == static_cast<float>(*source.nodata));
  };
  if (auto w = undeclared_fill(dem.elevation_m, source.nodata_name)) {
    // Only values not declared: a declared nodata of -9999 is fine.
    const bool declared_fill = std::any_of(std::begin(common_fill_values), std::end(common_fill_values),
                                           [&](float f) { return is_declared(f); });
    if (!declared_fill) dem.warnings.push_back(recorded_name(source) + ": " + *w);
  }
  for (auto& v : dem.elevation_m) {
    if (std::isnan(v) || is_declared(v)) {
      v = nan_f;
    } else {
      ++n.valid;
    }
  }
  if (n.valid == 0) {
    throw InputError(source.path, "every cell of the DEM is nodata",
                     "check the nodata value (gdalinfo -stats) or choose another band");
  }
  return n;
}

// GDAL's scale and offset turn stored values into the band's unit (nodata is a stored value, so
// it was matched before), then the unit's metres; sets the vertical unit's description and warns
// when an unstated unit looks like another.
void apply_vertical_scale(Dem& dem, GDALRasterBand& band, const VerticalScale& vertical, const DemSource& source) {
  int has_scale = 0;
  int has_offset = 0;
  const double scale = band.GetScale(&has_scale);
  const double offset = band.GetOffset(&has_offset);
  const bool scaled = (has_scale != 0 && scale != 1.0) || (has_offset != 0 && offset != 0.0);
  const double a = (has_scale != 0 ? scale : 1.0) * vertical.metres_per_unit;
  const double b = (has_offset != 0 ? offset : 0.0) * vertical.metres_per_unit;
  if (a != 1.0 || b != 0.0) {
    for (auto& v : dem.elevation_m) {
      if (!std::isnan(v)) v = static_cast<float>(static_cast<double>(v) * a + b);
    }
  }
  // Judged on the band's values after its scale and offset (the unit is metres, assumed).
  if (!vertical.stated) {
    if (auto w = unit_suspicion(dem.elevation_m, band.GetRasterDataType(), scaled, source.z_units_name)) {
      dem.warnings.push_back(recorded_name(source) + ": " + *w);
    }
  }
  dem.vertical_unit = vertical.text;
  if (scaled) {
    dem.vertical_unit += "; band scale " + number(has_scale != 0 ? scale : 1.0) + ", offset " +
                         number(has_offset != 0 ? offset : 0.0);
  }
}

// Elevations into heights above the water-level datum; returns how, for the description.
std::string apply_datum(Dem& dem, const DemSource& source) {
  std::string datum;
  switch (source.datum.kind) {
    case DatumRelation::Kind::unstated:
      throw InputError("DEM datum",
                       "the relation between the DEM's vertical datum and the water-level datum is "
                       "not stated",
                       "give " + source.datum_names);
    case DatumRelation::Kind::same:
      datum = "DEM datum = water-level datum (stated by the user)";
      break;
    case DatumRelation::Kind::constant:
      dem.constant_offset_m = source.datum.offset_m;
      datum = "z_water = z_dem + " + number(source.datum.offset_m) + " m (constant offset)";
      break;
    case DatumRelation::Kind::raster: {
      dem.offset_m = resample_to_grid(source.datum.raster_path, dem.grid, "bilinear", "datum offset raster");
      std::size_t uncovered = 0;
      for (std::size_t i = 0; i < dem.elevation_m.size(); ++i) {
        if (!std::isnan(dem.elevation_m[i]) && std::isnan(dem.offset_m[i])) ++uncovered;
      }
      if (uncovered > 0) {
        throw InputError(source.datum.raster_path,
                         "the datum offset raster does not cover " + std::to_string(uncovered) + " valid DEM cells",
                         "give an offset raster whose extent covers the whole DEM");
      }
      datum = "z_water = z_dem + offset from " + source.datum.raster_path + " (bilinear resampling to the DEM grid)";
      break;
    }
  }
  for (std::size_t i = 0; i < dem.elevation_m.size(); ++i) {
    if (!std::isnan(dem.elevation_m[i])) {
      dem.elevation_m[i] = static_cast<float>(static_cast<double>(dem.elevation_m[i]) + dem.offset_at(i));
    }
  }
  return datum;
}

}  // namespace

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
  const OGRSpatialReference chosen = dem_crs(*ds, source);
  dem.grid.crs_wkt = horizontal_wkt(chosen);
  const PixelWindow win = pixel_window(source, dem.grid);
  dem.grid.shape = {static_cast<std::size_t>(win.cols), static_cast<std::size_t>(win.rows)};
  dem.grid.geotransform[0] += win.col0 * dem.grid.geotransform[1];
  dem.grid.geotransform[3] += win.row0 * dem.grid.geotransform[5];

  GDALRasterBand* band = ds->GetRasterBand(source.band);
  const VerticalScale vertical = vertical_scale(source, *band, chosen);
  check_fits_in_memory(source.path, dem.grid.shape.cols, dem.grid.shape.rows);
  dem.elevation_m.resize(dem.grid.shape.cells());
  read_elevations(*band, win, source.path, dem.elevation_m);
  const NodataCount nodata = mark_nodata(dem, *band, source);
  apply_vertical_scale(dem, *band, vertical, source);
  const std::string datum = apply_datum(dem, source);
  dem.description =
      recorded_name(source) + " band " + std::to_string(source.band) + " (" +
      std::to_string(dem.grid.shape.cols) + " x " + std::to_string(dem.grid.shape.rows) + " cells" +
      (source.window ? " of the window " + number((*source.window)[0]) + " " + number((*source.window)[1]) + " " +
                           number((*source.window)[2]) + " " + number((*source.window)[3])
                     : std::string()) +
      ", " + std::to_string(nodata.valid) + " valid; nodata: " +
      (nodata.file_has_nodata ? number(nodata.file_nodata) + " from the file" : "none in the file") +
      (source.nodata ? ", " + number(*source.nodata) + " declared" : "") + "); vertical unit: " +
      dem.vertical_unit + "; " + datum;
  return dem;
}

}  // namespace tidewright::terrain
