// Small GDAL files written by the terrain and map tests: GeoTIFF grids and vector layers.
#pragma once

#include <gdal_priv.h>
#include <ogrsf_frmts.h>

#include <array>
#include <optional>
#include <stdexcept>
#include <string>
#include <utility>
#include <vector>

namespace tidewright::testing {

// A UTM zone 33N grid with 10 m cells whose top-left corner is (500000, 6000000).
inline constexpr std::array<double, 6> utm_10m{500000.0, 10.0, 0.0, 6000000.0, 0.0, -10.0};

inline void write_raster(const std::string& path, int cols, int rows,
                         const std::array<double, 6>& geotransform, int epsg,
                         const std::vector<double>& values, std::optional<double> nodata = {},
                         GDALDataType type = GDT_Float32) {
  GDALAllRegister();
  GDALDriver* drv = GetGDALDriverManager()->GetDriverByName("GTiff");
  GDALDatasetUniquePtr ds(drv->Create(path.c_str(), cols, rows, 1, type, nullptr));
  std::array<double, 6> gt = geotransform;
  ds->SetGeoTransform(gt.data());
  if (epsg != 0) {
    OGRSpatialReference srs;
    srs.importFromEPSG(epsg);
    ds->SetSpatialRef(&srs);
  }
  GDALRasterBand* b = ds->GetRasterBand(1);
  if (nodata) b->SetNoDataValue(*nodata);
  std::vector<double> v = values;
  if (b->RasterIO(GF_Write, 0, 0, cols, rows, v.data(), cols, rows, GDT_Float64, 0, 0, nullptr) !=
      CE_None) {
    throw std::runtime_error("test fixture: cannot write " + path);
  }
}

struct VectorFeature {
  std::string wkt;
  std::optional<double> crest_m;
};

// A layer "layer" with an optional real attribute `field` (empty: no attribute).
inline void write_vector(const std::string& path, const std::string& driver, int epsg,
                         const std::vector<VectorFeature>& features,
                         const std::string& field = "crest_m") {
  GDALAllRegister();
  GDALDriver* drv = GetGDALDriverManager()->GetDriverByName(driver.c_str());
  GDALDatasetUniquePtr ds(drv->Create(path.c_str(), 0, 0, 0, GDT_Unknown, nullptr));
  OGRSpatialReference srs;
  srs.importFromEPSG(epsg);
  srs.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
  OGRLayer* layer = ds->CreateLayer("layer", &srs, wkbUnknown, nullptr);
  if (!field.empty()) {
    OGRFieldDefn f(field.c_str(), OFTReal);
    layer->CreateField(&f);
  }
  OGRFieldDefn name("name", OFTString);
  layer->CreateField(&name);
  for (const auto& feature : features) {
    OGRFeature f(layer->GetLayerDefn());
    OGRGeometry* g = nullptr;
    OGRGeometryFactory::createFromWkt(feature.wkt.c_str(), &srs, &g);
    f.SetGeometryDirectly(g);
    if (!field.empty() && feature.crest_m) f.SetField(field.c_str(), *feature.crest_m);
    f.SetField("name", "test");
    if (layer->CreateFeature(&f) != OGRERR_NONE) {
      throw std::runtime_error("test fixture: cannot write a feature to " + path);
    }
  }
}

}  // namespace tidewright::testing
