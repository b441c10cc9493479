// The demo generator's terrain of Quillhaven (invented data): the DEM opens in GDAL with its CRS
// and nodata, the designed features are where the design puts them, the low district behind the
// ridge is cut off from the sea below its saddle, and the defence and sea GeoJSON open in OGR.
#include "demo_terrain.hpp"

#include <gdal_alg.h>
#include <gdal_priv.h>
#include <gtest/gtest.h>
#include <ogr_spatialref.h>
#include <ogrsf_frmts.h>

#include <cmath>
#include <deque>
#include <string>
#include <vector>

#include "demo_inputs.hpp"
#include "demo_place.hpp"
#include "support/run_cli.hpp"

namespace demo = tidewright::demo;
using tidewright::testing::TempDir;

namespace {

const demo::Terrain& full_terrain() {
  static const demo::Terrain t =
      demo::generate_terrain(demo::demo_terrain_design(false), 20261201ULL);
  return t;
}

const demo::Landmark& landmark(const std::string& name) {
  static const auto marks = demo::terrain_landmarks();
  for (const auto& m : marks) {
    if (m.name == name) return m;
  }
  throw std::runtime_error("no landmark " + name);
}

float at_landmark(const demo::Terrain& t, const std::string& name) {
  const auto& m = landmark(name);
  const auto rc = t.cell_of(m.x_m, m.y_m);
  return t.at(rc[0], rc[1]);
}

// Cells at or below `level_m` that are 8-connected to a sea cell (z < 0): a plain breadth-first
// flood fill, the textbook reference for the connectivity that a priority-flood computes
// (Barnes, Lehman & Mulla 2014, §1).
std::vector<char> connected_to_sea(const demo::Terrain& t, double level_m) {
  const int nr = t.rows;
  const int nc = t.columns;
  std::vector<char> wet(static_cast<std::size_t>(nr) * static_cast<std::size_t>(nc), 0);
  std::deque<std::pair<int, int>> queue;
  const auto idx = [nc](int r, int c) {
    return static_cast<std::size_t>(r) * static_cast<std::size_t>(nc) + static_cast<std::size_t>(c);
  };
  const auto floodable = [&](int r, int c) {
    const float z = t.at(r, c);
    return z != t.design.nodata && z <= level_m;
  };
  for (int r = 0; r < nr; ++r) {
    for (int c = 0; c < nc; ++c) {
      const float z = t.at(r, c);
      if (z != t.design.nodata && z < 0.0F) {
        wet[idx(r, c)] = 1;
        queue.emplace_back(r, c);
      }
    }
  }
  while (!queue.empty()) {
    const auto [r, c] = queue.front();
    queue.pop_front();
    for (int dr = -1; dr <= 1; ++dr) {
      for (int dc = -1; dc <= 1; ++dc) {
        const int rr = r + dr;
        const int cc = c + dc;
        if (rr < 0 || cc < 0 || rr >= nr || cc >= nc || wet[idx(rr, cc)] != 0 || !floodable(rr, cc))
          continue;
        wet[idx(rr, cc)] = 1;
        queue.emplace_back(rr, cc);
      }
    }
  }
  return wet;
}

bool wet_at(const demo::Terrain& t, const std::vector<char>& wet, const std::string& name) {
  const auto& m = landmark(name);
  const auto rc = t.cell_of(m.x_m, m.y_m);
  return wet[static_cast<std::size_t>(rc[0]) * static_cast<std::size_t>(t.columns) +
             static_cast<std::size_t>(rc[1])] != 0;
}

struct DatasetCloser {
  void operator()(GDALDataset* ds) const { GDALClose(ds); }
};
using Dataset = std::unique_ptr<GDALDataset, DatasetCloser>;

Dataset open_vector(const std::filesystem::path& p) {
  GDALAllRegister();
  return Dataset(static_cast<GDALDataset*>(
      GDALOpenEx(p.c_str(), GDAL_OF_VECTOR | GDAL_OF_READONLY, nullptr, nullptr, nullptr)));
}

}  // namespace

