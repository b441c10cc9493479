#include "tidewright/local/rise_ensemble.hpp"

#include <algorithm>

#include "tidewright/common/error.hpp"

namespace tidewright::local {

Eigen::VectorXd RiseEnsemble::rise_in(int year) const {
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
  if (*it == year) return rise_m.col(hi);
  const Eigen::Index lo = hi - 1;
  const double w = static_cast<double>(year - years[static_cast<std::size_t>(lo)]) /
                   static_cast<double>(*it - years[static_cast<std::size_t>(lo)]);
  return (1.0 - w) * rise_m.col(lo) + w * rise_m.col(hi);
}

}  // namespace tidewright::local
