#include "tidewright/study/study_pipeline.hpp"

#include <algorithm>
#include <chrono>
#include <limits>
#include <cctype>
#include <cmath>
#include <fstream>
#include <sstream>

#include "tidewright/common/atomic_output.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/report/cautions.hpp"
#include "tidewright/report/document.hpp"
#include "tidewright/report/plots.hpp"
#include "tidewright/report/text_table.hpp"
#include "tidewright/study/fit_stage.hpp"
#include "tidewright/study/map_layers.hpp"
#include "tidewright/study/planning_stage.hpp"
#include "tidewright/study/projection_stage.hpp"
#include "tidewright/terrain/flood_map.hpp"
#include "tidewright/version.hpp"

#include <gdal_priv.h>
#include <memory>

namespace tidewright::study {
namespace {

// The scenario as tables, figures and warnings name it: a high-end storyline says so there too.
std::string display_name(const ScenarioSettings& s) {
  return s.storyline == "high-end-ice" ? s.name + " [high-end ice storyline]" : s.name;
}

std::string sentence_case(std::string s) {
  if (!s.empty()) s[0] = static_cast<char>(std::toupper(static_cast<unsigned char>(s[0])));
  return s;
}


using report::fixed;
using Json = nlohmann::ordered_json;

// Letters, digits, - and _ only: a table's or figure's file stem from a scenario name.
std::string file_stem(std::string name) {
  for (auto& ch : name) {
    if (!std::isalnum(static_cast<unsigned char>(ch)) && ch != '_' && ch != '-') ch = '_';
  }
  return name;
}

// Paths in the site file's folder as the site file writes them (relative to it), so that the
// report and results.json read the same wherever the study was run from. A path is cut only
// where it starts a word, so "/a/inputs/x" is left alone for a site folder "inputs".
std::string relative_to_site(std::string text, const SiteConfig& c) {
  const std::string dir = c.file.parent_path().string();
  if (dir.empty()) return text;
  const std::string prefix = dir + "/";
  for (std::size_t at = text.find(prefix); at != std::string::npos; at = text.find(prefix, at)) {
    const bool starts_word =
        at == 0 || (text[at - 1] != '/' && !std::isalnum(static_cast<unsigned char>(text[at - 1])));
    if (starts_word) text.erase(at, prefix.size());
    else at += prefix.size();
  }
  return text;
}

// A metre figure for a CSV: 4 decimals, empty where there is no number.
std::string csv_m(double v) { return std::isfinite(v) ? fixed(v, 4) : std::string(); }

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

FitRequest fit_request(const SiteConfig& c) {
  FitRequest r;
  r.input = c.record.path;
  r.kind = c.record.kind == "series" ? RecordKind::series : RecordKind::annual_maxima;
  r.read.time_column = c.record.time_column;
  r.read.year_column = c.record.year_column;
  r.read.level_column = c.record.level_column;
  r.read.unit = c.record.units;
  r.read.datum = c.site.datum;
  for (const auto& m : c.record.missing_markers) r.read.missing.markers.push_back(m);
  r.read.missing.sentinels = c.record.sentinels;
  r.read.accept_implausible_levels = c.record.accept_implausible_levels;
  r.model = c.extremes.model;
  r.return_periods_yr = c.extremes.return_periods_yr;
  const auto method = record::parse_detrend_method(c.record.detrend == "annual_mean" ? "annual-mean" : c.record.detrend,
                                                   field_location(c.file.string(), "record.detrend"));
  r.maxima.min_completeness = c.record.min_completeness;
  r.maxima.year_start_month = c.record.year_start_month;
  r.maxima.detrend = method;
  r.maxima.epoch_yr = c.record.reference_epoch;
  r.peaks.min_completeness = c.record.min_completeness;
  r.peaks.year_start_month = c.record.year_start_month;
  r.peaks.detrend = method;
  r.peaks.epoch_yr = c.record.reference_epoch;
  r.detrend_input = field_location(c.file.string(), "record.detrend");
  r.epoch_input = field_location(c.file.string(), "record.reference_epoch");
  r.detrend_given = c.record.detrend_given;
  r.peaks.separation_h = c.extremes.declustering_hours;
  if (c.extremes.threshold_m) r.peaks.threshold_m = c.extremes.threshold_m;
  else r.peaks.threshold_quantile = c.extremes.threshold_quantile;
  r.r_largest = static_cast<std::size_t>(c.extremes.r_largest);
  r.bootstrap_samples = static_cast<std::size_t>(c.extremes.bootstrap_samples);
  r.seed = c.seed;
  return r;
}

ProjectionRequest projection_request(const SiteConfig& c, const ScenarioSettings& s, std::size_t index) {
  ProjectionRequest r;
  r.label = s.name;
  if (s.source == "pathway") {
    r.source = ScenarioSource::pathway;
    r.pathway = s.pathway;
  } else {
    r.source = s.source == "forcing_csv" ? ScenarioSource::forcing_csv
               : s.source == "co2_csv"   ? ScenarioSource::co2_csv
               : s.source == "temperature_csv" ? ScenarioSource::temperature_csv
                                               : ScenarioSource::table;
    r.path = *s.path;
  }
  r.storyline = s.storyline == "high-end-ice" ? climate::IceStoryline::high_end_ice : climate::IceStoryline::assessed;
  r.storyline_input = field_location(c.file.string(), "scenario.storyline");
  r.first_year = c.projection.start_year;
  r.last_year = c.projection.end_year;
  r.members = c.projection.members;
  r.accept_extreme_inputs = c.projection.accept_extreme;
  r.input_names.members = field_location(c.file.string(), "projection.members");
  r.input_names.years = field_location(c.file.string(), "projection.start_year/end_year");
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
      // A linear ramp from zero at the start to the stated offset in 2100 (docs/site-file.md).
      for (int y = r.first_year; y <= r.last_year; ++y) {
        const double w = std::max(0.0, static_cast<double>(y - r.first_year) / (2100.0 - r.first_year));
        r.local.ocean_dynamic.years.push_back(y);
        r.local.ocean_dynamic.mean_m.push_back(c.local.ocean_dynamic_offset_m * w);
        r.local.ocean_dynamic.sd_m.push_back(c.local.ocean_dynamic_sd_m * w);
      }
    }
  }
  return r;
}

