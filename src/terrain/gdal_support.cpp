// Shared GDAL/OGR helpers of the terrain module (gdal_support.hpp, private to the module).
#include "gdal_support.hpp"

#include <cpl_error.h>

#include <cmath>
#include <filesystem>
#include <mutex>
#include <sstream>

#include "tidewright/common/error.hpp"

namespace tidewright::terrain::gdal {

void register_drivers() {
  static std::once_flag once;
  std::call_once(once, [] { GDALAllRegister(); });
}

std::string number_text(double value) {
  std::ostringstream s;
  s.precision(10);
  s << value;
  return s.str();
}

std::string last_error() {
  std::string msg = CPLGetLastErrorMsg();
  while (!msg.empty() && (msg.back() == '\n' || msg.back() == ' ' || msg.back() == '.')) {
    msg.pop_back();
  }
  for (auto& c : msg) {
    if (c == '\n') c = ' ';
  }
  return msg.empty() ? "no reason given" : msg;
}

namespace {
// GDAL says nothing useful for a missing file; local paths (not /vsi..., URLs or connection
// strings, which hold a ':' or start with /vsi) are checked first.
void require_local_file(const std::string& path, const std::string& role) {
  if (path.rfind("/vsi", 0) == 0 || path.find(':') != std::string::npos) return;
  std::error_code ec;
  if (!std::filesystem::exists(path, ec)) {
    throw InputError(path, "the " + role + " file does not exist", "check the path");
  }
}

GDALDatasetUniquePtr open_quietly(const std::string& path, unsigned flags) {
  register_drivers();
  CPLErrorReset();
  CPLPushErrorHandler(CPLQuietErrorHandler);
  GDALDatasetUniquePtr ds(GDALDataset::Open(path.c_str(), flags | GDAL_OF_READONLY));
  CPLPopErrorHandler();
  return ds;
}
}  // namespace

GDALDatasetUniquePtr open_raster(const std::string& path, const std::string& role) {
  require_local_file(path, role);
  auto ds = open_quietly(path, GDAL_OF_RASTER);
  if (!ds || ds->GetRasterCount() < 1) {
    throw InputError(path, "GDAL cannot open the " + role + " as a raster (" + last_error() + ")",
                     "check the path and that 'gdalinfo " + path + "' reads it");
  }
  return ds;
}

void close_checked(GDALDatasetUniquePtr& ds, const std::string& shown, const std::string& what) {
  CPLErrorReset();
  if (ds) ds->FlushCache(true);
  ds.reset();
  if (CPLGetLastErrorType() >= CE_Failure) {
    throw InputError(shown, what + " failed (" + last_error() + ")", "free disk space or choose another folder");
  }
}

GDALDatasetUniquePtr open_vector(const std::string& path, const std::string& role) {
  require_local_file(path, role);
  auto ds = open_quietly(path, GDAL_OF_VECTOR);
  if (!ds || ds->GetLayerCount() < 1) {
    throw InputError(path,
                     "GDAL cannot open the " + role + " as a vector layer (" + last_error() + ")",
                     "check the path and that 'ogrinfo " + path + "' reads it");
  }
  return ds;
}

bool is_vector(const std::string& path) {
  auto ds = open_quietly(path, GDAL_OF_VECTOR);
  return ds && ds->GetLayerCount() > 0;
}

GDALDatasetUniquePtr mem_raster(const GeoGrid& grid, GDALDataType type, int bands, double fill) {
  register_drivers();
  GDALDriver* mem = GetGDALDriverManager()->GetDriverByName("MEM");
  GDALDatasetUniquePtr ds(mem->Create("", static_cast<int>(grid.shape.cols),
                                      static_cast<int>(grid.shape.rows), bands, type, nullptr));
  if (!ds) throw std::bad_alloc();
  std::array<double, 6> gt = grid.geotransform;
  ds->SetGeoTransform(gt.data());
  ds->SetProjection(grid.crs_wkt.c_str());
  for (int b = 1; b <= bands; ++b) {
    ds->GetRasterBand(b)->SetNoDataValue(fill);
    ds->GetRasterBand(b)->Fill(fill);
  }
  return ds;
}

OGRSpatialReference grid_srs(const GeoGrid& grid) {
  OGRSpatialReference srs;
  srs.importFromWkt(grid.crs_wkt.c_str());
  srs.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
  return srs;
}

std::vector<LayerGeometry> layer_geometries(OGRLayer& layer, const GeoGrid& grid,
                                            const std::string& path) {
  const OGRSpatialReference* layer_srs = layer.GetSpatialRef();
  if (layer_srs == nullptr) {
    throw InputError(
        path, "layer '" + std::string(layer.GetName()) + "' has no coordinate reference system",
        "give the file a CRS (e.g. ogr2ogr -a_srs EPSG:XXXX) so it can be placed "
        "on the DEM");
  }
  OGRSpatialReference source = *layer_srs;
  source.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
  OGRSpatialReference target = grid_srs(grid);
  std::unique_ptr<OGRCoordinateTransformation> transform;
  if (!source.IsSame(&target)) {
    transform.reset(OGRCreateCoordinateTransformation(&source, &target));
    if (!transform) {
      throw InputError(path,
                       "layer '" + std::string(layer.GetName()) +
                           "' cannot be reprojected to the DEM's CRS (" + last_error() + ")",
                       "reproject it to the DEM's CRS with ogr2ogr -t_srs");
    }
  }
  std::vector<LayerGeometry> out;
  layer.ResetReading();
  for (auto& feature : layer) {
    const OGRGeometry* g = feature->GetGeometryRef();
    if (g == nullptr || g->IsEmpty()) continue;
    std::unique_ptr<OGRGeometry> copy(g->clone());
    if (transform && copy->transform(transform.get()) != OGRERR_NONE) {
      throw InputError(path + ": feature " + std::to_string(feature->GetFID()),
                       "cannot be reprojected to the DEM's CRS",
                       "check the layer's CRS, or reproject it with ogr2ogr -t_srs");
    }
    out.push_back({std::move(copy), feature->GetFID()});
  }
  return out;
}

}  // namespace tidewright::terrain::gdal
