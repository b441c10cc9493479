// The map folder as a GIS reads it: GDAL's Python bindings (Debian python3-gdal) open the class
// rasters as classes (palette, colour table, category names), find units, level metadata,
// statistics and overviews on every band, and parse the SLD styles
// (tests/reference/scripts/map_products_gdal.py).
#include <gtest/gtest.h>

#include <cstdio>
#include <string>
#include <vector>

#include "support/run_cli.hpp"
#include "terrain/terrain_fixtures.hpp"

using tidewright::testing::run_cli;
using tidewright::testing::shell_quote;
using tidewright::testing::TempDir;

TEST(MapProductsGdal, ClassRastersStylesAndStatisticsReadBack) {
  TempDir tmp;
  // 600 x 4 cells of 10 m (wide enough for one overview level): sea below column 100, then a
  // slope of 1 cm a cell.
  std::vector<double> z;
  for (int r = 0; r < 4; ++r) {
    for (int c = 0; c < 600; ++c) z.push_back(0.01 * (c - 100));
  }
  const auto dem = (tmp / "dem.tif").string();
  tidewright::testing::write_raster(dem, 600, 4, tidewright::testing::utm_10m, 32633, z);
  const auto out = tmp / "maps";
  const auto r = run_cli("map --dem " + shell_quote(dem) + " --same-datum --sea-edge-below 0 --level 1,2 --quiet --out " +
                         shell_quote(out.string()));
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const std::string cmd = std::string(TIDEWRIGHT_PYTHON) + " " + TIDEWRIGHT_SOURCE_DIR +
                          "/tests/reference/scripts/map_products_gdal.py " + shell_quote(out.string()) + " 2 2>&1";
  const auto script = tidewright::testing::run_shell(cmd);
  ASSERT_EQ(script.exit_code, 0) << "the GDAL script failed (needs python3-gdal): " << script.out;
  EXPECT_EQ(script.out, "ok\n");
}
