#include "tidewright/study/planning_stage.hpp"

#include <cmath>
#include <cstdio>
#include <random>

#include "tidewright/common/error.hpp"
#include "tidewright/report/cautions.hpp"

namespace tidewright::study {
namespace {

std::string num(double v, int decimals = 2) {
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.*f", decimals, v);
  return buf;
}

}  // namespace

PlanningInputs join_fit_and_projection(FitSummary fit, local::RiseEnsemble rise,
                                       std::optional<double> epoch_offset_m,
                                       const planning::StorminessChange& storminess,
                                       const std::string& epoch_offset_input) {
  PlanningInputs in;
  in.storminess = storminess;
  if (rise.years.empty() || rise.rise_m.rows() == 0) {
    throw InputError("projection", "holds no members", "give the --members output of 'tidewright project'");
  }
  if (epoch_offset_m) {
    if (!std::isfinite(*epoch_offset_m)) {
      throw InputError(
          epoch_offset_input, "is not a finite number",
          "give the rise from the record's epoch to the projection's reference in metres");
    }
    rise.rise_m.array() += *epoch_offset_m;
    // The rise is now measured from the record's epoch, so label and period say so.
    rise.reference = fit.reference_epoch ? "the record's epoch " + num(*fit.reference_epoch, 1) + " (stated offset)"
                                         : "the record's levels (stated offset)";
    rise.reference_period.reset();
    in.notes.push_back("rise shifted by " + num(*epoch_offset_m, 3) +
                       " m, the stated rise from the record's epoch to the projection's reference");
  } else if (fit.reference_epoch) {
    const double e = *fit.reference_epoch;
    if (e >= rise.years.front() && e <= rise.years.back()) {
      const int year = static_cast<int>(std::lround(e));
      const Eigen::VectorXd at_epoch = rise.rise_in(std::clamp(year, rise.years.front(), rise.years.back()));
      rise.rise_m.colwise() -= at_epoch;
      in.rise_zero_year = std::clamp(year, rise.years.front(), rise.years.back());
      rise.reference = "the record's epoch " + num(e, 1);
      rise.reference_period.reset();
      in.notes.push_back("each member's rise is measured from the record's epoch " + num(e, 1) +
                         " (its rise in " + std::to_string(year) + " subtracted)");
    } else if (rise.reference_period && rise.reference_period->covers_decimal_year(e)) {
      // A mean over years a..b covers decimal years a.0 to (b+1).0; its centre is where the
      // mean of a linear rise is reached, so the rise at the epoch is zero to within the
      // rate times the distance from the centre. 3 mm/yr: between the global rates of 1971-2006
      // (1.9) and 2006-2018 (3.7 mm/yr), IPCC AR6 WG1 SPM A.1.7.
      const climate::YearSpan& p = *rise.reference_period;
      const double centre = p.centre_decimal_year();
      const double off_mm = 3.0 * (e - centre);
      in.notes.push_back(
          "the record's epoch " + num(e, 1) + " lies in the projection's reference period " +
          p.label() + "; the rise at the epoch is taken as zero (the period's centre is " +
          num(centre, 1) + "; at about 3 mm/yr of rise the epoch's own rise is about " +
          num(std::abs(off_mm) < 0.5 ? 0.0 : off_mm, 0) + " mm; state " + epoch_offset_input +
          " to correct it)");
    } else {
      const std::string period =
          rise.reference_period ? rise.reference_period->label() : "none stated";
      throw InputError("projection reference '" + rise.reference + "'",
                       "does not fit the record's epoch " + num(e, 1) +
                           ", which lies neither in the projected years " +
                           std::to_string(rise.years.front()) + "-" +
                           std::to_string(rise.years.back()) + " nor in the reference period (" +
                           period + ")",
                       "project from a first year at or before the epoch, or state the rise from "
                       "the epoch to the reference with " +
                           epoch_offset_input);
    }
  } else {
    in.notes.push_back("the record's levels were not referred to an epoch (no trend removed); they are taken to "
                       "refer to the projection's reference " + rise.reference);
  }
  in.fit = std::move(fit);
  in.rise = std::move(rise);
  return in;
}

std::vector<planning::YearConditions> year_span(const PlanningInputs& in, int first, int last) {
  return planning::conditions_over_years(in.rise, first, last, in.storminess);
}

std::vector<extremes::StillWaterModel> parameter_draws(const FitSummary& fit, int draws, unsigned long long seed) {
  if (draws <= 0) return {};
  if (!fit.covariance || fit.estimates.empty()) {
    throw InputError(fit.source, "holds no covariance, so there is no parameter uncertainty to draw from",
                     "use the JSON of a fit with standard errors, or ask for no parameter range");
  }
  const auto n = static_cast<Eigen::Index>(fit.estimates.size());
  Eigen::VectorXd mean(n);
  for (Eigen::Index i = 0; i < n; ++i) mean(i) = fit.estimates[static_cast<std::size_t>(i)];
  Eigen::LLT<Eigen::MatrixXd> llt(*fit.covariance);
  if (llt.info() != Eigen::Success) {
    throw ComputationError(fit.source, "the fit's covariance is not positive definite",
                           "refit; a covariance that is not positive definite means the fit is not trustworthy");
  }
  const Eigen::MatrixXd l = llt.matrixL();
  std::mt19937_64 rng(seed);
  std::normal_distribution<double> z01;
  std::vector<extremes::StillWaterModel> out;
  int attempts = 0;
  while (static_cast<int>(out.size()) < draws) {
    if (++attempts > 100 * draws) {
      throw ComputationError(fit.source, "parameter draws keep falling outside the parameter space",
                             "the fit is too uncertain for a parameter range; use a longer record");
    }
    Eigen::VectorXd z(n);
    for (Eigen::Index i = 0; i < n; ++i) z(i) = z01(rng);
    const Eigen::VectorXd theta = mean + l * z;
    extremes::StillWaterModel m = fit.model;
    for (std::size_t i = 0; i < fit.parameter_names.size(); ++i) {
      const auto& name = fit.parameter_names[i];
      const double v = theta(static_cast<Eigen::Index>(i));
      if (name == "location") m.location_m = v;
      else if (name == "scale") m.scale_m = v;
      else if (name == "shape") m.shape = v;
    }
    if (!(m.scale_m > 0.0) || m.shape <= -1.0) continue;
    out.push_back(m);
  }
  return out;
}

std::vector<AllowanceRow> allowance_table(const PlanningInputs& in, const std::vector<int>& years,
                                          const std::vector<double>& return_periods_yr, int draws,
                                          unsigned long long seed) {
  for (double t : return_periods_yr) {
    if (!(t > 1.0)) {
      throw InputError("--return-periods", "holds " + num(t, 3) + ", a return period of 1 year or less",
                       "give return periods above 1 year");
    }
  }
  const auto models = parameter_draws(in.fit, draws, seed);
  std::vector<AllowanceRow> rows;
  for (int y : years) {
    const auto cond = planning::conditions_in_year(in.rise, y, in.storminess);
    for (double t : return_periods_yr) {
      AllowanceRow row;
      row.allowance = planning::allowance(in.fit.model, cond, t);
      for (const auto& [p, out] : {std::pair{0.999, &row.cut_at_p999_m}, std::pair{0.99, &row.cut_at_p99_m}}) {
        planning::YearConditions cut = cond;
        cut.rise = planning::cut_at_quantile(cond.rise, p);
        *out = planning::allowance(in.fit.model, cut, t).allowance_m;
      }
      if (!models.empty()) {
        row.range = planning::range_over_parameters(
            in.fit.model, models,
            [&](const extremes::StillWaterModel& m) { return planning::allowance(m, cond, t).allowance_m; });
      }
      rows.push_back(std::move(row));
    }
  }
  return rows;
}

nlohmann::ordered_json planning_context_json(const PlanningInputs& in) {
  nlohmann::ordered_json j;
  j["datum"] = in.fit.datum;
  j["record_epoch"] = in.fit.reference_epoch ? nlohmann::ordered_json(*in.fit.reference_epoch) : nlohmann::ordered_json(nullptr);
  j["projection_reference"] = in.rise.reference;
  j["projection_reference_period"] = reference_period_json(in.rise.reference_period);
  j["scenario"] = in.rise.scenario;
  j["illustrative"] = in.rise.illustrative;
  j["members"] = in.rise.member_count();
  j["present_day_model"] = still_water_model_json(in.fit.model);
  j["storminess"] = {{"location_m_per_yr", in.storminess.location_m_per_yr},
                     {"scale_fraction_per_yr", in.storminess.scale_fraction_per_yr},
                     {"reference_year", in.storminess.reference_year}};
  j["notes"] = in.notes;
  return j;
}

nlohmann::ordered_json monte_carlo_json(const planning::MonteCarloError& e, const std::string& unit) {
  if (!e.sampled) return nullptr;
  nlohmann::ordered_json j;
  j[unit.empty() ? "standard_error" : "standard_error_" + unit] = e.standard_error;
  j["effective_sample_size"] = e.effective_sample_size;
  j["heaviest_member_share"] = e.heaviest_share;
  return j;
}

namespace {
nlohmann::ordered_json finite_or_null(double v) {
  return std::isfinite(v) ? nlohmann::ordered_json(v) : nlohmann::ordered_json(nullptr);
}
}  // namespace

nlohmann::ordered_json amplification_json(const planning::Amplification& a) {
  nlohmann::ordered_json j;
  j["year"] = a.year;
  j["level"] = a.level_m;
  j["present_return_period"] = finite_or_null(a.present_return_period_yr);
  j["present_rate_is_zero"] = a.present_rate_is_zero;
  j["beyond_annual_maxima_range"] = a.beyond_annual_maxima_range;
  j["present_annual_exceedance_probability"] = a.present_aep;
  j["future_annual_exceedance_probability"] = a.future_aep;
  j["future_return_period"] = a.beyond_annual_maxima_range ? nullptr : finite_or_null(a.future_return_period_yr);
  j["future_return_period_below"] =
      a.beyond_annual_maxima_range ? finite_or_null(1.0 / a.rate_lower_bound_per_yr) : nlohmann::ordered_json(nullptr);
  j["amplification_factor"] = a.beyond_annual_maxima_range ? nullptr : finite_or_null(a.amplification_factor);
  j["amplification_factor_above"] =
      a.beyond_annual_maxima_range ? finite_or_null(a.quotable_factor()) : nlohmann::ordered_json(nullptr);
  j["members_beyond_model_range_fraction"] = a.beyond_range_fraction;
  j["monte_carlo"] = monte_carlo_json(a.monte_carlo, "");
  return j;
}

std::string return_period_text(double t_yr) {
  if (!std::isfinite(t_yr)) return "never";
  if (t_yr >= 1e6) return "> 1,000,000";
  return t_yr >= 100 ? num(t_yr, 0) : num(t_yr, 2);
}

AmplificationText amplification_text(const planning::Amplification& a) {
  AmplificationText t;
  const double below = 1.0 / a.rate_lower_bound_per_yr;
  t.future_return_period = !a.beyond_annual_maxima_range ? return_period_text(a.future_return_period_yr)
                           : below <= 1.0                ? "< 1 (more than yearly)"
                                                         : "< " + return_period_text(below);
  t.factor = a.present_rate_is_zero           ? "not finite (level above today's upper end point)"
             : a.beyond_annual_maxima_range   ? "> " + num(a.quotable_factor(), 1)
                                              : num(a.amplification_factor, 1);
  return t;
}

std::vector<std::string> amplification_csv_columns() {
  return {"present_return_period_yr", "future_return_period_yr", "amplification_factor", "beyond_annual_maxima_range",
          "amplification_factor_above", "members_beyond_model_range_fraction"};
}

std::vector<std::string> amplification_csv_cells(const planning::Amplification& a) {
  const auto cell = [](double v) { return std::isfinite(v) ? num(v, 6) : std::string(); };
  const bool beyond = a.beyond_annual_maxima_range;
  return {cell(a.present_return_period_yr),
          beyond ? std::string() : cell(a.future_return_period_yr),
          beyond ? std::string() : cell(a.amplification_factor),
          beyond ? "true" : "false",
          beyond ? cell(a.quotable_factor()) : std::string(),
          num(a.beyond_range_fraction, 6)};
}

nlohmann::ordered_json design_life_risk_json(const planning::DesignLifeRisk& r) {
  nlohmann::ordered_json j;
  j["height_m"] = r.level_m;
  j["probability"] = r.probability;
  j["probability_none"] = r.probability_none;
  j["rounds_to_one"] = r.rounds_to_one;
  j["monte_carlo"] = monte_carlo_json(r.monte_carlo, "");
  j["expected_years_with_exceedance"] = r.expected_years_with_exceedance;
  j["expected_exceedances"] = std::isfinite(r.expected_exceedances) ? nlohmann::ordered_json(r.expected_exceedances)
                                                                    : nlohmann::ordered_json(nullptr);
  j["beyond_model_range_fraction"] = r.beyond_range_fraction;
  return j;
}

std::string expected_count_heading(const extremes::StillWaterModel& m) {
  return m.family == extremes::Family::gpd ? "expected exceedances" : "expected years with an exceedance";
}

double expected_count(const extremes::StillWaterModel& m, const planning::DesignLifeRisk& r) {
  return m.family == extremes::Family::gpd ? r.expected_exceedances : r.expected_years_with_exceedance;
}

std::string few_members_warning(const std::string& figure, const planning::MonteCarloError& e,
                                const std::string& members_input) {
  if (!e.few_effective_members()) return "";
  return figure + " rests on about " + num(e.effective_sample_size, 0) + " effective members (fewer than " +
         num(planning::min_effective_sample_size, 0) + "; the heaviest carries " + num(100.0 * e.heaviest_share, 0) +
         " % of the weight): its Monte Carlo error is " + num(e.standard_error, 3) +
         "; more members (" + members_input + ") settle it";
}

nlohmann::ordered_json allowance_json(const PlanningInputs& in, const std::vector<AllowanceRow>& rows,
                                      const std::string& members_input) {
  nlohmann::ordered_json j = planning_context_json(in);
  nlohmann::ordered_json list = nlohmann::ordered_json::array();
  nlohmann::ordered_json warnings = nlohmann::ordered_json::array();
  for (const auto& r : rows) {
    nlohmann::ordered_json a;
    a["year"] = r.allowance.first_year;
    a["return_period"] = r.allowance.return_period_yr;
    a["present_level_m"] = r.allowance.present_level_m;
    a["allowance_m"] = r.allowance.allowance_m;
    a["design_level_m"] = r.allowance.present_level_m + r.allowance.allowance_m;
    a["mean_rise_m"] = r.allowance.mean_rise_m;
    a["sd_rise_m"] = r.allowance.sd_rise_m;
    a["method"] = r.allowance.method;
    a["monte_carlo"] = monte_carlo_json(r.allowance.monte_carlo, "m");
    a["members_beyond_model_range_fraction"] = r.allowance.beyond_range_fraction;
    if (r.allowance.beyond_range_fraction > 0.0) {
      warnings.push_back("in " + std::to_string(r.allowance.first_year) + ", " +
                         num(100.0 * r.allowance.beyond_range_fraction, 1) + " % of the members take today's " +
                         num(r.allowance.return_period_yr, 0) +
                         "-year level below the fitted model's lower end point, so the " +
                         num(r.allowance.return_period_yr, 0) +
                         "-year allowance is set by lifting them back into its range (it can exceed a longer "
                         "return period's); fit peaks over a threshold where frequent levels matter");
    }
    a["tail_sensitivity"] = {{"rise_cut_at_p99_9_m", r.cut_at_p999_m}, {"rise_cut_at_p99_m", r.cut_at_p99_m}};
    const std::string w = few_members_warning(
        "the " + num(r.allowance.return_period_yr, 0) + "-year allowance in " + std::to_string(r.allowance.first_year),
        r.allowance.monte_carlo, members_input);
    if (!w.empty()) warnings.push_back(w);
    if (r.range) {
      a["parameter_range"] = {{"lower_m", r.range->lower}, {"upper_m", r.range->upper},
                              {"coverage", r.range->coverage}, {"draws", r.range->draws_used},
                              {"failed_draws", r.range->draws_failed}, {"label", r.range->label}};
    }
    list.push_back(a);
  }
  j["allowances"] = list;
  j["warnings"] = warnings;
  j["cautions"] = report::safety_cautions();
  return j;
}

}  // namespace tidewright::study
