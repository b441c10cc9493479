// The present-day extreme still-water model as the later stages see it: a value type that
// gives N_0(z), the expected number of exceedances of level z per year (see docs/methods.md).
// Fitting lives elsewhere in this module; planning and mapping only need this.
//
// Glossary: z level (m above the water-level datum); mu location, sigma scale (m);
// xi shape (Coles 2001 sign convention, xi > 0 heavy tail); u threshold (m);
// lambda_u rate of independent exceedances of u per year.
#pragma once

#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "tidewright/record/empirical_rate_curve.hpp"

namespace tidewright::extremes {

enum class Family {
  gumbel,  // annual maxima, xi = 0
  gev,     // annual maxima (also the result of an r-largest fit)
  gpd,     // peaks over threshold u with Poisson rate lambda_u
};

[[nodiscard]] std::string_view family_name(Family family);

// Empirical annual exceedance rates of declustered peaks at levels below the GPD threshold,
// used where sea-level rise brings a level of interest below u (made by the record module).
using EmpiricalRateCurve = record::EmpiricalRateCurve;

// N_0 at a level with its first two derivatives in z (per yr, per yr per m, per yr per m^2).
struct RateDerivatives {
  double rate = 0.0;
  double first = 0.0;
  double second = 0.0;
};

struct StillWaterModel {
  Family family = Family::gev;
  double location_m = 0.0;  // mu (GEV/Gumbel); unused for GPD
  double scale_m = 1.0;     // sigma (> 0)
  double shape = 0.0;       // xi; 0 for Gumbel
  double threshold_m = 0.0;       // u (GPD only)
  double rate_per_yr = 1.0;       // lambda_u (GPD only)
  EmpiricalRateCurve below_threshold;  // GPD only; may be empty

  // N_0(z). GEV/Gumbel annual maxima: -ln F(z) = [1 + xi (z - mu)/sigma]^(-1/xi)
  // (Coles 2001, eq. 3.2); GPD: lambda_u [1 + xi (z - u)/sigma]^(-1/xi) for z >= u
  // (Coles 2001, eq. 4.13). Returns 0 above a finite upper end point (xi < 0), and +inf
  // below the GEV's lower end point (xi > 0).
  [[nodiscard]] double annual_exceedance_rate(double level_m) const;
  // N_0(z) with dN_0/dz and d2N_0/dz2. With t = 1 + xi (z - m)/sigma and N = c t^(-1/xi)
  // (m = mu, c = 1 for GEV/Gumbel; m = u, c = lambda_u for GPD at z >= u):
  //   dN/dz = -N / (sigma t),   d2N/dz2 = (1 + xi) N / (sigma t)^2
  // (t = 1 for Gumbel). On the log-linear curve below a GPD threshold, ln N has slope b in z:
  // b N and b^2 N, taken from the segment above z at a curve point; 0 below the curve's first
  // point. Beyond an upper end point all three are 0; below a GEV lower end point +inf, -inf, +inf.
  [[nodiscard]] RateDerivatives annual_exceedance_rate_derivatives(double level_m) const;
  // Weighted sums over nodes i of N_0(z - d_i) and, when `derivatives`, of dN_0/dz and
  // d2N_0/dz2 there: sum_i w_i N_0(z - d_i) etc.; nodes with w_i <= 0 are left out (so an
  // infinite rate of a zero-weight node does not enter). The batch form the planning sums use:
  // vectorised exp/log (SIMD: AVX-512, else AVX2 with FMA, chosen at run time where the
  // processor has them; SSE2 otherwise), within about 1e-13 relative of summing
  // annual_exceedance_rate node by node (the tests' bound).
  [[nodiscard]] RateDerivatives weighted_shifted_rates(double level_m, std::span<const double> shift_m,
                                                       std::span<const double> weight, bool derivatives) const;
  // The level z with N_0(z) = rate (the inverse of the above, where it exists).
  [[nodiscard]] double level_for_rate(double rate_per_yr) const;
  // A model whose rate is this one's squared, N'(z) = N_0(z)^2, so that weighted sums of squared
  // rates (Monte Carlo errors) use the same batch kernel: [1 + xi y]^(-2/xi) is the tail of
  // scale sigma/2 and shape xi/2 at y' = 2y (Gumbel: exp(-2y)); a GPD's rate becomes lambda_u^2,
  // and the empirical curve below its threshold, log-linear, squares point by point.
  [[nodiscard]] StillWaterModel squared_rates() const;
};

// The builds of StillWaterModel::weighted_shifted_rates this processor runs, the one it uses
// first: "x86-64-v4" (AVX-512), "x86-64-v3" (AVX2 with FMA), "portable" (or "scalar" where
// the compiler has no vector extension); and the sum in a named build, so that one machine can
// check them all. An unknown build is InputError.
[[nodiscard]] std::vector<std::string_view> rate_sum_builds();
[[nodiscard]] RateDerivatives weighted_shifted_rates_in_build(const StillWaterModel& model, std::string_view build,
                                                              double level_m, std::span<const double> shift_m,
                                                              std::span<const double> weight, bool derivatives);

}  // namespace tidewright::extremes