TEST(DemoTerrain, SameSeedSameValuesAndSeedsOnlyMoveTexture) {
  const auto design = demo::demo_terrain_design(true);
  const auto a = demo::generate_terrain(design, 5);
  const auto b = demo::generate_terrain(design, 5);
  const auto c = demo::generate_terrain(design, 6);
  EXPECT_EQ(a.elevation_m, b.elevation_m);
  EXPECT_NE(a.elevation_m, c.elevation_m);
  for (const char* name :
       {"west quay", "breakwater crest", "harbour basin", "Orrin gap (saddle)"}) {
    EXPECT_EQ(at_landmark(a, name), at_landmark(c, name)) << name;
  }
}

TEST(DemoTerrain, GeoTiffOpensWithCrsNodataAndTheSameValues) {
  TempDir dir;
  const auto& t = full_terrain();
  demo::write_terrain_geotiff(t, dir / "dem.tif", false);
  GDALAllRegister();
  Dataset ds(static_cast<GDALDataset*>(GDALOpen((dir / "dem.tif").c_str(), GA_ReadOnly)));
  ASSERT_TRUE(ds);
  EXPECT_EQ(ds->GetRasterXSize(), 1200);
  EXPECT_EQ(ds->GetRasterYSize(), 900);
  const OGRSpatialReference* srs = ds->GetSpatialRef();
  ASSERT_NE(srs, nullptr);
  EXPECT_STREQ(srs->GetAuthorityCode(nullptr), "32630");
  std::array<double, 6> gt{};
  ASSERT_EQ(ds->GetGeoTransform(gt.data()), CE_None);
  EXPECT_DOUBLE_EQ(gt[0], 497000.0);
  EXPECT_DOUBLE_EQ(gt[1], 5.0);
  EXPECT_DOUBLE_EQ(gt[3], 5004500.0);
  EXPECT_DOUBLE_EQ(gt[5], -5.0);
  GDALRasterBand* band = ds->GetRasterBand(1);
  EXPECT_EQ(band->GetRasterDataType(), GDT_Float32);
  int has_nodata = 0;
  EXPECT_EQ(band->GetNoDataValue(&has_nodata), -9999.0);
  EXPECT_EQ(has_nodata, 1);
  EXPECT_NE(std::string(ds->GetMetadataItem("INVENTED_DATA")).find("not a real place"),
            std::string::npos);
  std::vector<float> back(t.elevation_m.size());
  ASSERT_EQ(band->RasterIO(GF_Read, 0, 0, 1200, 900, back.data(), 1200, 900, GDT_Float32, 0, 0),
            CE_None);
  EXPECT_EQ(back, t.elevation_m);
  // Nodata only in the unsurveyed north-east corner; the sea is real negative values.
  std::size_t nodata = 0;
  std::size_t sea = 0;
  for (int r = 0; r < t.rows; ++r) {
    for (int c = 0; c < t.columns; ++c) {
      if (t.at(r, c) == t.design.nodata) {
        ++nodata;
        ASSERT_GT((c + 0.5) * 5.0 + (900 - r - 0.5) * 5.0, 10200.0);
      } else if (t.at(r, c) < 0.0F) {
        ++sea;
      }
    }
  }
  EXPECT_GT(nodata, 0U);
  EXPECT_LT(nodata, 20000U);
  EXPECT_GT(sea, 300000U);  // roughly the southern 1,250 m of 4,500 m
}

TEST(DemoTerrain, DesignedFeaturesAreWhereTheDesignSays) {
  const auto& t = full_terrain();
  const demo::TerrainLevels lv = demo::terrain_levels();
  EXPECT_FLOAT_EQ(at_landmark(t, "west quay"), static_cast<float>(lv.quay_m));
  EXPECT_FLOAT_EQ(at_landmark(t, "harbour basin"), static_cast<float>(lv.harbour_floor_m));
  EXPECT_FLOAT_EQ(at_landmark(t, "breakwater crest"), static_cast<float>(lv.breakwater_crest_m));
  EXPECT_LT(at_landmark(t, "outer harbour"), 0.0F);
  EXPECT_LT(at_landmark(t, "open sea"), -5.0F);
  EXPECT_LT(at_landmark(t, "Tamsel channel"), 0.0F);
  EXPECT_GT(at_landmark(t, "hills"), 30.0F);
  EXPECT_NEAR(at_landmark(t, "Orrin Levels (low district)"), lv.low_district_floor_m, 0.05);
  EXPECT_NEAR(at_landmark(t, "Orrin Bank crest"), lv.ridge_crest_m, 0.05);
  EXPECT_NEAR(at_landmark(t, "Tamsel floodplain"), landmark("Tamsel floodplain").design_elevation_m,
              0.05);
  // The breakwater is a thin wall with sea on both sides: 40 m north and south of its crest
  // landmark the cells are below 0 m.
  const auto& bw = landmark("breakwater crest");
  for (double dy : {-40.0, 40.0}) {
    const auto rc = t.cell_of(bw.x_m, bw.y_m + dy);
    EXPECT_LT(t.at(rc[0], rc[1]), 0.0F) << dy;
  }
}

