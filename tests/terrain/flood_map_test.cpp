// The GDAL/PROJ adapters and the map pipeline on small files written in the test, with
// answers worked out by hand, and the bad inputs of issue 6 (each an InputError, no output).
#include "tidewright/terrain/flood_map.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <filesystem>
#include <limits>
#include <memory>
#include <nlohmann/json.hpp>
#include <stdexcept>

#include "support/run_cli.hpp"
#include "terrain/terrain_fixtures.hpp"
#include "tidewright/common/error.hpp"

namespace tw = tidewright::terrain;
using tidewright::InputError;
using tidewright::testing::TempDir;
using tidewright::testing::utm_10m;
using tidewright::testing::write_raster;
using tidewright::testing::write_vector;

namespace {

constexpr float inf_f = std::numeric_limits<float>::infinity();

tw::DemSource same_datum(const std::string& path) {
  tw::DemSource s;
  s.path = path;
  s.datum.kind = tw::DatumRelation::Kind::same;
  return s;
}

// The message of the InputError thrown by f, or "" if none.
template <typename F>
std::string input_error(F&& f) {
  try {
    f();
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}

// Expects f to throw an InputError whose message contains `text`.
template <typename F>
void expect_refused(F&& f, const std::string& text) {
  const std::string message = input_error(std::forward<F>(f));
  EXPECT_NE(message.find(text), std::string::npos) << "message: '" << message << "'";
}

// Points given in UTM 33N (x, y) as WGS 84 (lon, lat), through PROJ.
std::vector<std::pair<double, double>> utm33_to_wgs84(std::vector<std::pair<double, double>> xy) {
  OGRSpatialReference utm;
  utm.importFromEPSG(32633);
  OGRSpatialReference wgs;
  wgs.importFromEPSG(4326);
  utm.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
  wgs.SetAxisMappingStrategy(OAMS_TRADITIONAL_GIS_ORDER);
  std::unique_ptr<OGRCoordinateTransformation> ct(OGRCreateCoordinateTransformation(&utm, &wgs));
  for (auto& [x, y] : xy) {
    if (ct == nullptr || !ct->Transform(1, &x, &y)) throw std::runtime_error("PROJ transform");
  }
  return xy;
}

// A closed WKT ring of the points.
std::string wkt_ring(const std::vector<std::pair<double, double>>& points) {
  std::string ring;
  for (std::size_t i = 0; i <= points.size(); ++i) {
    const auto& [x, y] = points[i % points.size()];
    ring += (i ? "," : "") + std::to_string(x) + " " + std::to_string(y);
  }
  return ring;
}

// Area (m^2) of the WGS 84 cell between the parallels phi1 < phi2 and meridians dlon degrees
// apart: (a^2 / 2) (q(phi2) - q(phi1)) dlon, with q(phi) = (1 - e^2) [sin phi / (1 - e^2 sin^2
// phi) - 1/(2e) ln((1 - e sin phi) / (1 + e sin phi))] (Snyder 1987, "Map Projections: A Working
// Manual", USGS PP 1395, eq. 3-12). WGS 84: a = 6378137 m, 1/f = 298.257223563 (EPSG:7030).
constexpr double wgs84_a_m = 6378137.0;
constexpr double wgs84_inv_f = 298.257223563;
double zone_area_m2(double phi1_deg, double phi2_deg, double dlon_deg) {
  const double f = 1.0 / wgs84_inv_f;
  const double e2 = f * (2.0 - f);
  const double e = std::sqrt(e2);
  const auto q = [&](double phi_deg) {
    const double s = std::sin(phi_deg * M_PI / 180.0);
    return (1.0 - e2) *
           (s / (1.0 - e2 * s * s) - std::log((1.0 - e * s) / (1.0 + e * s)) / (2.0 * e));
  };
  return wgs84_a_m * wgs84_a_m / 2.0 * (q(phi2_deg) - q(phi1_deg)) * (dlon_deg * M_PI / 180.0);
}

}  // namespace

TEST(TerrainDem, KeepsNegativeElevationsAndOnlyDeclaredNodata) {
  TempDir tmp;
  const auto path = (tmp / "dem.tif").string();
  write_raster(path, 3, 1, utm_10m, 32633, {-2.5, -9999.0, 7.0}, -9999.0);
  auto dem = tw::read_dem(same_datum(path));
  EXPECT_EQ(dem.elevation_m[0], -2.5F);
  EXPECT_TRUE(std::isnan(dem.elevation_m[1]));
  EXPECT_EQ(dem.elevation_m[2], 7.0F);
  auto src = same_datum(path);
  src.nodata = 7.0;  // declared by the user on top of the file's
  dem = tw::read_dem(src);
  EXPECT_TRUE(std::isnan(dem.elevation_m[2]));
}

TEST(TerrainDem, IntegerDemAndConstantOffset) {
  TempDir tmp;
  const auto path = (tmp / "dem.tif").string();
  write_raster(path, 2, 1, utm_10m, 32633, {-3.0, 12.0}, -32768.0, GDT_Int16);
  auto src = same_datum(path);
  src.datum = {tw::DatumRelation::Kind::constant, -0.25, ""};
  const auto dem = tw::read_dem(src);
  EXPECT_FLOAT_EQ(dem.elevation_m[0], -3.25F);
  EXPECT_FLOAT_EQ(dem.elevation_m[1], 11.75F);
}

TEST(TerrainDem, OffsetRasterIsResampledBilinearlyToTheDemGrid) {
  // An offset raster in geographic coordinates (EPSG:4326) whose value is a linear function of
  // longitude, offset = lon - 14.9 (m), over a UTM 33N DEM: bilinear resampling reproduces a
  // linear field exactly, so each DEM cell must get lon(cell centre) - 14.9 (its centre mapped
  // to WGS 84 with OGR), where nearest-neighbour resampling would be off by up to 0.01 m.
  TempDir tmp;
  const auto dem_path = (tmp / "dem.tif").string();
  write_raster(dem_path, 4, 4, utm_10m, 32633, std::vector<double>(16, 1.0));
  const auto off_path = (tmp / "offset.tif").string();
  // UTM 33N (500000, 6000000) is at 15 E, about 54.13 N: cover 14.9..15.1 E, 54.0..54.3 N.
  std::vector<double> field;
  for (int r = 0; r < 10; ++r) {
    for (int c = 0; c < 10; ++c) field.push_back(0.02 * (c + 0.5));
  }
  write_raster(off_path, 10, 10, {14.9, 0.02, 0.0, 54.3, 0.0, -0.03}, 4326, field);
  auto src = same_datum(dem_path);
  src.datum = {tw::DatumRelation::Kind::raster, 0.0, off_path};
  const auto dem = tw::read_dem(src);
  for (int r = 0; r < 4; ++r) {
    for (int c = 0; c < 4; ++c) {
      const double lon = utm33_to_wgs84({{500005.0 + 10.0 * c, 5999995.0 - 10.0 * r}})[0].first;
      EXPECT_NEAR(dem.elevation_m[static_cast<std::size_t>(r * 4 + c)], 1.0 + (lon - 14.9), 2e-6);
    }
  }
}

TEST(TerrainDem, OffsetRasterNotCoveringTheDemIsRefused) {
  TempDir tmp;
  const auto dem_path = (tmp / "dem.tif").string();
  write_raster(dem_path, 4, 4, utm_10m, 32633, std::vector<double>(16, 1.0));
  const auto off_path = (tmp / "offset.tif").string();
  write_raster(off_path, 2, 2, {20.0, 0.1, 0.0, 10.0, 0.0, -0.1}, 4326, {0, 0, 0, 0});
  auto src = same_datum(dem_path);
  src.datum = {tw::DatumRelation::Kind::raster, 0.0, off_path};
  expect_refused([&] { (void)tw::read_dem(src); }, "does not cover 16 valid DEM cells");
}

TEST(TerrainDem, BadDemsAreInputErrors) {
  TempDir tmp;
  const auto no_crs = (tmp / "nocrs.tif").string();
  write_raster(no_crs, 2, 2, utm_10m, 0, {0, 1, 2, 3});
  expect_refused([&] { (void)tw::read_dem(same_datum(no_crs)); },
                 "has no coordinate reference system");
  auto with_crs = same_datum(no_crs);
  with_crs.crs_override = "EPSG:32633";
  EXPECT_EQ(tw::read_dem(with_crs).grid.shape.cells(), 4U);

  const auto all_nodata = (tmp / "empty.tif").string();
  write_raster(all_nodata, 2, 1, utm_10m, 32633, {-1, -1}, -1.0);
  expect_refused([&] { (void)tw::read_dem(same_datum(all_nodata)); }, "every cell");

  expect_refused([&] { (void)tw::read_dem(same_datum((tmp / "missing.tif").string())); },
                 "the DEM file does not exist");

  tw::DemSource unstated;
  unstated.path = all_nodata;
  write_raster(all_nodata, 2, 1, utm_10m, 32633, {1, 2});
  expect_refused([&] { (void)tw::read_dem(unstated); }, "--same-datum");
}

TEST(TerrainSea, PolygonInAnotherCrsIsReprojected) {
  // A WGS 84 polygon covering the DEM's left column only (the DEM is UTM 33N, 10 m cells):
  // the cell centres of column 0 lie at x = 500005, columns 1+ at x >= 500015.
  TempDir tmp;
  const auto dem_path = (tmp / "dem.tif").string();
  write_raster(dem_path, 5, 3, utm_10m, 32633, std::vector<double>(15, 1.0));
  const std::string ring = wkt_ring(
      utm33_to_wgs84({{499990, 6000010}, {500010, 6000010}, {500010, 5999960}, {499990, 5999960}}));
  const auto sea_path = (tmp / "sea.geojson").string();
  write_vector(sea_path, "GeoJSON", 4326, {{"POLYGON((" + ring + "))", {}}}, "");
  const auto dem = tw::read_dem(same_datum(dem_path));
  tw::SeaSource src;
  src.mask_path = sea_path;
  const auto sea = tw::find_sea_cells(dem, src, tw::Connectivity::eight);
  EXPECT_EQ(sea.count, 3U);
  for (std::size_t r = 0; r < 3; ++r) {
    EXPECT_EQ(sea.is_sea[r * 5], 1);
    EXPECT_EQ(sea.is_sea[r * 5 + 1], 0);
  }
}

TEST(TerrainSea, PointsEdgesAndNodataAndTheirErrors) {
  TempDir tmp;
  const auto dem_path = (tmp / "dem.tif").string();
  write_raster(dem_path, 3, 3, utm_10m, 32633, {0.2, 5, 5, 5, 5, 5, -9, 5, 0.9}, -9.0);
  const auto dem = tw::read_dem(same_datum(dem_path));
  tw::SeaSource edge;
  edge.edge_at_or_below_m = 0.5;
  EXPECT_EQ(tw::find_sea_cells(dem, edge, tw::Connectivity::four).count, 1U);
  tw::SeaSource nodata;
  nodata.nodata_is_sea = true;
  const auto s = tw::find_sea_cells(dem, nodata, tw::Connectivity::four);
  EXPECT_EQ(s.count, 1U);
  EXPECT_EQ(s.is_sea[6], 1);
  tw::SeaSource point;
  point.points_xy = {{500025.0, 5999975.0}};  // centre of the bottom-right cell
  EXPECT_EQ(tw::find_sea_cells(dem, point, tw::Connectivity::four).is_sea[8], 1);
  point.points_xy = {{0.0, 0.0}};
  expect_refused([&] { (void)tw::find_sea_cells(dem, point, tw::Connectivity::four); },
                 "outside the DEM");
  expect_refused([&] { (void)tw::find_sea_cells(dem, {}, tw::Connectivity::four); },
                 "no sea is given");
  tw::SeaSource none;
  none.edge_at_or_below_m = -5.0;
  expect_refused([&] { (void)tw::find_sea_cells(dem, none, tw::Connectivity::four); },
                 "no sea cell found");
  const auto far_path = (tmp / "far.gpkg").string();
  write_vector(far_path, "GPKG", 32633, {{"POLYGON((0 0,10 0,10 10,0 10,0 0))", {}}}, "");
  tw::SeaSource far;
  far.mask_path = far_path;
  expect_refused([&] { (void)tw::find_sea_cells(dem, far, tw::Connectivity::four); },
                 "covers no cell of the DEM");
}

TEST(TerrainSea, SeaThatTouchesNoValidCellIsRefused) {
  // A nodata column declared sea, walled off from the land by a second nodata column.
  TempDir tmp;
  const auto dem_path = (tmp / "dem.tif").string();
  write_raster(dem_path, 3, 2, utm_10m, 32633, {-9, -8, 1, -9, -8, 1}, -9.0);
  auto src = same_datum(dem_path);
  src.nodata = -8.0;
  const auto dem = tw::read_dem(src);
  tw::SeaSource sea;
  sea.points_xy = {{500005.0, 5999995.0}, {500005.0, 5999985.0}};
  expect_refused([&] { (void)tw::find_sea_cells(dem, sea, tw::Connectivity::eight); },
                 "touches no valid land cell");
}

TEST(TerrainDefences, DiagonalWallHoldsUnderEightConnectivity) {
  // 20 x 20 cells of 0 m ground; a 45-degree wall line exactly through cell corners from the
  // top-left to the bottom-right corner (the worst case for a burn: a centre-rule burn leaves
  // diagonal neighbours on either side open). Sea: the bottom-left cell. With ALL_TOUCHED the
  // land above the wall floods only over the 5 m crest, under 8-connectivity.
  TempDir tmp;
  const auto dem_path = (tmp / "dem.tif").string();
  write_raster(dem_path, 20, 20, utm_10m, 32633, std::vector<double>(400, 0.0));
  const auto wall_path = (tmp / "wall.gpkg").string();
  write_vector(wall_path, "GPKG", 32633, {{"LINESTRING(499990 6000010,500210 5999790)", 5.0}});
  tw::SeaSource sea;
  sea.points_xy = {{500005.0, 5999805.0}};
  const auto map = tw::prepare_flood_threshold(same_datum(dem_path), sea,
                                               tw::DefenceSource{wall_path, "", "crest_m", false},
                                               tw::Connectivity::eight);
  ASSERT_TRUE(map.defences);
  EXPECT_GE(map.defences->cells_raised, 20U);
  EXPECT_EQ(map.threshold_m[19], 5.0F);             // top-right corner cell, behind the wall
  EXPECT_EQ(map.threshold_m[19 * 20 + 0], -inf_f);  // the sea cell
  EXPECT_EQ(map.threshold_m[19 * 20 + 5], 0.0F);    // seaward of the wall
  std::size_t behind = 0;
  for (std::size_t r = 0; r < 20; ++r) {
    for (std::size_t c = r + 2; c < 20; ++c) behind += map.threshold_m[r * 20 + c] == 5.0F;
  }
  EXPECT_EQ(behind, 18U * 19U / 2U);  // every cell strictly above the burned band
}

TEST(TerrainDefences, ShapefileLinesAndGeoJsonPolygonsHoldToTheirCrest) {
  // 20 x 20 cells at 0 m, sea in the bottom-left cell. A wall across the whole grid through
  // column 10 holds the land east of it dry up to its crest: T = crest there, 0 west of it. The
  // same wall as an ESRI Shapefile line (crest 5 m) and as a GeoJSON polygon two cells wide in
  // WGS 84 (crest 4 m), reprojected to the DEM's UTM 33N by OGR.
  TempDir tmp;
  const auto dem_path = (tmp / "dem.tif").string();
  write_raster(dem_path, 20, 20, utm_10m, 32633, std::vector<double>(400, 0.0));
  tw::SeaSource sea;
  sea.points_xy = {{500005.0, 5999805.0}};
  const auto line = (tmp / "wall.shp").string();
  write_vector(line, "ESRI Shapefile", 32633, {{"LINESTRING(500105 6000010,500105 5999790)", 5.0}});
  // The UTM 33N rectangle x 500095..500125, y 5999780..6000020 (half a cell wider than
  // columns 10-11 on each side) in WGS 84 (lon, lat), through PROJ.
  const std::string ring = wkt_ring(
      utm33_to_wgs84({{500095, 6000020}, {500125, 6000020}, {500125, 5999780}, {500095, 5999780}}));
  const auto polygon = (tmp / "wall.geojson").string();
  write_vector(polygon, "GeoJSON", 4326, {{"POLYGON((" + ring + "))", 4.0}});
  for (const auto& [path, crest] :
       std::vector<std::pair<std::string, float>>{{line, 5.0F}, {polygon, 4.0F}}) {
    SCOPED_TRACE(path);
    const auto map = tw::prepare_flood_threshold(same_datum(dem_path), sea,
                                                 tw::DefenceSource{path, "", "crest_m", false},
                                                 tw::Connectivity::eight);
    ASSERT_TRUE(map.defences);
    for (std::size_t r = 0; r < 20; ++r) {
      EXPECT_EQ(map.threshold_m[r * 20 + 5], 0.0F) << "row " << r;
      EXPECT_EQ(map.threshold_m[r * 20 + 19], crest) << "row " << r;
      EXPECT_EQ(map.dem.elevation_m[r * 20 + 10], crest) << "row " << r;  // burned in
    }
  }
}

TEST(TerrainDefences, CrestAttributeMustExistAndBeSet) {
  TempDir tmp;
  const auto dem_path = (tmp / "dem.tif").string();
  write_raster(dem_path, 4, 4, utm_10m, 32633, std::vector<double>(16, 0.0));
  auto dem = tw::read_dem(same_datum(dem_path));
  const auto no_field = (tmp / "nofield.gpkg").string();
  write_vector(no_field, "GPKG", 32633, {{"LINESTRING(500000 6000000,500040 5999960)", {}}},
               "height");
  expect_refused(
      [&] {
        (void)tw::burn_defences(dem, {no_field, "", "crest_m", false});
      },
      "no crest-level attribute 'crest_m' (its attributes: height, name)");
  const auto unset = (tmp / "unset.gpkg").string();
  write_vector(unset, "GPKG", 32633, {{"LINESTRING(500000 6000000,500040 5999960)", {}}});
  expect_refused(
      [&] {
        (void)tw::burn_defences(dem, {unset, "", "crest_m", false});
      },
      "has no value in 'crest_m'");
}

TEST(TerrainAreas, GeographicCellsMatchTheEllipsoidalZoneFormula) {
  // PROJ's geodesic area of the densified cell outline against the closed form (zone_area_m2).
  tw::GeoGrid grid;
  grid.shape = {3, 4};
  grid.geotransform = {10.0, 0.01, 0.0, 50.04, 0.0, -0.01};
  OGRSpatialReference wgs;
  wgs.importFromEPSG(4326);
  char* wkt = nullptr;
  wgs.exportToWkt(&wkt);
  grid.crs_wkt = wkt;
  CPLFree(wkt);
  const auto areas = tw::cell_areas(grid);
  ASSERT_TRUE(areas.geodesic);
  for (std::size_t r = 0; r < 4; ++r) {
    const double top = 50.04 - 0.01 * static_cast<double>(r);
    const double want = zone_area_m2(top - 0.01, top, 0.01);
    EXPECT_NEAR(areas.row_area_m2[r] / want, 1.0, 1e-9) << "row " << r << " area " << want;
  }
  // A one-degree cell, the header's stated limit.
  const double one = tw::geodesic_cell_area_m2(0.0, 1.0, 50.0, 51.0, wgs84_a_m, wgs84_inv_f);
  EXPECT_NEAR(one / zone_area_m2(50.0, 51.0, 1.0), 1.0, 1e-9);
}

TEST(TerrainAreas, ProjectedCellsArePlanar) {
  tw::GeoGrid grid;
  grid.shape = {2, 2};
  grid.geotransform = utm_10m;
  OGRSpatialReference utm;
  utm.importFromEPSG(32633);
  char* wkt = nullptr;
  utm.exportToWkt(&wkt);
  grid.crs_wkt = wkt;
  CPLFree(wkt);
  const auto areas = tw::cell_areas(grid);
  EXPECT_FALSE(areas.geodesic);
  EXPECT_DOUBLE_EQ(areas.row_area_m2[1], 100.0);
}

TEST(TerrainMap, WritesEveryProductAndSummarisesByHand) {
  // 5 x 3 profile (rows alike): sea 0 | beach 0.5 | ridge 3 | bowl 1 | slope 2, 10 m cells
  // (100 m2). Level 1.5: beaches flooded (3 cells, depth 1.0 each), bowls cut off (3).
  TempDir tmp;
  const auto dem_path = (tmp / "dem.tif").string();
  std::vector<double> z;
  for (int r = 0; r < 3; ++r) z.insert(z.end(), {0.0, 0.5, 3.0, 1.0, 2.0});
  write_raster(dem_path, 5, 3, utm_10m, 32633, z);
  tw::MapRequest req;
  req.dem = same_datum(dem_path);
  req.sea.edge_at_or_below_m = 0.0;
  req.levels = {{1.5, 2050, "test"}, {3.5, {}, ""}};
  req.aep.push_back({[](double h) { return std::exp(-(h - 1.0) / 0.5); }, "Gumbel", {}, ""});
  req.polygons = true;
  req.out_dir = tmp / "out";
  req.cautions = {"Test caution."};
  const auto s = tw::make_flood_maps(req);
  ASSERT_EQ(s.levels.size(), 2U);
  EXPECT_EQ(s.sea_cells, 3U);
  EXPECT_EQ(s.levels[0].connected_cells, 3U);
  EXPECT_EQ(s.levels[0].cut_off_cells, 3U);
  EXPECT_DOUBLE_EQ(s.levels[0].flooded_area_m2, 300.0);
  EXPECT_DOUBLE_EQ(s.levels[0].volume_m3, 300.0);
  EXPECT_DOUBLE_EQ(s.levels[0].max_depth_m, 1.0);
  EXPECT_EQ(s.levels[1].connected_cells, 12U);  // everything over the ridge
  EXPECT_DOUBLE_EQ(s.levels[1].volume_m3, 100.0 * 3 * (3.0 + 0.5 + 2.5 + 1.5));
  for (const auto& f : s.files) EXPECT_TRUE(std::filesystem::exists(tmp / "out" / f)) << f;
  // The written extent and AEP, read back through GDAL.
  GDALDatasetUniquePtr ext(GDALDataset::Open((tmp / "out" / "extent.tif").c_str(), GDAL_OF_RASTER));
  ASSERT_TRUE(ext);
  std::vector<std::uint8_t> cls(15);
  ASSERT_EQ(ext->GetRasterBand(1)->RasterIO(GF_Read, 0, 0, 5, 3, cls.data(), 5, 3, GDT_Byte, 0, 0,
                                            nullptr),
            CE_None);
  EXPECT_EQ(std::vector<std::uint8_t>(cls.begin(), cls.begin() + 5),
            (std::vector<std::uint8_t>{3, 1, 0, 2, 0}));
  GDALDatasetUniquePtr aep(GDALDataset::Open((tmp / "out" / "aep.tif").c_str(), GDAL_OF_RASTER));
  std::vector<float> p(15);
  ASSERT_EQ(aep->GetRasterBand(1)->RasterIO(GF_Read, 0, 0, 5, 3, p.data(), 5, 3, GDT_Float32, 0, 0,
                                            nullptr),
            CE_None);
  EXPECT_NEAR(p[3], -std::expm1(-std::exp(-(3.0 - 1.0) / 0.5)), 1e-7);  // the bowl: T = 3
  EXPECT_TRUE(std::isnan(p[0]));
  GDALDatasetUniquePtr gpkg(
      GDALDataset::Open((tmp / "out" / "extent.gpkg").c_str(), GDAL_OF_VECTOR));
  ASSERT_TRUE(gpkg);
  EXPECT_EQ(gpkg->GetLayerByName("extent")->GetFeatureCount(), 3);  // beach, bowl; all land
  // Refused without force; replaced with it.
  expect_refused([&] { (void)tw::make_flood_maps(req); }, "already exists");
  req.force = true;
  req.levels.pop_back();
  EXPECT_EQ(tw::make_flood_maps(req).levels.size(), 1U);
}

TEST(TerrainMap, SpreadSeaIsNotFloodedLand) {
  // Profile (rows alike): seabed -3 | -2 | -1 | beach 0.5 | ridge 3 | bowl 1, 10 m cells, sea
  // seeded at the left edge only. Without a spread the seabed cells count as flooded land at
  // 1.5 m (depths 3.5 and 2.5 in the volume); spread to 0 m they are sea and only the beach
  // floods: 3 cells, 300 m2, depth 1.0.
  TempDir tmp;
  const auto dem_path = (tmp / "dem.tif").string();
  std::vector<double> z;
  for (int r = 0; r < 3; ++r) z.insert(z.end(), {-3.0, -2.0, -1.0, 0.5, 3.0, 1.0});
  write_raster(dem_path, 6, 3, utm_10m, 32633, z);
  tw::MapRequest req;
  req.dem = same_datum(dem_path);
  req.sea.edge_at_or_below_m = -2.5;
  req.levels = {{1.5, {}, ""}};
  req.out_dir = tmp / "seeds";
  const auto seeds = tw::make_flood_maps(req);
  EXPECT_EQ(seeds.sea_cells, 3U);
  EXPECT_EQ(seeds.levels[0].connected_cells, 9U);
  EXPECT_DOUBLE_EQ(seeds.levels[0].volume_m3, 100.0 * 3 * (3.5 + 2.5 + 1.0));
  req.sea.spread_to_m = 0.0;
  req.out_dir = tmp / "spread";
  const auto spread = tw::make_flood_maps(req);
  EXPECT_EQ(spread.sea_cells, 9U);
  EXPECT_EQ(spread.levels[0].connected_cells, 3U);
  EXPECT_EQ(spread.levels[0].cut_off_cells, 3U);  // the bowl
  EXPECT_DOUBLE_EQ(spread.levels[0].flooded_area_m2, 300.0);
  EXPECT_DOUBLE_EQ(spread.levels[0].volume_m3, 300.0);
  GDALDatasetUniquePtr ext(
      GDALDataset::Open((tmp / "spread" / "extent.tif").c_str(), GDAL_OF_RASTER));
  ASSERT_TRUE(ext);
  std::vector<std::uint8_t> cls(6);
  ASSERT_EQ(ext->GetRasterBand(1)->RasterIO(GF_Read, 0, 0, 6, 1, cls.data(), 6, 1, GDT_Byte, 0, 0,
                                            nullptr),
            CE_None);
  EXPECT_EQ(cls, (std::vector<std::uint8_t>{3, 3, 3, 1, 0, 2}));
  const std::string meta = ext->GetMetadataItem("TIDEWRIGHT_SEA");
  EXPECT_NE(meta.find("spread over the 6 cells it reaches at or below 0 m"), std::string::npos)
      << meta;
  // A mapped level below the spread level would show dry land between the two as sea: refused
  // before any work, with no output.
  req.sea.spread_to_m = 2.0;
  req.out_dir = tmp / "below";
  expect_refused([&] { (void)tw::make_flood_maps(req); }, "lies above the mapped level 1.500 m");
  EXPECT_FALSE(std::filesystem::exists(tmp / "below"));
  // A spread over every cell the sea reaches leaves nothing to flood: refused.
  req.sea.spread_to_m = 3.0;
  req.levels = {{3.5, {}, ""}};
  expect_refused([&] { (void)tw::make_flood_maps(req); }, "covers all the land it can reach");
  EXPECT_FALSE(std::filesystem::exists(tmp / "below"));
}

TEST(TerrainMap, BadInputLeavesNoOutput) {
  TempDir tmp;
  const auto dem_path = (tmp / "dem.tif").string();
  write_raster(dem_path, 2, 2, utm_10m, 32633, {0, 1, 2, 3});
  tw::MapRequest req;
  req.dem = same_datum(dem_path);
  req.sea.edge_at_or_below_m = -10.0;  // no sea cell
  req.levels = {{1.0, {}, ""}};
  req.out_dir = tmp / "out";
  EXPECT_THROW((void)tw::make_flood_maps(req), InputError);
  std::size_t entries = 0;
  for ([[maybe_unused]] const auto& e : std::filesystem::directory_iterator(tmp.path())) ++entries;
  EXPECT_EQ(entries, 1U);  // the DEM only
}

TEST(TerrainMap, GeographicDemAreasAreGeodesic) {
  // 3 x 2 cells of 0.01 degree at 50.02..50.00 N in WGS 84; sea in column 0, land at 0 m in
  // columns 1-2, level 0.5 m: the flooded area is two cells of each row, whose areas follow the
  // ellipsoidal zone formula (zone_area_m2, Snyder 1987 eq. 3-12).
  TempDir tmp;
  const auto dem_path = (tmp / "dem.tif").string();
  write_raster(dem_path, 3, 2, {10.0, 0.01, 0.0, 50.02, 0.0, -0.01}, 4326, {-1, 0, 0, -1, 0, 0});
  tw::MapRequest req;
  req.dem = same_datum(dem_path);
  req.sea.edge_at_or_below_m = -0.5;
  req.levels = {{0.5, {}, ""}};
  req.out_dir = tmp / "out";
  const auto s = tw::make_flood_maps(req);
  const double want = 2.0 * zone_area_m2(50.0, 50.02, 0.01);
  ASSERT_EQ(s.levels.size(), 1U);
  EXPECT_EQ(s.levels[0].connected_cells, 4U);
  EXPECT_NEAR(s.levels[0].flooded_area_m2 / want, 1.0, 1e-9);
  EXPECT_NE(s.area_method.find("geodesic"), std::string::npos);
}

TEST(TerrainSea, RasterMaskNonZeroCellsAreSea) {
  // A byte mask on the DEM's grid with 1 in column 0 and 0 elsewhere, and a second mask in
  // WGS 84 that misses the DEM entirely (nearest resampling leaves it all nodata).
  TempDir tmp;
  const auto dem_path = (tmp / "dem.tif").string();
  write_raster(dem_path, 3, 2, utm_10m, 32633, {0, 1, 2, 0, 1, 2});
  const auto mask_path = (tmp / "mask.tif").string();
  write_raster(mask_path, 3, 2, utm_10m, 32633, {1, 0, 0, 1, 0, 0}, {}, GDT_Byte);
  const auto dem = tw::read_dem(same_datum(dem_path));
  tw::SeaSource src;
  src.mask_path = mask_path;
  const auto sea = tw::find_sea_cells(dem, src, tw::Connectivity::four);
  EXPECT_EQ(sea.is_sea, (std::vector<std::uint8_t>{1, 0, 0, 1, 0, 0}));
  const auto far_path = (tmp / "far.tif").string();
  write_raster(far_path, 2, 2, {100.0, 0.1, 0.0, -10.0, 0.0, -0.1}, 4326, {1, 1, 1, 1}, 0.0,
               GDT_Byte);
  src.mask_path = far_path;
  expect_refused([&] { (void)tw::find_sea_cells(dem, src, tw::Connectivity::four); },
                 "covers no cell of the DEM");
}

TEST(TerrainSea, RasterMaskInAnotherCrsIsWarpedToTheDemGrid) {
  // A WGS 84 byte mask, 1e-5 degree cells (about 0.7 m by 1.1 m here), that is 1 west of the
  // meridian through x = 500010 m (the edge between the DEM's columns 0 and 1) and 0 east of
  // it. Warped with nearest resampling to the UTM 33N DEM, column 0 is sea, columns 1-2 not.
  TempDir tmp;
  const auto dem_path = (tmp / "dem.tif").string();
  write_raster(dem_path, 3, 2, utm_10m, 32633, {0, 1, 2, 0, 1, 2});
  const auto corners = utm33_to_wgs84({{499990, 6000010}, {500040, 5999970}, {500010, 6000000}});
  const double west = corners[0].first;
  const double north = corners[0].second;
  const double edge_lon = corners[2].first;
  const double step = 1e-5;
  const int cols = static_cast<int>(std::ceil((corners[1].first - west) / step));
  const int rows = static_cast<int>(std::ceil((north - corners[1].second) / step));
  std::vector<double> mask(static_cast<std::size_t>(cols) * static_cast<std::size_t>(rows));
  for (int r = 0; r < rows; ++r) {
    for (int c = 0; c < cols; ++c) {
      const double lon = west + (c + 0.5) * step;
      mask[static_cast<std::size_t>(r) * static_cast<std::size_t>(cols) +
           static_cast<std::size_t>(c)] = lon < edge_lon ? 1.0 : 0.0;
    }
  }
  const auto mask_path = (tmp / "mask_wgs84.tif").string();
  write_raster(mask_path, cols, rows, {west, step, 0.0, north, 0.0, -step}, 4326, mask, {},
               GDT_Byte);
  const auto dem = tw::read_dem(same_datum(dem_path));
  tw::SeaSource src;
  src.mask_path = mask_path;
  const auto sea = tw::find_sea_cells(dem, src, tw::Connectivity::four);
  EXPECT_EQ(sea.is_sea, (std::vector<std::uint8_t>{1, 0, 0, 1, 0, 0}));
}

TEST(TerrainMap, CloudOptimizedAndZstdOutputs) {
  // --cog: GDAL's COG driver marks its files LAYOUT=COG; ZSTD shows as the compression.
  TempDir tmp;
  const auto dem_path = (tmp / "dem.tif").string();
  write_raster(dem_path, 4, 3, utm_10m, 32633, {0, 1, 2, 3, 0, 1, 2, 3, 0, 1, 2, 3});
  tw::MapRequest req;
  req.dem = same_datum(dem_path);
  req.sea.edge_at_or_below_m = 0.0;
  req.levels = {{1.5, {}, ""}};
  req.format = {tw::Compression::zstd, true};
  req.out_dir = tmp / "out";
  (void)tw::make_flood_maps(req);
  for (const char* f : {"threshold.tif", "extent.tif", "depth.tif"}) {
    GDALDatasetUniquePtr ds(GDALDataset::Open((tmp / "out" / f).c_str(), GDAL_OF_RASTER));
    ASSERT_TRUE(ds) << f;
    const char* layout = ds->GetMetadataItem("LAYOUT", "IMAGE_STRUCTURE");
    const char* compression = ds->GetMetadataItem("COMPRESSION", "IMAGE_STRUCTURE");
    EXPECT_STREQ(layout, "COG") << f;
    EXPECT_STREQ(compression, "ZSTD") << f;
    EXPECT_NE(std::string(ds->GetMetadataItem("TIDEWRIGHT_METHOD")).find("Barnes"),
              std::string::npos);
  }
  std::size_t side_files = 0;
  for (const auto& e : std::filesystem::directory_iterator(tmp / "out")) {
    side_files += e.path().string().find(".tiled.tif") != std::string::npos;
  }
  EXPECT_EQ(side_files, 0U);
}

// Issue 15 item 5: every polygon carries its area (planar in a projected CRS, ellipsoidal in a
// geographic one) and the return period and datum of its level; the areas of a level's polygons
// add up to the summary's areas, which are computed cell by cell (geodesic_cell_area_m2, PROJ).
TEST(TerrainMap, PolygonsCarryAreasThatAddUpToTheSummary) {
  for (const int epsg : {32633, 4326}) {
    SCOPED_TRACE(epsg);
    TempDir tmp;
    const auto dem_path = (tmp / "dem.tif").string();
    // 40 x 30 cells: a slope rising from the west edge, with a bowl behind a ridge (cut off at
    // 1.5 m). UTM: 10 m cells; geographic: 0.01 degree cells at 50-50.3 N.
    std::vector<double> z;
    for (int r = 0; r < 30; ++r) {
      for (int c = 0; c < 40; ++c) {
        double v = 0.1 * c - 0.5;
        if (c == 20) v = 4.0;                              // ridge
        if (c > 20 && c < 30 && r > 5 && r < 25) v = 0.5;  // bowl behind it
        z.push_back(v);
      }
    }
    const std::array<double, 6> geo{10.0, 0.01, 0.0, 50.3, 0.0, -0.01};
    write_raster(dem_path, 40, 30, epsg == 4326 ? geo : utm_10m, epsg, z);
    tw::MapRequest req;
    req.dem = same_datum(dem_path);
    req.sea.edge_at_or_below_m = 0.0;
    req.levels = {{1.5, 2100, "midway", 100.0}};
    req.datum = "QCD (invented)";
    req.polygons = true;
    req.out_dir = tmp / "out";
    const auto s = tw::make_flood_maps(req);
    ASSERT_GT(s.levels[0].cut_off_cells, 0U);
    GDALDatasetUniquePtr gpkg(GDALDataset::Open((tmp / "out" / "extent.gpkg").c_str(), GDAL_OF_VECTOR));
    ASSERT_TRUE(gpkg);
    OGRLayer* layer = gpkg->GetLayerByName("extent");
    EXPECT_STREQ(layer->GetMetadataItem("WATER_LEVEL_DATUM"), "QCD (invented)");
    EXPECT_NE(std::string(layer->GetMetadataItem("RETURN_PERIOD_DEFINITION")).find("annual rate 1/T"), std::string::npos);
    double flooded = 0.0;
    double cut_off = 0.0;
    for (auto& f : layer) {
      EXPECT_DOUBLE_EQ(f->GetFieldAsDouble("return_period_yr"), 100.0);
      (f->GetFieldAsInteger("extent_class") == 1 ? flooded : cut_off) += f->GetFieldAsDouble("area_m2");
    }
    EXPECT_NEAR(flooded, s.levels[0].flooded_area_m2, 1e-9 * s.levels[0].flooded_area_m2);
    EXPECT_NEAR(cut_off, s.levels[0].cut_off_area_m2, 1e-9 * s.levels[0].cut_off_area_m2);
    GDALDatasetUniquePtr depth(GDALDataset::Open((tmp / "out" / "depth.tif").c_str(), GDAL_OF_RASTER));
    ASSERT_TRUE(depth);
    EXPECT_STREQ(depth->GetRasterBand(1)->GetMetadataItem("RETURN_PERIOD_YR"), "100.0000");
    EXPECT_STREQ(depth->GetRasterBand(1)->GetMetadataItem("WATER_LEVEL_DATUM"), "QCD (invented)");
    EXPECT_STREQ(depth->GetMetadataItem("TIDEWRIGHT_WATER_LEVEL_DATUM"), "QCD (invented)");
  }
}
