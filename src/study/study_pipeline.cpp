#include "tidewright/study/study_pipeline.hpp"

#include <algorithm>
#include <chrono>
#include <fstream>
#include <sstream>

#include "tidewright/common/atomic_output.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/report/cautions.hpp"
#include "tidewright/study/map_layers.hpp"
#include "tidewright/study/study_results.hpp"
#include "tidewright/terrain/raster_band.hpp"

namespace tidewright::study {
namespace {

class StageClock {
 public:
  StageClock(StudyOutcome& out, const StudyOptions& o) : out_(out), o_(o) {}
  void begin(const std::string& name) {
    end();
    name_ = name;
    start_ = std::chrono::steady_clock::now();
    if (o_.progress) o_.progress(name);
  }
  void end() {
    if (name_.empty()) return;
    const double s = std::chrono::duration<double>(std::chrono::steady_clock::now() - start_).count();
    out_.stage_seconds.emplace_back(name_, s);
    name_.clear();
  }

 private:
  StudyOutcome& out_;
  const StudyOptions& o_;
  std::string name_;
  std::chrono::steady_clock::time_point start_;
};

// The site file's fit, recording the record as the site file names it.
FitRequest fit_request(const SiteConfig& c) {
  FitRequest r = c.fit;
  r.read.recorded_as = path_as_written(c.fit.input, c);
  return r;
}

ProjectionRequest projection_request(const SiteConfig& c, const ScenarioSettings& s, std::size_t index) {
  ProjectionRequest r;
  r.label = s.name;
  r.source = s.source;
  if (s.source == ScenarioSource::pathway) r.pathway = s.pathway;
  else r.path = *s.path;
  r.storyline = s.storyline;
  r.storyline_input = field_location(c.file.string(), "scenario.storyline");
  r.first_year = c.projection.start_year;
  r.last_year = c.projection.end_year;
  r.members = c.projection.members;
  r.accept_extreme_inputs = c.projection.accept_extreme;
  r.input_names.members = field_location(c.file.string(), "projection.members");
  r.input_names.years = field_location(c.file.string(), "projection.start_year/end_year");
  r.input_names.reference = field_location(c.file.string(), "projection.reference");
  r.input_names.land_motion = field_location(c.file.string(), "local.land_motion_mm_per_yr");
  r.input_names.land_motion_sd = field_location(c.file.string(), "local.land_motion_sd_mm_per_yr");
  r.input_names.accept_extreme = "set projection.accept_extreme = true";
  r.seed = c.seed + index;  // each scenario its own stream, reproducible
  r.reference = climate::parse_year_span(c.projection.reference,
                                         field_location(c.file.string(), "projection.reference"));
  if (r.source != ScenarioSource::table) {
    r.local.fingerprint = c.local.fingerprints;
    r.local.land_motion.uplift_mm_per_yr = c.local.land_motion_mm_per_yr;
    r.local.land_motion.uplift_sd_mm_per_yr = c.local.land_motion_sd_mm_per_yr;
    if (c.local.ocean_dynamic_offset_m != 0.0 || c.local.ocean_dynamic_sd_m != 0.0) {
      // A linear ramp from zero at the start through the stated offset in
      // local.ocean_dynamic_year, continued at the same slope beyond it (docs/site-file.md).
      const double ramp_yr = std::max(1, c.local.ocean_dynamic_year - r.first_year);
      for (int y = r.first_year; y <= r.last_year; ++y) {
        const double w = std::max(0.0, static_cast<double>(y - r.first_year) / ramp_yr);
        r.local.ocean_dynamic.years.push_back(y);
        r.local.ocean_dynamic.mean_m.push_back(c.local.ocean_dynamic_offset_m * w);
        r.local.ocean_dynamic.sd_m.push_back(c.local.ocean_dynamic_sd_m * w);
      }
    }
  }
  return r;
}


// Every planning answer of one scenario: allowances, amplification and emergence of the
// followed levels, design-life risk and target height, and the paths the figures draw.
void answer_scenario(ScenarioRun& run, const StudyResults& r, const SiteConfig& c) {
  const auto& p = c.planning;
  run.allowances = allowance_table(run.inputs, p.design_years, p.return_periods_yr, 0, c.seed);
  run.amplification = amplification_rows(run.inputs, p.design_years, r.follow_levels_m);
  run.emergence = emergence_rows(run.inputs, r.follow_levels_m, 1.0);
  run.design_life =
      design_life_answers(run.inputs, p.design_life_start, p.design_life_end, {}, p.levels_of_interest_m, p.target_risk);
  const auto life = year_span(run.inputs, p.design_life_start, p.design_life_end);
  for (double h : r.risk_curve_heights_m) {
    run.risk_curve.push_back(planning::design_life_risk(r.fit.present_day, life, h).probability);
  }
  const double z_design = planning::present_return_level(r.fit.present_day, r.design_return_period_yr);
  run.factor_path = factor_path(run.inputs, r.plot_years, z_design);
  for (int y : r.plot_years) {
    const auto cond = planning::conditions_in_year(run.inputs.rise, y, run.inputs.storminess);
    const auto a = planning::allowance(r.fit.present_day, cond, r.design_return_period_yr);
    run.allowance_path_m.push_back(a.allowance_m);
    run.height_path_m.push_back(a.present_level_m + a.allowance_m);
  }
}

// The levels, years and heights every scenario's answers are given for.
void set_answer_grid(StudyResults& r, const SiteConfig& c) {
  const auto& model = r.fit.present_day;
  for (double t : c.planning.return_periods_yr) r.follow_levels_m.push_back(planning::present_return_level(model, t));
  for (double z : c.planning.levels_of_interest_m) r.follow_levels_m.push_back(z);
  const auto& f = c.figures;
  for (int y = c.projection.start_year; y <= std::min(c.projection.end_year, f.plot_last_year); y += f.plot_step_yr) {
    r.plot_years.push_back(y);
  }
  const double z0 = planning::present_return_level(model, f.risk_curve_from_return_period_yr);
  for (int k = 0; k < f.risk_curve_points; ++k) r.risk_curve_heights_m.push_back(z0 + f.risk_curve_step_m * k);
  r.design_return_period_yr = c.planning.return_periods_yr.back();
}

terrain::MapRequest map_request(const StudyResults& r, const SiteConfig& c, const StudyOptions& o,
                                const std::filesystem::path& dir) {
  terrain::MapRequest m;
  m.dem.path = c.map.dem.string();
  m.dem.recorded_as = path_as_written(c.map.dem, c);
  m.dem.window = c.map.window;
  m.dem.window_name = field_location(c.file.string(), "map.window");
  m.dem.crs_override = c.map.dem_crs;
  m.dem.nodata = c.map.dem_nodata;
  m.dem.z_units = c.map.z_units;
  m.dem.z_factor = c.map.z_factor;
  // Messages name the site file's keys, not the map command's flags.
  m.dem.crs_name = "map.dem_crs";
  m.dem.nodata_name = "map.dem_nodata =";
  m.dem.z_units_name = "map.z_units";
  m.dem.z_factor_name = "map.z_factor";
  m.dem.datum_names = "map.dem_offset_m, or map.same_datum = true if they are the same";
  m.sea.spread_input = field_location(c.file.string(), "map.sea_spread_to_m");
  m.sea.ways = "map.sea (polygons or a raster mask of the sea)";
  m.names.level = field_location(c.file.string(), "map.return_periods/map.years") + " (a mapped level)";
  m.names.accept_high_level = "check the fit and the projection behind it";
  m.names.polygons = field_location(c.file.string(), "map");
  if (c.map.same_datum) m.dem.datum.kind = terrain::DatumRelation::Kind::same;
  else {
    m.dem.datum.kind = terrain::DatumRelation::Kind::constant;
    m.dem.datum.offset_m = *c.map.dem_offset_m;
  }
  if (c.map.sea) {
    m.sea.mask_path = c.map.sea->string();
    m.sea.mask_recorded_as = path_as_written(*c.map.sea, c);
  }
  m.sea.layer = c.map.sea_layer;
  m.sea.where = c.map.sea_where;
  m.sea.layer_input = field_location(c.file.string(), "map.sea_layer");
  m.sea.where_input = field_location(c.file.string(), "map.sea_where");
  m.sea.spread_to_m = c.map.sea_spread_to_m;
  if (c.map.defences) {
    terrain::DefenceSource d;
    d.path = c.map.defences->string();
    d.recorded_as = path_as_written(*c.map.defences, c);
    d.crest_field = c.map.crest_attribute;
    d.crest_in_water_datum = true;
    d.crest_field_input = "map.crest_attribute";
    d.crest_datum_input = "that the crests are heights above the water-level datum (as a study reads them)";
    m.defences = d;
  }
  m.connectivity = c.map.connectivity;
  const auto& present = r.fit.present_day;
  add_present_levels(m, present, c.map.return_periods_yr);
  for (const auto& run : r.runs) {
    add_future_levels(m, present, run.inputs.rise, run.inputs.storminess, c.map.years, c.map.return_periods_yr,
                      display_name(run.settings));
  }
  add_present_aep(m, present);
  for (const auto& run : r.runs) {
    add_future_aep(m, present, run.inputs.rise, run.inputs.storminess, c.map.years, display_name(run.settings));
  }
  const auto& chosen = *std::find_if(r.runs.begin(), r.runs.end(), [&](const ScenarioRun& run) {
    return run.settings.name == first_year_scenario(c).name;
  });
  m.first_year = first_year_layer(present, chosen.inputs.rise, chosen.inputs.storminess,
                                  projection_years(chosen.inputs.rise, kFirstYearStepYr), c.map.aep_passing,
                                  display_name(chosen.settings));
  m.polygons = true;
  m.out_dir = dir / "maps";
  m.force = false;
  m.command_line = o.command;
  m.datum = r.fit.datum;
  std::string scenario_names;
  for (const auto& s : c.scenarios) scenario_names += (scenario_names.empty() ? "" : ", ") + display_name(s);
  m.input_metadata = {{"TIDEWRIGHT_SITE_FILE", c.file.filename().string()},
                      {"TIDEWRIGHT_RECORD", path_as_written(c.fit.input, c)},
                      {"TIDEWRIGHT_PROJECTION", "the study's own ensembles (scenarios " + scenario_names + ")"}};
  for (const auto& s : report::safety_cautions()) m.cautions.emplace_back(s);
  return m;
}

report::RasterView raster_view(terrain::BandValues b) {
  return {b.columns, b.rows, std::move(b.values), b.cell_size_m, b.nodata};
}

// The map stage: the rasters and polygons into dir/maps, and the two bands the report draws.
StudyMaps map_stage(const StudyResults& r, const SiteConfig& c, const StudyOptions& o, const std::filesystem::path& dir) {
  const terrain::MapRequest m = map_request(r, c, o, dir);
  StudyMaps maps;
  maps.summary = terrain::make_flood_maps(m);
  if (!m.levels.empty()) maps.highest = m.levels.back();
  const auto extent = dir / "maps" / "extent.tif";
  if (std::filesystem::exists(extent)) maps.extent = raster_view(terrain::read_band_values(extent, -1));
  const auto aep = dir / "maps" / "aep.tif";
  if (std::filesystem::exists(aep)) maps.aep = raster_view(terrain::read_band_values(aep, 0));
  return maps;
}

// Writes the report, its tables and figures, results.json and a copy of the site file; returns
// the names written, relative to dir.
std::vector<std::string> write_outputs(const StudyResults& r, const SiteConfig& c, const StudyOptions& o,
                                       const std::filesystem::path& dir) {
  std::vector<std::string> files;
  if (r.maps) {
    for (const auto& f : r.maps->summary.files) files.push_back("maps/" + f);
  }
  const report::ReportDocument doc = study_report(r, c, o.date);
  report::write_html(doc, dir / "report.html", false);
  files.push_back("report.html");
  std::filesystem::create_directories(dir / "tables");
  std::filesystem::create_directories(dir / "plots");
  for (const auto& p : report::write_tables_csv(doc, dir / "tables", false)) files.push_back("tables/" + p.filename().string());
  for (const auto& p : report::write_figures(doc, dir / "plots", false)) files.push_back("plots/" + p.filename().string());
  write_json_file(dir / "results.json", study_results_json(r, c), false);
  files.push_back("results.json");
  std::ifstream in(c.file, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  write_text_file(dir / "site.toml", text.str(), false);
  files.push_back("site.toml");
  return files;
}

}  // namespace

StudyOutcome run_study(const SiteConfig& c, const StudyOptions& o) {
  StudyOutcome out;
  out.out_dir = o.out_dir;
  StageClock clock(out, o);
  AtomicPath folder(o.out_dir, o.force, "--out");
  const auto dir = folder.make_temp_folder();
  StudyResults r;

  clock.begin("record and extreme-value fit");
  r.fit = run_fit_stage(fit_request(c));
  set_answer_grid(r, c);
  const FitSummary summary = fit_summary(r.fit);
  planning::StorminessChange storminess;
  storminess.scale_fraction_per_yr = c.planning.storminess_scale_per_yr;
  storminess.reference_year = c.projection.start_year;
  for (std::size_t i = 0; i < c.scenarios.size(); ++i) {
    clock.begin("projection '" + c.scenarios[i].name + "'");
    ScenarioRun run;
    run.settings = c.scenarios[i];
    run.projection = run_projection_stage(projection_request(c, c.scenarios[i], i));
    clock.begin("planning '" + c.scenarios[i].name + "'");
    run.inputs = join_fit_and_projection(summary, run.projection.local.total, c.planning.epoch_offset_m, storminess,
                                         field_location(c.file.string(), "planning.epoch_offset_m"));
    answer_scenario(run, r, c);
    r.runs.push_back(std::move(run));
  }
  if (c.map.enabled) {
    clock.begin("maps");
    r.maps = map_stage(r, c, o, dir);
  }
  clock.begin("report");
  out.files = write_outputs(r, c, o, dir);
  clock.end();
  folder.commit();
  out.report = o.out_dir / "report.html";
  out.headline = study_headline(r, c);
  return out;
}

}  // namespace tidewright::study