TEST(DemoTerrain, LowDistrictIsCutOffFromTheSeaBelowTheSaddle) {
  for (bool small : {false, true}) {
    const auto t = small ? demo::generate_terrain(demo::demo_terrain_design(true), 20261201ULL)
                         : full_terrain();
    const double saddle = demo::terrain_levels().saddle_m;
    // At 5.0 m (above the district floor of 3.4 m) a bathtub fill would flood the district; the
    // connected fill does not, but it does flood the river floodplain through the channel.
    EXPECT_LT(at_landmark(t, "Orrin Levels (low district)"), 5.0F);
    const auto at5 = connected_to_sea(t, 5.0);
    EXPECT_FALSE(wet_at(t, at5, "Orrin Levels (low district)")) << small;
    EXPECT_TRUE(wet_at(t, at5, "Tamsel floodplain")) << small;
    EXPECT_FALSE(wet_at(t, at5, "town centre")) << small;
    EXPECT_FALSE(wet_at(t, connected_to_sea(t, 4.7), "Tamsel floodplain")) << small;
    // Just below the saddle the district stays dry; just above it, it floods through the gap.
    EXPECT_FALSE(wet_at(t, connected_to_sea(t, saddle - 0.05), "Orrin Levels (low district)"))
        << small;
    EXPECT_TRUE(wet_at(t, connected_to_sea(t, saddle + 0.05), "Orrin Levels (low district)"))
        << small;
  }
}

TEST(DemoTerrain, DefencesOpenInOgrWithCrestLevels) {
  TempDir dir;
  const auto design = demo::demo_terrain_design(false);
  demo::write_defences_geojson(design, dir / "defences.geojson", false);
  const Dataset ds = open_vector(dir / "defences.geojson");
  ASSERT_TRUE(ds);
  ASSERT_EQ(ds->GetLayerCount(), 1);
  OGRLayer* layer = ds->GetLayer(0);
  ASSERT_NE(layer->GetSpatialRef(), nullptr);
  EXPECT_STREQ(layer->GetSpatialRef()->GetAuthorityCode(nullptr), "32630");
  const int crest = layer->GetLayerDefn()->GetFieldIndex("crest_m");
  ASSERT_GE(crest, 0);
  EXPECT_EQ(layer->GetLayerDefn()->GetFieldDefn(crest)->GetType(), OFTReal);
  const auto& t = full_terrain();
  std::vector<double> crests;
  for (auto& f : *layer) {
    crests.push_back(f->GetFieldAsDouble(crest));
    const OGRGeometry* g = f->GetGeometryRef();
    ASSERT_NE(g, nullptr);
    ASSERT_EQ(wkbFlatten(g->getGeometryType()), wkbLineString);
    const auto* line = g->toLineString();
    ASSERT_GE(line->getNumPoints(), 2);
    // Every vertex stands on land, and the line adds height the DEM does not hold somewhere
    // (its ends tie into ground above the crest).
    bool adds_height = false;
    for (int i = 0; i < line->getNumPoints(); ++i) {
      const auto rc = t.cell_of(line->getX(i) - design.west_m, line->getY(i) - design.south_m);
      const float z = t.at(rc[0], rc[1]);
      EXPECT_GT(z, 4.0F);
      adds_height = adds_height || z < f->GetFieldAsDouble(crest) - 0.5;
    }
    EXPECT_TRUE(adds_height) << f->GetFieldAsString("name");
  }
  EXPECT_EQ(crests, (std::vector<double>{6.3, 6.0, 6.0}));
}

