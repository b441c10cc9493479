// The climate stage's product: global mean sea-level rise by component, as a Monte Carlo
// ensemble whose members are whole paths through the years. The local stage turns it into
// local relative sea level (local/rise_ensemble.hpp).
#pragma once

#include <Eigen/Dense>
#include <string>
#include <vector>

namespace tidewright::climate {

// Component names used everywhere (JSON keys, fingerprint keys in the site file, plots).
inline constexpr const char* thermal_expansion = "thermal_expansion";
inline constexpr const char* glaciers = "glaciers";
inline constexpr const char* greenland = "greenland";
inline constexpr const char* antarctica = "antarctica";
inline constexpr const char* land_water = "land_water";

struct ComponentEnsemble {
  std::vector<int> years;                   // strictly ascending
  std::vector<std::string> component_names;  // e.g. {thermal_expansion, glaciers, ...}
  std::vector<Eigen::MatrixXd> rise_m;      // one per component: members x years, metres of GMSL
  Eigen::MatrixXd surface_warming_k;        // members x years: global surface temperature anomaly
  Eigen::MatrixXd ocean_heat_content_change_yj;  // members x years: ocean heat gain, 10^24 J
  std::string reference;                    // what rise and warming are measured from
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
