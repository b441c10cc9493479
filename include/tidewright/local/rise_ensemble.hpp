// Delta_t as the planning stage sees it: members of local relative sea-level rise, each a
// whole path through the years, so that design-life questions keep the year-to-year
// correlation (see docs/methods.md).
#pragma once

#include <Eigen/Dense>
#include <optional>
#include <string>
#include <vector>

#include "tidewright/climate/component_ensemble.hpp"

namespace tidewright::local {

struct RiseEnsemble {
  std::vector<int> years;   // strictly ascending
  Eigen::MatrixXd rise_m;   // members x years: rise since the reference, metres
  std::string reference;    // what the rise is measured from, for people, e.g. "1995-2014 mean"
  // The reference period the rise is zero over on average, for checks against the record's
  // epoch; empty when not known (a quantile table that states none, or an older members file).
  std::optional<climate::YearSpan> reference_period;
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