TEST(DemoTerrain, SeawallKeepsTheSeafrontDryUntilOvertopped) {
  // Burn the defence crests into the DEM (GDAL's rasterizer, all cells the lines touch, the
  // higher of ground and crest), then fill from the sea: the seafront behind the 6.0 m wall is
  // wet at 5.9 m without the wall and dry with it; at 6.1 m the wall is overtopped.
  TempDir dir;
  const auto design = demo::demo_terrain_design(false);
  demo::write_defences_geojson(design, dir / "defences.geojson", false);
  const auto& t = full_terrain();
  GDALAllRegister();
  Dataset mem(GetGDALDriverManager()->GetDriverByName("MEM")->Create("", t.columns, t.rows, 1,
                                                                     GDT_Float32, nullptr));
  auto gt = t.geotransform;
  mem->SetGeoTransform(gt.data());
  ASSERT_EQ(mem->GetRasterBand(1)->Fill(-1e30), CE_None);  // no crest: leave the ground as it is
  const Dataset vec = open_vector(dir / "defences.geojson");
  int band = 1;
  OGRLayerH layer = vec->GetLayer(0);
  char** options = CSLSetNameValue(nullptr, "ATTRIBUTE", "crest_m");
  options = CSLSetNameValue(options, "ALL_TOUCHED", "TRUE");
  ASSERT_EQ(GDALRasterizeLayers(mem.get(), 1, &band, 1, &layer, nullptr, nullptr, nullptr, options,
                                nullptr, nullptr),
            CE_None);
  CSLDestroy(options);
  std::vector<float> crest(t.elevation_m.size());
  ASSERT_EQ(mem->GetRasterBand(1)->RasterIO(GF_Read, 0, 0, t.columns, t.rows, crest.data(),
                                            t.columns, t.rows, GDT_Float32, 0, 0),
            CE_None);
  demo::Terrain defended = t;
  for (std::size_t i = 0; i < crest.size(); ++i) {
    if (defended.elevation_m[i] != t.design.nodata)
      defended.elevation_m[i] = std::max(defended.elevation_m[i], crest[i]);
  }
  const std::string front = "town seafront (behind the seawall)";
  EXPECT_TRUE(wet_at(t, connected_to_sea(t, 5.9), front));
  const auto defended_59 = connected_to_sea(defended, 5.9);
  EXPECT_FALSE(wet_at(defended, defended_59, front));
  EXPECT_TRUE(wet_at(defended, defended_59, "Tamsel floodplain"));  // the sea is still there
  EXPECT_TRUE(wet_at(defended, connected_to_sea(defended, 6.1), front));
}

TEST(DemoTerrain, SeaPolygonOpensInOgrAndCoversOnlySea) {
  TempDir dir;
  const auto design = demo::demo_terrain_design(false);
  demo::write_sea_geojson(design, dir / "sea.geojson", false);
  const Dataset ds = open_vector(dir / "sea.geojson");
  ASSERT_TRUE(ds);
  OGRLayer* layer = ds->GetLayer(0);
  ASSERT_EQ(layer->GetFeatureCount(), 1);
  EXPECT_STREQ(layer->GetSpatialRef()->GetAuthorityCode(nullptr), "32630");
  const OGRFeatureUniquePtr f(layer->GetNextFeature());
  const OGRGeometry* poly = f->GetGeometryRef();
  ASSERT_EQ(wkbFlatten(poly->getGeometryType()), wkbPolygon);
  EXPECT_GT(poly->toPolygon()->get_Area(), 6000.0 * 500.0);
  const auto& t = full_terrain();
  std::size_t inside = 0;
  for (int r = 0; r < t.rows; r += 4) {
    for (int c = 0; c < t.columns; c += 4) {
      const OGRPoint p(t.geotransform[0] + (c + 0.5) * 5.0, t.geotransform[3] - (r + 0.5) * 5.0);
      if (!poly->Contains(&p)) continue;
      ++inside;
      ASSERT_LT(t.at(r, c), 0.0F) << r << "," << c;
    }
  }
  EXPECT_GT(inside, 5000U);
}
