#include "tidewright/study/site_config.hpp"

#include <algorithm>
#include <cctype>

#include "tidewright/common/csv.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/study/option_names.hpp"
#include "toml_reader.hpp"

namespace tidewright::study {
namespace {

void require(bool ok, const TomlReader& t, std::string_view key, const std::string& what,
             const std::string& hint) {
  if (!ok) throw InputError(t.where(key), what, hint);
}

std::vector<double> positive_periods(TomlReader& t, std::string_view key, std::vector<double> fallback) {
  if (!t.has(key)) return fallback;
  auto v = t.numbers(key);
  require(!v.empty(), t, key, "is empty", "list at least one return period in years");
  for (double p : v) require(p > 1.0, t, key, "holds a return period <= 1 year", "give return periods above 1 year");
  return v;
}

template <typename T>
void sort_unique(std::vector<T>& v) {
  std::sort(v.begin(), v.end());
  v.erase(std::unique(v.begin(), v.end()), v.end());
}

int year_in_range(TomlReader& t, std::string_view key, long long value) {
  require(value >= 1700 && value <= 2500, t, key, "is " + std::to_string(value) + ", not a plausible year",
          "give a year between 1700 and 2500");
  return static_cast<int>(value);
}

// A value in the command line's spelling (option_names.hpp). The site file's older spelling,
// with '_' where the command line writes '-', is still read, with a note in `notes`.
template <typename E>
E named_value(TomlReader& t, std::string_view key, const NameTable<E>& names, E fallback,
              std::vector<std::string>& notes) {
  const auto text = t.optional_string(key);
  if (!text) return fallback;
  std::string dashed = *text;
  std::replace(dashed.begin(), dashed.end(), '_', '-');
  if (dashed != *text) {
    for (const auto& entry : names) {
      if (entry.first == dashed) {
        std::string note = t.where(key);
        note.append(": '").append(*text).append("' is the older spelling of '").append(dashed);
        note.append("', still read; write '").append(dashed).append("'");
        notes.push_back(std::move(note));
        return entry.second;
      }
    }
  }
  return value_named(names, *text, t.where(key));
}

void read_site(TomlReader& root, SiteConfig& c) {
  auto site = root.table("site");
  if (!site) throw InputError(location(c.file.string()) + ": site", "required table is missing", "add a [site] table");
  c.site.name = site->string("name");
  c.site.datum = site->string("water_level_datum");
  c.site.crs = site->optional_string("crs").value_or("");
  c.site.x = site->optional_number("x").value_or(0.0);
  c.site.y = site->optional_number("y").value_or(0.0);
  c.site.invented = site->optional_boolean("invented").value_or(false);
  site->finish();
}

void read_record(TomlReader& root, SiteConfig& c) {
  auto rec = root.table("record");
  if (!rec) throw InputError(location(c.file.string()) + ": record", "required table is missing", "add a [record] table");
  auto& f = c.fit;
  auto& read = f.read;
  f.input = rec->path("path");
  f.kind = named_value(*rec, "kind", record_kind_names(), RecordKind::series, c.notes);
  if (f.kind == RecordKind::detect) {
    throw InputError(rec->where("kind"), "is 'detect', which a site file does not take",
                     "write kind = \"series\" or \"annual-maxima\"");
  }
  read.time_column = rec->optional_string("time_column").value_or(read.time_column);
  read.year_column = rec->optional_string("year_column").value_or(read.year_column);
  read.level_column = rec->optional_string("level_column").value_or(read.level_column);
  read.unit = rec->choice("units", {"m", "cm", "mm", "ft"}, "m");
  for (const auto& m : rec->strings("missing_markers")) read.missing.markers.push_back(m);
  read.r_largest_columns = rec->strings("r_largest_columns");
  f.r_columns_input = "record.r_largest_columns";
  read.missing.sentinels = rec->numbers("sentinels");
  read.accept_implausible_levels = rec->optional_boolean("accept_implausible_levels").value_or(false);
  if (auto v = rec->optional_number("min_completeness")) {
    require(*v > 0.0 && *v <= 1.0, *rec, "min_completeness", "must lie in (0, 1]", "give a fraction such as 0.75");
    f.series.min_completeness = *v;
  }
  if (auto v = rec->optional_integer("year_start_month")) {
    require(*v >= 1 && *v <= 12, *rec, "year_start_month", "must be 1 to 12", "give a month number");
    f.series.year_start_month = static_cast<int>(*v);
  }
  f.detrend_given = rec->has("detrend");
  f.series.detrend = named_value(*rec, "detrend", detrend_names(), record::DetrendMethod::linear, c.notes);
  f.series.epoch_yr = rec->optional_number("reference_epoch");
  f.detrend_input = field_location(c.file.string(), "record.detrend");
  f.epoch_input = field_location(c.file.string(), "record.reference_epoch");
  rec->finish();
}

void read_extremes(TomlReader& root, SiteConfig& c) {
  auto& f = c.fit;
  f.r_largest = 3;
  f.series.threshold_quantile = record::default_threshold_quantile;
  auto ext = root.table("extremes");
  if (!ext) return;
  f.model = ext->choice("model", {"gumbel", "gev", "gpd", "rlargest", "auto"}, "gev");
  f.model_input = field_location(c.file.string(), "extremes.model");
  f.gev_choice = "extremes.model = \"gev\"";
  f.return_periods_yr = positive_periods(*ext, "return_periods", f.return_periods_yr);
  if (auto q = ext->optional_number("threshold_quantile")) {
    require(*q > 0.5 && *q < 1.0, *ext, "threshold_quantile", "must lie in (0.5, 1)", "give e.g. 0.997");
    f.series.threshold_quantile = *q;
  }
  f.series.threshold_m = ext->optional_number("threshold_m");
  if (f.series.threshold_m) f.series.threshold_quantile.reset();  // the level overrides the quantile
  if (auto h = ext->optional_number("declustering_hours")) {
    require(*h > 0.0, *ext, "declustering_hours", "must be positive", "give hours, e.g. 72");
    f.series.separation_h = *h;
  }
  if (auto r = ext->optional_integer("r_largest")) {
    require(*r >= 1 && *r <= 20, *ext, "r_largest", "must be 1 to 20", "give e.g. 3");
    f.r_largest = static_cast<std::size_t>(*r);
  }
  if (auto b = ext->optional_integer("bootstrap_samples")) {
    require(*b >= 0 && *b <= 100000, *ext, "bootstrap_samples", "must be 0 to 100000", "give e.g. 1000");
    f.bootstrap_samples = static_cast<std::size_t>(*b);
  }
  ext->finish();
}

void read_scenarios(TomlReader& root, SiteConfig& c) {
  for (auto& sc : root.array_of_tables("scenario")) {
    ScenarioSettings s;
    s.name = sc.string("name");
    const auto same_files = [&](const ScenarioSettings& earlier) {
      return iequals(scenario_file_stem(earlier.name), scenario_file_stem(s.name));
    };
    const auto earlier = std::find_if(c.scenarios.begin(), c.scenarios.end(), same_files);
    require(earlier == c.scenarios.end(), sc, "name",
            earlier == c.scenarios.end() || earlier->name == s.name
                ? "repeats the name '" + s.name + "' of an earlier [[scenario]]"
                : "'" + s.name + "' gives the same file names as the earlier [[scenario]] '" + earlier->name + "'",
            "give each scenario its own name: its tables and figures are written under it");
    s.source = named_value(sc, "source", scenario_source_names(), ScenarioSource::pathway, c.notes);
    s.storyline = named_value(sc, "storyline", storyline_names(), climate::IceStoryline::assessed, c.notes);
    if (s.source == ScenarioSource::pathway) s.pathway = sc.string("pathway");
    else s.path = sc.path("path");
    sc.finish();
    c.scenarios.push_back(std::move(s));
  }
  if (c.scenarios.empty()) {
    throw InputError(location(c.file.string()) + ": scenario", "no [[scenario]] is given",
                     "add at least one [[scenario]] table");
  }
}

void read_projection(TomlReader& root, SiteConfig& c) {
  auto pr = root.table("projection");
  if (!pr) return;
  if (auto m = pr->optional_integer("members")) {
    require(*m >= 10 && *m <= 200000, *pr, "members", "must be 10 to 200000", "give e.g. 2000");
    c.projection.members = static_cast<int>(*m);
  }
  if (auto y = pr->optional_integer("start_year")) c.projection.start_year = year_in_range(*pr, "start_year", *y);
  if (auto y = pr->optional_integer("end_year")) c.projection.end_year = year_in_range(*pr, "end_year", *y);
  require(c.projection.end_year > c.projection.start_year, *pr, "end_year", "is not after start_year",
          "give an end year after the start year");
  c.projection.reference = pr->optional_string("reference").value_or(c.projection.reference);
  c.projection.accept_extreme = pr->optional_boolean("accept_extreme").value_or(false);
  pr->finish();
}

void read_local(TomlReader& root, SiteConfig& c) {
  auto lo = root.table("local");
  if (!lo) return;
  if (auto fp = lo->table("fingerprints")) {
    for (const auto& k : fp->keys()) {
      static const std::vector<std::string> known{"thermal_expansion", "glaciers", "greenland", "antarctica",
                                                  "land_water"};
      if (std::find(known.begin(), known.end(), k) == known.end()) {
        throw InputError(fp->where(k), "unknown component",
                         "use thermal_expansion, glaciers, greenland, antarctica or land_water");
      }
      c.local.fingerprints[k] = fp->number(k);
    }
    fp->finish();
  }
  c.local.land_motion_mm_per_yr = lo->optional_number("land_motion_mm_per_yr").value_or(0.0);
  c.local.land_motion_sd_mm_per_yr = lo->optional_number("land_motion_sd_mm_per_yr").value_or(0.0);
  require(c.local.land_motion_sd_mm_per_yr >= 0.0, *lo, "land_motion_sd_mm_per_yr", "is negative", "give a standard deviation >= 0");
  c.local.ocean_dynamic_offset_m = lo->optional_number("ocean_dynamic_offset_m").value_or(0.0);
  c.local.ocean_dynamic_sd_m = lo->optional_number("ocean_dynamic_sd_m").value_or(0.0);
  require(c.local.ocean_dynamic_sd_m >= 0.0, *lo, "ocean_dynamic_sd_m", "is negative", "give a standard deviation >= 0");
  if (auto y = lo->optional_integer("ocean_dynamic_year")) c.local.ocean_dynamic_year = year_in_range(*lo, "ocean_dynamic_year", *y);
  const bool offset_given = c.local.ocean_dynamic_offset_m != 0.0 || c.local.ocean_dynamic_sd_m != 0.0;
  require(!offset_given || c.local.ocean_dynamic_year > c.projection.start_year, *lo, "ocean_dynamic_year",
          "is not after projection.start_year, so the offset's ramp has no length", "give a later year, e.g. 2100");
  lo->finish();
}

void read_planning(TomlReader& root, SiteConfig& c) {
  auto pl = root.table("planning");
  if (!pl) return;
  if (pl->has("design_years")) {
    c.planning.design_years.clear();
    for (long long y : pl->integers("design_years")) c.planning.design_years.push_back(year_in_range(*pl, "design_years", y));
    require(!c.planning.design_years.empty(), *pl, "design_years", "is empty", "list at least one year");
  }
  c.planning.return_periods_yr = positive_periods(*pl, "return_periods", c.planning.return_periods_yr);
  // Ascending and once each, so that tables run in order and the last (the design year and
  // return period of the headline and figures) is the largest, however the file lists them.
  sort_unique(c.planning.design_years);
  sort_unique(c.planning.return_periods_yr);
  if (pl->has("design_life")) {
    const auto span = pl->integers("design_life");
    require(span.size() == 2, *pl, "design_life", "must be [first_year, last_year]", "give two years");
    c.planning.design_life_start = year_in_range(*pl, "design_life", span[0]);
    c.planning.design_life_end = year_in_range(*pl, "design_life", span[1]);
    require(span[1] > span[0], *pl, "design_life", "ends before it starts", "give [first_year, last_year]");
  }
  if (auto r = pl->optional_number("target_risk")) {
    require(*r > 0.0 && *r < 1.0, *pl, "target_risk", "must lie in (0, 1)", "give a probability such as 0.1");
    c.planning.target_risk = *r;
  }
  c.planning.levels_of_interest_m = pl->numbers("levels_of_interest_m");
  c.planning.storminess_scale_per_yr = pl->optional_number("storminess_scale_per_yr").value_or(0.0);
  c.planning.epoch_offset_m = pl->optional_number("epoch_offset_m");
  pl->finish();
}

void read_map(TomlReader& root, SiteConfig& c) {
  auto mp = root.table("map");
  if (!mp) return;
  c.map.enabled = true;
  c.map.dem = mp->path("dem");
  c.map.dem_offset_m = mp->optional_number("dem_offset_m");
  c.map.same_datum = mp->optional_boolean("same_datum").value_or(false);
  if (!c.map.dem_offset_m && !c.map.same_datum) {
    throw InputError(mp->where("dem"), "the relation between the DEM's datum and the water-level datum is not given",
                     "set map.dem_offset_m, or map.same_datum = true if they are the same");
  }
  c.map.dem_crs = mp->optional_string("dem_crs").value_or("");
  c.map.dem_nodata = mp->optional_number("dem_nodata");
  c.map.z_units = mp->optional_string("z_units").value_or("");
  c.map.z_factor = mp->optional_number("z_factor");
  c.map.sea = mp->optional_path("sea");
  if (mp->has("window")) {
    const auto w = mp->numbers("window");
    require(w.size() == 4, *mp, "window", "must hold four numbers", "give [ULX, ULY, LRX, LRY] in the DEM's CRS");
    c.map.window = std::array<double, 4>{w[0], w[1], w[2], w[3]};
  }
  c.map.sea_layer = mp->optional_string("sea_layer").value_or("");
  c.map.sea_where = mp->optional_string("sea_where").value_or("");
  c.map.sea_spread_to_m = mp->optional_number("sea_spread_to_m");
  c.map.defences = mp->optional_path("defences");
  c.map.crest_attribute = mp->optional_string("crest_attribute").value_or(c.map.crest_attribute);
  if (auto k = mp->optional_integer("connectivity")) {
    require(*k == 4 || *k == 8, *mp, "connectivity", "must be 4 or 8", "give 4 or 8");
    c.map.connectivity = *k == 4 ? terrain::Connectivity::four : terrain::Connectivity::eight;
  }
  c.map.return_periods_yr = positive_periods(*mp, "return_periods", c.map.return_periods_yr);
  if (mp->has("years")) {
    c.map.years.clear();
    for (long long y : mp->integers("years")) c.map.years.push_back(year_in_range(*mp, "years", y));
  }
  if (auto a = mp->optional_number("aep_passing")) {
    require(*a > 0.0 && *a < 1.0, *mp, "aep_passing", "must lie in (0, 1)", "give e.g. 0.01");
    c.map.aep_passing = *a;
  }
  if (auto name = mp->optional_string("first_year_scenario")) {
    std::string names;
    for (const auto& s : c.scenarios) names += (names.empty() ? "" : ", ") + s.name;
    require(std::any_of(c.scenarios.begin(), c.scenarios.end(), [&](const ScenarioSettings& s) { return s.name == *name; }),
            *mp, "first_year_scenario", "names no [[scenario]] ('" + *name + "')", "name one of: " + names);
    c.map.first_year_scenario = *name;
  }
  mp->finish();
}

void read_figures(TomlReader& root, SiteConfig& c) {
  auto fg = root.table("figures");
  if (!fg) return;
  auto& f = c.figures;
  if (auto y = fg->optional_integer("plot_last_year")) f.plot_last_year = year_in_range(*fg, "plot_last_year", *y);
  require(f.plot_last_year > c.projection.start_year, *fg, "plot_last_year", "is not after projection.start_year",
          "give a later year");
  if (auto s = fg->optional_integer("plot_step_yr")) {
    require(*s >= 1 && *s <= 50, *fg, "plot_step_yr", "must be 1 to 50", "give e.g. 5");
    f.plot_step_yr = static_cast<int>(*s);
  }
  if (auto t = fg->optional_number("risk_curve_from_return_period_yr")) {
    require(*t > 1.0, *fg, "risk_curve_from_return_period_yr", "is a return period of 1 year or less",
            "give a return period above 1 year, e.g. 2");
    f.risk_curve_from_return_period_yr = *t;
  }
  if (auto s = fg->optional_number("risk_curve_step_m")) {
    require(*s > 0.0 && *s <= 1.0, *fg, "risk_curve_step_m", "must lie in (0, 1] m", "give e.g. 0.05");
    f.risk_curve_step_m = *s;
  }
  if (auto n = fg->optional_integer("risk_curve_points")) {
    require(*n >= 2 && *n <= 1000, *fg, "risk_curve_points", "must be 2 to 1000", "give e.g. 41");
    f.risk_curve_points = static_cast<int>(*n);
  }
  fg->finish();
}

}  // namespace

SiteConfig load_site_file(const std::filesystem::path& file) {
  const toml::table root_table = parse_toml_file(file);
  TomlReader root(root_table, file, "");
  SiteConfig c;
  c.file = file;
  if (auto s = root.optional_integer("seed")) {
    require(*s >= 0, root, "seed", "is negative", "give a whole number >= 0");
    c.seed = static_cast<unsigned long long>(*s);
  }
  read_site(root, c);
  read_record(root, c);
  c.fit.read.datum = c.site.datum;
  c.fit.seed = c.seed;
  read_extremes(root, c);
  read_scenarios(root, c);
  read_projection(root, c);
  read_local(root, c);
  read_planning(root, c);
  read_map(root, c);
  read_figures(root, c);
  root.finish();
  return c;
}

std::string scenario_file_stem(std::string name) {
  for (auto& ch : name) {
    if (!std::isalnum(static_cast<unsigned char>(ch)) && ch != '_' && ch != '-') ch = '_';
  }
  return name;
}

const ScenarioSettings& first_year_scenario(const SiteConfig& c) {
  for (const auto& s : c.scenarios) {
    if (s.name == c.map.first_year_scenario) return s;
  }
  return c.scenarios.back();
}

std::string path_as_written(const std::filesystem::path& path, const SiteConfig& c) {
  const std::string dir = c.file.parent_path().string();
  std::string text = path.string();
  if (!dir.empty() && text.size() > dir.size() + 1 && text.compare(0, dir.size() + 1, dir + "/") == 0) {
    text.erase(0, dir.size() + 1);
  }
  return text;
}

}  // namespace tidewright::study
