// write_demo_inputs: the folder of the demo study of Quillhaven (invented data) is complete,
// deterministic, refused when it exists without force, and its site file names its files.
#include "demo_inputs.hpp"

#include <gdal_priv.h>
#include <gtest/gtest.h>

#include "tidewright/study/site_config.hpp"
#include <toml++/toml.h>

#include <fstream>

#include "support/run_cli.hpp"
#include "tidewright/common/error.hpp"

namespace demo = tidewright::demo;
using tidewright::testing::read_all;
using tidewright::testing::TempDir;

namespace {

std::vector<float> raster_values(const std::filesystem::path& p) {
  GDALAllRegister();
  GDALDataset* ds = static_cast<GDALDataset*>(GDALOpen(p.c_str(), GA_ReadOnly));
  if (ds == nullptr) return {};
  const int nx = ds->GetRasterXSize();
  const int ny = ds->GetRasterYSize();
  std::vector<float> v(static_cast<std::size_t>(nx) * static_cast<std::size_t>(ny));
  if (ds->GetRasterBand(1)->RasterIO(GF_Read, 0, 0, nx, ny, v.data(), nx, ny, GDT_Float32, 0, 0) !=
      CE_None)
    v.clear();
  GDALClose(ds);
  return v;
}

}  // namespace

TEST(DemoInputs, WritesEveryFileAndTheSameBytesForTheSameSeed) {
  TempDir a;
  TempDir b;
  const demo::DemoOptions small{true, false};
  const auto in = demo::write_demo_inputs(a / "inputs", 42, small);
  (void)demo::write_demo_inputs(b / "inputs", 42, small);
  for (const auto& p :
       {in.record_csv, in.dem_tif, in.defences_geojson, in.sea_geojson, in.site_toml}) {
    ASSERT_TRUE(std::filesystem::exists(p)) << p;
    EXPECT_GT(std::filesystem::file_size(p), 100U) << p;
  }
  EXPECT_EQ(std::distance(std::filesystem::directory_iterator(a / "inputs"),
                          std::filesystem::directory_iterator()),
            5);
  EXPECT_EQ(in.first_year, 1995);
  EXPECT_EQ(in.dem_columns, 300);
  EXPECT_EQ(in.dem_rows, 225);
  // Same seed: byte-identical record, GeoJSON and site file, identical raster values.
  for (const char* name : {"quillhaven_tide_gauge.csv", "quillhaven_defences.geojson",
                           "quillhaven_sea.geojson", "site.toml"}) {
    EXPECT_EQ(read_all(a / "inputs" / name), read_all(b / "inputs" / name)) << name;
  }
  const auto va = raster_values(in.dem_tif);
  ASSERT_EQ(va.size(), 300U * 225U);
  EXPECT_EQ(va, raster_values(b / "inputs" / "quillhaven_dem.tif"));
  // Every file says the data are invented.
  for (const char* name :
       {"quillhaven_tide_gauge.csv", "quillhaven_defences.geojson", "site.toml"}) {
    EXPECT_NE(read_all(a / "inputs" / name).find("INVENTED DATA"), std::string::npos) << name;
  }
  EXPECT_NE(read_all(in.dem_tif).find("INVENTED DATA"), std::string::npos);
  EXPECT_EQ(in.summary_text().rfind("INVENTED DATA", 0), 0U);
  // The record's counts add up.
  EXPECT_EQ(in.rows_with_value + in.rows_na + in.rows_empty + in.rows_sentinel, in.rows_written);
  EXPECT_LT(in.rows_written, in.hours_in_span);
}

TEST(DemoInputs, ExistingFolderIsRefusedWithoutForceAndNothingChanges) {
  TempDir dir;
  const auto in = demo::write_demo_inputs(dir.path(), 1, {true, false});
  const std::string before = read_all(in.record_csv);
  try {
    (void)demo::write_demo_inputs(dir.path(), 2, {true, false});
    FAIL() << "an existing demo folder was overwritten without force";
  } catch (const tidewright::InputError& e) {
    EXPECT_NE(std::string(e.what()).find("--force"), std::string::npos) << e.what();
  }
  EXPECT_EQ(read_all(in.record_csv), before);
  (void)demo::write_demo_inputs(dir.path(), 2, {true, true});
  EXPECT_NE(read_all(in.record_csv), before);
}

TEST(DemoInputs, SiteFileLoadsAndNamesTheWrittenFiles) {
  TempDir dir;
  const auto in = demo::write_demo_inputs(dir.path(), 3, {true, false});
  // Through the study's own strict reader: an unknown or misspelt key would fail here.
  const auto site = tidewright::study::load_site_file(in.site_toml);
  EXPECT_TRUE(site.site.invented);
  EXPECT_EQ(site.site.crs, "EPSG:32630");
  ASSERT_TRUE(site.map.enabled);
  ASSERT_TRUE(site.map.dem_offset_m.has_value());
  EXPECT_EQ(*site.map.dem_offset_m, 0.0);
  EXPECT_EQ(site.seed, 3U);
  for (const auto& p : {site.fit.input, site.map.dem, *site.map.sea, *site.map.defences}) {
    EXPECT_TRUE(std::filesystem::exists(p)) << p;
  }
}

TEST(DemoInputs, CommittedSiteFileIsTheGeneratorsText) {
  // demo_coast/site.toml is demo_site_toml() for the default seed and the full variant; if the
  // keys change, change the generator and copy its text (see demo_coast/README.md).
  const std::string committed =
      read_all(std::filesystem::path(TIDEWRIGHT_SOURCE_DIR) / "demo_coast" / "site.toml");
  EXPECT_EQ(committed, demo::demo_site_toml(demo::demo_default_seed, false));
}

TEST(DemoInputs, BadCellSizeIsRefusedBeforeAnyFileIsWritten) {
  TempDir dir;
  demo::DemoOptions options{true, false};
  options.dem_cell_size_m = 0.1;
  EXPECT_THROW((void)demo::write_demo_inputs(dir.path(), 1, options), tidewright::InputError);
  EXPECT_TRUE(std::filesystem::is_empty(dir.path()));
}
