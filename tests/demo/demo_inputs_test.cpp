// write_demo_inputs: the folder of the demo study of Quillhaven (invented data) is complete,
// deterministic, refused when it exists without force, and its site file names its files.
#include "demo_inputs.hpp"

#include <gdal_priv.h>
#include <gtest/gtest.h>
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

TEST(DemoInputs, SiteFileParsesAndNamesTheWrittenFiles) {
  TempDir dir;
  const auto in = demo::write_demo_inputs(dir.path(), 3, {true, false});
  const toml::table site = toml::parse_file(in.site_toml.string());
  EXPECT_EQ(site["site"]["invented"].value<bool>(), true);
  EXPECT_EQ(site["site"]["crs"].value<std::string>(), "EPSG:32630");
  EXPECT_EQ(site["site"]["dem_datum_offset_m"].value<double>(), 0.0);
  for (const auto& [table, key] : std::vector<std::pair<std::string, std::string>>{
           {"record", "path"}, {"terrain", "dem"}, {"terrain", "sea"}, {"terrain", "defences"}}) {
    const auto rel = site[table][key].value<std::string>();
    ASSERT_TRUE(rel) << table << "." << key;
    EXPECT_TRUE(std::filesystem::exists(dir / *rel)) << *rel;
  }
  EXPECT_EQ(site["projection"]["seed"].value<std::int64_t>(), 3);
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
