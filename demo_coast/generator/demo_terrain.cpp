// The synthetic terrain of Quillhaven (INVENTED data; glossary in demo_terrain.hpp, equations and
// the map of features in demo_coast/README.md). The landscape is a sum of simple closed-form
// shapes composed with min (carving) and max (raising), so each designed level is exact.
#include "demo_terrain.hpp"

#include <cpl_conv.h>
#include <cpl_error.h>
#include <gdal_priv.h>
#include <ogr_spatialref.h>
#include <ogrsf_frmts.h>

#include <algorithm>
#include <cmath>
#include <memory>
#include <mutex>
#include <numbers>

#include "demo_place.hpp"
#include "demo_random.hpp"
#include "tidewright/common/atomic_output.hpp"
#include "tidewright/common/error.hpp"

namespace tidewright::demo {
namespace {

constexpr std::uint64_t s_texture_big = 11;
constexpr std::uint64_t s_texture_fine = 12;

// Cubic Hermite step 0 → 1 between e0 and e1 (the GLSL smoothstep), for blending shapes.
double smoothstep(double e0, double e1, double v) {
  const double t = std::clamp((v - e0) / (e1 - e0), 0.0, 1.0);
  return t * t * (3.0 - 2.0 * t);
}

// Value noise (a lattice of seeded values in [−1, 1], interpolated with Perlin's 2002 quintic
// fade 6t⁵ − 15t⁴ + 10t³). Hand-written because it is twenty lines and no Debian library that
// the project already uses offers seeded, portable 2-D noise.
class ValueNoise {
 public:
  ValueNoise(std::uint64_t seed, double spacing_m, double width_m, double height_m)
      : spacing_m_(spacing_m),
        nx_(static_cast<std::size_t>(width_m / spacing_m) + 3),
        ny_(static_cast<std::size_t>(height_m / spacing_m) + 3),
        values_(nx_ * ny_) {
    Draws draws(seed);
    for (auto& v : values_) v = 2.0 * draws.uniform() - 1.0;
  }
  [[nodiscard]] double at(double x_m, double y_m) const {
    const double gx = std::clamp(x_m / spacing_m_, 0.0, static_cast<double>(nx_ - 2) - 1e-9);
    const double gy = std::clamp(y_m / spacing_m_, 0.0, static_cast<double>(ny_ - 2) - 1e-9);
    const auto i = static_cast<std::size_t>(gx);
    const auto j = static_cast<std::size_t>(gy);
    const double fx = fade(gx - static_cast<double>(i));
    const double fy = fade(gy - static_cast<double>(j));
    const double a = values_[j * nx_ + i] * (1 - fx) + values_[j * nx_ + i + 1] * fx;
    const double b = values_[(j + 1) * nx_ + i] * (1 - fx) + values_[(j + 1) * nx_ + i + 1] * fx;
    return a * (1 - fy) + b * fy;
  }

