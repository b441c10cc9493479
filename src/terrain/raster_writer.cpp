// GeoTIFF output (include/tidewright/terrain/raster_writer.hpp).
#include "tidewright/terrain/raster_writer.hpp"

#include <cpl_string.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <limits>
#include <filesystem>
#include <string>
#include <vector>

#include "tidewright/common/atomic_output.hpp"
#include "tidewright/common/error.hpp"
#include "gdal_support.hpp"

namespace tidewright::terrain {

// Exact statistics of a band gathered as its rows pass, so that no band is read back for them:
// sums of the values shifted by the first one (the shifted-data algorithm, Chan, Golub &
// LeVeque 1983, Am. Stat. 37:242), which keeps the variance accurate without a division per
// value; population standard deviation, as GDAL reports it.
struct BandStatistics {
  std::size_t count = 0;
  double shift = 0.0;
  double sum = 0.0;
  double sum_squares = 0.0;
  double min = std::numeric_limits<double>::infinity();
  double max = -std::numeric_limits<double>::infinity();
  [[nodiscard]] double mean() const { return shift + sum / static_cast<double>(count); }
  [[nodiscard]] double sd() const {
    const double n = static_cast<double>(count);
    return std::sqrt(std::max(0.0, (sum_squares - sum * sum / n) / n));
  }
};

struct GeoTiffWriter::Impl {
  std::filesystem::path path;       // final file
  std::filesystem::path tiff_path;  // where the GTiff driver writes (a side file for COG)
  GeoGrid grid;
  GDALDataType type = GDT_Float32;
  RasterFormat format;
  double nodata = 0.0;
  GDALDatasetUniquePtr ds;
  std::vector<BandStatistics> statistics;

