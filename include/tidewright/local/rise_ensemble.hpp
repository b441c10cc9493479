// Delta_t as the planning stage sees it: members of local relative sea-level rise, each a
// whole path through the years, so that design-life questions keep the year-to-year
// correlation (see docs/methods.md).
#pragma once

#include <Eigen/Dense>
#include <string>
#include <vector>

namespace tidewright::local {

struct RiseEnsemble {
  std::vector<int> years;   // strictly ascending
  Eigen::MatrixXd rise_m;   // members x years: rise since the reference, metres
  std::string reference;    // what the rise is measured from, e.g. "2020" or "1995-2014 mean"
  std::string scenario;     // label carried into every output
  bool illustrative = false;  // true when the scenario is a built-in illustrative pathway
  // Optional (added by the local stage): members x years global surface warming since the
  // reference (K), carried from climate::ComponentEnsemble so that a storminess change per
  // kelvin can be applied member by member. Empty when not known (e.g. a quantile table).
  Eigen::MatrixXd surface_warming_k;

  [[nodiscard]] Eigen::Index member_count() const { return rise_m.rows(); }
  // Every member's rise in `year`, linear between listed years; throws InputError outside.
  [[nodiscard]] Eigen::VectorXd rise_in(int year) const;
  // Every member's warming in `year`, interpolated as rise_in; empty when none is carried.
  [[nodiscard]] Eigen::VectorXd warming_in(int year) const;
};

}  // namespace tidewright::local