 private:
  static double fade(double t) { return t * t * t * (t * (t * 6.0 - 15.0) + 10.0); }
  double spacing_m_;
  std::size_t nx_;
  std::size_t ny_;
  std::vector<double> values_;
};

// The harbour is laid out square to the shoreline at its centre.
double harbour_y_m() { return coast_y_m(2800.0); }

// River Tamsel's centreline x at northing y (a gentle meander).
double river_x_m(double y_m) { return 1350.0 + 120.0 * std::sin((y_m - 1300.0) / 600.0); }

std::vector<std::array<double, 2>> breakwater_m() {
  const double yh = harbour_y_m();
  return {{2320.0, yh - 60.0}, {2330.0, yh - 380.0}, {2700.0, yh - 460.0}, {3080.0, yh - 420.0}};
}

double distance_to_polyline_m(const std::vector<std::array<double, 2>>& line, double x, double y) {
  double best = 1e300;
  for (std::size_t i = 0; i + 1 < line.size(); ++i) {
    const double ax = line[i][0];
    const double ay = line[i][1];
    const double dx = line[i + 1][0] - ax;
    const double dy = line[i + 1][1] - ay;
    const double t = std::clamp(((x - ax) * dx + (y - ay) * dy) / (dx * dx + dy * dy), 0.0, 1.0);
    best = std::min(best, std::hypot(x - ax - t * dx, y - ay - t * dy));
  }
  return best;
}

// z(x, y) in metres above QCD. n_big, n_fine in [−1, 1] are the texture noise at the point
// (zero for the noise-free design). Every coefficient below is invented for the demo.
double elevation_m(double x, double y, double n_big, double n_fine) {
  const TerrainLevels lv = terrain_levels();
  const double d = y - coast_y_m(x);
  double z = 0.0;
  // 1. Sea bed, beach and land, across the shore.
  if (d < -70.0) {
    // Sea bed deepening towards 22 m below QCD, with ±8 % texture (it stays below zero).
    z = -22.0 * (1.0 - std::exp(-(-d - 70.0) / 900.0)) * (1.0 + 0.08 * n_fine);
  } else if (d < 100.0) {
    z = 2.1 + 0.03 * d;  // beach, slope 1:33, 0 m at d = −70 m, 5.1 m at d = 100 m
  } else {
    z = 5.1 + 0.01 * (d - 100.0);                                      // rising land
    z += 45.0 * smoothstep(600.0, 2600.0, d) * (0.75 + 0.25 * n_big);  // hills inland
    z += 0.3 * n_fine * smoothstep(300.0, 700.0, d);                   // texture
    z += 9.0 * std::exp(-std::pow((x - 3700.0) / 260.0, 2)) *
         smoothstep(100.0, 180.0, d);                                         // Chapel Knoll
    z += 14.0 * smoothstep(5500.0, 5950.0, x) * smoothstep(100.0, 250.0, d);  // Skarrow Head
    // Streets of the town: a grid 12 m wide, 0.25 m below the blocks (a bare-earth DEM shows
    // roads, not buildings), E-W every 110 m inland and N-S every 130 m.
    const double town = smoothstep(1950.0, 2050.0, x) * (1.0 - smoothstep(3300.0, 3400.0, x)) *
                        smoothstep(120.0, 160.0, d) * (1.0 - smoothstep(800.0, 900.0, d));
    if (town > 0.0) {
      const double to_ew = std::abs(std::remainder(d - 150.0, 110.0));
      const double to_ns = std::abs(std::remainder(x - 2000.0, 130.0));
      z -= 0.25 * town * (1.0 - smoothstep(5.0, 7.0, std::min(to_ew, to_ns)));
    }
    // 2. River Tamsel's floodplain and valley sides, rising 0.8 m per km inland.
    const double dist = std::abs(x - river_x_m(y));
    const double floodplain = lv.floodplain_m + 0.0008 * (d - 100.0) + 0.03 * n_fine;
    z = std::min(
        z, floodplain + 14.0 * smoothstep(380.0, 800.0, dist) + 0.2 * std::max(dist - 800.0, 0.0));
  }
  // 3. Dunes in front of the floodplain and the west of the town (crest 6.8 m).
  if (std::abs(d - 140.0) < 60.0) {
    const double w = smoothstep(600.0, 800.0, x) * (1.0 - smoothstep(1850.0, 2050.0, x));
    const double dune = 6.8 - 3.3 * std::pow((d - 140.0) / 60.0, 2);
    z = std::max(z, 3.0 + w * (dune - 3.0));
  }
  // 4. The river channel, 30 m wide with 10 m banks, bed rising from −2.0 m at the mouth.
  {
    const double dist = std::abs(x - river_x_m(y));
    if (d > -150.0 && dist < 25.0) {
      const double bed = -2.0 + 0.0013 * (d + 150.0);
      const double bank_top = lv.floodplain_m + 0.0008 * std::max(d - 100.0, 0.0);
      z = std::min(z, dist <= 15.0 ? bed : bed + (dist - 15.0) / 10.0 * (bank_top - bed));
    }
  }
  // 5. Orrin Levels: an elliptical dish with a flat floor at 3.4 m and steep sides.
  {
    const double r = std::hypot((x - 4750.0) / 800.0, (d - 650.0) / 400.0);
    const double dish = r <= 1.0 ? lv.low_district_floor_m + 0.03 * n_fine
                                 : lv.low_district_floor_m + 25.0 * (r - 1.0);
    z = std::min(z, dish);
  }
  // 6. Orrin Bank: a shingle ridge (crest 7.5 m) with one saddle at 6.3 m.
  if (std::abs(d - 130.0) <= 100.0) {
    const double w = smoothstep(3400.0, 3650.0, x);
    const double crest = lv.ridge_crest_m - (lv.ridge_crest_m - lv.saddle_m) *
                                                std::exp(-std::pow((x - 4900.0) / 70.0, 2));
    const double ridge = crest - (crest - 3.0) * std::pow((d - 130.0) / 100.0, 2);
    z = std::max(z, 3.0 + w * (ridge - 3.0));
  }
  // 7. The harbour: a dredged basin and the quays around it.
  {
    const double yh = harbour_y_m();
    if (x >= 2350.0 && x <= 3250.0 && y >= yh - 150.0 && y <= yh + 260.0) {
      z = lv.harbour_floor_m;
    } else if (x >= 2290.0 && x <= 3310.0 && y >= yh - 60.0 && y <= yh + 320.0) {
      z = lv.quay_m;
    }
  }
  // 8. The breakwater: crest 16 m wide at 7.0 m, armour slopes 1:1.5 (V:H).
  {
    static const auto line = breakwater_m();
    const double dist = distance_to_polyline_m(line, x, y);
    z = std::max(z, lv.breakwater_crest_m - std::max(dist - 8.0, 0.0) / 1.5);
  }
  return z;
}

void gdal_register_once() {
  static std::once_flag once;
  std::call_once(once, [] { GDALAllRegister(); });
}

[[noreturn]] void gdal_failed(const std::filesystem::path& path, const std::string& what) {
  throw InputError(path.string(), what + ": " + CPLGetLastErrorMsg(),
                   "check the folder, its free space and permissions");
}

OGRSpatialReference demo_crs() {
  OGRSpatialReference srs;
  srs.importFromEPSG(crs_epsg);
  srs.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
  return srs;
}

struct GdalCloser {
  void operator()(GDALDataset* ds) const { GDALClose(ds); }
};
using DatasetPtr = std::unique_ptr<GDALDataset, GdalCloser>;

DatasetPtr create_geojson(const std::filesystem::path& temp, const std::filesystem::path& target) {
  gdal_register_once();
  GDALDriver* drv = GetGDALDriverManager()->GetDriverByName("GeoJSON");
  if (drv == nullptr) gdal_failed(target, "GDAL has no GeoJSON driver");
  DatasetPtr ds(drv->Create(temp.c_str(), 0, 0, 0, GDT_Unknown, nullptr));
  if (!ds) gdal_failed(target, "cannot be created");
  return ds;
}

OGRLayer* create_layer(GDALDataset& ds, const char* name, OGRwkbGeometryType type,
                       const std::filesystem::path& target) {
  OGRSpatialReference srs = demo_crs();
  char** options = CSLSetNameValue(nullptr, "COORDINATE_PRECISION", "2");
  options = CSLSetNameValue(options, "DESCRIPTION", std::string(invented_notice).c_str());
  OGRLayer* layer = ds.CreateLayer(name, &srs, type, options);
  CSLDestroy(options);
  if (layer == nullptr) gdal_failed(target, "cannot create its layer");
  return layer;
}

void add_field(OGRLayer& layer, const char* name, OGRFieldType type,
               const std::filesystem::path& target) {
  OGRFieldDefn field(name, type);
  if (layer.CreateField(&field) != OGRERR_NONE)
    gdal_failed(target, std::string("cannot add field ") + name);
}

}  // namespace

TerrainLevels terrain_levels() { return {}; }

double coast_y_m(double x_m) {
  return 1300.0 + 60.0 * std::sin(2.0 * std::numbers::pi * x_m / 5200.0 + 0.6) +
         20.0 * std::sin(2.0 * std::numbers::pi * x_m / 1700.0 + 2.0);
}

std::vector<Landmark> terrain_landmarks() {
  const double yh = harbour_y_m();
  const auto bw = breakwater_m();
  const double y_fp = coast_y_m(1350.0) + 300.0;
  std::vector<Landmark> marks = {
      {"harbour basin", 2800.0, yh + 100.0, 0.0},
      {"west quay", 2320.0, yh + 100.0, 0.0},
      {"breakwater crest", bw[2][0], bw[2][1], 0.0},
      {"outer harbour", 2700.0, yh - 300.0, 0.0},
      {"Orrin Levels (low district)", 4750.0, coast_y_m(4750.0) + 650.0, 0.0},
      {"Orrin gap (saddle)", 4900.0, coast_y_m(4900.0) + 130.0, 0.0},
      {"Orrin Bank crest", 4300.0, coast_y_m(4300.0) + 130.0, 0.0},
      {"Tamsel floodplain", river_x_m(y_fp) + 200.0, y_fp, 0.0},
      {"Tamsel channel", river_x_m(y_fp), y_fp, 0.0},
      {"town centre", 2100.0, coast_y_m(2100.0) + 450.0, 0.0},
      {"town seafront (behind the seawall)", 2000.0, coast_y_m(2000.0) + 150.0, 0.0},
      {"open sea", 3000.0, 400.0, 0.0},
      {"hills", 3000.0, 4300.0, 0.0},
  };
  for (auto& m : marks) m.design_elevation_m = elevation_m(m.x_m, m.y_m, 0.0, 0.0);
  return marks;
}

std::array<int, 2> Terrain::cell_of(double x_m, double y_m) const {
  const double cell = design.cell_size_m;
  return {static_cast<int>(std::floor((design.height_m - y_m) / cell)),
          static_cast<int>(std::floor(x_m / cell))};
}

Terrain generate_terrain(const TerrainDesign& design, unsigned long long seed) {
  if (!(design.cell_size_m >= 0.5) || !(design.width_m > design.cell_size_m) ||
      !(design.height_m > design.cell_size_m)) {
    throw InputError("demo terrain design", "cell size must be >= 0.5 m and smaller than the area",
                     "use the default 5 m cells");
  }
  Terrain t;
  t.design = design;
  t.seed = seed;
  t.columns = static_cast<int>(std::lround(design.width_m / design.cell_size_m));
  t.rows = static_cast<int>(std::lround(design.height_m / design.cell_size_m));
  if (static_cast<double>(t.columns) * t.rows > 50e6) {
    throw InputError("demo terrain design", "more than 50 million cells", "use larger cells");
  }
  t.geotransform = {design.west_m, design.cell_size_m, 0.0, design.south_m + design.height_m,
                    0.0,           -design.cell_size_m};
  const ValueNoise big(split_seed(seed, s_texture_big), 500.0, design.width_m, design.height_m);
  const ValueNoise fine(split_seed(seed, s_texture_fine), 90.0, design.width_m, design.height_m);
  t.elevation_m.resize(static_cast<std::size_t>(t.columns) * static_cast<std::size_t>(t.rows));
  for (int r = 0; r < t.rows; ++r) {
    const double y = design.height_m - (r + 0.5) * design.cell_size_m;
    for (int c = 0; c < t.columns; ++c) {
      const double x = (c + 0.5) * design.cell_size_m;
      float v = 0.0F;
      if (design.unsurveyed_corner && x + y > 10200.0) {
        v = design.nodata;  // north-east corner, "not surveyed"
      } else {
        v = static_cast<float>(elevation_m(x, y, big.at(x, y), fine.at(x, y)));
      }
      t.elevation_m[static_cast<std::size_t>(r) * static_cast<std::size_t>(t.columns) +
                    static_cast<std::size_t>(c)] = v;
    }
  }
  return t;
}

void write_terrain_geotiff(const Terrain& terrain, const std::filesystem::path& path, bool force) {
  gdal_register_once();
  CPLErrorReset();  // the check after closing must see only this write's errors
  AtomicPath out(path, force);
  GDALDriver* drv = GetGDALDriverManager()->GetDriverByName("GTiff");
  if (drv == nullptr) gdal_failed(path, "GDAL has no GTiff driver");
  char** options = CSLSetNameValue(nullptr, "TILED", "YES");
  options = CSLSetNameValue(options, "COMPRESS", "DEFLATE");
  options = CSLSetNameValue(options, "PREDICTOR", "3");  // floating-point predictor
  DatasetPtr ds(
      drv->Create(out.temp_path().c_str(), terrain.columns, terrain.rows, 1, GDT_Float32, options));
  CSLDestroy(options);
  if (!ds) gdal_failed(path, "cannot be created");
  auto gt = terrain.geotransform;
  const OGRSpatialReference srs = demo_crs();
  if (ds->SetGeoTransform(gt.data()) != CE_None || ds->SetSpatialRef(&srs) != CE_None) {
    gdal_failed(path, "cannot set its georeferencing");
  }
  ds->SetMetadataItem("TIFFTAG_IMAGEDESCRIPTION",
                      (std::string("Quillhaven DEM. ") + std::string(invented_notice)).c_str());
  ds->SetMetadataItem("INVENTED_DATA", "yes: not a real place, not for any real decision");
  ds->SetMetadataItem("PLACE", std::string(place_name).c_str());
  ds->SetMetadataItem("VERTICAL_DATUM", std::string(datum_label).c_str());
  ds->SetMetadataItem("DEM_DATUM_OFFSET_M", "0.0 (DEM datum = tide gauge datum + 0.0 m)");
  ds->SetMetadataItem("GENERATOR", "tidewright demo generator (demo_coast/generator)");
  ds->SetMetadataItem("SEED", std::to_string(terrain.seed).c_str());
  GDALRasterBand* band = ds->GetRasterBand(1);
  band->SetNoDataValue(terrain.design.nodata);
  band->SetDescription("elevation_m above QCD (invented)");
  band->SetUnitType("m");
  auto values = terrain.elevation_m;  // RasterIO takes a non-const buffer
  if (band->RasterIO(GF_Write, 0, 0, terrain.columns, terrain.rows, values.data(), terrain.columns,
                     terrain.rows, GDT_Float32, 0, 0) != CE_None) {
    gdal_failed(path, "writing the raster failed");
  }
  ds->FlushCache();
  ds.reset();
  if (CPLGetLastErrorType() == CE_Failure) gdal_failed(path, "GDAL reported an error");
  out.commit();
}

std::vector<DefenceLine> defence_lines() {
  // Each line ties into ground above its crest at its ends (or the other line), so that water
  // cannot walk round it below the crest.
  const TerrainLevels lv = terrain_levels();
  const auto at = [](double x, double d) { return std::array<double, 2>{x, coast_y_m(x) + d}; };
  DefenceLine bank{"Tamsel east embankment (invented)", "embankment", lv.embankment_crest_m, {}};
  for (double d = 320.0; d >= 100.0; d -= 55.0) bank.points_m.push_back(at(1900.0, d));
  DefenceLine west{
      "Quillhaven seawall, west of the harbour (invented)", "seawall", lv.seawall_crest_m, {}};
  for (double x = 1900.0; x < 2290.0; x += 65.0) west.points_m.push_back(at(x, 100.0));
  west.points_m.push_back(at(2290.0, 100.0));
  west.points_m.push_back(at(2290.0, 250.0));
  DefenceLine east{
      "Quillhaven seawall, east of the harbour (invented)", "seawall", lv.seawall_crest_m, {}};
  east.points_m.push_back(at(3310.0, 250.0));
  for (double x = 3310.0; x <= 3650.0; x += 68.0) east.points_m.push_back(at(x, 100.0));
  return {bank, west, east};
}

std::vector<std::array<double, 2>> sea_polygon_m(const TerrainDesign& design) {
  std::vector<std::array<double, 2>> ring = {{0.0, 0.0}, {design.width_m, 0.0}};
  for (double x = design.width_m; x > 0.0; x -= 100.0) ring.push_back({x, coast_y_m(x) - 600.0});
  ring.push_back({0.0, coast_y_m(0.0) - 600.0});
  ring.push_back({0.0, 0.0});
  return ring;
}

void write_defences_geojson(const TerrainDesign& design, const std::filesystem::path& path,
                            bool force) {
  AtomicPath out(path, force);
  {
    DatasetPtr ds = create_geojson(out.temp_path(), path);
    OGRLayer* layer = create_layer(*ds, "quillhaven_defences", wkbLineString, path);
    add_field(*layer, "name", OFTString, path);
    add_field(*layer, "kind", OFTString, path);
    add_field(*layer, "crest_m", OFTReal, path);
    add_field(*layer, "note", OFTString, path);
    for (const auto& line : defence_lines()) {
      OGRFeature feature(layer->GetLayerDefn());
      feature.SetField("name", line.name.c_str());
      feature.SetField("kind", line.kind.c_str());
      feature.SetField("crest_m", line.crest_m);
      feature.SetField("note", "crest in metres above QCD; invented, not a real defence");
      OGRLineString geom;
      for (const auto& p : line.points_m)
        geom.addPoint(design.west_m + p[0], design.south_m + p[1]);
      feature.SetGeometry(&geom);
      if (layer->CreateFeature(&feature) != OGRERR_NONE)
        gdal_failed(path, "cannot write a feature");
    }
  }
  out.commit();
}

void write_sea_geojson(const TerrainDesign& design, const std::filesystem::path& path, bool force) {
  AtomicPath out(path, force);
  {
    DatasetPtr ds = create_geojson(out.temp_path(), path);
    OGRLayer* layer = create_layer(*ds, "quillhaven_sea", wkbPolygon, path);
    add_field(*layer, "name", OFTString, path);
    OGRFeature feature(layer->GetLayerDefn());
    feature.SetField("name", "open sea off Quillhaven (invented)");
    OGRLinearRing ring;
    for (const auto& p : sea_polygon_m(design))
      ring.addPoint(design.west_m + p[0], design.south_m + p[1]);
    OGRPolygon poly;
    poly.addRing(&ring);
    feature.SetGeometry(&poly);
    if (layer->CreateFeature(&feature) != OGRERR_NONE) gdal_failed(path, "cannot write a feature");
  }
  out.commit();
}

}  // namespace tidewright::demo
