// The planning stage's levels and rates as layers of a flood map: the same N_t(z) and
// allowances the tables quote (design.md), shared by `tidewright map` and the study.
#pragma once

#include <string>
#include <vector>

#include "tidewright/extremes/still_water_model.hpp"
#include "tidewright/local/rise_ensemble.hpp"
#include "tidewright/planning/future_exceedance.hpp"
#include "tidewright/terrain/flood_map.hpp"

namespace tidewright::study {

// Today's T-year level for each return period, labelled "present day".
void add_present_levels(terrain::MapRequest& m, const extremes::StillWaterModel& present,
                        const std::vector<double>& return_periods_yr);

// The T-year level of each year: today's level plus Hunter's allowance for that year.
void add_future_levels(terrain::MapRequest& m, const extremes::StillWaterModel& present,
                       const local::RiseEnsemble& rise, const planning::StorminessChange& storminess,
                       const std::vector<int>& years, const std::vector<double>& return_periods_yr,
                       const std::string& scenario);

// One AEP band for today, from N_0.
void add_present_aep(terrain::MapRequest& m, const extremes::StillWaterModel& present);

// One AEP band per year, from N_t(z) = E[N_0(z - Delta_t)] over the members.
void add_future_aep(terrain::MapRequest& m, const extremes::StillWaterModel& present, const local::RiseEnsemble& rise,
                    const planning::StorminessChange& storminess, const std::vector<int>& years,
                    const std::string& scenario);

// The first of `years` in which a cell's AEP reaches `aep`.
[[nodiscard]] terrain::FirstYearLayer first_year_layer(const extremes::StillWaterModel& present,
                                                       const local::RiseEnsemble& rise,
                                                       const planning::StorminessChange& storminess,
                                                       const std::vector<int>& years, double aep,
                                                       const std::string& scenario);

// Step of the years a first-year raster is resolved to: one AEP lookup per year, and five
// years is finer than a projection's spread between scenarios (a project choice).
inline constexpr int kFirstYearStepYr = 5;

// Every `step` years across the projection, for the first-year layer.
[[nodiscard]] std::vector<int> projection_years(const local::RiseEnsemble& rise, int step);

}  // namespace tidewright::study
