// The climate stage's product: global mean sea-level rise by component, as a Monte Carlo
// ensemble whose members are whole paths through the years. The local stage turns it into
// local relative sea level (local/rise_ensemble.hpp).
#pragma once

#include <Eigen/Dense>
#include <optional>
#include <string>
#include <vector>

namespace tidewright::climate {

// Component names used everywhere (JSON keys, fingerprint keys in the site file, plots).
inline constexpr const char* thermal_expansion = "thermal_expansion";
inline constexpr const char* glaciers = "glaciers";
inline constexpr const char* greenland = "greenland";
inline constexpr const char* antarctica = "antarctica";
inline constexpr const char* land_water = "land_water";

// A span of whole calendar years; as a reference, the mean over years first..last inclusive,
// which covers decimal years first_year.0 to (last_year + 1).0.
struct YearSpan {
  int first_year = 0;
  int last_year = 0;
  [[nodiscard]] std::string label() const;  // "1995-2014 mean" or "2020"
  [[nodiscard]] std::string text() const;   // "1995-2014" or "2020": what parse_year_span reads
  [[nodiscard]] double middle_year() const {
    return 0.5 * (first_year + last_year);
  }  // 1995-2014 -> 2004.5
  // As decimal years the mean covers first_year.0 to (last_year + 1).0; 1995-2014 -> 2005.0.
  [[nodiscard]] double centre_decimal_year() const { return 0.5 * (first_year + last_year + 1.0); }
  [[nodiscard]] bool covers_decimal_year(double t) const {
    return t >= first_year && t <= last_year + 1.0;
  }
  friend bool operator==(const YearSpan&, const YearSpan&) = default;
};

// "2020" or "1995-2014" as a span of years; InputError at `where` otherwise.
[[nodiscard]] YearSpan parse_year_span(const std::string& text, const std::string& where);

struct ComponentEnsemble {
  std::vector<int> years;                   // strictly ascending
  std::vector<std::string> component_names;  // e.g. {thermal_expansion, glaciers, ...}
  std::vector<Eigen::MatrixXd> rise_m;      // one per component: members x years, metres of GMSL
  Eigen::MatrixXd surface_warming_k;        // members x years: global surface temperature anomaly
  Eigen::MatrixXd ocean_heat_content_change_yj;  // members x years: ocean heat gain, 10^24 J
  std::string reference;                     // what rise and warming are measured from (for people)
  std::optional<YearSpan> reference_period;  // the rise's reference period, structured (for checks)
  std::string scenario;                     // label carried into every output
  bool illustrative = false;                // true for the built-in illustrative pathways
  unsigned long long seed = 0;              // seed that drew the members

  [[nodiscard]] Eigen::Index member_count() const {
    return rise_m.empty() ? 0 : rise_m.front().rows();
  }
  // Sum over components: members x years.
  [[nodiscard]] Eigen::MatrixXd total_m() const {
    Eigen::MatrixXd total = Eigen::MatrixXd::Zero(member_count(), static_cast<Eigen::Index>(years.size()));
    for (const auto& c : rise_m) total += c;
    return total;
  }
};

}  // namespace tidewright::climate
