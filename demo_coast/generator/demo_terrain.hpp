// The synthetic terrain of Quillhaven, an INVENTED harbour town (invented data — not a real
// place, not for any real decision): a DEM (GeoTIFF, float32), its defence lines and its sea
// polygon (GeoJSON). The landscape is defined by functions of position in metres, so any cell
// size samples the same place; the seed only moves small texture noise on the hills, flats and
// sea bed, never the levels of the designed features (quays, breakwater, ridge, saddle, floors).
//
// Glossary (names in code → demo_coast/README.md):
//   x_m, y_m         local east and north from the south-west corner of the area (metres)
//   coast_y_m(x)     the mean-sea-level shoreline y_c(x)
//   d_m              y − y_c(x), distance inland from the shoreline (negative offshore)
//   elevation_m      z, metres above QCD (the gauge datum; DEM datum = gauge datum + 0.0 m)
#pragma once

#include <array>
#include <cstddef>
#include <filesystem>
#include <string>
#include <vector>

namespace tidewright::demo {

struct TerrainDesign {
  double cell_size_m = 5.0;
  double width_m = 6000.0;        // 1,200 columns at 5 m
  double height_m = 4500.0;       // 900 rows at 5 m
  double west_m = 497000.0;       // easting of the west edge, EPSG:32630 (invented place)
  double south_m = 5000000.0;     // northing of the south edge
  float nodata = -9999.0F;        // declared nodata; sea cells are real (negative) values
  bool unsurveyed_corner = true;  // a small north-east corner left as nodata ("not surveyed")
};

// Designed features, in local metres, so that tests and the study can find them.
struct Landmark {
  std::string name;
  double x_m = 0.0;
  double y_m = 0.0;
  double design_elevation_m = 0.0;  // the level the design puts there (metres above QCD)
};

// Designed levels (metres above QCD; all invented).
struct TerrainLevels {
  double quay_m = 5.2;
  double breakwater_crest_m = 7.0;
  double ridge_crest_m = 7.5;
  double saddle_m = 6.3;  // lowest point of the ridge: where the low district spills
  double low_district_floor_m = 3.4;
  double floodplain_m = 4.6;  // river floodplain near the mouth, rising inland
  double harbour_floor_m = -6.0;
  double seawall_crest_m = 6.0;     // defence attribute only; not in the DEM
  double embankment_crest_m = 6.3;  // defence attribute only; not in the DEM
};

[[nodiscard]] TerrainLevels terrain_levels();
[[nodiscard]] double coast_y_m(double x_m);
// Landmarks: harbour basin, west quay, breakwater crest, outer harbour, low district, saddle,
// ridge crest, floodplain, river channel, town centre, town seafront, open sea, hills.
[[nodiscard]] std::vector<Landmark> terrain_landmarks();

struct Terrain {
  TerrainDesign design;
  unsigned long long seed = 0;
  int columns = 0;
  int rows = 0;
  std::vector<float> elevation_m;        // row-major from the north-west corner; nodata declared
  std::array<double, 6> geotransform{};  // GDAL order

  [[nodiscard]] float at(int row, int column) const {
    return elevation_m[static_cast<std::size_t>(row) * static_cast<std::size_t>(columns) +
                       static_cast<std::size_t>(column)];
  }
  // Row and column of the cell holding local point (x_m, y_m).
  [[nodiscard]] std::array<int, 2> cell_of(double x_m, double y_m) const;
};

// The elevation of the design at local point (x_m, y_m) with the seeded texture noise.
[[nodiscard]] Terrain generate_terrain(const TerrainDesign& design, unsigned long long seed);

// GeoTIFF (float32, DEFLATE, tiled, nodata and EPSG:32630 set, metadata saying "invented")
// written through common/atomic_output.hpp.
void write_terrain_geotiff(const Terrain& terrain, const std::filesystem::path& path, bool force);
// Defence lines (LineStrings with "name", "kind", "crest_m" in metres above QCD).
void write_defences_geojson(const TerrainDesign& design, const std::filesystem::path& path,
                            bool force);
// One polygon of open sea (every DEM cell inside it is below 0 m QCD), attribute "name".
void write_sea_geojson(const TerrainDesign& design, const std::filesystem::path& path, bool force);

// The defence lines and the sea polygon in local metres (for tests and the README).
struct DefenceLine {
  std::string name;
  std::string kind;
  double crest_m = 0.0;
  std::vector<std::array<double, 2>> points_m;
};
[[nodiscard]] std::vector<DefenceLine> defence_lines();
[[nodiscard]] std::vector<std::array<double, 2>> sea_polygon_m(const TerrainDesign& design);

}  // namespace tidewright::demo
