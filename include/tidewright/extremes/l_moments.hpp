// Sample L-moments and the L-moment (probability-weighted-moment) estimates used as starting
// values for maximum likelihood.
//
// Glossary (Hosking 1990, J. R. Statist. Soc. B 52:105): b_r unbiased sample probability-
// weighted moments; l1, l2, l3 sample L-moments; t3 = l3/l2 L-skewness. Hosking's GEV and GPD
// shape k is -xi in Coles' sign convention used throughout tidewright.
#pragma once

#include <span>

namespace tidewright::extremes {

struct SampleLMoments {
  double l1 = 0.0;
  double l2 = 0.0;
  double t3 = 0.0;
};
// Needs at least 3 values. Hosking (1990) eq. 2.3 (unbiased b_r) and 2.4 (l_r from b_r).
[[nodiscard]] SampleLMoments sample_l_moments(std::span<const double> values);

struct StartValues {
  double location = 0.0;  // mu (0 for the GPD, whose threshold is given)
  double scale = 1.0;
  double shape = 0.0;
};
// Gumbel: sigma = l2/ln 2, mu = l1 - gamma sigma (Hosking 1990, Table 1).
[[nodiscard]] StartValues gumbel_l_moment_estimates(std::span<const double> maxima);
// GEV: Hosking, Wallis & Wood (1985) Technometrics 27:251, eq. 14-15.
[[nodiscard]] StartValues gev_l_moment_estimates(std::span<const double> maxima);
// GPD of the excesses x - u with known u: xi = 2 - l1/l2, sigma = (1 - xi) l1
// (Hosking & Wallis 1987, Technometrics 29:339, with k = -xi).
[[nodiscard]] StartValues gpd_l_moment_estimates(std::span<const double> excesses);

}  // namespace tidewright::extremes
