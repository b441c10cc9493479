#include "tidewright/terrain/raster_band.hpp"

#include <algorithm>
#include <cmath>

#include "gdal_support.hpp"
#include "tidewright/common/error.hpp"

namespace tidewright::terrain {

BandValues read_band_values(const std::filesystem::path& raster, int band_index) {
  gdal::register_drivers();
  const GDALDatasetUniquePtr ds(GDALDataset::Open(raster.c_str(), GDAL_OF_RASTER | GDAL_OF_READONLY));
  if (!ds) throw ComputationError(raster.string(), "a raster just written cannot be read back", "report this as a bug");
  const int bands = ds->GetRasterCount();
  const int b = band_index < 0 ? bands : std::clamp(band_index + 1, 1, bands);
  GDALRasterBand* band = ds->GetRasterBand(b);
  BandValues v;
  v.columns = ds->GetRasterXSize();
  v.rows = ds->GetRasterYSize();
  double gt[6] = {0, 1, 0, 0, 0, -1};
  ds->GetGeoTransform(gt);
  v.cell_size_m = std::abs(gt[1]);
  v.values.resize(static_cast<std::size_t>(v.columns) * static_cast<std::size_t>(v.rows));
  if (band->RasterIO(GF_Read, 0, 0, v.columns, v.rows, v.values.data(), v.columns, v.rows, GDT_Float32, 0, 0) != CE_None) {
    throw ComputationError(raster.string(), "a raster just written cannot be read back", "report this as a bug");
  }
  int has_nodata = 0;
  const double nd = band->GetNoDataValue(&has_nodata);
  if (has_nodata) v.nodata = static_cast<float>(nd);
  return v;
}

}  // namespace tidewright::terrain
