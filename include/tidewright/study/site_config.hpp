// The site file: one TOML file that describes a study from record to maps. Its keys are
// documented in docs/site-file.md; unknown and missing keys are errors naming the key's path
// and the file's line; relative paths are relative to the site file's folder.
#pragma once

#include <array>
#include <filesystem>
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "tidewright/climate/projection.hpp"
#include "tidewright/record/mean_sea_level_trend.hpp"
#include "tidewright/study/fit_stage.hpp"
#include "tidewright/study/projection_stage.hpp"
#include "tidewright/terrain/flood_threshold.hpp"

namespace tidewright::study {

struct SiteInfo {
  std::string name;
  std::string crs;             // CRS of the coordinates, e.g. "EPSG:32633"
  double x = 0.0, y = 0.0;     // site (gauge) coordinates in `crs`
  std::string datum;           // water-level datum label, carried into every output
  bool invented = false;       // true for the demo: every output says so
};

struct ScenarioSettings {
  std::string name;
  ScenarioSource source = ScenarioSource::pathway;
  std::string pathway;             // built-in illustrative pathway name
  std::optional<std::filesystem::path> path;  // CSV for the other sources
  climate::IceStoryline storyline = climate::IceStoryline::assessed;
};

struct ProjectionSettings {
  int members = 2000;
  int start_year = 2020;
  int end_year = 2150;
  std::string reference = "1995-2014";  // "YYYY" or "YYYY-YYYY"
  bool accept_extreme = false;  // project's --accept-extreme: inputs outside the physical ranges on purpose
};

struct LocalSettings {
  std::map<std::string, double> fingerprints;  // component -> factor; absent = 1
  double land_motion_mm_per_yr = 0.0;          // positive = uplift
  double land_motion_sd_mm_per_yr = 0.0;
  double ocean_dynamic_offset_m = 0.0;
  double ocean_dynamic_sd_m = 0.0;
  // The year the stated ocean dynamic offset is reached, by a linear ramp from zero at the
  // projection's start (2100: the year assessments state regional offsets for; common practice).
  int ocean_dynamic_year = 2100;
};

struct PlanningSettings {
  std::vector<int> design_years{2050, 2100};
  std::vector<double> return_periods_yr{10, 100};
  int design_life_start = 2030;
  int design_life_end = 2100;
  double target_risk = 0.1;                  // probability over the design life
  std::vector<double> levels_of_interest_m;  // e.g. a quay deck
  double storminess_scale_per_yr = 0.0;      // relative change of the extreme scale per year
  // Rise from the record's epoch to the projection's reference, metres; needed only when the
  // epoch lies neither in the projected years nor in the reference period (none by default).
  std::optional<double> epoch_offset_m;
};

struct MapSettings {
  bool enabled = false;
  std::filesystem::path dem;
  std::optional<double> dem_offset_m;  // water level = DEM elevation + offset
  std::string dem_crs;                 // used only when the DEM has none (map --dem-crs)
  std::optional<double> dem_nodata;    // declared in addition to the file's own (map --dem-nodata)
  std::string z_units;                 // the DEM values' unit (map --z-units); empty: as the file says
  std::optional<double> z_factor;      // metres per unit instead (map --z-factor)
  std::optional<std::array<double, 4>> window;    // map.window: ULX ULY LRX LRY in the DEM's CRS
  bool same_datum = false;
  std::optional<std::filesystem::path> sea;       // vector polygon or raster mask
  std::string sea_layer;                          // the sea's layer in a vector file of several
  std::string sea_where;                          // OGR SQL attribute filter on the sea's features
  std::optional<double> sea_spread_to_m;          // the sea covers all it reaches at or below
  std::optional<std::filesystem::path> defences;  // lines or polygons with crest level
  std::string crest_attribute = "crest_m";
  terrain::Connectivity connectivity = terrain::Connectivity::eight;
  std::vector<double> return_periods_yr{100};
  std::vector<int> years{2100};
  double aep_passing = 0.01;  // the AEP whose first year is mapped
  // The scenario whose ensemble sets the first-year raster; empty: the last one listed.
  std::string first_year_scenario;
};

// What the report's figures span (the [figures] table).
struct FigureSettings {
  int plot_last_year = 2150;  // the yearly figures stop here (or at the projection's end, if sooner)
  int plot_step_yr = 5;       // one point every 5 years: finer than the scenarios' spread
  // The design-life risk curve: heights from today's T-year level for this T, in steps, so the
  // curve starts at a level met about every other year and climbs 2 m (41 points of 0.05 m).
  double risk_curve_from_return_period_yr = 2.0;
  double risk_curve_step_m = 0.05;
  int risk_curve_points = 41;
};

struct SiteConfig {
  std::filesystem::path file;  // the site file itself
  SiteInfo site;
  // [record] and [extremes]: the fit as `tidewright fit` requests it (fit_stage.hpp), with the
  // site file's own defaults where they differ from the command's: a series (not detected),
  // detrend "linear" (maxima relative to mean sea level at the epoch), r_largest 3 (a project
  // choice: fewer values a year are likelier independent), the GPD threshold at the 99.7th
  // percentile (IPCC AR6 WG1 Fig. 9.32). Errors name the site-file keys.
  FitRequest fit;
  std::vector<ScenarioSettings> scenarios;
  ProjectionSettings projection;
  LocalSettings local;
  PlanningSettings planning;
  MapSettings map;
  FigureSettings figures;
  unsigned long long seed = 20261201ULL;
  // Notes on how the file was read (an older spelling of a value), for the caller to print.
  std::vector<std::string> notes;
};

// The stem of a scenario's table and figure file names: letters, digits, '-' and '_', anything
// else turned into '_'. Two scenarios whose stems match without regard to case are refused by
// load_site_file, since their files would overwrite each other.
[[nodiscard]] std::string scenario_file_stem(std::string name);

// The scenario map.first_year_scenario names (the last one when it names none).
[[nodiscard]] const ScenarioSettings& first_year_scenario(const SiteConfig& c);

// Reads and checks the site file; throws InputError naming key path and line.
[[nodiscard]] SiteConfig load_site_file(const std::filesystem::path& file);

// A path as the site file writes it: relative to the site file's folder when it lies inside it,
// so that the report, results.json and the maps read the same wherever the study was run from.
[[nodiscard]] std::string path_as_written(const std::filesystem::path& path, const SiteConfig& c);

}  // namespace tidewright::study
