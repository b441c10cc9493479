// Global components to local relative sea level, member by member (docs/methods-local.md):
//   R_it = sum_c f_c G_itc  -  v_i (t - t_v)/1000  +  O_it
// with G the global mean rise of component c (climate::ComponentEnsemble), f_c the site's
// fingerprint factor for c (the ratio of local to global sea-level change from the
// gravitational, rotational and deformational response; Mitrovica et al. 2011, Geophys. J.
// Int. 187:729; Slangen et al. 2014, Climatic Change 124:317; citations from memory), v_i = v + sd_v s_i the
// vertical land motion rate in mm/yr (positive = uplift, which lowers relative sea level;
// one normal score s_i per member, constant in time), t_v the year from which land motion is
// counted, and O_it = m_t + sd_t r_i the ocean-dynamic offset (one normal score r_i per member,
// shared across years, so each member's offset is a whole path). Members stay whole: member i
// of the output is member i of the input in every year.
//
// Glossary: i member; t year; c component; f_c fingerprint (dimensionless); v rate (mm/yr);
// m_t, sd_t mean and sd of the ocean-dynamic offset (m); s_i, r_i normal scores.
#pragma once

#include <Eigen/Dense>
#include <cstdint>
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "tidewright/climate/component_ensemble.hpp"
#include "tidewright/local/rise_ensemble.hpp"

namespace tidewright::local {

// Names of the local terms, beside the climate component names (JSON keys, plots).
inline constexpr const char* vertical_land_motion = "vertical_land_motion";
inline constexpr const char* ocean_dynamic = "ocean_dynamic";

struct VerticalLandMotion {
  double uplift_mm_per_yr = 0.0;     // v: positive = uplift (subsidence is negative)
  double uplift_sd_mm_per_yr = 0.0;  // sd_v: one standard deviation, drawn per member
  // t_v: the year from which land motion accumulates. Empty: taken from the projection's
  // reference ("2020" -> 2020, "1995-2014 mean" -> 2004.5, the middle of the period).
  std::optional<double> reference_year;
};

// Mean and sd by year (m), linear between the listed years, which must cover the projection.
struct OceanDynamicOffset {
  std::vector<int> years;
  std::vector<double> mean_m;
  std::vector<double> sd_m;
  [[nodiscard]] bool empty() const { return years.empty(); }
};

struct LocalTerms {
  // f_c by component name; a component without an entry gets 1 and a caution.
  std::map<std::string, double> fingerprint;
  VerticalLandMotion land_motion;
  OceanDynamicOffset ocean_dynamic;  // optional
  std::uint64_t seed = 20261201;     // the project's default seed (DEVELOPERS.md)
};

struct LocalRise {
  RiseEnsemble total;                       // R: local relative rise, with the members' warming
  std::vector<std::string> component_names;  // the climate components, vertical_land_motion, ocean_dynamic (if given)
  std::vector<Eigen::MatrixXd> contribution_m;  // members x years per name: f_c G_c, -v(t - t_v), O
  std::map<std::string, double> fingerprint_used;  // f_c as applied
  double land_motion_reference_year = 0.0;         // t_v as applied
  std::vector<std::string> cautions;               // e.g. fingerprints that defaulted to 1
};

// Throws InputError for a fingerprint naming no component, non-finite terms, a negative sd,
// an ocean-dynamic table that is unsorted or does not cover the years, or or land motion with
// neither a stated reference year nor a reference period to count it from (its middle year).
[[nodiscard]] LocalRise local_relative_rise(const climate::ComponentEnsemble& global, const LocalTerms& terms);

}  // namespace tidewright::local