struct ScenarioRun {
  ScenarioSettings settings;
  ProjectionStageResult projection;
  PlanningInputs inputs;
  std::vector<AllowanceRow> allowances;
};

// A band of a GeoTIFF the map stage wrote, as the report's map plots take it.
report::RasterView read_raster_for_view(const std::filesystem::path& tif, double& cell_size_m, int band_index = 0) {
  GDALAllRegister();
  std::unique_ptr<GDALDataset> ds(GDALDataset::Open(tif.c_str(), GDAL_OF_RASTER | GDAL_OF_READONLY));
  if (!ds) throw ComputationError(tif.string(), "the map stage's raster cannot be read back", "report this as a bug");
  const int bands = ds->GetRasterCount();
  const int b = band_index < 0 ? bands : std::clamp(band_index + 1, 1, bands);
  GDALRasterBand* band = ds->GetRasterBand(b);
  report::RasterView v;
  v.columns = ds->GetRasterXSize();
  v.rows = ds->GetRasterYSize();
  double gt[6] = {0, 1, 0, 0, 0, -1};
  ds->GetGeoTransform(gt);
  cell_size_m = std::abs(gt[1]);
  v.cell_size_m = cell_size_m;
  v.values.resize(static_cast<std::size_t>(v.columns) * static_cast<std::size_t>(v.rows));
  if (band->RasterIO(GF_Read, 0, 0, v.columns, v.rows, v.values.data(), v.columns, v.rows, GDT_Float32, 0, 0) != CE_None) {
    throw ComputationError(tif.string(), "the map stage's raster cannot be read back", "report this as a bug");
  }
  int has_nodata = 0;
  const double nd = band->GetNoDataValue(&has_nodata);
  if (has_nodata) v.nodata = static_cast<float>(nd);
  return v;
}

// The answer at a glance for one scenario: return periods down, today and the design years
// across, each design height with the allowance's Monte Carlo standard error.
report::Table design_height_matrix(const ScenarioRun& run, const PlanningSettings& p, const std::string& datum) {
  const std::string scenario = display_name(run.settings);
  report::Table t{"design_height_matrix_" + file_stem(run.settings.name),
                  "Design heights, scenario " + scenario + ", in m above " + datum +
                      ": today's T-year still-water level, and in each design year the level with the same expected "
                      "number of exceedances (Hunter 2012), \u00b1 its Monte Carlo standard error.",
                  {{"Return period", "years"}, {"Today", "m"}},
                  {}};
  t.csv_columns = {"return_period_yr", "today_m"};
  for (int y : p.design_years) {
    t.columns.push_back({std::to_string(y), "m"});
    t.csv_columns.push_back("design_height_" + std::to_string(y) + "_m");
    t.csv_columns.push_back("monte_carlo_error_" + std::to_string(y) + "_m");
  }
  for (double period : p.return_periods_yr) {
    std::vector<std::string> cells{fixed(period, 0)};
    std::vector<std::string> csv{fixed(period, 0)};
    for (int y : p.design_years) {
      const auto row = std::find_if(run.allowances.begin(), run.allowances.end(), [&](const AllowanceRow& r) {
        return r.allowance.first_year == y && r.allowance.return_period_yr == period;
      });
      if (row == run.allowances.end()) {
        throw ComputationError("design-height table", "a design year's allowance is missing", "report this as a bug");
      }
      const auto& a = row->allowance;
      if (cells.size() == 1) {
        cells.push_back(fixed(a.present_level_m, 2));
        csv.push_back(csv_m(a.present_level_m));
      }
      const double height = a.present_level_m + a.allowance_m;
      const double se = a.monte_carlo.sampled ? a.monte_carlo.standard_error : 0.0;
      cells.push_back(fixed(height, 2) + (a.monte_carlo.sampled ? " \u00b1 " + fixed(se, 3) : std::string()));
      csv.push_back(csv_m(height));
      csv.push_back(a.monte_carlo.sampled ? csv_m(se) : std::string());
    }
    t.add_row(std::move(cells));
    t.add_csv_row(std::move(csv));
  }
  return t;
}

template <typename T>
std::string joined(const std::vector<T>& values, int decimals) {
  std::string out;
  for (const auto& v : values) out += (out.empty() ? "" : ", ") + fixed(static_cast<double>(v), decimals);
  return out;
}

