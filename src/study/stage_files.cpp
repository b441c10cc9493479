#include "tidewright/study/stage_files.hpp"

#include <charconv>
#include <cmath>
#include <cstdio>
#include <fstream>
#include <sstream>

#include "tidewright/common/atomic_output.hpp"
#include "tidewright/common/csv.hpp"
#include "tidewright/common/error.hpp"

namespace tidewright::study {
namespace {

// Shortest text that reads back to the same double (round trip), for byte-stable files;
// std::to_chars guarantees both, at a fraction of a printf-and-reread loop's cost.
std::string exact(double v) {
  char buf[32];
  const auto r = std::to_chars(buf, buf + sizeof buf, v);
  return {buf, r.ptr};
}

}  // namespace

void write_members_csv(const std::filesystem::path& file, const local::RiseEnsemble& e, bool force) {
  AtomicFile out(file, force, "--members");
  auto& s = out.stream();
  s << "# tidewright members: local relative sea-level rise in metres, one row per member\n";
  s << "# scenario: " << e.scenario << "\n";
  s << "# reference: " << e.reference << "\n";
  if (e.reference_period) s << "# reference_period: " << e.reference_period->text() << "\n";
  s << "# illustrative: " << (e.illustrative ? "true" : "false") << "\n";
  s << "member";
  for (int y : e.years) s << ',' << y;
  s << '\n';
  for (Eigen::Index m = 0; m < e.rise_m.rows(); ++m) {
    s << (m + 1);
    for (Eigen::Index c = 0; c < e.rise_m.cols(); ++c) s << ',' << exact(e.rise_m(m, c));
    s << '\n';
  }
  out.commit();
}

local::RiseEnsemble read_members_csv(const std::filesystem::path& file) {
  std::ifstream in(file, std::ios::binary);
  if (!in) throw InputError(file.string(), "cannot be opened for reading", "check the path");
  std::stringstream buffer;
  buffer << in.rdbuf();
  const CsvTable table = CsvTable::parse(buffer.str(), file.string());
  const auto meta = [&](const std::string& key) {
    const auto* m = table.metadata(key);
    return m ? m->value : std::string();
  };
  local::RiseEnsemble e;
  e.scenario = meta("scenario");
  e.reference = meta("reference");
  e.illustrative = meta("illustrative") == "true";
  if (const auto* period = table.metadata("reference_period")) {
    e.reference_period = climate::parse_year_span(
        period->value, location(file.string(), period->line) + ": reference_period");
  }
  const auto& header = table.header();
  if (header.size() < 2 || header[0] != "member") {
    throw InputError(location(file.string(), table.header_line()),
                     "is not a members file (the header must be member,<year>,<year>,...)",
                     "give the --members output of 'tidewright project'");
  }
  for (std::size_t c = 1; c < header.size(); ++c) {
    const auto y = whole_year(parse_finite_double(header[c]));
    if (!y) {
      throw InputError(location(file.string(), table.header_line()), "column '" + header[c] + "' is not a year",
                       "give whole years as column names");
    }
    if (!e.years.empty() && *y <= e.years.back()) {
      throw InputError(location(file.string(), table.header_line()), "years are not strictly ascending",
                       "sort the year columns");
    }
    e.years.push_back(*y);
  }
  if (table.rows().empty()) {
    throw InputError(file.string(), "holds no members", "give a file with at least one member row");
  }
  e.rise_m.resize(static_cast<Eigen::Index>(table.rows().size()), static_cast<Eigen::Index>(e.years.size()));
  MissingValues none;
  none.markers.clear();
  for (std::size_t r = 0; r < table.rows().size(); ++r) {
    const auto& row = table.rows()[r];
    for (std::size_t c = 1; c < header.size(); ++c) {
      const auto v = table.number(row, c, none);
      if (!v) throw InputError(table.where(row), "an empty value", "every member needs a value in every year");
      e.rise_m(static_cast<Eigen::Index>(r), static_cast<Eigen::Index>(c - 1)) = *v;
    }
  }
  return e;
}

nlohmann::ordered_json reference_period_json(const std::optional<climate::YearSpan>& period) {
  if (!period) return nullptr;
  return {{"first_year", period->first_year}, {"last_year", period->last_year}};
}

nlohmann::ordered_json still_water_model_json(const extremes::StillWaterModel& m) {
  nlohmann::ordered_json j;
  j["family"] = std::string(extremes::family_name(m.family));
  if (m.family != extremes::Family::gpd) j["location_m"] = m.location_m;
  j["scale_m"] = m.scale_m;
  j["shape"] = m.family == extremes::Family::gumbel ? 0.0 : m.shape;
  if (m.family == extremes::Family::gpd) {
    j["threshold_m"] = m.threshold_m;
    j["rate_per_yr"] = m.rate_per_yr;
    j["below_threshold"] = {{"level_m", m.below_threshold.level_m}, {"rate_per_yr", m.below_threshold.rate_per_yr}};
  }
  return j;
}

extremes::StillWaterModel still_water_model_from_json(const nlohmann::json& j,
                                                     const std::function<std::string(const std::string&)>& field) {
  if (!j.is_object()) throw InputError(field("family"), "the model is not a JSON object", "give {\"family\": ...}");
  extremes::StillWaterModel m;
  const std::string family = j.contains("family") && j["family"].is_string() ? j["family"].get<std::string>() : "";
  if (family == "gumbel") m.family = extremes::Family::gumbel;
  else if (family == "gev") m.family = extremes::Family::gev;
  else if (family == "gpd") m.family = extremes::Family::gpd;
  else throw InputError(field("family"), "'" + family + "' is not gumbel, gev or gpd", "name the model family");
  const auto number = [&](const char* key, double fallback, bool required) {
    if (!j.contains(key)) {
      if (required) throw InputError(field(key), "is missing", "add it (docs/file-formats.md)");
      return fallback;
    }
    if (!j[key].is_number() || !std::isfinite(j[key].get<double>())) {
      throw InputError(field(key), "is not a finite number", "give a number");
    }
    return j[key].get<double>();
  };
  const bool gpd = m.family == extremes::Family::gpd;
  m.location_m = number("location_m", 0.0, !gpd);
  m.scale_m = number("scale_m", 1.0, true);
  m.shape = m.family == extremes::Family::gumbel ? 0.0 : number("shape", 0.0, true);
  if (!(m.scale_m > 0.0)) throw InputError(field("scale_m"), "is not above 0", "give the scale in metres (> 0)");
  if (gpd) {
    m.threshold_m = number("threshold_m", 0.0, true);
    m.rate_per_yr = number("rate_per_yr", 1.0, true);
    if (!(m.rate_per_yr > 0.0)) {
      throw InputError(field("rate_per_yr"), "is not above 0", "give the threshold's exceedance rate per year");
    }
    if (j.contains("below_threshold")) {
      const auto& b = j["below_threshold"];
      const auto list = [&](const char* key) {
        if (!b.is_object() || !b.contains(key) || !b[key].is_array()) {
          throw InputError(field(std::string("below_threshold.") + key), "is not a list of numbers",
                           "give the fit's output unchanged");
        }
        std::vector<double> v;
        for (const auto& x : b[key]) {
          if (!x.is_number()) {
            throw InputError(field(std::string("below_threshold.") + key), "holds a value that is not a number",
                             "give the fit's output unchanged");
          }
          v.push_back(x.get<double>());
        }
        return v;
      };
      m.below_threshold.level_m = list("level_m");
      m.below_threshold.rate_per_yr = list("rate_per_yr");
      if (m.below_threshold.level_m.size() != m.below_threshold.rate_per_yr.size()) {
        throw InputError(field("below_threshold"), "lists levels and rates of different lengths",
                         "give the fit's output unchanged");
      }
    }
  }
  return m;
}

FitSummary read_fit_json(const std::filesystem::path& file) {
  std::ifstream in(file, std::ios::binary);
  if (!in) throw InputError(file.string(), "cannot be opened for reading", "check the path");
  nlohmann::json j;
  try {
    j = nlohmann::json::parse(in);
  } catch (const nlohmann::json::exception& e) {
    // parse_error, and out_of_range for numbers beyond double (found by tests/fuzz).
    throw InputError(file.string(), std::string("is not valid JSON (") + e.what() + ")",
                     "give the --json output of 'tidewright fit'");
  }
  const auto field = [&](const char* name) -> std::string { return field_location(file.string(), name); };
  try {
    FitSummary f;
    f.source = file.string();
    if (!j.is_object() || !j.contains("present_day_model")) {
      throw InputError(field("present_day_model"), "is missing", "give the --json output of 'tidewright fit'");
    }
    f.model = still_water_model_from_json(j.at("present_day_model"), [&](const std::string& key) {
      return field_location(file.string(), "present_day_model." + key);
    });
    f.datum = j.value("datum", "");
    if (j.contains("reference_epoch") && j["reference_epoch"].is_number()) {
      f.reference_epoch = j["reference_epoch"].get<double>();
    }
    if (j.contains("parameters") && j["parameters"].is_object()) {
      for (const auto& [k, v] : j["parameters"].items()) {
        f.parameter_names.push_back(k);
        f.estimates.push_back(v.get<double>());
      }
    }
    if (j.contains("covariance") && j["covariance"].is_array()) {
      const auto rows = j["covariance"].get<std::vector<std::vector<double>>>();
      const auto n = static_cast<Eigen::Index>(rows.size());
      Eigen::MatrixXd cov(n, n);
      for (Eigen::Index r = 0; r < n; ++r) {
        if (static_cast<Eigen::Index>(rows[static_cast<std::size_t>(r)].size()) != n) {
          throw InputError(field("covariance"), "is not a square matrix", "give the output of 'tidewright fit'");
        }
        for (Eigen::Index c = 0; c < n; ++c) cov(r, c) = rows[static_cast<std::size_t>(r)][static_cast<std::size_t>(c)];
      }
      f.covariance = cov;
    }
    return f;
  } catch (const nlohmann::json::exception& e) {
    throw InputError(file.string(), std::string("does not have the fields of a fit result (") + e.what() + ")",
                     "give the --json output of 'tidewright fit'");
  }
}

}  // namespace tidewright::study
