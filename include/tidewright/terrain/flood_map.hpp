// The map pipeline: DEM, sea and defences in; the flood-threshold raster computed once; then,
// streamed block by block against it, the extent, depth, AEP and first-year rasters, extent
// polygons and a summary table, all written into one output folder that appears whole or not
// at all (AtomicPath on the folder).
//
// Memory: the threshold pass holds z (4 bytes/cell), T (4), the sea mask (1) and one open bit
// per cell, i.e. about 9.1 bytes/cell, plus the priority queue (8 bytes per cell on the flood
// front) and the FIFO (4 bytes per cell in a depression being filled). Reading adds a transient
// full-size float32 grid per offset raster, sea raster or defence layer. The streamed passes
// need one block of 256 rows per output band; polygons add one byte per cell while a level is
// polygonised. See docs/methods-terrain.md and docs/performance.md ("Maps").
#pragma once

#include <filesystem>
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "tidewright/terrain/defences.hpp"
#include "tidewright/terrain/dem.hpp"
#include "tidewright/terrain/flood_threshold.hpp"
#include "tidewright/terrain/inundation.hpp"
#include "tidewright/terrain/raster_writer.hpp"
#include "tidewright/terrain/sea.hpp"

namespace tidewright::terrain {

// A still-water level to map (m above the water-level datum), with the year and scenario it
// stands for when the planning stage supplied it (written as attributes; empty otherwise).
struct MapLevel {
  double level_m = 0.0;
  std::optional<int> year;
  std::string scenario;
  // The return period T whose T-year level this is (extremes::return_period_definition), when
  // it came from one; recorded on the level's bands and polygons.
  std::optional<double> return_period_yr{};
};

// One band of the AEP raster: P = 1 - exp(-N(T)) for a rate function N (present day:
// extremes::StillWaterModel::annual_exceedance_rate; a future year: the planning stage's N_t).
struct AepLayer {
  RateFunction rate;
  std::string description;  // e.g. "present-day AEP (GEV fit)"
  std::optional<int> year;
  std::string scenario;
};

struct FirstYearLayer {
  std::vector<YearlyRate> years;
  RateFunction today;  // today's rate: cells passing under it are "already today" (code 1)
  double aep = 0.01;
  std::string description;
  std::string scenario;
};

// The threshold stage alone: inputs read, defences burned, T computed.
struct FloodThresholdMap {
  Dem dem;
  SeaCells sea;
  std::optional<DefenceBurn> defences;
  Connectivity connectivity = Connectivity::eight;
  std::vector<float> threshold_m;
};

[[nodiscard]] FloodThresholdMap prepare_flood_threshold(
    const DemSource& dem, const SeaSource& sea, const std::optional<DefenceSource>& defences,
    Connectivity connectivity);

// No still-water level reaches 50 m above a tidal datum (the highest storm tides on record are
// under 10 m, from memory): a higher one is usually a level in centimetres or feet.
inline constexpr double max_plausible_level_m = 50.0;

enum class PolygonFormat { geopackage, flatgeobuf, shapefile };

struct MapRequest {
  DemSource dem;
  SeaSource sea;
  std::optional<DefenceSource> defences;
  Connectivity connectivity = Connectivity::eight;
  std::vector<MapLevel> levels;
  // Levels more than max_plausible_level_m above the datum are refused unless this is set.
  bool accept_high_levels = false;
  // How the caller names these inputs in messages: the command's flags by default, the site
  // file's keys in a study.
  struct InputNames {
    std::string level = "--level";
    std::string accept_high_level = "pass --accept-high-level to map it on purpose";  // a hint
    std::string polygons = "--polygons";
  } names{};
  std::vector<AepLayer> aep;
  std::optional<FirstYearLayer> first_year;
  bool polygons = false;  // extent polygons (needs levels), in polygon_format:
  // GeoPackage (extent.gpkg, one layer, layer metadata), FlatGeobuf (extent.fgb) or ESRI
  // Shapefile (extent.shp with .shx, .dbf, .prj, .cpg; field names cut to 10 characters:
  // extent_class -> ext_class, return_period_yr -> ret_per_yr; no layer metadata).
  PolygonFormat polygon_format = PolygonFormat::geopackage;
  RasterFormat format;
  std::filesystem::path out_dir;
  bool force = false;
  // For the outputs' metadata record; the cautions come from the caller (report/cautions.hpp:
  // terrain comes before report in the module order, so it does not include it).
  std::string command_line;
  std::vector<std::string> cautions;
  // The water-level datum's name (from the fit), recorded on every band and polygon layer;
  // empty when the caller does not know it.
  std::string datum;
  // Further inputs for every file's metadata record, as the caller names them (e.g.
  // TIDEWRIGHT_FIT = the fit file, TIDEWRIGHT_MEMBERS = the projection's members file).
  std::vector<std::pair<std::string, std::string>> input_metadata;
  // Depths also as one single-band file per level (depth_level_K.tif), beside depth.tif.
  bool depth_per_level = false;
  std::function<void(double fraction)> progress;  // 0..1; may be empty
};

struct LevelSummary {
  MapLevel level;
  std::size_t connected_cells = 0;
  std::size_t cut_off_cells = 0;
  double flooded_area_m2 = 0.0;       // connected flooded land (sea cells excluded)
  double cut_off_area_m2 = 0.0;  // land below the level the sea does not reach
  double volume_m3 = 0.0;             // sum of depth x cell area over connected flooded land
  double max_depth_m = 0.0;
};

struct MapSummary {
  std::size_t cells = 0;
  std::size_t valid_cells = 0;  // with an elevation (not nodata): the metadata record's "valid" count
  std::size_t sea_cells = 0;
  std::size_t unreached_cells = 0;  // valid land no path of valid cells joins to the sea
  double lowest_threshold_m = 0.0;  // over finite thresholds
  double highest_threshold_m = 0.0;
  std::string area_method;
  std::vector<LevelSummary> levels;
  std::vector<std::string> files;  // names inside out_dir
  std::vector<std::string> warnings;  // about the inputs (e.g. a DEM's unclear vertical unit)
  std::optional<DefenceBurn> defences;  // what the defence layer did, when one was given
};

// One level's summary as summary.json and a study's results.json write it: the level, its year,
// scenario and return period, cell counts, areas (m2), volume (m3) and deepest depth (m).
[[nodiscard]] nlohmann::ordered_json level_summary_json(const LevelSummary& l);

// Throws InputError for bad inputs (before any output exists) and when out_dir exists without
// force; ComputationError for a rate function that rises with level.
[[nodiscard]] MapSummary make_flood_maps(const MapRequest& request);

}  // namespace tidewright::terrain
