// Glossary: see include/tidewright/local/quantile_table.hpp.
#include "tidewright/local/quantile_table.hpp"

#include <boost/math/distributions/normal.hpp>
#include <cmath>

// Boost 1.74's pchip.hpp calls isnan unqualified without declaring it (fixed in later
// releases); make std::isnan visible in its namespace before including it.
namespace boost::math::interpolators {
using std::isnan;
}
#include <boost/math/interpolators/pchip.hpp>
#include <cstdio>

#include "tidewright/common/csv.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/local/normal_scores.hpp"

namespace tidewright::local {

struct QuantileDistribution::Interior {
  boost::math::interpolators::pchip<std::vector<double>> pchip;
};

namespace {

constexpr std::uint64_t stream_table_innovations = 4;

std::string fmt(double x) {
  char b[32];
  std::snprintf(b, sizeof b, "%g", x);
  return b;
}

// "p5" -> 0.05, "p17.5" -> 0.175; nullopt when the cell is not p<number>.
std::optional<double> probability_of_header(const std::string& cell) {
  if (cell.size() < 2 || (cell[0] != 'p' && cell[0] != 'P')) return std::nullopt;
  const auto percent = parse_finite_double(std::string_view(cell).substr(1));
  if (!percent) return std::nullopt;
  return *percent / 100.0;
}

void check_probabilities(const std::vector<double>& p, const std::string& where) {
  if (p.size() < 2) {
    throw InputError(where, "gives " + std::to_string(p.size()) + " quantile(s)",
                     "give at least two quantiles per year, e.g. p5,p50,p95");
  }
  for (std::size_t k = 0; k < p.size(); ++k) {
    if (!(p[k] > 0.0 && p[k] < 1.0)) {
      throw InputError(where, "probability " + fmt(100 * p[k]) + " % lies outside (0, 100) %",
                       "give quantiles strictly between 0 and 100 %");
    }
    if (k > 0 && p[k] <= p[k - 1]) {
      throw InputError(where, "probabilities are not increasing (" + fmt(100 * p[k - 1]) + " % then " +
                                  fmt(100 * p[k]) + " %)",
                       "order the quantile columns from lowest to highest, without repeats");
    }
  }
}

// Row `values` must be finite and non-decreasing.
void check_row(const double* values, std::size_t n, const std::vector<double>& p, const std::string& where) {
  for (std::size_t k = 0; k < n; ++k) {
    if (!std::isfinite(values[k])) {
      throw InputError(where, "the " + fmt(100 * p[k]) + " % quantile is not a finite number", "give every quantile");
    }
    if (k > 0 && values[k] < values[k - 1]) {
      throw InputError(where, "quantiles are not increasing: " + fmt(100 * p[k]) + " % is " + fmt(values[k]) +
                                  " m, below the " + fmt(100 * p[k - 1]) + " % value " + fmt(values[k - 1]) + " m",
                       "check the row; each quantile must be at least the one before");
    }
  }
}

QuantileTable table_from_csv(const CsvTable& csv);

}  // namespace

QuantileTable parse_quantile_table(std::string_view text, std::string source) {
  return table_from_csv(CsvTable::parse(text, std::move(source)));
}

namespace {
QuantileTable table_from_csv(const CsvTable& csv) {
  const std::string header_where = location(csv.source(), csv.header_line());
  const std::size_t year_col = csv.column("year");
  QuantileTable t;
  t.source = csv.source();
  if (const auto* period = csv.metadata("reference_period")) {
    t.reference_period = climate::parse_year_span(
        period->value, location(csv.source(), period->line) + ": reference_period");
  }
  std::vector<std::size_t> cols;
  for (std::size_t c = 0; c < csv.header().size(); ++c) {
    if (c == year_col) continue;
    const auto p = probability_of_header(csv.header()[c]);
    if (!p) {
      throw InputError(header_where, "column '" + csv.header()[c] + "' is not a quantile column",
                       "name quantile columns p and the percentage, e.g. p5, p50, p95");
    }
    t.probabilities.push_back(*p);
    cols.push_back(c);
  }
  check_probabilities(t.probabilities, header_where);
  if (csv.rows().empty()) throw InputError(header_where, "the table has no rows", "give one row per year");
  t.rise_m.resize(static_cast<Eigen::Index>(csv.rows().size()), static_cast<Eigen::Index>(cols.size()));
  std::vector<double> row_values(cols.size());
  for (std::size_t r = 0; r < csv.rows().size(); ++r) {
    const CsvRow& row = csv.rows()[r];
    const auto year = whole_year(csv.number(row, year_col));
    if (!year) {
      throw InputError(csv.where(row), "the year '" + row.cells[year_col] + "' is not a whole year",
                       "give the year as an integer, e.g. 2100");
    }
    const int y = *year;
    if (!t.years.empty() && y <= t.years.back()) {
      throw InputError(csv.where(row), "year " + std::to_string(y) + " does not come after " +
                                           std::to_string(t.years.back()),
                       "sort the rows by year and remove duplicates");
    }
    t.years.push_back(y);
    for (std::size_t k = 0; k < cols.size(); ++k) {
      const auto v = csv.number(row, cols[k]);
      if (!v) {
        throw InputError(csv.where(row), "the " + fmt(100 * t.probabilities[k]) + " % quantile is missing",
                         "give every quantile in every year");
      }
      row_values[k] = *v;
      t.rise_m(static_cast<Eigen::Index>(r), static_cast<Eigen::Index>(k)) = *v;
    }
    check_row(row_values.data(), row_values.size(), t.probabilities, csv.where(row));
  }
  return t;
}

}  // namespace

QuantileTable read_quantile_table(const std::filesystem::path& path) {
  return table_from_csv(CsvTable::read(path));  // file errors (missing, folder, not UTF-8) named by the reader
}

void validate_quantile_table(const QuantileTable& t, const std::string& where) {
  check_probabilities(t.probabilities, where);
  if (t.years.empty()) throw InputError(where, "has no years", "give at least one year");
  if (t.rise_m.rows() != static_cast<Eigen::Index>(t.years.size()) ||
      t.rise_m.cols() != static_cast<Eigen::Index>(t.probabilities.size())) {
    throw InputError(where, "the rise matrix is not years x quantiles", "give one value per year and quantile");
  }
  for (std::size_t r = 0; r < t.years.size(); ++r) {
    if (r > 0 && t.years[r] <= t.years[r - 1]) {
      throw InputError(where, "year " + std::to_string(t.years[r]) + " does not come after " +
                                  std::to_string(t.years[r - 1]),
                       "sort the years and remove duplicates");
    }
    const Eigen::RowVectorXd row = t.rise_m.row(static_cast<Eigen::Index>(r));
    check_row(row.data(), static_cast<std::size_t>(row.size()), t.probabilities,
              where + ": year " + std::to_string(t.years[r]));
  }
}

QuantileDistribution::QuantileDistribution(std::vector<double> probabilities, std::vector<double> rise_m)
    : probabilities_(std::move(probabilities)), rise_m_(std::move(rise_m)) {
  check_probabilities(probabilities_, "quantile distribution");
  if (rise_m_.size() != probabilities_.size()) {
    throw InputError("quantile distribution", "has " + std::to_string(rise_m_.size()) + " values for " +
                                                  std::to_string(probabilities_.size()) + " probabilities",
                     "give one value per probability");
  }
  check_row(rise_m_.data(), rise_m_.size(), probabilities_, "quantile distribution");
  const boost::math::normal_distribution<double> standard;
  for (double p : probabilities_) scores_.push_back(boost::math::quantile(standard, p));
  const std::size_t n = scores_.size();
  // Tail slopes: the outermost secants in normal-score space (a normal tail beyond them).
  lower_slope_m = (rise_m_[1] - rise_m_[0]) / (scores_[1] - scores_[0]);
  upper_slope_m = (rise_m_[n - 1] - rise_m_[n - 2]) / (scores_[n - 1] - scores_[n - 2]);
  if (n >= 4) {
    // Boost's pchip: monotone (Fritsch & Carlson 1980); its default end derivatives are the
    // end secants, so the interpolant joins the linear tails with a continuous slope.
    interior_ = std::make_shared<const Interior>(
        Interior{boost::math::interpolators::pchip<std::vector<double>>(std::vector<double>(scores_),
                                                                        std::vector<double>(rise_m_))});
  }
}

double QuantileDistribution::rise_at_score(double s) const {
  const std::size_t n = scores_.size();
  if (s <= scores_.front()) return rise_m_.front() + lower_slope_m * (s - scores_.front());
  if (s >= scores_.back()) return rise_m_.back() + upper_slope_m * (s - scores_.back());
  if (interior_) return interior_->pchip(s);
  std::size_t k = 1;
  while (k + 1 < n && scores_[k] < s) ++k;
  const double w = (s - scores_[k - 1]) / (scores_[k] - scores_[k - 1]);
  return (1.0 - w) * rise_m_[k - 1] + w * rise_m_[k];
}

double QuantileDistribution::quantile(double p) const {
  if (!(p > 0.0 && p < 1.0)) {
    throw InputError("probability " + fmt(p), "lies outside (0, 1)", "ask for a probability strictly between 0 and 1");
  }
  return rise_at_score(boost::math::quantile(boost::math::normal_distribution<double>(), p));
}

QuantileDistribution distribution_in_year(const QuantileTable& t, int year) {
  if (t.years.empty() || year < t.years.front() || year > t.years.back()) {
    throw InputError("year " + std::to_string(year),
                     "lies outside the projection table" +
                         (t.years.empty() ? std::string()
                                          : " (" + std::to_string(t.years.front()) + "-" +
                                                std::to_string(t.years.back()) + ")"),
                     "ask for a year inside the table's span");
  }
  const auto it = std::lower_bound(t.years.begin(), t.years.end(), year);
  const auto hi = static_cast<Eigen::Index>(it - t.years.begin());
  Eigen::RowVectorXd row;
  if (*it == year) {
    row = t.rise_m.row(hi);
  } else {
    const Eigen::Index lo = hi - 1;
    const double w = static_cast<double>(year - t.years[static_cast<std::size_t>(lo)]) /
                     static_cast<double>(*it - t.years[static_cast<std::size_t>(lo)]);
    row = (1.0 - w) * t.rise_m.row(lo) + w * t.rise_m.row(hi);
  }
  return {t.probabilities, std::vector<double>(row.data(), row.data() + row.size())};
}

RiseEnsemble sample_quantile_table(const QuantileTable& t, const TableSampling& sampling) {
  validate_quantile_table(t, t.source.empty() ? "projection table" : t.source);
  if (sampling.members <= 0) {
    throw InputError("members", std::to_string(sampling.members) + " members asked for", "ask for at least one member");
  }
  const double rho = sampling.year_to_year_correlation;
  if (!(rho >= 0.0 && rho <= 1.0)) {
    throw InputError("year-to-year correlation", fmt(rho) + " lies outside [0, 1]", "give a correlation from 0 to 1");
  }
  RiseEnsemble e;
  e.years = sampling.years.empty() ? t.years : sampling.years;
  for (std::size_t k = 1; k < e.years.size(); ++k) {
    if (e.years[k] <= e.years[k - 1]) {
      throw InputError("years", "are not strictly ascending at " + std::to_string(e.years[k]), "sort the years");
    }
  }
  e.reference = t.reference;
  e.reference_period = t.reference_period;
  e.scenario = t.source;
  const auto members = static_cast<std::size_t>(sampling.members);
  std::vector<double> s = normal_scores(sampling.seed, stream_table_members, members);
  std::vector<double> innovations;
  e.rise_m.resize(sampling.members, static_cast<Eigen::Index>(e.years.size()));
  for (std::size_t k = 0; k < e.years.size(); ++k) {
    const QuantileDistribution d = distribution_in_year(t, e.years[k]);
    if (k > 0 && rho < 1.0) {
      // AR(1) in the score: s_t = r s_prev + sqrt(1 - r^2) e_t, r = rho^(dt), keeps N(0, 1) marginals.
      const double r = std::pow(rho, static_cast<double>(e.years[k] - e.years[k - 1]));
      innovations = normal_scores(sampling.seed, stream_table_innovations + 16 * static_cast<std::uint64_t>(k), members);
      const double c = std::sqrt(std::max(0.0, 1.0 - r * r));
      for (std::size_t i = 0; i < members; ++i) s[i] = r * s[i] + c * innovations[i];
    }
    for (std::size_t i = 0; i < members; ++i) {
      e.rise_m(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(k)) = d.rise_at_score(s[i]);
    }
  }
  return e;
}

}  // namespace tidewright::local
