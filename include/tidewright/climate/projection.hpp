// The climate stage end to end: a scenario -> a Monte Carlo ensemble of global mean sea-level
// rise by component (ComponentEnsemble), with members kept whole through time.
//
// Each member draws its uncertain parameters once (seeded std::mt19937_64), is spun up from 1850
// on the historical forcing ramp (forcing.hpp), runs the two-layer energy balance through the
// scenario, and turns its warming and ocean heat into the five components. Rise and ocean heat
// are then expressed relative to the member's mean over the reference period (default
// 1995-2014, the IPCC AR6 baseline), warming relative to its 1850-1900 mean (AR6's
// pre-industrial proxy).
//
// Glossary: lambda feedback_w_m2_k, gamma heat_exchange_w_m2_k, eps efficacy, e expansion
// efficiency (m per YJ), f_A Antarctic discharge factor; see energy_balance.hpp, land_ice.hpp.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

#include "tidewright/climate/component_ensemble.hpp"
#include "tidewright/climate/energy_balance.hpp"
#include "tidewright/climate/forcing.hpp"
#include "tidewright/climate/land_ice.hpp"
#include "tidewright/climate/scenario.hpp"

namespace tidewright::climate {

// The feedback that gives AR6's best-estimate ECS of 3 K (WG1 SPM A.4.4, confirmed) under AR6's
// effective forcing of doubled CO2 (3.93 W m-2), the convention of the built-in pathways.
inline constexpr double ar6_best_ecs_k = 3.0;
inline constexpr double ar6_best_feedback_w_m2_k = ar6_co2_doubling_erf_w_m2 / ar6_best_ecs_k;

// A normal distribution truncated to [lower, upper] by redrawing.
struct TruncatedNormal {
  double mean = 0.0;
  double sd = 0.0;
  double lower = 0.0;
  double upper = 0.0;
};

// The ensemble's parameter distributions (docs/methods-climate.md, "Ensemble"); sources:
struct ParameterDistributions {
  // Mean 3.93 W m-2 / 3.0 K: AR6's best-estimate ECS of 3 K (WG1 SPM A.4.4, confirmed) with its
  // effective forcing of doubled CO2, the convention of the built-in pathways; sd 0.30 puts the
  // 17-83 % range of 3.93 / lambda at 2.45-3.9 K, AR6's likely range 2.5-4 K (confirmed).
  TruncatedNormal feedback_w_m2_k{ar6_best_feedback_w_m2_k, 0.30, 0.6, 2.2};
  // Geoffroy et al. (2013) Part II means; spreads from memory of their inter-model spread.
  TruncatedNormal heat_exchange_w_m2_k{0.67, 0.15, 0.3, 1.2};
  TruncatedNormal efficacy{1.28, 0.2, 0.8, 2.0};
  // Kuhlbrodt & Gregory (2012) give 0.11 +- 0.01 m per YJ (secondary); the mean is calibrated to
  // 0.12, one of their sd higher, so that thermal expansion meets AR6 Table 9.9 (docs, section 6).
  TruncatedNormal expansion_efficiency_m_per_yj{0.12, 0.01, 0.07, 0.16};
  // Farinotti et al. (2019): 0.32 +- 0.08 m SLE (confirmed).
  TruncatedNormal glacier_volume_2019_m{0.32, 0.08, 0.12, 0.6};
  // Multipliers of the calibrated rates, their sd calibrated to AR6 Table 9.9's likely ranges for
  // the three comparable SSPs (docs/methods-climate.md, section 6).
  TruncatedNormal glacier_sensitivity_factor{1.0, 0.15, 0.3, 2.0};
  TruncatedNormal greenland_factor{1.0, 0.42, 0.2, 2.5};
  TruncatedNormal antarctic_snowfall_increase_per_k{0.05, 0.015, 0.0, 0.12};  // Frieler et al. (2015), from memory
  // Log-normal f_A, median 1: 0.8 (chosen wide earlier, from memory) meets the Antarctic likely
  // ranges of AR6 Table 9.9 within 0.02 m on all three pathways (checked, docs section 6).
  double antarctic_discharge_log_sd = 0.8;
  // ln f_A is bounded at 2.5 sd (f_A in x0.14..x7.4), a choice: unbounded, the top member of
  // 10,000 lost 3.4 m from Antarctica by 2100 on "midway" with the earlier surface-driven form,
  // an artefact of the log-normal tail.
  double antarctic_discharge_log_bound_sd = 2.5;
  TruncatedNormal land_water_factor{1.0, 0.3, 0.0, 2.5};
};

// One member's parameters; the central member has every distribution at its mean.
struct MemberParameters {
  TwoLayerParameters energy_balance{.feedback_w_m2_k = ar6_best_feedback_w_m2_k};
  double expansion_efficiency_m_per_yj = 0.12;
  GlacierParameters glaciers;
  GreenlandParameters greenland;
  AntarcticParameters antarctica;
  LandWaterParameters land_water;
};

// Which ice-sheet behaviour the ensemble samples. The high-end storyline is a separate,
// labelled variant for deep uncertainty in Antarctic ice loss (the assessment's low-likelihood,
// high-impact range: processes such as marine ice-cliff instability that the likely range leaves
// out), for testing a design's robustness; it is not a likely range and says so in every output.
enum class IceStoryline {
  assessed,      // the likely-range calibration
  high_end_ice,  // Antarctic discharge factor's median raised by high_end_antarctic_multiplier
};
// Calibrated so that the built-in `unchecked` pathway's 95th percentile of global rise is 2.0 m
// in 2100 (2,000 members, default seed), the level that AR6 WG1 SPM B.5.3 says "cannot be ruled
// out" under SSP5-8.5 (approaching 2 m by 2100 and 5 m by 2150, low confidence; confirmed). In
// 2150 its 95th percentile is 4.7 m and its 99th 6.7 m (docs/methods-climate.md, section 6a).
inline constexpr double high_end_antarctic_multiplier = 2.0;
// The label added to the scenario of a high-end ensemble, carried into every output.
inline constexpr const char* high_end_label = "high-end ice-sheet storyline (low likelihood, not a likely range)";

enum class ThermalExpansionRoute {
  efficiency,  // rise = e * ocean heat (Kuhlbrodt & Gregory 2012); e drawn per member
  layered,     // TEOS-10 alpha on each layer's warming (thermal_expansion.hpp)
};

struct ProjectionOptions {
  int first_year = 2020;                     // first output year
  int last_year = 2150;                      // last output year (inside the scenario)
  long long member_count = 1000;             // > 0
  std::uint64_t seed = 20261201;             // DEVELOPERS.md default seed
  YearSpan reference{1995, 2014};            // sea level and ocean heat: AR6 WG1 baseline
  YearSpan warming_reference{1850, 1900};    // surface warming: AR6 pre-industrial proxy
  ThermalExpansionRoute thermal_route = ThermalExpansionRoute::efficiency;
  IceStoryline storyline = IceStoryline::assessed;
  int spinup_start_year = historical_ramp_start_year;  // the ramp starts from equilibrium in 1850
  MemberParameters central;                  // C, C_d and every fixed constant come from here
  ParameterDistributions distributions;
  // How the caller names these options in messages: `project`'s flags by default, the site
  // file's keys in a study.
  struct InputNames {
    std::string members = "--samples";
    std::string years = "--first-year/--last-year";
    std::string reference = "--reference";
  } input_names{};
};

// Throws InputError for a bad option (the option's name as `where`): member_count <= 0, years
// outside the scenario or before the spin-up, a reference outside the run, a forcing scenario that
// starts after 2020 (the historical ramp ends in 2019).
void validate(const Scenario& s, const ProjectionOptions& o);

// The ensemble: years first_year..last_year; components thermal_expansion, glaciers, greenland,
// antarctica, land_water; illustrative and scenario label from the scenario.
[[nodiscard]] ComponentEnsemble project_global_components(const Scenario& s, const ProjectionOptions& o);

// One member, absolute (from the 1850 start state, not referenced), on years spinup..last needed.
struct MemberPath {
  std::vector<int> years;
  std::vector<double> surface_k;
  std::vector<double> deep_k;
  std::vector<double> upper_heat_w_yr_m2;  // C T
  std::vector<double> deep_heat_w_yr_m2;   // C_d T_d
  std::vector<double> toa_imbalance_w_m2;  // N (forcing-driven years; 0 where warming is given)
  std::vector<double> ocean_heat_j;
  std::vector<double> thermal_efficiency_m;
  std::vector<double> thermal_layered_m;
  std::vector<double> glaciers_m;
  std::vector<double> greenland_m;
  std::vector<double> antarctica_m;
  std::vector<double> land_water_m;
};
[[nodiscard]] MemberPath simulate_member(const Scenario& s, const MemberParameters& m, const ProjectionOptions& o);

// Draws the parameters of `count` members from `seed` (the same stream project_global_components uses).
[[nodiscard]] std::vector<MemberParameters> draw_members(const ProjectionOptions& o);

}  // namespace tidewright::climate
