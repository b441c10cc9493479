#include "tidewright/record/annual_maxima.hpp"

#include <algorithm>
#include <cmath>
#include <map>

#include "prepared_record.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/record/level_plausibility.hpp"

namespace tidewright::record {
namespace {

using detail::format_number;

// The year of a row: a whole number, not seen before, not before the previous row's year.
class YearCheck {
 public:
  YearCheck(const CsvTable& table, const ReadOptions& options, std::size_t year_col)
      : table_(table), options_(options), year_col_(year_col) {}
  int operator()(const CsvRow& row) {
    const std::string& year_cell = row.cells[year_col_];
    const auto year_value =
        whole_year(options_.missing.is_marker(year_cell) ? std::nullopt : parse_finite_double(year_cell));
    if (!year_value) {
      throw InputError(table_.where(row),
                       "column '" + table_.header()[year_col_] + "' holds '" + year_cell +
                           "', which is not a whole year",
                       "write the year as an integer such as 1987");
    }
    const int year = *year_value;
    if (const auto seen = line_of_year_.find(year); seen != line_of_year_.end()) {
      throw InputError(table_.where(row),
                       "year " + std::to_string(year) + " is given twice (lines " + std::to_string(seen->second) +
                           " and " + std::to_string(row.line) + ")",
                       "give one row per year");
    }
    if (previous_line_ != 0 && year < previous_year_) {
      throw InputError(table_.where(row),
                       "year " + std::to_string(year) + " comes after year " + std::to_string(previous_year_) +
                           " on line " + std::to_string(previous_line_),
                       "sort the rows by year");
    }
    line_of_year_.emplace(year, row.line);
    previous_year_ = year;
    previous_line_ = row.line;
    return year;
  }

