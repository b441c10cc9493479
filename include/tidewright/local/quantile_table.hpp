// A published sea-level projection given as year-by-year quantiles (e.g. 5/17/50/83/95 %), a
// continuous distribution per year built from them, and ensemble members sampled from it
// (docs/methods-local.md, "Projection tables").
//
// Distribution: the quantile function x(p) is interpolated in normal-score space, x(s) with
// s = Phi^-1(p), by the monotone piecewise cubic Hermite interpolant (PCHIP, Fritsch & Carlson
// 1980, SIAM J. Numer. Anal. 17:238; Boost.Math's pchip) through (s_k, x_k) when there are 4
// or more quantiles, piecewise linear in s when there are 2 or 3. Tails: beyond the outer
// quantiles x(s) continues linearly in s with the slope of the outermost pair, i.e. a
// normal tail whose spread matches the outer pair (for 5 % and 17 % that slope is
// (x_17 - x_5)/(Phi^-1(0.17) - Phi^-1(0.05))). With only a 17-50-83 table the whole
// distribution is then piecewise normal. Between listed years each quantile is linear in time.
//
// Members: one normal score s_i per member shared by every year (comonotone: member i sits at
// the same quantile in every year, so each member is a whole, smooth path and ranks are kept),
// or, with year_to_year_correlation rho < 1, an AR(1) in the score with correlation rho per
// year between years (rho^(dt) between years dt apart), whose marginals stay standard normal.
//
// Glossary: p probability (0, 1); s normal score; x_k rise at quantile k (m); Phi standard
// normal cdf; rho correlation of scores one year apart.
#pragma once

#include <Eigen/Dense>
#include <cstdint>
#include <filesystem>
#include <memory>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "tidewright/local/rise_ensemble.hpp"

namespace tidewright::local {

struct QuantileTable {
  std::vector<int> years;            // strictly ascending
  std::vector<double> probabilities;  // strictly ascending in (0, 1)
  Eigen::MatrixXd rise_m;            // years x probabilities, non-decreasing along each row
  std::string reference;             // what the rise is measured from (set by the caller)
  // From a "# reference_period: 1995-2014" line before the header; empty when the file states none.
  std::optional<climate::YearSpan> reference_period;
  std::string source;                // file name or label, for messages and outputs
};

// CSV: a header "year,p5,p17,p50,p83,p95" (column 'year' and one column per quantile named p
// and the percentage, in increasing order), one row per year in increasing order, rises in
// metres. Every problem is an InputError at file:line (the header line for bad probabilities).
[[nodiscard]] QuantileTable read_quantile_table(const std::filesystem::path& path);
[[nodiscard]] QuantileTable parse_quantile_table(std::string_view text, std::string source);
// The same checks for a table built in code; `where` names it in messages.
void validate_quantile_table(const QuantileTable& table, const std::string& where);

class QuantileDistribution {
 public:
  // probabilities strictly ascending in (0, 1), at least 2; rise non-decreasing.
  QuantileDistribution(std::vector<double> probabilities, std::vector<double> rise_m);

  [[nodiscard]] double rise_at_score(double score) const;  // x(s)
  [[nodiscard]] double quantile(double probability) const;  // x(Phi^-1(p))
  [[nodiscard]] const std::vector<double>& scores() const { return scores_; }
  [[nodiscard]] const std::vector<double>& rise_m() const { return rise_m_; }

 private:
  std::vector<double> probabilities_;
  std::vector<double> scores_;
  std::vector<double> rise_m_;
  double lower_slope_m = 0.0;
  double upper_slope_m = 0.0;
  struct Interior;  // the PCHIP interpolant (defined in the source file)
  std::shared_ptr<const Interior> interior_;
};

// The distribution in `year` (each quantile linear between table years); InputError outside.
[[nodiscard]] QuantileDistribution distribution_in_year(const QuantileTable& table, int year);

struct TableSampling {
  Eigen::Index members = 10000;        // default: common practice for planning ensembles
  std::uint64_t seed = 20261201;       // the project's default seed (DEVELOPERS.md)
  std::vector<int> years;              // output years; empty = the table's years
  double year_to_year_correlation = 1.0;  // rho in [0, 1]; 1 = comonotone (the default)
};

// Members x years, each member a whole path. InputError for a non-positive member count, a
// correlation outside [0, 1], or a year outside the table.
[[nodiscard]] RiseEnsemble sample_quantile_table(const QuantileTable& table, const TableSampling& sampling = {});

}  // namespace tidewright::local
