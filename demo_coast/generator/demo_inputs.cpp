// Writes the inputs of the demo study of Quillhaven (INVENTED data) into one folder.
#include "demo_inputs.hpp"

#include <array>
#include <cmath>
#include <cstdio>
#include <sstream>

#include "demo_place.hpp"
#include "tidewright/common/atomic_output.hpp"
#include "tidewright/common/error.hpp"

namespace tidewright::demo {
namespace {

constexpr const char* record_name = "quillhaven_tide_gauge.csv";
constexpr const char* dem_name = "quillhaven_dem.tif";
constexpr const char* defences_name = "quillhaven_defences.geojson";
constexpr const char* sea_name = "quillhaven_sea.geojson";
constexpr const char* site_name = "site.toml";

std::string fixed(double v, int decimals) {
  std::array<char, 64> buf{};
  std::snprintf(buf.data(), buf.size(), "%.*f", decimals, v);
  return buf.data();
}

// Mean high water springs of the invented tide: Z0 + H(M2) + H(S2), the usual approximation
// (Pugh 1987, Tides, Surges and Mean Sea-Level, ch. 4; from memory). The sea spreads over the
// ground it reaches below this level, so harbour basin, river bed and tidal flats are not
// counted as flooded land in the maps and their tables.
double spring_high_water_m(const TideRecordDesign& rd) {
  double m2 = 0.0;
  double s2 = 0.0;
  for (const auto& c : rd.constituents) {
    if (c.name == "M2") m2 = c.amplitude_m;
    if (c.name == "S2") s2 = c.amplitude_m;
  }
  return rd.mean_level_m + m2 + s2;
}

}  // namespace

TideRecordDesign demo_record_design(bool small) {
  return small ? TideRecordDesign::standard_years(1995, 2024) : TideRecordDesign::standard();
}

TerrainDesign demo_terrain_design(bool small, double cell_size_m) {
  TerrainDesign d;
  if (small) d.cell_size_m = 20.0;
  if (cell_size_m > 0.0) d.cell_size_m = cell_size_m;
  return d;
}

std::string DemoInputs::summary_text() const {
  std::ostringstream s;
  s << invented_notice << "\n";
  s << "demo inputs of " << place_name << " in " << folder.string() << " (seed " << seed
    << (small ? ", small variant" : "") << "):\n";
  s << "  " << record_csv.filename().string() << ": hourly levels " << first_year << "-"
    << last_year << ", " << rows_written << " rows of " << hours_in_span << " hours ("
    << rows_with_value << " values, " << rows_na << " NA, " << rows_empty << " empty, "
    << rows_sentinel << " sentinel -99), " << surge_events << " storm surges\n";
  s << "  " << dem_tif.filename().string() << ": " << dem_columns << " x " << dem_rows
    << " cells of " << fixed(dem_cell_size_m, 1) << " m, EPSG:" << crs_epsg << ", metres above "
    << datum_label << "\n";
  s << "  " << defences_geojson.filename().string() << ", " << sea_geojson.filename().string()
    << ", " << site_toml.filename().string() << "\n";
  return s.str();
}

DemoInputs write_demo_inputs(const std::filesystem::path& folder, unsigned long long seed,
                             const DemoOptions& options) {
  std::error_code ec;
  std::filesystem::create_directories(folder, ec);
  if (ec) {
    throw InputError(folder.string(), "cannot create the demo folder: " + ec.message(),
                     "choose a folder you can write to");
  }
  DemoInputs in;
  in.folder = folder;
  in.record_csv = folder / record_name;
  in.dem_tif = folder / dem_name;
  in.defences_geojson = folder / defences_name;
  in.sea_geojson = folder / sea_name;
  in.site_toml = folder / site_name;
  in.seed = seed;
  in.small = options.small;
  // Check every target first, so that a refusal writes nothing.
  for (const auto* p :
       {&in.record_csv, &in.dem_tif, &in.defences_geojson, &in.sea_geojson, &in.site_toml}) {
    check_output_path(*p, options.force);
  }

  // Generate both in memory first, so that a bad design is refused before any file is written.
  const TideRecord record = generate_tide_record(demo_record_design(options.small), seed);
  const TerrainDesign td = demo_terrain_design(options.small, options.dem_cell_size_m);
  const Terrain terrain = generate_terrain(td, seed);

  write_tide_record_csv(record, in.record_csv, options.force);
  in.first_year = record.design.first_year;
  in.last_year = record.design.last_year;
  in.hours_in_span = record.hours_in_span;
  in.rows_written = record.time_s.size();
  in.rows_with_value = record.count(RowState::value);
  in.rows_na = record.count(RowState::na);
  in.rows_empty = record.count(RowState::empty);
  in.rows_sentinel = record.count(RowState::sentinel);
  in.surge_events = record.surges.size();

  write_terrain_geotiff(terrain, in.dem_tif, options.force);
  write_defences_geojson(td, in.defences_geojson, options.force);
  write_sea_geojson(td, in.sea_geojson, options.force);
  in.dem_columns = terrain.columns;
  in.dem_rows = terrain.rows;
  in.dem_cell_size_m = td.cell_size_m;
  in.landmarks = terrain_landmarks();

  write_text_file(in.site_toml, demo_site_toml(seed, options.small), options.force);
  return in;
}

std::string demo_site_toml(unsigned long long seed, bool small) {
  const TideRecordDesign rd = demo_record_design(small);
  const TerrainDesign td = demo_terrain_design(small);
  const TerrainLevels lv = terrain_levels();
  const double harbour_e = td.west_m + 2800.0;
  const double harbour_n = td.south_m + std::round(coast_y_m(2800.0));
  std::ostringstream s;
  s << "# Quillhaven demo study. " << invented_notice << "\n"
    << "# `tidewright demo` writes this file beside the inputs it generates "
       "(demo_coast/generator,\n"
    << "# seed " << seed << (small ? ", small variant" : "")
    << "); paths are relative to this file. Keys: docs/site-file.md.\n"
    << "seed = " << seed << "\n"
    << "\n[site]\n"
    << "name = \"" << place_name << "\"\n"
    << "invented = true                # invented data, not a real place\n"
    << "crs = \"EPSG:" << crs_epsg
    << "\"           # WGS 84 / UTM zone 30N: a real code, an invented place\n"
    << "x = " << fixed(harbour_e, 1) << "                 # the harbour basin\n"
    << "y = " << fixed(harbour_n, 1) << "\n"
    << "water_level_datum = \"" << datum_label << "\"\n"
    << "\n[record]\n"
    << "path = \"" << record_name << "\"\n"
    << "kind = \"series\"                # hourly levels, " << rd.first_year << "-" << rd.last_year
    << "\n"
    << "time_column = \"time\"           # ISO 8601, UTC\n"
    << "level_column = \"level_m\"\n"
    << "units = \"m\"\n"
    << "sentinels = [-99.0]            # the gauge's sentinel (deliberate faults)\n"
    << "min_completeness = 0.8         # fraction of a year's hours\n"
    << "year_start_month = 7           # storm years July-June: surges peak in January\n"
    << "detrend = \"linear\"             # maxima relative to mean sea level at the epoch\n"
    << "reference_epoch = 2024.0\n"
    << "\n[extremes]\n"
    << "model = \"gev\"                  # annual maxima of the detrended record\n"
    << "return_periods = [2, 5, 10, 20, 50, 100, 200, 500, 1000]\n"
    << "\n[[scenario]]\n"
    << "name = \"restrained\"\n"
    << "pathway = \"restrained\"          # built-in illustrative pathway\n"
    << "\n[[scenario]]\n"
    << "name = \"midway\"\n"
    << "pathway = \"midway\"\n"
    << "\n[[scenario]]\n"
    << "name = \"unchecked\"\n"
    << "pathway = \"unchecked\"\n"
    << "\n[projection]\n"
    << "members = " << (small ? 300 : 1000) << "\n"
    << "start_year = 2020\n"
    << "end_year = 2150\n"
    << "reference = \"1995-2014\"\n"
    << "\n[local]\n"
    << "land_motion_mm_per_yr = -0.5   # invented subsidence (negative = sinking)\n"
    << "land_motion_sd_mm_per_yr = 0.3\n"
    << "\n[planning]\n"
    << "design_years = [2050, 2100]\n"
    << "return_periods = [10, 100, 200]\n"
    << "design_life = [2030, 2080]\n"
    << "target_risk = 0.1\n"
    << "levels_of_interest_m = [" << fixed(lv.quay_m, 1) << ", " << fixed(lv.seawall_crest_m, 1)
    << ", " << fixed(lv.saddle_m, 1) << "]   # quay, seawall crest, Orrin gap (m above QCD)\n"
    << "\n[map]\n"
    << "dem = \"" << dem_name << "\"            # float32, nodata declared, sea is negative\n"
    << "dem_offset_m = " << fixed(dem_datum_offset_m, 1)
    << "                 # DEM datum = gauge datum\n"
    << "sea = \"" << sea_name << "\"        # polygon of open sea\n"
    << "sea_spread_to_m = " << fixed(spring_high_water_m(rd), 2)
    << "          # mean high water springs: tidal ground is sea, not flooded land\n"
    << "defences = \"" << defences_name << "\"  # lines with crest_m (metres above QCD)\n"
    << "crest_attribute = \"crest_m\"\n"
    << "connectivity = 8\n"
    << "return_periods = [100]\n"
    << "years = [2100]\n"
    << "aep_passing = 0.01\n";
  return s.str();
}

}  // namespace tidewright::demo