// Everything that shaped the numbers, as the report's inputs table lists it: files relative to
// the site file, and the settings a reader would otherwise have to look up in it.
std::vector<report::InputItem> report_inputs(const SiteConfig& c, const std::string& datum,
                                             const std::optional<terrain::DefenceBurn>& defences) {
  const auto name = [&](const std::filesystem::path& p) { return relative_to_site(p.string(), c); };
  const auto& p = c.planning;
  std::vector<report::InputItem> in{
      {"Site file", c.file.filename().string()},
      {"Record", name(c.record.path) + " (" + c.record.kind + ", units " + c.record.units + ")"},
      {"Water-level datum", datum},
      {"Extreme model", c.extremes.model},
      {"Projection", std::to_string(c.projection.members) + " members, " + std::to_string(c.projection.start_year) +
                         "-" + std::to_string(c.projection.end_year) + ", reference " + c.projection.reference},
      {"Seed", std::to_string(c.seed)}};
  for (const auto& s : c.scenarios) {
    in.push_back({"Scenario " + display_name(s),
                  s.source == "pathway" ? "built-in pathway " + s.pathway : s.source + " " + name(*s.path)});
  }
  in.push_back({"Design years", joined(p.design_years, 0)});
  in.push_back({"Return periods", joined(p.return_periods_yr, 0) + " years (" + extremes::return_period_definition + ")"});
  in.push_back({"Design life", std::to_string(p.design_life_start) + "-" + std::to_string(p.design_life_end) +
                                   ", target probability of at least one exceedance " + fixed(p.target_risk, 3)});
  in.push_back({"Heights of interest", p.levels_of_interest_m.empty() ? std::string("none")
                                                                      : joined(p.levels_of_interest_m, 2) + " m above " + datum});
  in.push_back({"Epoch offset", p.epoch_offset_m ? fixed(*p.epoch_offset_m, 3) +
                                                       " m, the stated rise from the record's epoch to the projection's reference"
                                                 : std::string("none stated")});
  in.push_back({"Storminess change", fixed(p.storminess_scale_per_yr, 4) + " of the extreme scale per year"});
  std::string prints;
  for (const auto& [component, factor] : c.local.fingerprints) {
    prints += (prints.empty() ? "" : ", ") + component + " " + fixed(factor, 3);
  }
  in.push_back({"Fingerprint factors", prints.empty() ? std::string("none given (1 for every component)")
                                                       : prints + "; 1 for components not listed"});
  in.push_back({"Vertical land motion", fixed(c.local.land_motion_mm_per_yr, 2) + " ± " +
                                            fixed(c.local.land_motion_sd_mm_per_yr, 2) + " mm/yr (positive = uplift)"});
  if (c.local.ocean_dynamic_offset_m != 0.0 || c.local.ocean_dynamic_sd_m != 0.0) {
    in.push_back({"Ocean dynamic offset", fixed(c.local.ocean_dynamic_offset_m, 3) + " ± " +
                                              fixed(c.local.ocean_dynamic_sd_m, 3) + " m in 2100, a ramp from the start"});
  }
  if (!c.map.enabled) return in;
  in.push_back({"DEM", name(c.map.dem) + "; " + (c.map.same_datum ? std::string("same vertical datum as the water levels")
                                                                   : "water level = DEM elevation + " +
                                                                         fixed(c.map.dem_offset_m.value_or(0.0), 3) + " m")});
  if (c.map.sea) in.push_back({"Sea", name(*c.map.sea)});
  if (c.map.defences) {
    std::string d = name(*c.map.defences) + ", crest attribute '" + c.map.crest_attribute + "'";
    if (defences) {
      d += ": " + std::to_string(defences->features) + " features, crests " + joined(defences->crests_m, 2) + " m above " +
           datum + ", " + std::to_string(defences->cells_raised) + " DEM cells raised";
    }
    in.push_back({"Defences", d});
  }
  in.push_back({"Mapped", "today's and the future " + joined(c.map.return_periods_yr, 0) + "-year levels in " +
                              joined(c.map.years, 0) + "; first year with an AEP of " + fixed(100.0 * c.map.aep_passing, 2) +
                              " % (scenario " + display_name(c.scenarios.back()) + ")"});
  return in;
}

}  // namespace

