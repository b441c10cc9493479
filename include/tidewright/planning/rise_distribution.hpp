// Delta_t for one year as the planning core integrates over it: weighted nodes of local
// relative sea-level rise. Either ensemble members (equal weights, each node one whole path
// through the years) or a quadrature rule for a continuous distribution (Gauss-Hermite in
// normal-score space; for a comonotone distribution node k of every year lies on the same
// path, so design-life questions can use it too).
//
// Glossary: delta_i rise of node i (m); w_i its weight (sum 1); s normal score (standard
// normal deviate); mu, sigma mean and standard deviation of a normal Delta (m);
// T_i warming of node i (K), only where a storminess change per kelvin needs it.
#pragma once

#include <Eigen/Dense>
#include <functional>
#include <string>
#include <vector>

namespace tidewright::planning {

struct RiseDistribution {
  std::vector<double> rise_m;     // delta_i
  std::vector<double> weight;     // w_i, sum 1
  std::vector<double> warming_k;  // T_i, empty when not known
  std::string kind;               // "members" or "gauss_hermite" (carried into outputs)

  // Equal-weight members (one per ensemble member, in member order).
  [[nodiscard]] static RiseDistribution members(const Eigen::VectorXd& rise_m,
                                                const Eigen::VectorXd& warming_k = {});
  // Delta = rise_at_score(s) with s standard normal, integrated by an n-point Gauss-Hermite
  // rule (probabilists' weight exp(-s^2/2)); exact for polynomials of degree 2n - 1 in s.
  // rise_at_score must be non-decreasing. Default 20 nodes (our choice, checked in the tests):
  // exact for polynomials of degree 39; E[exp(a s)] to 1e-12 relative up to a = 2 and 4e-12 at
  // a = 3 (a = sigma/lambda in the Gumbel allowance); the
  // outermost nodes lie at s = +-7.62, so that a rise 8 standard deviations out (where a GEV
  // with xi > 0 would meet its lower end point) does not enter through a 1e-13 weight.
  [[nodiscard]] static RiseDistribution normal_score(const std::function<double(double)>& rise_at_score,
                                                     int nodes = 20);
  // Normal Delta ~ N(mu, sigma): normal_score with rise = mu + sigma s.
  [[nodiscard]] static RiseDistribution normal(double mean_m, double sd_m, int nodes = 20);

  [[nodiscard]] std::size_t size() const { return rise_m.size(); }
  [[nodiscard]] double mean_m() const;
  [[nodiscard]] double sd_m() const;
  [[nodiscard]] double min_m() const;
  [[nodiscard]] double max_m() const;
};

// The distribution cut at its p-quantile: the lowest nodes whose weights add up to at most p
// (at least one), weights scaled back to sum 1, kind kept. For a tail sensitivity: how much of
// a figure comes from the top 1 - p of the rise. Throws InputError unless 0 < p <= 1.
[[nodiscard]] RiseDistribution cut_at_quantile(const RiseDistribution& d, double p);

// Standard normal Gauss-Hermite nodes s_k and weights w_k (sum 1) for n points, by the
// Golub & Welsch (1969, Math. Comp. 23:221) eigenvalue method on the Jacobi matrix of the
// probabilists' Hermite polynomials (off-diagonal sqrt(k)).
struct GaussHermiteRule {
  std::vector<double> node;
  std::vector<double> weight;
};
[[nodiscard]] GaussHermiteRule gauss_hermite_rule(int nodes);

}  // namespace tidewright::planning
