// tidewright map: flood-threshold, extent, depth, AEP and first-year rasters from a DEM.
// Parsing and printing only; the work is terrain::make_flood_maps.
//
// Levels are explicit (--level) or the T-year levels of today and of projected years; the AEP
// rasters use the fit's present-day model and, for future years, the planning stage's
// N_t(z) = E[N_0(z - Delta_t)] over the projection members (study/map_layers), or a stated
// deterministic rise (--rise) where the user has one number per year.

#include <CLI/CLI.hpp>
#include <algorithm>
#include <cmath>
#include <fstream>
#include <iostream>
#include <memory>
#include <nlohmann/json.hpp>

#include "command.hpp"
#include "tidewright/terrain/gdal_messages.hpp"
#include "planning_options.hpp"
#include "tidewright/common/csv.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/extremes/still_water_model.hpp"
#include "tidewright/report/cautions.hpp"
#include "tidewright/report/text_table.hpp"
#include "tidewright/study/map_layers.hpp"
#include "tidewright/study/stage_files.hpp"
#include "tidewright/terrain/flood_map.hpp"

namespace tidewright::cli {
namespace {

using extremes::Family;
using extremes::StillWaterModel;

struct MapOptions {
  std::string dem;
  int band = 1;
  std::optional<double> dem_nodata;
  std::string dem_crs;
  std::string z_units;
  std::optional<double> z_factor;
  std::vector<double> projwin;  // ULX ULY LRX LRY
  std::optional<double> datum_offset_m;
  std::string datum_offset_raster;
  bool same_datum = false;
  std::string sea;
  std::string sea_layer;
  std::string sea_where;
  std::vector<std::string> sea_points;
  std::optional<double> sea_edge_below_m;
  bool nodata_is_sea = false;
  std::optional<double> sea_spread_to_m;
  std::string defences;
  std::string defence_layer;
  std::string crest_field = "crest_m";
  std::string crest_datum = "dem";
  int connectivity = 8;
  std::vector<double> levels;
  bool accept_high_levels = false;
  std::optional<int> year;
  std::string scenario;
  std::vector<double> gumbel;
  std::vector<double> gev;
  std::vector<double> gpd;
  std::string model_json;
  std::vector<std::string> rises;
  PlanningArgs planning;
  std::vector<int> years;
  std::vector<double> return_periods_yr;
  int first_year_step = study::kFirstYearStepYr;
  std::optional<double> aep_pass;
  bool polygons = false;
  std::string polygon_format;  // empty: gpkg
  std::vector<std::string> creation_options;  // --co KEY=VALUE
  bool cog = false;
  bool no_overviews = false;
  bool depth_per_level = false;
  std::string compress = "deflate";
  std::string out;
};

double parse_number(const std::string& text, const std::string& where) {
  try {
    std::size_t used = 0;
    const double v = std::stod(text, &used);
    if (used == text.size() && std::isfinite(v)) return v;
  } catch (const std::exception&) {
  }
  throw InputError(where, "'" + text + "' is not a number", "give a number such as 1.25");
}

std::array<double, 2> parse_point(const std::string& text) {
  const auto comma = text.find(',');
  if (comma == std::string::npos) {
    throw InputError("--sea-point", "'" + text + "' is not X,Y",
                     "give the point as X,Y in the DEM's CRS");
  }
  return {parse_number(text.substr(0, comma), "--sea-point"),
          parse_number(text.substr(comma + 1), "--sea-point")};
}

StillWaterModel model_from_json(const std::string& path) {
  std::ifstream in(path);
  if (!in) throw InputError(path, "cannot be opened", "check the path");
  nlohmann::json j;
  try {
    j = nlohmann::json::parse(in);
  } catch (const nlohmann::json::exception& e) {
    throw InputError(path, std::string("is not valid JSON (") + e.what() + ")", "fix the file");
  }
  return study::still_water_model_from_json(j, [&](const std::string& key) { return field_location(path, key); });
}

std::optional<StillWaterModel> present_day_model(const MapOptions& o) {
  const int given = static_cast<int>(!o.gumbel.empty()) + static_cast<int>(!o.gev.empty()) +
                    static_cast<int>(!o.gpd.empty()) + static_cast<int>(!o.model_json.empty()) +
                    static_cast<int>(!o.planning.fit_json.empty());
  if (given > 1) {
    throw InputError("--fit/--gumbel/--gev/--gpd/--model-json", "more than one still-water model given",
                     "give one");
  }
  if (given == 0) return std::nullopt;
  StillWaterModel m;
  if (!o.planning.fit_json.empty()) {
    m = study::read_fit_json(o.planning.fit_json).model;  // its datum: build_request
  } else if (!o.gumbel.empty()) {
    m = {Family::gumbel, o.gumbel[0], o.gumbel[1], 0.0, 0.0, 1.0, {}};
  } else if (!o.gev.empty()) {
    m = {Family::gev, o.gev[0], o.gev[1], o.gev[2], 0.0, 1.0, {}};
  } else if (!o.gpd.empty()) {
    m = {Family::gpd, 0.0, o.gpd[1], o.gpd[2], o.gpd[0], o.gpd[3], {}};
  } else {
    m = model_from_json(o.model_json);
  }
  if (!(m.scale_m > 0.0)) {
    throw InputError("still-water model", "the scale is " + std::to_string(m.scale_m),
                     "give a scale above 0 m");
  }
  if (m.family == Family::gpd && !(m.rate_per_yr > 0.0)) {
    throw InputError("still-water model", "the GPD exceedance rate is not positive",
                     "give the threshold's rate per year (> 0)");
  }
  return m;
}

std::string model_label(const StillWaterModel& m) {
  const auto f = [](double v) { return report::fixed(v, 4); };
  switch (m.family) {
    case Family::gumbel:
      return "Gumbel mu " + f(m.location_m) + " m, sigma " + f(m.scale_m) + " m";
    case Family::gev:
      return "GEV mu " + f(m.location_m) + " m, sigma " + f(m.scale_m) + " m, xi " + f(m.shape);
    case Family::gpd:
      return "GPD u " + f(m.threshold_m) + " m, sigma " + f(m.scale_m) + " m, xi " + f(m.shape) +
             ", rate " + f(m.rate_per_yr) + "/yr";
  }
  return "";
}

// --fit and --members: today's and each year's T-year levels and AEP from the planning stage.
void add_projected_layers(const MapOptions& o, terrain::MapRequest& req, std::vector<std::string>& notes) {
  if (o.planning.fit_json.empty()) {
    throw InputError("--members", "a projection needs the fit it applies to", "give --fit FILE as well");
  }
  if (!o.rises.empty()) {
    throw InputError("--rise", "a deterministic rise and projection members were both given", "give one of them");
  }
  if (!o.gumbel.empty() || !o.gev.empty() || !o.gpd.empty() || !o.model_json.empty()) {
    throw InputError("--gumbel/--gev/--gpd/--model-json", "the fit's model and another model were both given",
                     "with --members the present-day model is the one in --fit; drop the other");
  }
  const auto in = load_planning_inputs(o.planning);
  const auto& present = in.fit.model;
  if (!in.fit.datum.empty()) notes.push_back("water-level datum: " + in.fit.datum + " (from " + o.planning.fit_json + ")");
  req.datum = in.fit.datum;
  notes.insert(notes.end(), in.notes.begin(), in.notes.end());
  const std::string scenario = o.scenario.empty() ? in.rise.scenario : o.scenario;
  // A year outside the members is refused by planning::conditions_in_year, before any output.
  study::add_present_levels(req, present, o.return_periods_yr);
  study::add_future_levels(req, present, in.rise, in.storminess, o.years, o.return_periods_yr, scenario);
  study::add_present_aep(req, present);
  study::add_future_aep(req, present, in.rise, in.storminess, o.years, scenario);
  if (o.aep_pass) {
    req.first_year = study::first_year_layer(present, in.rise, in.storminess,
                                             study::projection_years(in.rise, o.first_year_step), *o.aep_pass,
                                             scenario);
  }
}

// A model on its own (--fit, --gumbel, ...), optionally shifted by stated rises (--rise).
void add_model_layers(const MapOptions& o, terrain::MapRequest& req) {
  if (!o.years.empty()) {
    throw InputError("--years", "mapping projected years needs the projection", "give --members FILE and --fit FILE");
  }
  const PlanningArgs& p = o.planning;
  if (p.epoch_offset_m || p.storminess_scale_per_yr != 0.0 || p.storminess_location_m_per_yr != 0.0) {
    throw InputError("--epoch-offset/--storminess-*", "applies to projection members, and none were given",
                     "give --members FILE, or drop the option");
  }
  const auto model = present_day_model(o);
  if (!o.return_periods_yr.empty()) {
    if (!model) {
      throw InputError("--return-periods", "return levels need a still-water model", "give --fit FILE");
    }
    study::add_present_levels(req, *model, o.return_periods_yr);
  }
  std::vector<terrain::YearlyRate> years;
  for (const auto& r : o.rises) {
    const auto eq = r.find('=');
    if (eq == std::string::npos) {
      throw InputError("--rise", "'" + r + "' is not YEAR=METRES", "give e.g. --rise 2050=0.3");
    }
    const double year = parse_number(r.substr(0, eq), "--rise");
    const double rise = parse_number(r.substr(eq + 1), "--rise");
    if (!whole_year(year)) throw InputError("--rise", "'" + r + "': the year is not whole", "give a year");
    if (!model) {
      throw InputError("--rise", "a rise needs a present-day still-water model",
                       "give --fit, --gumbel, --gev, --gpd or --model-json");
    }
    const StillWaterModel& m = *model;
    // N_t(z) = N_0(z - rise_t): design.md's N_t with Delta_t a stated number, not a distribution.
    years.push_back({*whole_year(year), [m, rise](double z) { return m.annual_exceedance_rate(z - rise); }});
  }
  if (model) {
    const StillWaterModel& m = *model;
    req.aep.push_back({[m](double z) { return m.annual_exceedance_rate(z); },
                       "present day, " + model_label(m), std::nullopt, o.scenario});
    for (std::size_t i = 0; i < years.size(); ++i) {
      req.aep.push_back({years[i].rate,
                         "year " + std::to_string(years[i].year) + ", " + model_label(m) +
                             " shifted by a stated rise of " + o.rises[i].substr(o.rises[i].find('=') + 1) + " m",
                         years[i].year, o.scenario});
    }
  }
  if (o.aep_pass) {
    if (years.empty()) {
      throw InputError("--aep-pass", "the first-year raster needs years",
                       "give --members FILE (with --fit) or --rise YEAR=M (repeat)");
    }
    const StillWaterModel& m = *model;
    req.first_year = terrain::FirstYearLayer{years, [m](double z) { return m.annual_exceedance_rate(z); }, *o.aep_pass,
                                             model_label(m) + " shifted by stated rises", o.scenario};
  }
}

terrain::MapRequest build_request(const MapOptions& o, const CommonOptions& common, const std::string& recipe,
                                  std::vector<std::string>& notes) {
  terrain::MapRequest req;
  req.dem.path = o.dem;
  req.dem.band = o.band;
  req.dem.nodata = o.dem_nodata;
  req.dem.crs_override = o.dem_crs;
  req.dem.z_units = o.z_units;
  req.dem.z_factor = o.z_factor;
  if (!o.projwin.empty()) req.dem.window = std::array<double, 4>{o.projwin[0], o.projwin[1], o.projwin[2], o.projwin[3]};
  const int datum_given = static_cast<int>(o.datum_offset_m.has_value()) +
                          static_cast<int>(!o.datum_offset_raster.empty()) +
                          static_cast<int>(o.same_datum);
  if (datum_given > 1) {
    throw InputError("--datum-offset/--datum-offset-raster/--same-datum",
                     "more than one datum relation given", "give exactly one");
  }
  if (o.datum_offset_m) {
    req.dem.datum = {terrain::DatumRelation::Kind::constant, *o.datum_offset_m, ""};
  } else if (!o.datum_offset_raster.empty()) {
    req.dem.datum = {terrain::DatumRelation::Kind::raster, 0.0, o.datum_offset_raster};
  } else if (o.same_datum) {
    req.dem.datum.kind = terrain::DatumRelation::Kind::same;
  }
  req.sea.mask_path = o.sea;
  req.sea.layer = o.sea_layer;
  req.sea.where = o.sea_where;
  req.sea.layer_input = "--sea-layer";
  req.sea.where_input = "--sea-where";
  for (const auto& p : o.sea_points) req.sea.points_xy.push_back(parse_point(p));
  req.sea.edge_at_or_below_m = o.sea_edge_below_m;
  req.sea.nodata_is_sea = o.nodata_is_sea;
  req.sea.spread_to_m = o.sea_spread_to_m;
  if (!o.defences.empty()) {
    req.defences = terrain::DefenceSource{o.defences, o.defence_layer, o.crest_field,
                                          o.crest_datum == "water"};
  }
  req.connectivity =
      o.connectivity == 4 ? terrain::Connectivity::four : terrain::Connectivity::eight;
  std::vector<double> levels = o.levels;
  std::sort(levels.begin(), levels.end());
  if (const auto twin = std::adjacent_find(levels.begin(), levels.end()); twin != levels.end()) {
    throw InputError("--level", "the level " + CLI::detail::to_string(*twin) + " m is given twice",
                     "give each level once");
  }
  if (levels != o.levels) notes.push_back("levels are written in ascending order (band 1 the lowest)");
  for (double l : levels) req.levels.push_back({l, o.year, o.scenario});
  req.accept_high_levels = o.accept_high_levels;

  if (!o.planning.members.empty()) {
    add_projected_layers(o, req, notes);
  } else {
    add_model_layers(o, req);
    if (!o.planning.fit_json.empty()) req.datum = study::read_fit_json(o.planning.fit_json).datum;
  }
  if (req.levels.empty() && req.aep.empty()) {
    throw InputError("map", "nothing to map",
                     "give --level M (repeat), --return-periods with --fit, or a still-water model");
  }
  req.polygons = o.polygons;
  if (!o.polygon_format.empty() && !o.polygons) {
    throw InputError("--polygon-format", "applies to the extent polygons, and --polygons is not given",
                     "add --polygons, or drop --polygon-format");
  }
  req.polygon_format = o.polygon_format == "fgb" ? terrain::PolygonFormat::flatgeobuf
                       : o.polygon_format == "shp" ? terrain::PolygonFormat::shapefile
                                                   : terrain::PolygonFormat::geopackage;
  req.format.cloud_optimized = o.cog;
  req.format.overviews = !o.no_overviews;
  req.depth_per_level = o.depth_per_level;
  if (!o.planning.fit_json.empty()) req.input_metadata.emplace_back("TIDEWRIGHT_FIT", o.planning.fit_json);
  if (!o.planning.members.empty()) req.input_metadata.emplace_back("TIDEWRIGHT_MEMBERS", o.planning.members);
  for (const auto& kv : o.creation_options) {
    const auto eq = kv.find('=');
    if (eq == std::string::npos || eq == 0) {
      throw InputError("--co " + kv, "is not KEY=VALUE", "give a GDAL creation option, e.g. --co ZLEVEL=9");
    }
    req.format.creation_options.emplace_back(kv.substr(0, eq), kv.substr(eq + 1));
  }
  req.format.compression =
      o.compress == "zstd" ? terrain::Compression::zstd : terrain::Compression::deflate;
  req.out_dir = o.out;
  req.force = common.force;
  req.command_line = recipe;
  for (const auto& c : report::safety_cautions()) req.cautions.emplace_back(c);
  if (!common.quiet) {
    req.progress = terrain::terminal_progress();
  }
  return req;
}

void print_summary(const terrain::MapSummary& s, const std::string& out) {
  std::cout << "Flood maps written to " << out << " (" << s.cells << " cells, " << s.sea_cells
            << " sea, " << s.unreached_cells << " land cells never reached; areas " << s.area_method
            << ")\n";
  if (!s.levels.empty()) {
    // Long scenario labels (a built-in pathway's runs to some 60 characters) would stretch every
    // row: the table then shows S1, S2, ... and a key below it.
    std::vector<std::string> labels;
    for (const auto& l : s.levels) {
      if (!l.level.scenario.empty() &&
          std::find(labels.begin(), labels.end(), l.level.scenario) == labels.end()) {
        labels.push_back(l.level.scenario);
      }
    }
    // Characters; chosen here: about as wide as a number column.
    constexpr std::size_t longest_shown = 16;
    const bool keyed = std::any_of(labels.begin(), labels.end(),
                                   [](const std::string& x) { return x.size() > longest_shown; });
    const auto shown = [&](const std::string& label) {
      if (!keyed || label.empty()) return label;
      const auto at = std::find(labels.begin(), labels.end(), label) - labels.begin();
      return "S" + std::to_string(at + 1);
    };
    report::TextTable t({"level_m", "year", "scenario", "connected_cells", "flooded_area_m2", "volume_m3", "max_depth_m",
                         "cut_off_cells", "cut_off_area_m2"});
    for (const auto& l : s.levels) {
      t.add_row({report::fixed(l.level.level_m, 3),
                 l.level.year ? std::to_string(*l.level.year) : "", shown(l.level.scenario),
                 std::to_string(l.connected_cells), report::fixed(l.flooded_area_m2, 0),
                 report::fixed(l.volume_m3, 0), report::fixed(l.max_depth_m, 3),
                 std::to_string(l.cut_off_cells), report::fixed(l.cut_off_area_m2, 0)});
    }
    std::cout << t.render();
    if (keyed) {
      for (std::size_t i = 0; i < labels.size(); ++i) {
        std::cout << "  S" << i + 1 << ": " << labels[i] << '\n';
      }
    }
  }
  std::cout << "Files:";
  for (const auto& f : s.files) std::cout << ' ' << f;
  std::cout << "\nCautions:\n" << report::cautions_text("  - ", 92);
}

void add_dem_options(CLI::App& app, MapOptions* o) {
  app.add_option("--dem", o->dem, "DEM raster (any GDAL format)")->required()->type_name("FILE");
  app.add_option("--dem-band", o->band, "Band of the DEM to read")->default_val(1);
  app.add_option("--dem-nodata", o->dem_nodata,
                 "Extra nodata value (the file's own is always used)");
  app.add_option("--dem-crs", o->dem_crs, "CRS to assume when the DEM has none (e.g. EPSG:32633)");
  app.add_option("--z-units", o->z_units,
                 "Vertical unit of the DEM's values: m, ft, us-ft, cm, mm (default: the band's "
                 "unit, else the vertical CRS's, else metres)")
      ->type_name("UNIT");
  app.add_option("--projwin", o->projwin, "Map only this window of the DEM, in its CRS (as gdal_translate -projwin)")
      ->expected(4)
      ->type_name("ULX ULY LRX LRY");
  app.add_option("--z-factor", o->z_factor,
                 "Metres per unit of the DEM's values, for a unit --z-units does not name")
      ->type_name("M_PER_UNIT");
  app.add_option("--datum-offset", o->datum_offset_m,
                 "Metres added to DEM elevations to give heights above the water-level datum")
      ->type_name("M");
  app.add_option("--datum-offset-raster", o->datum_offset_raster,
                 "Raster of that offset (m), resampled bilinearly to the DEM grid")
      ->type_name("FILE");
  app.add_flag("--same-datum", o->same_datum,
               "State that the DEM's datum is the water-level datum");
}

void add_sea_options(CLI::App& app, MapOptions* o) {
  app.add_option("--sea", o->sea, "Sea mask: polygons (OGR) or raster (non-zero = sea)")
      ->type_name("FILE");
  app.add_option("--sea-layer", o->sea_layer, "Layer of --sea that is the sea (needed when it has several)")
      ->type_name("NAME");
  app.add_option("--sea-where", o->sea_where, "Only --sea features passing this OGR SQL condition, e.g. \"kind = 'sea'\"")
      ->type_name("SQL");
  app.add_option("--sea-point", o->sea_points, "A sea seed point X,Y in the DEM's CRS (repeat)")
      ->type_name("X,Y");
  app.add_option("--sea-edge-below", o->sea_edge_below_m,
                 "Cells at or below M on the edge of the valid data (frame, or nodata reaching it) are sea")
      ->type_name("M");
  app.add_flag("--nodata-is-sea", o->nodata_is_sea, "Nodata cells are sea (otherwise barriers)");
  app.add_option("--sea-spread-to", o->sea_spread_to_m,
                 "The sea also covers all it reaches at or below M (today's water, not flooded)")
      ->type_name("M");
  app.add_option("--defences", o->defences, "Defence lines/polygons (OGR) burned in as walls")
      ->type_name("FILE");
  app.add_option("--defence-layer", o->defence_layer, "Layer of --defences (default: the first)");
  app.add_option("--crest-field", o->crest_field, "Attribute holding the crest level (m)")
      ->default_val("crest_m");
  app.add_option("--crest-datum", o->crest_datum, "Datum of the crest levels: dem or water")
      ->check(CLI::IsMember({"dem", "water"}))
      ->default_val("dem");
  app.add_option("--connectivity", o->connectivity,
                 "4 or 8 neighbours (8: water passes diagonally, the cautious side)")
      ->check(CLI::IsMember({4, 8}))
      ->default_val(8);
}

void add_level_options(CLI::App& app, MapOptions* o) {
  // Lists of plain numbers take the same syntax as in every command: comma-separated, or the
  // option repeated.
  app.add_option("--level", o->levels,
                 "Still-water levels to map, m above the water-level datum (comma list or repeat)")
      ->delimiter(',')
      ->type_name("M");
  app.add_flag("--accept-high-level", o->accept_high_levels,
               "Map a level more than 50 m above the water-level datum on purpose");
  app.add_option("--year", o->year, "Year label written with the levels");
  app.add_option("--scenario", o->scenario, "Scenario label written with the levels");
  app.add_option("--gumbel", o->gumbel, "Present-day Gumbel annual maxima MU,SIGMA (m), for AEP")
      ->expected(2)
      ->delimiter(',')
      ->type_name("MU,SIGMA");
  app.add_option("--gev", o->gev, "Present-day GEV annual maxima MU,SIGMA,XI, for AEP")
      ->expected(3)
      ->delimiter(',')
      ->type_name("MU,SIGMA,XI");
  app.add_option("--gpd", o->gpd, "Present-day GPD peaks U,SIGMA,XI,RATE_PER_YR, for AEP")
      ->expected(4)
      ->delimiter(',')
      ->type_name("U,SIGMA,XI,RATE");
  app.add_option("--model-json", o->model_json,
                 "Present-day still-water model as JSON (docs/map.md)")
      ->type_name("FILE");
  add_planning_options(app, o->planning, false);
  app.add_option("--years", o->years,
                 "Projected years to map (needs --fit and --members): AEP bands and, with --return-periods, levels")
      ->delimiter(',')
      ->type_name("YEAR");
  app.add_option("--return-periods", o->return_periods_yr,
                 "Map today's T-year level and, with --members, each --years year's T-year level")
      ->delimiter(',')
      ->type_name("T");  // T <= 1 is refused by planning::present_return_level, with the reason
  app.add_option("--first-year-step", o->first_year_step,
                 "Years between the projected years --aep-pass looks at")
      ->check(CLI::Range(1, 50))
      ->default_val(study::kFirstYearStepYr);
  app.add_option("--rise", o->rises,
                 "Instead of members: year and a stated deterministic rise (m) shifting the model (repeat)")
      ->type_name("YEAR=M");
  app.add_option("--aep-pass", o->aep_pass,
                 "Write first_year.tif: first projected (or --rise) year a cell's AEP reaches P")
      ->type_name("P")
      ->check(CLI::Range(1e-9, 1.0));
}

void add_output_options(CLI::App& app, MapOptions* o) {
  app.add_flag("--polygons", o->polygons, "Write extent polygons (extent.gpkg; see --polygon-format)");
  app.add_option("--polygon-format", o->polygon_format,
                 "Format of the extent polygons: gpkg (GeoPackage), fgb (FlatGeobuf) or shp (Shapefile)")
      ->check(CLI::IsMember({"gpkg", "fgb", "shp"}))
      ->type_name("FORMAT");
  app.add_flag("--cog", o->cog, "Write Cloud-Optimized GeoTIFFs");
  app.add_option("--co", o->creation_options,
                 "GDAL creation option KEY=VALUE for the GeoTIFFs (the COG driver's with --cog), over the "
                 "defaults and --compress (repeat)")
      ->type_name("KEY=VALUE");
  app.add_flag("--depth-per-level", o->depth_per_level,
               "Also write each level's depths as its own file, depth_level_K.tif");
  app.add_flag("--no-overviews", o->no_overviews,
               "Leave out the internal overviews (faster for many levels; --cog always has them)");
  app.add_option("--compress", o->compress, "GeoTIFF compression: deflate or zstd")
      ->check(CLI::IsMember({"deflate", "zstd"}))
      ->default_val("deflate");
}

// The command line as given, for the outputs' records: flags, then each option's values
// shell-quoted (a model's numbers joined by commas, as typed).
std::string command_recipe(const CLI::App& app) {
  std::string recipe = "tidewright map";
  for (const auto* opt : app.get_options()) {
    if (opt->count() == 0 || opt->get_name() == "--help") continue;
    const std::string name = opt->get_name();
    if (opt->get_expected_max() == 0) {  // a flag
      recipe += " " + name;
    } else if (name == "--gumbel" || name == "--gev" || name == "--gpd") {
      std::string joined;
      for (const auto& r : opt->results()) {
        if (!joined.empty()) joined += ',';
        joined += r;
      }
      recipe.append(" ").append(name).append(" ").append(shell_word(joined));
    } else {
      for (const auto& r : opt->results()) recipe.append(" ").append(name).append(" ").append(shell_word(r));
    }
  }
  return recipe;
}

void configure(CLI::App& app, CommonOptions& common) {
  auto o = std::make_shared<MapOptions>();
  app.description(
      "Flood-threshold raster of a DEM (priority-flood from the sea), and from it extent, depth, "
      "annual exceedance probability and first-year rasters, extent polygons and a summary table. "
      "Levels in metres above the water-level datum.");
  add_dem_options(app, o.get());
  add_sea_options(app, o.get());
  add_level_options(app, o.get());
  add_output_options(app, o.get());
  add_out_dir_option(app, o->out)->required();
  add_force_flag(app, common);
  add_quiet_flag(app, common);
  app.callback([o, &common, &app] {
    const std::string recipe = command_recipe(app);
    std::vector<std::string> notes;
    const auto req = build_request(*o, common, recipe, notes);
    // GDAL's own messages would break the one-line error rule; the library reports its
    // failures through InputError with GDAL's last message in the text.
    const terrain::QuietGdalMessages quiet_gdal;
    const auto summary = terrain::make_flood_maps(req);
    for (const auto& w : summary.warnings) std::cerr << "tidewright: warning: " << w << "\n";
    if (!common.quiet) {
      for (const auto& n : notes) std::cout << "note: " << n << "\n";
      print_summary(summary, o->out);
    }
  });
}

const bool registered = register_command(
    {"map", "Flood-threshold, extent, depth and AEP rasters from a DEM", 50, configure});

}  // namespace
}  // namespace tidewright::cli
