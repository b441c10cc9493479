// Model choice and goodness of fit. Glossary and sources:
// include/tidewright/extremes/diagnostics.hpp.
#include "tidewright/extremes/diagnostics.hpp"

#include <algorithm>
#include <boost/math/distributions/chi_squared.hpp>
#include <cmath>

#include "tidewright/common/error.hpp"
#include "tidewright/extremes/distributions.hpp"

namespace tidewright::extremes {

double aic(const FitResult& fit) {
  // AIC = 2k - 2 l (Akaike 1974, IEEE Trans. Autom. Control 19:716). The GPD's rate is not in
  // its log-likelihood here, so it counts the two GPD parameters only.
  const double k = fit.family == Family::gpd ? 2.0 : static_cast<double>(fit.parameter_count());
  return 2.0 * k - 2.0 * fit.log_likelihood;
}

DevianceTest gumbel_against_gev(const FitResult& gumbel, const FitResult& gev, double alpha) {
  if (gumbel.family != Family::gumbel || gev.family != Family::gev || gumbel.data != gev.data) {
    throw InputError("gumbel_against_gev", "needs a Gumbel and a GEV fit of the same maxima",
                     "fit both models to the same data");
  }
  DevianceTest t;
  t.alpha = alpha;
  // D = 2 (l1 - l0) ~ chi-square_1 under xi = 0 (Coles 2001, sec. 2.6.6, Theorem 2.7).
  t.deviance = std::max(0.0, 2.0 * (gev.log_likelihood - gumbel.log_likelihood));
  t.p_value = boost::math::cdf(boost::math::complement(boost::math::chi_squared(1.0), t.deviance));
  t.aic_gumbel = aic(gumbel);
  t.aic_gev = aic(gev);
  t.chosen = t.p_value < alpha ? Family::gev : Family::gumbel;
  return t;
}

AutoFit fit_annual_maxima_auto(std::span<const double> annual_maxima_m, double alpha) {
  FitResult g = fit_gumbel(annual_maxima_m);
  FitResult e = fit_gev(annual_maxima_m);
  const DevianceTest t = gumbel_against_gev(g, e, alpha);
  return AutoFit{t.chosen == Family::gev ? std::move(e) : std::move(g), t};
}

double fitted_cdf(const FitResult& fit, double level_m) {
  switch (fit.family) {
    case Family::gumbel:
      return cdf(Gumbel(fit.location(), fit.scale()), level_m);
    case Family::gev:
      return cdf(Gev(fit.location(), fit.scale(), fit.shape()), level_m);
    case Family::gpd:
      return cdf(Gpd(fit.threshold_m, fit.scale(), fit.shape()), level_m);
  }
  return 0.0;
}

double fitted_quantile(const FitResult& fit, double p) {
  switch (fit.family) {
    case Family::gumbel:
      return quantile(Gumbel(fit.location(), fit.scale()), p);
    case Family::gev:
      return quantile(Gev(fit.location(), fit.scale(), fit.shape()), p);
    case Family::gpd:
      return quantile(Gpd(fit.threshold_m, fit.scale(), fit.shape()), p);
  }
  return 0.0;
}

namespace {
double fitted_sf(const FitResult& fit, double level_m) {
  switch (fit.family) {
    case Family::gumbel:
      return cdf(complement(Gumbel(fit.location(), fit.scale()), level_m));
    case Family::gev:
      return cdf(complement(Gev(fit.location(), fit.scale(), fit.shape()), level_m));
    case Family::gpd:
      return cdf(complement(Gpd(fit.threshold_m, fit.scale(), fit.shape()), level_m));
  }
  return 1.0;
}
}  // namespace

double anderson_darling(const FitResult& fit) {
  std::vector<double> x = fit.data;
  std::sort(x.begin(), x.end());
  const std::size_t n = x.size();
  const double nd = static_cast<double>(n);
  double sum = 0.0;
  for (std::size_t i = 0; i < n; ++i) {
    // Stephens (1974) eq. 2 with i counted from 1: weight (2i - 1).
    const double w = 2.0 * static_cast<double>(i) + 1.0;
    sum += w * (std::log(fitted_cdf(fit, x[i])) + std::log(fitted_sf(fit, x[n - 1 - i])));
  }
  return -nd - sum / nd;
}

std::vector<PlotPoint> diagnostic_plot_points(const FitResult& fit) {
  std::vector<double> x = fit.data;
  std::sort(x.begin(), x.end());
  const double nd = static_cast<double>(x.size());
  std::vector<PlotPoint> out;
  out.reserve(x.size());
  for (std::size_t i = 0; i < x.size(); ++i) {
    PlotPoint p;
    p.level_m = x[i];
    // Gringorten (1963) JGR 68(3):813: P_i = (i - 0.44)/(n + 0.12), i from 1 for the smallest.
    p.plotting_position = (static_cast<double>(i + 1) - 0.44) / (nd + 0.12);
    p.model_probability = fitted_cdf(fit, x[i]);
    p.model_level_m = fitted_quantile(fit, p.plotting_position);
    // T = 1/N_0 as everywhere (return_levels.hpp): annual maxima N_0 = -log P_i, GPD
    // N_0 = lambda_u (1 - P_i).
    p.return_period_yr = fit.family == Family::gpd ? 1.0 / (fit.rate_per_yr * (1.0 - p.plotting_position))
                                                   : -1.0 / std::log(p.plotting_position);
    out.push_back(p);
  }
  return out;
}

}  // namespace tidewright::extremes
