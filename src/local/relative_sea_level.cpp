// Glossary: see include/tidewright/local/relative_sea_level.hpp.
#include "tidewright/local/relative_sea_level.hpp"

#include <algorithm>
#include <cmath>
#include <cctype>

#include "tidewright/common/csv.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/local/normal_scores.hpp"

namespace tidewright::local {
namespace {

void check_finite(double x, const std::string& where, const std::string& what) {
  if (!std::isfinite(x)) throw InputError(where, what + " is not a finite number", "give a finite value");
}

// Linear interpolation of `values` on ascending `years` at `year` (inside the span).
double interpolate(const std::vector<int>& years, const std::vector<double>& values, int year) {
  const auto it = std::lower_bound(years.begin(), years.end(), year);
  const auto hi = static_cast<std::size_t>(it - years.begin());
  if (*it == year) return values[hi];
  const std::size_t lo = hi - 1;
  const double w = static_cast<double>(year - years[lo]) / static_cast<double>(years[hi] - years[lo]);
  return (1.0 - w) * values[lo] + w * values[hi];
}

void check_ocean_dynamic(const OceanDynamicOffset& o, const std::vector<int>& years) {
  const std::string where = "ocean-dynamic offset";
  if (o.mean_m.size() != o.years.size() || o.sd_m.size() != o.years.size()) {
    throw InputError(where, "has " + std::to_string(o.years.size()) + " years but " + std::to_string(o.mean_m.size()) +
                                " means and " + std::to_string(o.sd_m.size()) + " sds",
                     "give a mean and an sd for every year");
  }
  for (std::size_t k = 0; k < o.years.size(); ++k) {
    if (k > 0 && o.years[k] <= o.years[k - 1]) {
      throw InputError(where, "years are not strictly ascending at " + std::to_string(o.years[k]),
                       "sort the years and remove duplicates");
    }
    check_finite(o.mean_m[k], where, "the mean in " + std::to_string(o.years[k]));
    check_finite(o.sd_m[k], where, "the sd in " + std::to_string(o.years[k]));
    if (o.sd_m[k] < 0.0) {
      throw InputError(where, "the sd in " + std::to_string(o.years[k]) + " is negative", "give an sd >= 0");
    }
  }
  if (o.years.front() > years.front() || o.years.back() < years.back()) {
    throw InputError(where, "covers " + std::to_string(o.years.front()) + "-" + std::to_string(o.years.back()) +
                                " but the projection runs " + std::to_string(years.front()) + "-" +
                                std::to_string(years.back()),
                     "give the offset over the whole projected span");
  }
}

// InputError for a projection and local terms that do not fit together.
void check_local_inputs(const climate::ComponentEnsemble& global, const LocalTerms& terms) {
  const Eigen::Index members = global.member_count();
  const auto n_years = static_cast<Eigen::Index>(global.years.size());
  if (members == 0 || n_years == 0) {
    throw InputError("projection", "has no members or no years", "project with at least one member and year");
  }
  if (global.component_names.size() != global.rise_m.size()) {
    throw InputError("projection", "names " + std::to_string(global.component_names.size()) + " components but holds " +
                                       std::to_string(global.rise_m.size()),
                     "give one name per component");
  }
  for (const auto& [name, f] : terms.fingerprint) {
    if (std::find(global.component_names.begin(), global.component_names.end(), name) ==
        global.component_names.end()) {
      std::string have;
      for (const auto& c : global.component_names) have += (have.empty() ? "" : ", ") + c;
      throw InputError("fingerprint " + name, "names no component of the projection (components: " + have + ")",
                       "use one of the component names");
    }
    check_finite(f, "fingerprint " + name, "the factor");
  }
  const auto& lm = terms.land_motion;
  check_finite(lm.uplift_mm_per_yr, "vertical land motion", "the rate");
  check_finite(lm.uplift_sd_mm_per_yr, "vertical land motion", "the sd");
  if (lm.uplift_sd_mm_per_yr < 0.0) {
    throw InputError("vertical land motion", "the sd is negative", "give an sd >= 0");
  }

  if (global.surface_warming_k.size() != 0 &&
      (global.surface_warming_k.rows() != members || global.surface_warming_k.cols() != n_years)) {
    throw InputError("projection warming", "is not members x years like the components",
                     "give warming for every member and year, or none");
  }
}

// Vertical land motion of each member and year (m), counted from the reference period's middle
// (or the stated year); sets out.land_motion_reference_year.
Eigen::MatrixXd land_motion_paths(const climate::ComponentEnsemble& global, const LocalTerms& terms, LocalRise& out) {
  const Eigen::Index members = global.member_count();
  const auto n_years = static_cast<Eigen::Index>(global.years.size());
  const auto& lm = terms.land_motion;
  // Vertical land motion: -v_i (t - t_v)/1000 m, v_i = v + sd_v s_i (mm/yr, uplift positive).
  std::optional<double> t_v = lm.reference_year;
  if (!t_v && global.reference_period) t_v = global.reference_period->middle_year();
  const bool any_land_motion = lm.uplift_mm_per_yr != 0.0 || lm.uplift_sd_mm_per_yr != 0.0;
  if (!t_v) {
    if (any_land_motion) {
      throw InputError("vertical land motion", "the projection's reference '" + global.reference +
                                                   "' gives no year to count land motion from",
                       "state the land-motion reference year");
    }
    t_v = static_cast<double>(global.years.front());
  }
  check_finite(*t_v, "vertical land motion", "the reference year");
  out.land_motion_reference_year = *t_v;
  const std::vector<double> s = lm.uplift_sd_mm_per_yr > 0.0
                                    ? normal_scores(terms.seed, stream_land_motion, static_cast<std::size_t>(members))
                                    : std::vector<double>(static_cast<std::size_t>(members), 0.0);
  Eigen::MatrixXd vlm(members, n_years);
  for (Eigen::Index i = 0; i < members; ++i) {
    const double v = lm.uplift_mm_per_yr + lm.uplift_sd_mm_per_yr * s[static_cast<std::size_t>(i)];
    for (Eigen::Index k = 0; k < n_years; ++k) {
      vlm(i, k) = -v * (static_cast<double>(global.years[static_cast<std::size_t>(k)]) - *t_v) / 1000.0;
    }
  }
  return vlm;
}

}  // namespace

LocalRise local_relative_rise(const climate::ComponentEnsemble& global, const LocalTerms& terms) {
  check_local_inputs(global, terms);
  const Eigen::Index members = global.member_count();
  const auto n_years = static_cast<Eigen::Index>(global.years.size());
  LocalRise out;
  out.total.years = global.years;
  out.total.reference = global.reference;
  out.total.reference_period = global.reference_period;
  out.total.scenario = global.scenario;
  out.total.illustrative = global.illustrative;
  out.total.surface_warming_k = global.surface_warming_k;
  out.total.rise_m = Eigen::MatrixXd::Zero(members, n_years);

  for (std::size_t c = 0; c < global.rise_m.size(); ++c) {
    const std::string& name = global.component_names[c];
    const auto& g = global.rise_m[c];
    if (g.rows() != members || g.cols() != n_years) {
      throw InputError("projection component " + name, "is not members x years like the others",
                       "give every component the same shape");
    }
    double f = 1.0;
    if (const auto it = terms.fingerprint.find(name); it != terms.fingerprint.end()) {
      f = it->second;
    } else {
      out.cautions.push_back("The fingerprint factor for " + name +
                             " defaulted to 1, which ignores the gravitational, rotational and deformational "
                             "pattern of sea-level change; use a site-specific value.");
    }
    out.fingerprint_used[name] = f;
    out.component_names.push_back(name);
    out.contribution_m.push_back(f * g);  // f_c G_c (Mitrovica et al. 2011)
    out.total.rise_m += out.contribution_m.back();
  }

  const Eigen::MatrixXd vlm = land_motion_paths(global, terms, out);
  out.component_names.emplace_back(vertical_land_motion);
  out.contribution_m.push_back(vlm);
  out.total.rise_m += vlm;

  if (!terms.ocean_dynamic.empty()) {
    const auto& o = terms.ocean_dynamic;
    check_ocean_dynamic(o, global.years);
    const std::vector<double> r = normal_scores(terms.seed, stream_ocean_dynamic, static_cast<std::size_t>(members));
    Eigen::MatrixXd od(members, n_years);
    for (Eigen::Index k = 0; k < n_years; ++k) {
      const int year = global.years[static_cast<std::size_t>(k)];
      const double mean = interpolate(o.years, o.mean_m, year);
      const double sd = interpolate(o.years, o.sd_m, year);
      // O_it = m_t + sd_t r_i: one score per member, shared across years (a whole path).
      for (Eigen::Index i = 0; i < members; ++i) od(i, k) = mean + sd * r[static_cast<std::size_t>(i)];
    }
    out.component_names.emplace_back(ocean_dynamic);
    out.contribution_m.push_back(od);
    out.total.rise_m += od;
  }
  return out;
}

}  // namespace tidewright::local
