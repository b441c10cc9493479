#include "tidewright/local/rise_ensemble.hpp"

#include <algorithm>

#include "tidewright/common/error.hpp"

namespace tidewright::local {

namespace {

// Column of `values` (members x years) at `year`, linear between listed years.
Eigen::VectorXd column_in_year(const std::vector<int>& years, const Eigen::MatrixXd& values, int year) {
  if (years.empty() || year < years.front() || year > years.back()) {
    throw InputError("year " + std::to_string(year),
                     "lies outside the projection (" +
                         (years.empty() ? std::string("no years")
                                        : std::to_string(years.front()) + "-" + std::to_string(years.back())) +
                         ")",
                     "ask for a year inside the projected span");
  }
  const auto it = std::lower_bound(years.begin(), years.end(), year);
  const auto hi = static_cast<Eigen::Index>(it - years.begin());
  if (*it == year) return values.col(hi);
  const Eigen::Index lo = hi - 1;
  const double w = static_cast<double>(year - years[static_cast<std::size_t>(lo)]) /
                   static_cast<double>(*it - years[static_cast<std::size_t>(lo)]);
  return (1.0 - w) * values.col(lo) + w * values.col(hi);
}

}  // namespace

Eigen::VectorXd RiseEnsemble::rise_in(int year) const { return column_in_year(years, rise_m, year); }

Eigen::VectorXd RiseEnsemble::warming_in(int year) const {
  if (surface_warming_k.size() == 0) return {};
  if (surface_warming_k.rows() != rise_m.rows() || surface_warming_k.cols() != static_cast<Eigen::Index>(years.size())) {
    throw InputError("projection warming", "is not members x years like the rise",
                     "give warming for every member and year, or none");
  }
  return column_in_year(years, surface_warming_k, year);
}

}  // namespace tidewright::local