 private:
  const CsvTable& table_;
  const ReadOptions& options_;
  std::size_t year_col_;
  std::map<int, std::size_t> line_of_year_;
  int previous_year_ = 0;
  std::size_t previous_line_ = 0;
};

// A row's values in metres, largest first (r-largest columns after the level); missing ones
// only at the end. Counts a missing or sentinel level in `cleaning`.
std::vector<double> row_values(const CsvTable& table, const CsvRow& row, const std::vector<std::size_t>& value_cols,
                               const ReadOptions& options, double to_m, CleaningCounts& cleaning) {
  std::vector<double> values;
  bool gap = false;
  for (std::size_t k = 0; k < value_cols.size(); ++k) {
    const std::size_t col = value_cols[k];
    const std::string& cell = row.cells[col];
    std::optional<double> v;
    if (options.missing.is_marker(cell)) {
      if (k == 0) ++cleaning.missing;
    } else {
      v = table.number(row, col, options.missing);
      if (!v && k == 0) ++cleaning.sentinels;
    }
    if (!v) {
      gap = true;
      continue;
    }
    if (gap) {
      throw InputError(table.where(row), "column '" + table.header()[col] + "' holds a value after a missing one",
                       "give the r largest values of a year from the largest down, missing "
                       "values only at the end of the row");
    }
    const double metres = *v * to_m;
    if (!values.empty() && metres > values.back()) {
      throw InputError(table.where(row),
                       "column '" + table.header()[col] + "' holds " + cell + ", larger than the value before it",
                       "give the r largest values of a year in decreasing order");
    }
    values.push_back(metres);
  }
  return values;
}

AnnualMaxima from_table(const CsvTable& table, const ReadOptions& options) {
  const double to_m = metres_per_unit(options.unit);
  const std::size_t year_col = table.column(options.year_column);
  std::vector<std::size_t> value_cols{table.column(options.level_column)};
  for (const auto& name : options.r_largest_columns) value_cols.push_back(table.column(name));
  const bool r_largest = value_cols.size() > 1;

  AnnualMaxima am;
  am.datum = options.datum;
  am.source = options.recorded_as.empty() ? table.source() : options.recorded_as;
  YearCheck check_year(table, options, year_col);
  std::vector<std::size_t> value_lines;
  for (const auto& row : table.rows()) {
    ++am.cleaning.rows_read;
    const int year = check_year(row);
    std::vector<double> values = row_values(table, row, value_cols, options, to_m, am.cleaning);
    if (values.empty()) {
      am.dropped.push_back({year, 0.0, "no value in the file"});
      continue;
    }
    am.years.push_back(year);
    am.level_m.push_back(values.front());
    value_lines.push_back(row.line);
    if (r_largest) am.r_largest_m.push_back(std::move(values));
  }
  am.cleaning.values_kept = am.level_m.size();
  if (am.level_m.size() < 2) {
    throw InputError(table.source(),
                     "has " + std::to_string(am.level_m.size()) + " annual maxima in column '" +
                         options.level_column + "' (" + std::to_string(am.dropped.size()) +
                         " years without a value): too few values",
                     "give at least 2 years (an extreme-value fit needs " +
                         std::to_string(minimum_maxima_gumbel) + " or more)");
  }
  check_level_plausibility(am.level_m, value_lines, table.source(), options);
  const auto [lo, hi] = std::minmax_element(am.level_m.begin(), am.level_m.end());
  if (*lo == *hi) {
    throw InputError(table.source(),
                     "all " + std::to_string(am.level_m.size()) + " annual maxima equal " +
                         format_number(*lo, "%.6g") + " m: the data are constant",
                     "check the level column, its missing-value markers and sentinels");
  }
  return am;
}

}  // namespace

std::string AnnualMaxima::summary() const {
  std::string out = source + ": " + std::to_string(size()) + " annual maxima";
  if (!years.empty()) {
    out += " " + std::to_string(years.front()) + "-" + std::to_string(years.back());
  }
  if (year_start_month != 1) {
    out += " (years start in month " + std::to_string(year_start_month) +
           ", labelled by the year they start in)";
  }
  if (!r_largest_m.empty()) {
    std::size_t values = 0;
    for (const auto& r : r_largest_m) values += r.size();
    out += ", " + std::to_string(values) + " r-largest values";
  }
  out += "; datum: " + (datum.empty() ? std::string("not stated") : datum) + "\n";
  out += "  " + std::to_string(cleaning.rows_read) + " rows read, " +
         std::to_string(cleaning.missing) + " missing, " + std::to_string(cleaning.sentinels) +
         " sentinels\n";
  if (sampling_interval_s > 0.0) {
    out += detail::completeness_line(min_completeness, sampling_interval_s);
  }
  out += detail::dropped_and_trend_lines(dropped, detrend);
  return out;
}

AnnualMaxima read_annual_maxima(const std::filesystem::path& path, const ReadOptions& options) {
  (void)metres_per_unit(options.unit);
  return from_table(CsvTable::read(path, options.csv), options);
}

AnnualMaxima parse_annual_maxima(std::string_view text, std::string source,
                                 const ReadOptions& options) {
  (void)metres_per_unit(options.unit);
  return from_table(CsvTable::parse(text, std::move(source), options.csv), options);
}

std::size_t minimum_maxima(std::string_view model) {
  if (model == "gumbel") return minimum_maxima_gumbel;
  if (model == "gev" || model == "rlargest") return minimum_maxima_gev;
  if (model == "gpd") return minimum_exceedances_gpd;
  throw InputError("model", "'" + std::string(model) + "' is not a model tidewright fits",
                   "use gumbel, gev, rlargest or gpd");
}

void require_minimum_maxima(std::size_t n, std::string_view model, std::size_t minimum,
                            std::string_view source) {
  if (n >= minimum) return;
  const bool gpd = model == "gpd";
  const std::string what = gpd ? "declustered exceedances" : "annual maxima";
  throw InputError(std::string(source.empty() ? model : source),
                   std::to_string(n) + " " + what + " are too few for a " + std::string(model) +
                       " fit, which needs at least " + std::to_string(minimum),
                   gpd ? "lower the threshold or give a longer record"
                       : "give a longer record or a model with fewer parameters");
}

}  // namespace tidewright::record