StudyOutcome run_study(const SiteConfig& c, const StudyOptions& o) {
  StudyOutcome out;
  out.out_dir = o.out_dir;
  StageClock clock(out, o);
  AtomicPath folder(o.out_dir, o.force, "--out");
  const auto dir = folder.make_temp_folder();
  const std::string datum = c.site.datum;
  const std::string invented = c.site.invented ? " (invented data)" : "";

  // --- record and fit ---------------------------------------------------------------------
  clock.begin("record and extreme-value fit");
  const FitStageResult fit = run_fit_stage(fit_request(c));
  Json all;
  all["site"] = {{"name", c.site.name}, {"datum", datum}, {"crs", c.site.crs}, {"x", c.site.x}, {"y", c.site.y},
                 {"invented", c.site.invented}};
  all["tool"] = std::string("tidewright ") + version_string;
  all["seed"] = c.seed;
  all["fit"] = fit_result_json(fit);
  all["fit"]["source"] = relative_to_site(all["fit"]["source"].get<std::string>(), c);
  FitSummary summary;
  summary.model = fit.present_day;
  summary.datum = fit.datum;
  summary.reference_epoch = fit.reference_epoch;
  summary.parameter_names = fit.fit.parameter_names;
  for (Eigen::Index i = 0; i < fit.fit.estimate.size(); ++i) summary.estimates.push_back(fit.fit.estimate(i));
  summary.covariance = Eigen::MatrixXd(fit.fit.covariance);
  summary.source = c.record.path.string();

  // --- projections and planning -----------------------------------------------------------
  std::vector<ScenarioRun> runs;
  planning::StorminessChange storminess;
  storminess.scale_fraction_per_yr = c.planning.storminess_scale_per_yr;
  storminess.reference_year = c.projection.start_year;
  for (std::size_t i = 0; i < c.scenarios.size(); ++i) {
    clock.begin("projection '" + c.scenarios[i].name + "'");
    ScenarioRun run;
    run.settings = c.scenarios[i];
    run.projection = run_projection_stage(projection_request(c, c.scenarios[i], i));
    clock.begin("planning '" + c.scenarios[i].name + "'");
    run.inputs = join_fit_and_projection(
        summary, run.projection.local.total, c.planning.epoch_offset_m, storminess,
        field_location(c.file.string(), "planning.epoch_offset_m"));
    run.allowances = allowance_table(run.inputs, c.planning.design_years, c.planning.return_periods_yr, 0, c.seed);
    runs.push_back(std::move(run));
  }

  // --- the answers, as report tables ------------------------------------------------------
  clock.begin("planning tables");
  const std::string level_unit = "m above " + datum;
  report::Table heights{"design_heights",
                        "Still-water design heights: today's T-year level plus the allowance that keeps the expected "
                        "number of exceedances per year at today's (Hunter 2012), per scenario and year. Monte Carlo "
                        "error: the allowance's standard error over the ensemble's members; effective members: how "
                        "many members it rests on (Kish); the last column is the allowance with the year's rise cut "
                        "at its 99th percentile, to show how much of it comes from the top 1 % of the rise.",
                        {{"Scenario", ""}, {"Year", ""}, {"Return period", "years"}, {"Today's level", level_unit},
                         {"Allowance", "m"}, {"Monte Carlo error", "m"}, {"Effective members", ""},
                         {"Design height", level_unit}, {"Mean rise", "m"}, {"Rise sd", "m"},
                         {"Allowance, rise cut at 99%", "m"}},
                        {}};
  heights.csv_columns = {"scenario",           "year",           "return_period_yr",     "present_level_m",
                         "allowance_m",        "monte_carlo_error_m", "effective_members", "design_height_m",
                         "mean_rise_m",        "rise_sd_m",      "allowance_rise_cut_p99_m"};
  std::vector<std::string> ensemble_warnings;
  Json scen_json = Json::array();
  for (const auto& run : runs) {
    Json sj;
    sj["name"] = run.settings.name;
    sj["storyline"] = run.settings.storyline;
    sj["projection"] = projection_json(run.projection);
    const Json allowances = allowance_json(run.inputs, run.allowances, "projection.members");
    sj["allowances"] = allowances["allowances"];
    sj["warnings"] = allowances["warnings"];
    // One line per scenario and kind in the report (the JSON keeps one warning per row).
    std::string few;
    std::string beyond;
    for (const auto& r : run.allowances) {
      const auto& a = r.allowance;
      const std::string row = fixed(a.return_period_yr, 0) + "-year in " + std::to_string(a.first_year);
      if (a.monte_carlo.few_effective_members()) {
        few += (few.empty() ? "" : ", ") + row + " (" + fixed(a.monte_carlo.effective_sample_size, 0) + ")";
      }
      if (a.beyond_range_fraction > 0.0) {
        beyond += (beyond.empty() ? "" : ", ") + row + " (" + fixed(100.0 * a.beyond_range_fraction, 1) + " %)";
      }
    }
    if (!few.empty()) {
      ensemble_warnings.push_back(display_name(run.settings) +
                                  ": allowances that rest on fewer than 100 effective members (their Monte Carlo "
                                  "error is in the table): " + few + "; more members (projection.members) settle them");
    }
    if (!beyond.empty()) {
      ensemble_warnings.push_back(display_name(run.settings) +
                                  ": allowances set by members whose rise takes today's level below the fitted "
                                  "model's lower end point (share of members): " + beyond +
                                  "; such an allowance can exceed a longer return period's, and a peaks-over-threshold "
                                  "fit answers for frequent levels");
    }
    sj["notes"] = run.inputs.notes;
    for (const auto& r : run.allowances) {
      const auto& a = r.allowance;
      const auto& mc = a.monte_carlo;
      heights.add_row({display_name(run.settings), std::to_string(a.first_year), fixed(a.return_period_yr, 0),
                       fixed(a.present_level_m, 2), fixed(a.allowance_m, 2), mc.sampled ? fixed(mc.standard_error, 3) : "-",
                       mc.sampled ? fixed(mc.effective_sample_size, 0) : "-", fixed(a.present_level_m + a.allowance_m, 2),
                       fixed(a.mean_rise_m, 2), fixed(a.sd_rise_m, 2), fixed(r.cut_at_p99_m, 2)});
      heights.add_csv_row({run.settings.name, std::to_string(a.first_year), fixed(a.return_period_yr, 0),
                           csv_m(a.present_level_m), csv_m(a.allowance_m), mc.sampled ? csv_m(mc.standard_error) : "",
                           mc.sampled ? fixed(mc.effective_sample_size, 1) : "", csv_m(a.present_level_m + a.allowance_m),
                           csv_m(a.mean_rise_m), csv_m(a.sd_rise_m), csv_m(r.cut_at_p99_m)});
    }
    scen_json.push_back(sj);
  }

  report::Table shifts{"return_period_shifts",
                       "How often today's levels will be exceeded: future return period and amplification factor "
                       "N_t(z)/N_0(z), per scenario and year. '< 1' and '> x': the level would be passed more than "
                       "once a year, beyond what a model of annual maxima can count (the figure draws the bound x); a "
                       "peaks-over-threshold fit answers for frequent levels. Members beyond the model: the share of "
                       "members whose rise takes the level below the fitted lower end point.",
                       {{"Scenario", ""}, {"Year", ""}, {"Level", level_unit}, {"Today's return period", "years"},
                        {"Future return period", "years"}, {"Amplification factor", ""},
                        {"Members beyond the model", "%"}},
                       {}};
  shifts.csv_columns = {"scenario", "year", "level_m"};
  for (const auto& name : amplification_csv_columns()) shifts.csv_columns.push_back(name);
  report::Table emergence{"emergence_years",
                          "First year in which today's level is expected to be exceeded at least once a year.",
                          {{"Scenario", ""}, {"Level", level_unit}, {"Today's return period", "years"},
                           {"First year exceeded yearly", ""}},
                          {}};
  emergence.csv_columns = {"scenario", "level_m", "present_return_period_yr", "first_year_exceeded_yearly"};
  const int life_first = c.planning.design_life_start, life_last = c.planning.design_life_end;
  report::Table risk{"design_life_risk",
                     "Probability of at least one exceedance over the design life " + std::to_string(life_first) + "-" +
                         std::to_string(life_last) +
                         ", from the ensemble members (year-to-year correlation kept), with its Monte Carlo error; the "
                         "expected count (years with an exceedance for a model of annual maxima, which cannot count a "
                         "second exceedance in a year); and the share of member-years in which the rise takes the "
                         "height below the fitted model's lower end point (exceeded for certain in that year).",
                     {{"Scenario", ""}, {"Height", level_unit}, {"Probability of exceedance", ""},
                      {"Monte Carlo error", ""}, {sentence_case(expected_count_heading(fit.present_day)), ""},
                      {"Member-years beyond the model", "%"}},
                     {}};
  risk.csv_columns = {"scenario",          "height_m",       "probability", "rounds_to_one", "monte_carlo_error",
                      "expected_count", "member_years_beyond_model_fraction"};
  report::Table target{"target_heights",
                       "Height with the target probability of at least one exceedance over the design life.",
                       {{"Scenario", ""}, {"Design life", ""}, {"Target probability", ""}, {"Height", level_unit}},
                       {}};
  target.csv_columns = {"scenario", "design_life_first_year", "design_life_last_year", "target_probability", "height_m"};
  std::vector<double> follow_levels;
  for (double t : c.planning.return_periods_yr) follow_levels.push_back(planning::present_return_level(fit.present_day, t));
  for (double z : c.planning.levels_of_interest_m) follow_levels.push_back(z);
  std::vector<double> risk_heights;
  std::vector<report::NamedSeries> risk_curves, af_series, allowance_series, height_series;
  std::vector<double> plot_years;
  for (int y = c.projection.start_year; y <= std::min(c.projection.end_year, 2150); y += 5) plot_years.push_back(y);
  {
    const double z0 = planning::present_return_level(fit.present_day, 2.0);
    for (int k = 0; k <= 40; ++k) risk_heights.push_back(z0 + 0.05 * k);
  }
  const double design_rp = c.planning.return_periods_yr.back();
  for (std::size_t si = 0; si < runs.size(); ++si) {
    auto& run = runs[si];
    auto& sj = scen_json[si];
    Json rows = Json::array();
    for (int y : c.planning.design_years) {
      const auto cond = planning::conditions_in_year(run.inputs.rise, y, run.inputs.storminess);
      for (double z : follow_levels) {
        const auto am = planning::amplification(fit.present_day, cond, z);
        const auto text = amplification_text(am);
        shifts.add_row({display_name(run.settings), std::to_string(y), fixed(z, 2), return_period_text(am.present_return_period_yr),
                        text.future_return_period, text.factor, fixed(100.0 * am.beyond_range_fraction, 1)});
        std::vector<std::string> csv{run.settings.name, std::to_string(y), csv_m(z)};
        for (auto& cell : amplification_csv_cells(am)) csv.push_back(std::move(cell));
        shifts.add_csv_row(std::move(csv));
        rows.push_back(amplification_json(am));
      }
    }
    sj["amplification"] = rows;
    const auto span_all = year_span(run.inputs, run.inputs.rise.years.front(), run.inputs.rise.years.back());
    Json em = Json::array();
    for (double z : follow_levels) {
      const auto e = planning::emergence_year(fit.present_day, span_all, z, 1.0);
      const double present_period = 1.0 / fit.present_day.annual_exceedance_rate(z);
      emergence.add_row({display_name(run.settings), fixed(z, 2), return_period_text(present_period),
                         e.year ? std::to_string(*e.year) : "not by " + std::to_string(run.inputs.rise.years.back())});
      emergence.add_csv_row({run.settings.name, csv_m(z), std::isfinite(present_period) ? fixed(present_period, 6) : "",
                             e.year ? std::to_string(*e.year) : ""});
      em.push_back({{"level", z}, {"year", e.year ? Json(*e.year) : Json(nullptr)}});
    }
    sj["emergence"] = em;
    const auto life = year_span(run.inputs, life_first, life_last);
    Json rj = Json::array();
    for (double h : c.planning.levels_of_interest_m) {
      const auto r = planning::design_life_risk(fit.present_day, life, h);
      risk.add_row({display_name(run.settings), fixed(h, 2), report::probability_text(r.probability, r.rounds_to_one),
                    r.monte_carlo.sampled ? fixed(r.monte_carlo.standard_error, 4) : "-",
                    fixed(expected_count(fit.present_day, r), 3), fixed(100.0 * r.beyond_range_fraction, 2)});
      risk.add_csv_row({run.settings.name, csv_m(h), fixed(r.probability, 8), r.rounds_to_one ? "true" : "false",
                        r.monte_carlo.sampled ? fixed(r.monte_carlo.standard_error, 8) : "",
                        fixed(expected_count(fit.present_day, r), 6), fixed(r.beyond_range_fraction, 6)});
      rj.push_back(design_life_risk_json(r));
    }
    const auto tl = planning::level_for_design_life_risk(fit.present_day, life, c.planning.target_risk);
    target.add_row({display_name(run.settings), std::to_string(life_first) + "-" + std::to_string(life_last),
                    fixed(c.planning.target_risk, 3), fixed(tl.level_m, 2)});
    target.add_csv_row({run.settings.name, std::to_string(life_first), std::to_string(life_last),
                        fixed(c.planning.target_risk, 6), csv_m(tl.level_m)});
    sj["design_life"] = {{"first_year", life_first}, {"last_year", life_last}, {"risks", rj},
                         {"target_probability", c.planning.target_risk}, {"target_height_m", tl.level_m}};
    report::NamedSeries curve{display_name(run.settings), {}};
    for (double h : risk_heights) curve.values.push_back(planning::design_life_risk(fit.present_day, life, h).probability);
    risk_curves.push_back(curve);
    report::NamedSeries af{display_name(run.settings) + ", today's " + fixed(design_rp, 0) + "-year level", {}};
    report::NamedSeries al{display_name(run.settings), {}};
    report::NamedSeries dh{display_name(run.settings), {}};
    const double z_design = planning::present_return_level(fit.present_day, design_rp);
    for (double y : plot_years) {
      const auto cond = planning::conditions_in_year(run.inputs.rise, static_cast<int>(y), run.inputs.storminess);
      af.values.push_back(planning::amplification(fit.present_day, cond, z_design).quotable_factor());
      const auto a = planning::allowance(fit.present_day, cond, design_rp);
      al.values.push_back(a.allowance_m);
      dh.values.push_back(a.present_level_m + a.allowance_m);
    }
    af_series.push_back(af);
    allowance_series.push_back(al);
    height_series.push_back(dh);
  }
  all["scenarios"] = scen_json;

  // --- maps ---------------------------------------------------------------------------------
  Json maps_json;
  std::string extent_title = "Flood extent";
  std::optional<terrain::DefenceBurn> defence_burn;
  report::Table map_table{"flooded_areas",
                          "Land reached by the sea (connected) and low ground below the level it does not reach (cut off), per mapped level.",
                          {{"Level", level_unit}, {"Year", ""}, {"Scenario", ""}, {"Flooded area", "ha"},
                           {"Cut-off low ground", "ha"}, {"Largest depth", "m"}},
                          {}};
  map_table.csv_columns = {"level_m", "year", "scenario", "flooded_area_ha", "cut_off_area_ha", "max_depth_m"};
  if (c.map.enabled) {
    clock.begin("maps");
    terrain::MapRequest m;
    m.dem.path = c.map.dem.string();
    m.dem.recorded_as = relative_to_site(m.dem.path, c);
    m.dem.window = c.map.window;
    m.dem.window_name = field_location(c.file.string(), "map.window");
    if (c.map.same_datum) m.dem.datum.kind = terrain::DatumRelation::Kind::same;
    else {
      m.dem.datum.kind = terrain::DatumRelation::Kind::constant;
      m.dem.datum.offset_m = *c.map.dem_offset_m;
    }
    if (c.map.sea) m.sea.mask_path = c.map.sea->string();
    m.sea.mask_recorded_as = relative_to_site(m.sea.mask_path, c);
    m.sea.layer = c.map.sea_layer;
    m.sea.where = c.map.sea_where;
    m.sea.layer_input = field_location(c.file.string(), "map.sea_layer");
    m.sea.where_input = field_location(c.file.string(), "map.sea_where");
    m.sea.spread_to_m = c.map.sea_spread_to_m;
    if (c.map.defences) {
      terrain::DefenceSource d;
      d.path = c.map.defences->string();
      d.recorded_as = relative_to_site(d.path, c);
      d.crest_field = c.map.crest_attribute;
      d.crest_in_water_datum = true;
      m.defences = d;
    }
    m.connectivity = c.map.connectivity == 4 ? terrain::Connectivity::four : terrain::Connectivity::eight;
    const auto& present = fit.present_day;
    add_present_levels(m, present, c.map.return_periods_yr);
    for (const auto& run : runs) {
      add_future_levels(m, present, run.inputs.rise, run.inputs.storminess, c.map.years, c.map.return_periods_yr,
                        display_name(run.settings));
    }
    add_present_aep(m, present);
    for (const auto& run : runs) {
      add_future_aep(m, present, run.inputs.rise, run.inputs.storminess, c.map.years, display_name(run.settings));
    }
    const auto& last_run = runs.back();
    m.first_year = first_year_layer(present, last_run.inputs.rise, last_run.inputs.storminess,
                                    projection_years(last_run.inputs.rise, kFirstYearStepYr), c.map.aep_passing,
                                    display_name(last_run.settings));
    m.polygons = true;
    m.out_dir = dir / "maps";
    m.force = false;
    m.command_line = o.command;
    m.datum = fit.datum;
    std::string scenario_names;
    for (const auto& s : c.scenarios) scenario_names += (scenario_names.empty() ? "" : ", ") + display_name(s);
    m.input_metadata = {{"TIDEWRIGHT_SITE_FILE", c.file.filename().string()},
                        {"TIDEWRIGHT_RECORD", relative_to_site(c.record.path.string(), c)},
                        {"TIDEWRIGHT_PROJECTION", "the study's own ensembles (scenarios " + scenario_names + ")"}};
    for (const auto& s : report::safety_cautions()) m.cautions.emplace_back(s);
    const auto ms = terrain::make_flood_maps(m);
    defence_burn = ms.defences;
    if (!m.levels.empty()) {
      const auto& last = m.levels.back();
      extent_title = "Flood extent at " + fixed(last.level_m, 2) + " m (" + last.scenario +
                     (last.year ? ", " + std::to_string(*last.year) : std::string()) + ")";
    }
    Json levels = Json::array();
    for (const auto& l : ms.levels) {
      map_table.add_row({fixed(l.level.level_m, 2), l.level.year ? std::to_string(*l.level.year) : "today",
                         l.level.scenario, fixed(l.flooded_area_m2 / 1e4, 2), fixed(l.cut_off_area_m2 / 1e4, 2),
                         fixed(l.max_depth_m, 2)});
      map_table.add_csv_row({csv_m(l.level.level_m), l.level.year ? std::to_string(*l.level.year) : "",
                             l.level.scenario, fixed(l.flooded_area_m2 / 1e4, 4), fixed(l.cut_off_area_m2 / 1e4, 4),
                             csv_m(l.max_depth_m)});
      levels.push_back(terrain::level_summary_json(l));
    }
    maps_json = {{"files", ms.files}, {"area_method", ms.area_method}, {"levels", levels}};
    for (const auto& f : ms.files) out.files.push_back("maps/" + f);
    all["maps"] = maps_json;
  }

  // --- the report -------------------------------------------------------------------------
  clock.begin("report");
  report::ReportDocument doc;
  doc.title = "Sea-level planning report" + invented;
  doc.site_name = c.site.name;
  doc.date = o.date;
  doc.tool_version = std::string("tidewright ") + version_string;
  doc.summary = "Still-water design heights, return-period shifts, amplification factors and design-life risk for " +
                c.site.name + ", from the tide-gauge record " + c.record.path.filename().string() + " and " +
                std::to_string(runs.size()) + " sea-level scenario(s). Levels are in metres above " + datum + "." +
                (c.site.invented ? " All data in this report are invented for a demonstration." : "");
  report::Section answers{"Answers", {}};
  answers.blocks.emplace_back(report::Paragraph{"Design heights keep the expected number of exceedances per year in the "
                                                "design year equal to today's (Hunter 2012). They are still-water levels: "
                                                "add waves, freeboard and local code requirements."});
  for (const auto& run : runs) answers.blocks.emplace_back(design_height_matrix(run, c.planning, datum));
  for (const auto& w : ensemble_warnings) answers.blocks.emplace_back(report::Paragraph{"Warning: " + w + "."});
  answers.blocks.emplace_back(report::Figure{"design_heights", "Design height of today's " + fixed(design_rp, 0) +
                                                                   "-year level by year, per scenario.",
                                             report::design_height_plot(plot_years, height_series, datum,
                                                                        planning::present_return_level(fit.present_day, design_rp),
                                                                        "today's " + fixed(design_rp, 0) + "-year level")});
  answers.blocks.emplace_back(shifts);
  answers.blocks.emplace_back(report::Figure{"amplification", "Amplification of the exceedance frequency of today's " +
                                                                  fixed(design_rp, 0) + "-year level.",
                                             report::amplification_plot(plot_years, af_series)});
  answers.blocks.emplace_back(emergence);
  answers.blocks.emplace_back(risk);
  answers.blocks.emplace_back(target);
  answers.blocks.emplace_back(report::Figure{"design_life_risk", "Probability of at least one exceedance over the design life.",
                                             report::design_life_risk_plot(risk_heights, risk_curves, datum,
                                                                           std::to_string(life_first) + "-" + std::to_string(life_last),
                                                                           c.planning.target_risk)});
  doc.sections.push_back(std::move(answers));

  report::Section evidence{"Evidence", {}};
  evidence.blocks.emplace_back(report::Subheading{"The record"});
  {
    report::BulletList lines;
    std::istringstream in(fit.data_summary);
    for (std::string line; std::getline(in, line);) lines.items.push_back(relative_to_site(line, c));
    evidence.blocks.emplace_back(lines);
  }
  evidence.blocks.emplace_back(report::Subheading{"Extreme-value fit"});
  report::Table params{"fit_parameters", "Maximum-likelihood estimates with standard errors from the observed information.",
                       {{"Parameter", ""}, {"Estimate", ""}, {"Standard error", ""}}, {}};
  params.csv_columns = {"parameter", "estimate", "standard_error"};
  for (std::size_t i = 0; i < fit.fit.parameter_names.size(); ++i) {
    const auto k = static_cast<Eigen::Index>(i);
    params.add_row({fit.fit.parameter_names[i], fixed(fit.fit.estimate(k), 4), fixed(fit.fit.standard_error(k), 4)});
    params.add_csv_row({fit.fit.parameter_names[i], fixed(fit.fit.estimate(k), 8), fixed(fit.fit.standard_error(k), 8)});
  }
  evidence.blocks.emplace_back(params);
  std::string diag = "Model " + fit.model + ", " + std::to_string(fit.fit.n) + " values, log-likelihood " +
                     fixed(fit.fit.log_likelihood, 2) + ", AIC " + fixed(fit.aic, 2) + ", Anderson-Darling A² " +
                     fixed(fit.anderson_darling, 3) + ".";
  if (fit.deviance_test) {
    diag += " Deviance test of Gumbel against GEV: D = " + fixed(fit.deviance_test->deviance, 2) + ", p = " +
            fixed(fit.deviance_test->p_value, 3) + ".";
  }
  if (fit.reference_epoch) {
    diag += " Levels are relative to mean sea level at " + fixed(*fit.reference_epoch, 1) + " (trend removed: " +
            fixed(fit.trend_mm_per_yr, 2) + " mm/yr).";
  }
  evidence.blocks.emplace_back(report::Paragraph{diag});
  report::Table rl{"return_levels",
                   std::string("Present-day return levels with 95% profile-likelihood intervals (the interval to "
                               "quote) and, as an approximation, delta-method intervals; a delta lower bound below a "
                               "shorter return period's level is not shown. ") +
                       extremes::return_period_definition + ".",
                   {{"Return period", "years"}, {"AEP", "%"}, {"Level", level_unit}, {"Profile lower", level_unit},
                    {"Profile upper", level_unit}, {"Delta lower (approx.)", level_unit},
                    {"Delta upper (approx.)", level_unit}},
                   {}};
  rl.csv_columns = {"return_period_yr", "aep_percent", "level_m", "profile_lower_m", "profile_upper_m",
                    "delta_lower_approx_m", "delta_upper_approx_m"};
  for (std::size_t i = 0; i < fit.profile.size(); ++i) {
    const auto& p = fit.profile[i];
    const auto& d = fit.delta[i];
    const auto end = [](double v) {
      return std::isnan(v) ? std::string("not available") : std::isfinite(v) ? fixed(v, 2) : std::string("unbounded");
    };
    rl.add_row({fixed(p.return_period_yr, 0),
                fixed(100.0 * extremes::annual_exceedance_probability_of_period(p.return_period_yr), 3),
                fixed(p.level_m, 2), end(p.lower_m), end(p.upper_m),
                delta_lower_below_shorter_level(fit, i) ? std::string("not shown") : end(d.lower_m), end(d.upper_m)});
    rl.add_csv_row({fixed(p.return_period_yr, 6),
                    fixed(100.0 * extremes::annual_exceedance_probability_of_period(p.return_period_yr), 6),
                    csv_m(p.level_m), csv_m(p.lower_m), csv_m(p.upper_m),
                    delta_lower_below_shorter_level(fit, i) ? std::string() : csv_m(d.lower_m), csv_m(d.upper_m)});
  }
  std::string band_method;
  const report::ReturnLevelPlotInput rlp = return_level_plot_input(fit, &band_method);
  evidence.blocks.emplace_back(rl);
  for (const auto& w : fit.warnings) evidence.blocks.emplace_back(report::Paragraph{"Warning: " + w + "."});
  evidence.blocks.emplace_back(report::Figure{"return_levels",
                                              std::string("Annual maxima at Gringorten plotting positions, the fitted curve "
                                                          "and its 95% ") +
                                                  band_method + " band.",
                                              report::return_level_plot(rlp)});
  evidence.blocks.emplace_back(report::Subheading{"Sea-level projections"});
  for (const auto& run : runs) {
    const auto& t = run.inputs.rise;
    report::FanChartInput fan = fan_chart_input(run.projection, t, run.inputs.rise_zero_year);
    fan.title = "Relative sea-level rise, " + display_name(run.settings);
    const std::string name = "projection_" + file_stem(run.settings.name);
    evidence.blocks.emplace_back(report::Figure{name, "Scenario " + display_name(run.settings) + ": median, 17-83% and 5-95% of " +
                                                          std::to_string(t.member_count()) + " members, with component medians.",
                                                report::projection_fan_chart(fan)});
    report::BulletList notes;
    for (const auto& n : run.projection.cautions) notes.items.push_back(n);
    for (const auto& n : run.inputs.notes) notes.items.push_back(n);
    evidence.blocks.emplace_back(notes);
  }
  evidence.blocks.emplace_back(report::Subheading{"Allowances in detail"});
  evidence.blocks.emplace_back(heights);
  evidence.blocks.emplace_back(report::Figure{"allowances", "Allowance for today's " + fixed(design_rp, 0) +
                                                                "-year level by year, per scenario.",
                                              report::allowance_plot(plot_years, allowance_series)});
  if (c.map.enabled) {
    evidence.blocks.emplace_back(report::Subheading{"Maps"});
    evidence.blocks.emplace_back(map_table);
    double cell = 0.0;
    const auto extent_path = dir / "maps" / "extent.tif";
    if (std::filesystem::exists(extent_path)) {
      auto view = read_raster_for_view(extent_path, cell, -1);
      report::CategoricalMapInput cm;
      cm.title = extent_title;
      cm.raster = view;
      evidence.blocks.emplace_back(report::Figure{"map_extent", "Extent at the highest mapped level (band of extent.tif).",
                                                  report::categorical_map(cm)});
    }
    const auto aep_path = dir / "maps" / "aep.tif";
    if (std::filesystem::exists(aep_path)) {
      report::CategoricalMapInput am;
      am.title = "Annual exceedance probability, present day";
      am.raster = report::aep_classes(read_raster_for_view(aep_path, cell));
      am.categories = report::aep_categories();
      am.legend_title = "Chance of flooding in any year";
      evidence.blocks.emplace_back(report::Figure{
          "map_aep", "Present-day annual exceedance probability per cell (aep.tif band 1), in bands; sea and nodata blank.",
          report::categorical_map(am)});
    }
  }
  doc.sections.push_back(std::move(evidence));

  doc.inputs = report_inputs(c, datum, defence_burn);
  doc.assumptions = {"Still water only: tide plus surge, no waves.",
                     "Storm statistics stay as today's unless a storminess change is given (here: " +
                         fixed(c.planning.storminess_scale_per_yr, 4) + " of the scale per year).",
                     c.local.fingerprints.empty()
                         ? "No fingerprint factors given: every component's global rise is taken locally unchanged "
                           "(factor 1), which ignores regional patterns of sea-level change."
                         : "Fingerprint factors as listed in the inputs; components not listed take 1.",
                     "Vertical land motion " + fixed(c.local.land_motion_mm_per_yr, 2) + " ± " +
                         fixed(c.local.land_motion_sd_mm_per_yr, 2) + " mm/yr (positive = uplift)."};
  if (c.map.enabled && c.map.sea_spread_to_m) {
    doc.assumptions.push_back(
        "Maps: ground the sea reaches at or below " + fixed(*c.map.sea_spread_to_m, 2) + " " +
        level_unit +
        " is today's water (sea), not flooded land: it counts in no flooded area or depth and "
        "has no AEP in the maps.");
  }
  doc.methods = {
      {"Extreme-value fit", "GEV, Gumbel or GPD by maximum likelihood with profile-likelihood intervals",
       "Coles, S. (2001) An Introduction to Statistical Modeling of Extreme Values. Springer."},
      {"Plotting positions", "Gringorten positions of the annual maxima", "Gringorten, I. I. (1963) J. Geophys. Res. 68(3):813."},
      {"Energy balance", "Two-layer model with deep-ocean heat-uptake efficacy",
       "Held et al. (2010) J. Climate 23:2418; Geoffroy et al. (2013) J. Climate 26:1841, 1859."},
      {"Thermal expansion", "Expansion efficiency of heat and TEOS-10 seawater expansion",
       "Kuhlbrodt & Gregory (2012) GRL; IOC, SCOR & IAPSO (2010) TEOS-10; Roquet et al. (2015) Ocean Modelling."},
      {"Allowance", "Height that keeps the expected number of exceedances", "Hunter, J. (2012) Climatic Change 113:239-252."},
      {"Allowance under GEV/GPD", "Numerical allowance depending on return period", "Buchanan et al. (2016) Climatic Change."},
      {"Flood threshold", "Priority-flood from the sea", "Barnes, Lehman & Mulla (2014) Computers & Geosciences 62:117."}};
  if (c.site.invented) doc.extra_cautions.push_back("Every number in this report comes from invented data; it describes no real place.");
  report::write_html(doc, dir / "report.html", false);
  out.files.push_back("report.html");
  std::filesystem::create_directories(dir / "tables");
  std::filesystem::create_directories(dir / "plots");
  for (const auto& p : report::write_tables_csv(doc, dir / "tables", false)) out.files.push_back("tables/" + p.filename().string());
  for (const auto& p : report::write_figures(doc, dir / "plots", false)) out.files.push_back("plots/" + p.filename().string());
  all["cautions"] = report::safety_cautions();
  write_json_file(dir / "results.json", all, false);
  out.files.push_back("results.json");
  {
    std::ifstream in(c.file, std::ios::binary);
    std::ostringstream text;
    text << in.rdbuf();
    write_text_file(dir / "site.toml", text.str(), false);
    out.files.push_back("site.toml");
  }
  clock.end();
  folder.commit();
  out.report = o.out_dir / "report.html";
  for (const auto& run : runs) {
    for (const auto& r : run.allowances) {
      if (r.allowance.first_year == c.planning.design_years.back() && r.allowance.return_period_yr == design_rp) {
        out.headline.push_back("scenario " + display_name(run.settings) + ": " + fixed(design_rp, 0) + "-year still-water level " +
                               fixed(r.allowance.present_level_m, 2) + " m today, design height " +
                               fixed(r.allowance.present_level_m + r.allowance.allowance_m, 2) + " m in " +
                               std::to_string(r.allowance.first_year) + " (m above " + datum + ")");
      }
    }
  }
  return out;
}

}  // namespace tidewright::study
