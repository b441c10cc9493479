// Glossary: see include/tidewright/planning/rise_distribution.hpp.
#include "tidewright/planning/rise_distribution.hpp"

#include <algorithm>
#include <cmath>
#include <numeric>
#include <vector>

#include "tidewright/common/error.hpp"

namespace tidewright::planning {

GaussHermiteRule gauss_hermite_rule(int nodes) {
  if (nodes < 1 || nodes > 200) {
    throw InputError("Gauss-Hermite nodes", "asked for " + std::to_string(nodes) + " nodes",
                     "use between 1 and 200 nodes");
  }
  const auto n = static_cast<Eigen::Index>(nodes);
  // Jacobi matrix of the monic probabilists' Hermite polynomials: zero diagonal, off-diagonal
  // sqrt(k), k = 1..n-1 (recurrence He_{k+1} = s He_k - k He_{k-1}; Golub & Welsch 1969).
  // Eigen's tridiagonal solver does the eigen decomposition; Boost.Math has no Gauss-Hermite rule.
  Eigen::VectorXd diag = Eigen::VectorXd::Zero(n);
  Eigen::VectorXd sub(std::max<Eigen::Index>(n - 1, 0));
  for (Eigen::Index k = 0; k + 1 < n; ++k) sub(k) = std::sqrt(static_cast<double>(k + 1));
  GaussHermiteRule rule;
  if (n == 1) {
    rule.node = {0.0};
    rule.weight = {1.0};
    return rule;
  }
  Eigen::SelfAdjointEigenSolver<Eigen::MatrixXd> solver;
  solver.computeFromTridiagonal(diag, sub, Eigen::ComputeEigenvectors);
  if (solver.info() != Eigen::Success) {
    throw ComputationError("Gauss-Hermite rule", "the eigen decomposition did not converge",
                           "use fewer nodes");
  }
  rule.node.resize(static_cast<std::size_t>(n));
  rule.weight.resize(static_cast<std::size_t>(n));
  double total = 0.0;
  for (Eigen::Index k = 0; k < n; ++k) {
    // Weight = (first eigenvector component)^2 times the integral of the weight function,
    // which is 1 for the standard normal density (Golub & Welsch 1969, eq. 3.4).
    const double v = solver.eigenvectors()(0, k);
    rule.node[static_cast<std::size_t>(k)] = solver.eigenvalues()(k);
    rule.weight[static_cast<std::size_t>(k)] = v * v;
    total += v * v;
  }
  for (double& w : rule.weight) w /= total;
  // Symmetrise: the rule is symmetric about 0; averaging pairs removes round-off asymmetry.
  for (std::size_t k = 0, m = rule.node.size() - 1; k < m; ++k, --m) {
    const double s = 0.5 * (rule.node[m] - rule.node[k]);
    const double w = 0.5 * (rule.weight[m] + rule.weight[k]);
    rule.node[k] = -s;
    rule.node[m] = s;
    rule.weight[k] = w;
    rule.weight[m] = w;
  }
  if (rule.node.size() % 2 == 1) rule.node[rule.node.size() / 2] = 0.0;
  return rule;
}

RiseDistribution RiseDistribution::members(const Eigen::VectorXd& rise_m, const Eigen::VectorXd& warming_k) {
  if (rise_m.size() == 0) {
    throw InputError("rise ensemble", "has no members", "project with at least one member");
  }
  if (warming_k.size() != 0 && warming_k.size() != rise_m.size()) {
    throw InputError("rise ensemble", "warming has " + std::to_string(warming_k.size()) +
                                          " members but rise has " + std::to_string(rise_m.size()),
                     "give warming for every member or none");
  }
  RiseDistribution d;
  d.kind = "members";
  d.rise_m.assign(rise_m.data(), rise_m.data() + rise_m.size());
  if (!std::all_of(d.rise_m.begin(), d.rise_m.end(), [](double x) { return std::isfinite(x); })) {
    throw InputError("rise ensemble", "holds a value that is not a finite number",
                     "check the projection's members");
  }
  d.weight.assign(d.rise_m.size(), 1.0 / static_cast<double>(d.rise_m.size()));
  if (warming_k.size() != 0) d.warming_k.assign(warming_k.data(), warming_k.data() + warming_k.size());
  return d;
}

RiseDistribution RiseDistribution::normal_score(const std::function<double(double)>& rise_at_score, int nodes) {
  const GaussHermiteRule rule = gauss_hermite_rule(nodes);
  RiseDistribution d;
  d.kind = "gauss_hermite";
  d.weight = rule.weight;
  d.rise_m.reserve(rule.node.size());
  for (double s : rule.node) {
    const double x = rise_at_score(s);
    if (!std::isfinite(x)) {
      throw InputError("rise distribution", "gives a rise that is not finite at normal score " + std::to_string(s),
                       "check the distribution's quantiles");
    }
    d.rise_m.push_back(x);
  }
  return d;
}

RiseDistribution RiseDistribution::normal(double mean_m, double sd_m, int nodes) {
  if (!std::isfinite(mean_m) || !std::isfinite(sd_m) || sd_m < 0.0) {
    throw InputError("normal rise", "mean " + std::to_string(mean_m) + " m, sd " + std::to_string(sd_m) + " m",
                     "give a finite mean and a standard deviation >= 0");
  }
  return normal_score([=](double s) { return mean_m + sd_m * s; }, nodes);
}

double RiseDistribution::mean_m() const {
  return std::inner_product(rise_m.begin(), rise_m.end(), weight.begin(), 0.0);
}

double RiseDistribution::sd_m() const {
  const double m = mean_m();
  double v = 0.0;
  for (std::size_t i = 0; i < rise_m.size(); ++i) v += weight[i] * (rise_m[i] - m) * (rise_m[i] - m);
  // Members: the sample standard deviation with n - 1 (common practice for ensembles).
  if (kind == "members" && rise_m.size() > 1) {
    v *= static_cast<double>(rise_m.size()) / static_cast<double>(rise_m.size() - 1);
  }
  return std::sqrt(v);
}

double RiseDistribution::min_m() const { return *std::min_element(rise_m.begin(), rise_m.end()); }
double RiseDistribution::max_m() const { return *std::max_element(rise_m.begin(), rise_m.end()); }

RiseDistribution cut_at_quantile(const RiseDistribution& d, double p) {
  if (!(p > 0.0 && p <= 1.0)) {
    throw InputError("tail cut", "quantile " + std::to_string(p) + " is not in (0, 1]", "give a quantile such as 0.99");
  }
  std::vector<std::size_t> order(d.size());
  std::iota(order.begin(), order.end(), std::size_t{0});
  std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) { return d.rise_m[a] < d.rise_m[b]; });
  RiseDistribution out;
  out.kind = d.kind;
  double kept = 0.0;
  // The slack absorbs round-off in sums of equal weights (0.99 of 2,000 weights of 1/2,000).
  const double limit = p * (1.0 + 1e-12);
  for (const std::size_t i : order) {
    if (!out.rise_m.empty() && kept + d.weight[i] > limit) break;
    kept += d.weight[i];
    out.rise_m.push_back(d.rise_m[i]);
    out.weight.push_back(d.weight[i]);
    if (!d.warming_k.empty()) out.warming_k.push_back(d.warming_k[i]);
  }
  for (double& w : out.weight) w /= kept;
  return out;
}

}  // namespace tidewright::planning