  template <typename T>
  void gather(std::size_t band, const void* values, std::size_t n) {
    const T* v = static_cast<const T*>(values);
    BandStatistics& s = statistics[band];
    std::size_t count = 0;
    double sum = 0.0, squares = 0.0, lo = s.min, hi = s.max;
    for (std::size_t k = 0; k < n; ++k) {
      const double x = static_cast<double>(v[k]);
      if (std::isnan(x) || x == nodata) continue;
      if (s.count == 0 && count == 0) s.shift = x;
      const double d = x - s.shift;
      ++count;
      sum += d;
      squares += d * d;
      lo = std::min(lo, x);
      hi = std::max(hi, x);
    }
    s.count += count;
    s.sum += sum;
    s.sum_squares += squares;
    s.min = lo;
    s.max = hi;
  }
};

namespace {

GDALDataType gdal_type(CellType t) {
  switch (t) {
    case CellType::byte:
      return GDT_Byte;
    case CellType::int16:
      return GDT_Int16;
    case CellType::float32:
      return GDT_Float32;
  }
  return GDT_Float32;
}

const char* compression_name(Compression c) { return c == Compression::zstd ? "ZSTD" : "DEFLATE"; }

std::string thread_option(const RasterFormat& f) {
  return f.compression_threads == 0 ? "ALL_CPUS" : std::to_string(f.compression_threads);
}

// Colour table and category names of a class band; the nodata entry is transparent.
void set_classes(GDALRasterBand& band, const std::vector<MapClass>& classes, double nodata) {
  GDALColorTable table;
  CPLStringList names;
  int top = 0;
  for (const auto& c : classes) top = std::max(top, c.code);
  for (int code = 0; code <= top; ++code) names.AddString("");
  for (const auto& c : classes) {
    const auto hex = std::string(c.colour_hex);
    const GDALColorEntry e{static_cast<short>(std::stoi(hex.substr(1, 2), nullptr, 16)),
                           static_cast<short>(std::stoi(hex.substr(3, 2), nullptr, 16)),
                           static_cast<short>(std::stoi(hex.substr(5, 2), nullptr, 16)), 255};
    table.SetColorEntry(c.code, &e);
    CPLFree(names.List()[c.code]);
    names.List()[c.code] = CPLStrdup(std::string(c.label).c_str());
  }
  const GDALColorEntry clear{0, 0, 0, 0};
  table.SetColorEntry(static_cast<int>(nodata), &clear);
  band.SetColorTable(&table);
  band.SetCategoryNames(names.List());
}

// Internal overviews (factors 2, 4, ... until the coarsest fits one 256-cell tile), so a GIS
// draws a large map at once.
void add_overviews(const std::filesystem::path& path, GDALDataType type, const RasterFormat& format) {
  GDALDatasetUniquePtr ds(GDALDataset::Open(path.c_str(), GDAL_OF_RASTER | GDAL_OF_UPDATE));
  if (!ds) throw InputError(shown_path(path), "cannot be reopened (" + gdal::last_error() + ")", "check the folder");
  std::vector<int> factors;
  const int size = std::max(ds->GetRasterXSize(), ds->GetRasterYSize());
  for (int f = 2; size / f >= 256 || (factors.empty() && size > 256); f *= 2) factors.push_back(f);
  if (!factors.empty()) {
    // Compressed as the file itself, including a user's COMPRESS creation option.
    std::string compress = compression_name(format.compression);
    for (const auto& option : format.creation_options) {
      if (EQUAL(option.first.c_str(), "COMPRESS")) compress = option.second;
    }
    CPLSetThreadLocalConfigOption("COMPRESS_OVERVIEW", compress.c_str());
    CPLSetThreadLocalConfigOption("PREDICTOR_OVERVIEW", type == GDT_Float32 ? "3" : "2");
    CPLSetThreadLocalConfigOption("GDAL_NUM_THREADS", thread_option(format).c_str());
    // GDAL's block cache (5 % of RAM by default) would hold every band's tiles while the
    // overviews are made: 1.6 GB peak for 20 levels of 25 million cells, 0.46 GB with 64 MB,
    // at the same speed (docs/performance.md, "Maps").
    const GIntBig cache = GDALGetCacheMax64();
    GDALSetCacheMax64(std::min<GIntBig>(cache, GIntBig{64} << 20));
    const CPLErr err = ds->BuildOverviews(type == GDT_Float32 ? "AVERAGE" : "NEAREST", static_cast<int>(factors.size()),
                                          factors.data(), 0, nullptr, nullptr, nullptr, nullptr);
    CPLSetThreadLocalConfigOption("COMPRESS_OVERVIEW", nullptr);
    CPLSetThreadLocalConfigOption("PREDICTOR_OVERVIEW", nullptr);
    CPLSetThreadLocalConfigOption("GDAL_NUM_THREADS", nullptr);
    GDALSetCacheMax64(cache);
    if (err != CE_None) {
      throw InputError(shown_path(path), "building overviews failed (" + gdal::last_error() + ")",
                       "free disk space or choose another folder");
    }
  }
  gdal::close_checked(ds, shown_path(path), "writing the overviews");
}

// The user's options over `defaults`: a key given replaces the default's value (keys compared
// without case, as GDAL does), a new key is added.
std::vector<std::pair<std::string, std::string>> with_user_options(
    std::vector<std::pair<std::string, std::string>> defaults,
    const std::vector<std::pair<std::string, std::string>>& user) {
  for (const auto& option : user) {
    const auto same = std::find_if(defaults.begin(), defaults.end(),
                                   [&](const auto& d) { return EQUAL(d.first.c_str(), option.first.c_str()); });
    if (same != defaults.end()) same->second = option.second;
    else defaults.push_back(option);
  }
  return defaults;
}

// InputError unless every user option is one the driver lists.
void check_user_options(const char* driver_name, const std::vector<std::pair<std::string, std::string>>& user) {
  if (user.empty()) return;
  GDALDriver* driver = GetGDALDriverManager()->GetDriverByName(driver_name);
  if (driver == nullptr) return;
  for (const auto& [key, value] : user) {
    CPLStringList one;
    one.SetNameValue(key.c_str(), value.c_str());
    CPLErrorReset();
    CPLPushErrorHandler(CPLQuietErrorHandler);
    const int valid = GDALValidateCreationOptions(driver, one.List());
    CPLPopErrorHandler();
    if (valid == FALSE) {
      throw InputError("creation option " + key + "=" + value,
                       std::string("is not one the ") + driver_name + " driver takes (" + gdal::last_error() + ")",
                       std::string("see 'gdalinfo --format ") + driver_name + "' for its options");
    }
  }
}

std::vector<std::pair<std::string, std::string>> geotiff_defaults(CellType type, const RasterFormat& format,
                                                                  bool palette) {
  return {{"TILED", "YES"},
          {"BLOCKXSIZE", "256"},
          {"BLOCKYSIZE", "256"},
          {"COMPRESS", compression_name(format.compression)},
          {"PREDICTOR", type == CellType::float32 ? "3" : "2"},
          {"INTERLEAVE", "BAND"},
          // Bands are levels or years, not colours: without this GDAL tags a 3- or 4-band Byte
          // file RGB(A) and a desktop GIS draws extent.tif as a picture.
          {"PHOTOMETRIC", palette ? "PALETTE" : "MINISBLACK"},
          {"BIGTIFF", "IF_SAFER"},
          {"NUM_THREADS", thread_option(format)}};
}

}  // namespace

std::vector<std::pair<std::string, std::string>> geotiff_creation_options(
    CellType type, const RasterFormat& format, bool palette) {
  // With COG the user's options are the COG driver's (finish()); the tiled file takes defaults.
  const auto user = format.cloud_optimized ? std::vector<std::pair<std::string, std::string>>{}
                                           : format.creation_options;
  return with_user_options(geotiff_defaults(type, format, palette), user);
}

GeoTiffWriter::GeoTiffWriter(std::filesystem::path path, const GeoGrid& grid, CellType type,
                             double nodata, const std::vector<BandInfo>& bands,
                             const std::vector<std::pair<std::string, std::string>>& metadata,
                             RasterFormat format)
    : impl_(std::make_unique<Impl>()) {
  gdal::register_drivers();
  impl_->path = std::move(path);
  impl_->grid = grid;
  impl_->type = gdal_type(type);
  impl_->format = format;
  impl_->tiff_path = impl_->path;
  impl_->nodata = nodata;
  impl_->statistics.resize(bands.size());
  if (format.cloud_optimized) impl_->tiff_path += ".tiled.tif";
  check_user_options(format.cloud_optimized ? "COG" : "GTiff", format.creation_options);
  const bool palette = bands.size() == 1 && !bands.front().classes.empty();
  for (const auto& b : bands) {
    if (!b.classes.empty() && (!palette || type != CellType::byte)) {
      throw ComputationError(shown_path(impl_->path), "a colour table needs a single-band Byte raster",
                             "report this as a bug");
    }
  }
  CPLStringList options;
  for (const auto& [name, value] : geotiff_creation_options(type, format, palette)) {
    options.SetNameValue(name.c_str(), value.c_str());
  }
  GDALDriver* driver = GetGDALDriverManager()->GetDriverByName("GTiff");
  CPLErrorReset();
  impl_->ds.reset(driver->Create(impl_->tiff_path.c_str(), static_cast<int>(grid.shape.cols),
                                 static_cast<int>(grid.shape.rows), static_cast<int>(bands.size()),
                                 impl_->type, options.List()));
  if (!impl_->ds) {
    throw InputError(shown_path(impl_->path), "cannot be created (" + gdal::last_error() + ")",
                     "check the output folder's space and permissions");
  }
  std::array<double, 6> gt = grid.geotransform;
  impl_->ds->SetGeoTransform(gt.data());
  impl_->ds->SetProjection(grid.crs_wkt.c_str());
  for (const auto& [key, value] : metadata) impl_->ds->SetMetadataItem(key.c_str(), value.c_str());
  for (std::size_t b = 0; b < bands.size(); ++b) {
    GDALRasterBand* band = impl_->ds->GetRasterBand(static_cast<int>(b + 1));
    band->SetNoDataValue(nodata);
    band->SetDescription(bands[b].description.c_str());
    band->SetUnitType(bands[b].units.c_str());
    for (const auto& [key, value] : bands[b].metadata) {
      band->SetMetadataItem(key.c_str(), value.c_str());
    }
    if (!bands[b].classes.empty()) set_classes(*band, bands[b].classes, nodata);
  }
}

GeoTiffWriter::~GeoTiffWriter() = default;

void GeoTiffWriter::write_rows(std::size_t band, std::size_t first_row, std::size_t rows,
                               const void* values) {
  GDALRasterBand* b = impl_->ds->GetRasterBand(static_cast<int>(band + 1));
  const int cols = static_cast<int>(impl_->grid.shape.cols);
  const std::size_t n = rows * impl_->grid.shape.cols;
  switch (impl_->type) {
    case GDT_Byte:
      impl_->gather<std::uint8_t>(band, values, n);
      break;
    case GDT_Int16:
      impl_->gather<std::int16_t>(band, values, n);
      break;
    default:
      impl_->gather<float>(band, values, n);
  }
  if (b->RasterIO(GF_Write, 0, static_cast<int>(first_row), cols, static_cast<int>(rows),
                  const_cast<void*>(values), cols, static_cast<int>(rows), impl_->type, 0, 0,
                  nullptr) != CE_None) {
    throw InputError(shown_path(impl_->path), "writing failed (" + gdal::last_error() + ")",
                     "free disk space or choose another folder");
  }
  // A block of rows completes one row of tiles of this band: write it out now rather than let
  // GDAL's block cache (5% of RAM by default) fill with every band's tiles.
  b->FlushCache(false);
}

void GeoTiffWriter::finish() {
  if (!impl_->ds) return;
  for (std::size_t b = 0; b < impl_->statistics.size(); ++b) {
    const BandStatistics& s = impl_->statistics[b];
    if (s.count == 0) continue;  // an all-nodata band has no statistics
    GDALRasterBand* band = impl_->ds->GetRasterBand(static_cast<int>(b + 1));
    band->SetStatistics(s.min, s.max, s.mean(), s.sd());
    band->SetMetadataItem("STATISTICS_VALID_PERCENT",
                          std::to_string(100.0 * static_cast<double>(s.count) /
                                         static_cast<double>(impl_->grid.shape.cells()))
                              .c_str());
  }
  gdal::close_checked(impl_->ds, shown_path(impl_->path), "writing");
  if (impl_->format.overviews) add_overviews(impl_->tiff_path, impl_->type, impl_->format);
  if (!impl_->format.cloud_optimized) return;
  GDALDatasetUniquePtr tiled(GDALDataset::Open(impl_->tiff_path.c_str(), GDAL_OF_RASTER));
  GDALDriver* cog = GetGDALDriverManager()->GetDriverByName("COG");
  if (!tiled || cog == nullptr) {
    throw InputError(shown_path(impl_->path), "the COG driver is not available in this GDAL",
                     "leave out --cog");
  }
  CPLStringList options;
  for (const auto& [key, value] : with_user_options({{"COMPRESS", compression_name(impl_->format.compression)},
                                                     {"PREDICTOR", "YES"},
                                                     {"BLOCKSIZE", "256"},
                                                     {"BIGTIFF", "IF_SAFER"},
                                                     {"NUM_THREADS", thread_option(impl_->format)},
                                                     {"RESAMPLING", impl_->type == GDT_Float32 ? "AVERAGE" : "NEAREST"}},
                                                    impl_->format.creation_options)) {
    options.SetNameValue(key.c_str(), value.c_str());
  }
  CPLErrorReset();
  GDALDatasetUniquePtr out(
      cog->CreateCopy(impl_->path.c_str(), tiled.get(), FALSE, options.List(), nullptr, nullptr));
  const bool created = static_cast<bool>(out);
  out.reset();
  tiled.reset();
  std::error_code ec;
  std::filesystem::remove(impl_->tiff_path, ec);
  std::filesystem::remove(impl_->tiff_path.string() + ".aux.xml", ec);
  if (!created || CPLGetLastErrorType() >= CE_Failure) {
    throw InputError(shown_path(impl_->path), "writing the COG failed (" + gdal::last_error() + ")",
                     "free disk space or leave out --cog");
  }
}

}  // namespace tidewright::terrain
