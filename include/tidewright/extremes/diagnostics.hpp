// Model choice and goodness of fit for the extreme-value fits.
//
// Glossary: D deviance 2 (l_GEV - l_Gumbel); AIC = 2k - 2l (Akaike 1974); A^2 the
// Anderson-Darling statistic; P_i = (i - 0.44)/(n + 0.12) the Gringorten (1963) plotting
// position of the i-th smallest of n values (common practice in coastal work); F the fitted cdf
// (for a GPD fit the cdf of the exceedances above u; for an r-largest fit the GEV of the
// annual maxima).
#pragma once

#include <span>
#include <vector>

#include "tidewright/extremes/fit.hpp"

namespace tidewright::extremes {

[[nodiscard]] double aic(const FitResult& fit);

struct DevianceTest {
  double deviance = 0.0;  // 2 (l_GEV - l_Gumbel)
  double p_value = 1.0;   // 1 - chi-square_1 cdf (Coles 2001, sec. 2.6.6)
  double aic_gumbel = 0.0;
  double aic_gev = 0.0;
  double alpha = 0.05;
  Family chosen = Family::gumbel;  // GEV when p_value < alpha
};
// Deviance (likelihood-ratio) test of Gumbel (xi = 0) within GEV (Coles 2001, sec. 2.6.6, 3.4.1).
[[nodiscard]] DevianceTest gumbel_against_gev(const FitResult& gumbel, const FitResult& gev,
                                              double alpha = 0.05);

struct AutoFit {
  FitResult fit;  // the chosen model's fit
  DevianceTest test;
};
// Fits both and keeps the GEV only when the deviance test rejects the Gumbel at alpha (5%:
// common practice).
[[nodiscard]] AutoFit fit_annual_maxima_auto(std::span<const double> annual_maxima_m,
                                             double alpha = 0.05);

// The fitted cdf and quantile on the scale of the fit's data.
[[nodiscard]] double fitted_cdf(const FitResult& fit, double level_m);
[[nodiscard]] double fitted_quantile(const FitResult& fit, double p);

// A^2 = -n - (1/n) sum_i (2i - 1) [ln F(x_(i)) + ln(1 - F(x_(n+1-i)))] (Anderson & Darling
// 1954; Stephens 1974, JASA 69:730, eq. 2), parameters estimated (no p-value given).
[[nodiscard]] double anderson_darling(const FitResult& fit);

struct PlotPoint {
  double level_m = 0.0;            // x_(i), ascending
  double plotting_position = 0.0;  // P_i (Gringorten 1963)
  double model_probability = 0.0;  // F(x_(i)): probability plot (P_i, F(x_(i)))
  double model_level_m = 0.0;      // F^-1(P_i): quantile plot (F^-1(P_i), x_(i))
  double return_period_yr = 0.0;   // empirical: 1/(1 - P_i) (GPD: 1/(lambda_u (1 - P_i)))
};
[[nodiscard]] std::vector<PlotPoint> diagnostic_plot_points(const FitResult& fit);

}  // namespace tidewright::extremes
