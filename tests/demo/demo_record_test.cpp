// The demo generator's tide-gauge record of Quillhaven (invented data) has the statistics its
// design states (demo_coast/README.md): trend, tidal constituents, nodal cycle, surges, gaps and
// faults; and it is deterministic.
#include <gtest/gtest.h>

#include <Eigen/Dense>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <numbers>
#include <string>
#include <vector>

#include "demo_tide_record.hpp"
#include "tidewright/common/csv.hpp"
#include "tidewright/common/error.hpp"

namespace demo = tidewright::demo;
namespace chr = std::chrono;
using demo::RowState;

namespace {

const demo::TideRecord& standard_record() {
  static const demo::TideRecord rec =
      demo::generate_tide_record(demo::TideRecordDesign::standard(), 20261201ULL);
  return rec;
}

std::int64_t unix_s(int y, unsigned m, unsigned d) {
  return chr::duration_cast<chr::seconds>(
             chr::sys_days{chr::year{y} / chr::month{m} / chr::day{d}}.time_since_epoch())
      .count();
}

// Least-squares harmonic analysis (Pugh 1987, §4.2.3): level = a0 + a1·t + Σ_k (c_k cos ω_k t +
// s_k sin ω_k t), solved by normal equations. Amplitude A_k = hypot(c_k, s_k), phase lag g_k =
// atan2(s_k, c_k); standard errors from the residual variance (white-noise formula, which is
// conservative here: the AR(1) residual has less power at the tidal frequencies than white noise).
struct HarmonicFit {
  std::vector<double> amplitude_m;
  std::vector<double> amplitude_se_m;
  std::vector<double> phase_deg;
};

HarmonicFit harmonic_fit(const demo::TideRecord& rec, const std::vector<double>& periods_h,
                         std::int64_t from_s, std::int64_t to_s) {
  const auto n_par = static_cast<Eigen::Index>(2 + 2 * periods_h.size());
  Eigen::MatrixXd xtx = Eigen::MatrixXd::Zero(n_par, n_par);
  Eigen::VectorXd xty = Eigen::VectorXd::Zero(n_par);
  double yty = 0.0;
  std::size_t n = 0;
  const std::int64_t epoch = unix_s(2000, 1, 1);
  Eigen::VectorXd row(n_par);
  for (std::size_t i = 0; i < rec.time_s.size(); ++i) {
    if (rec.state[i] != RowState::value || rec.time_s[i] < from_s || rec.time_s[i] >= to_s)
      continue;
    const double t_h = static_cast<double>(rec.time_s[i] - epoch) / 3600.0;
    row(0) = 1.0;
    row(1) = t_h / 8766.0;
    for (std::size_t k = 0; k < periods_h.size(); ++k) {
      const double w = 2.0 * std::numbers::pi / periods_h[k];
      row(static_cast<Eigen::Index>(2 + 2 * k)) = std::cos(w * t_h);
      row(static_cast<Eigen::Index>(3 + 2 * k)) = std::sin(w * t_h);
    }
    xtx.noalias() += row * row.transpose();
    xty += row * rec.level_m[i];
    yty += rec.level_m[i] * rec.level_m[i];
    ++n;
  }
  const Eigen::LDLT<Eigen::MatrixXd> ldlt(xtx);
  const Eigen::VectorXd beta = ldlt.solve(xty);
  const double rss = yty - 2.0 * beta.dot(xty) + beta.dot(xtx * beta);
  const double sigma2 = rss / static_cast<double>(n - static_cast<std::size_t>(n_par));
  const Eigen::MatrixXd cov = sigma2 * ldlt.solve(Eigen::MatrixXd::Identity(n_par, n_par));
  HarmonicFit fit;
  for (std::size_t k = 0; k < periods_h.size(); ++k) {
    const auto ic = static_cast<Eigen::Index>(2 + 2 * k);
    const double c = beta(ic);
    const double s = beta(ic + 1);
    const double a = std::hypot(c, s);
    // Delta method for A = hypot(c, s).
    const double var =
        (c * c * cov(ic, ic) + s * s * cov(ic + 1, ic + 1) + 2 * c * s * cov(ic, ic + 1)) / (a * a);
    fit.amplitude_m.push_back(a);
    fit.amplitude_se_m.push_back(std::sqrt(var));
    double g = std::atan2(s, c) * 180.0 / std::numbers::pi;
    if (g < 0) g += 360.0;
    fit.phase_deg.push_back(g);
  }
  return fit;
}

std::vector<double> periods_of(const demo::TideRecordDesign& d) {
  std::vector<double> p;
  for (const auto& c : d.constituents) p.push_back(c.period_h);
  return p;
}

struct TrendFit {
  double slope_m_per_yr = 0.0;
  double se_m_per_yr = 0.0;  // OLS standard error inflated for lag-1 autocorrelation
  std::size_t years = 0;
};

// Ordinary least squares of annual means (years at least 90 % complete) on year. The standard
// error is inflated by sqrt((1 + r1)/(1 − r1)), r1 the lag-1 autocorrelation of the residuals
// (the AR(1) variance-inflation factor for a trend slope, e.g. Wilks 2011, Statistical Methods in
// the Atmospheric Sciences, §5.2.4 on effective sample size).
TrendFit annual_mean_trend(const demo::TideRecord& rec) {
  std::vector<double> years;
  std::vector<double> means;
  for (int y = rec.design.first_year; y <= rec.design.last_year; ++y) {
    const std::int64_t a = unix_s(y, 1, 1);
    const std::int64_t b = unix_s(y + 1, 1, 1);
    double sum = 0.0;
    std::size_t n = 0;
    for (std::size_t i = 0; i < rec.time_s.size(); ++i) {
      if (rec.time_s[i] >= a && rec.time_s[i] < b && rec.state[i] == RowState::value) {
        sum += rec.level_m[i];
        ++n;
      }
    }
    if (static_cast<double>(n) >= 0.9 * static_cast<double>(b - a) / 3600.0) {
      years.push_back(y + 0.5);
      means.push_back(sum / static_cast<double>(n));
    }
  }
  const auto m = static_cast<double>(years.size());
  double ybar = 0.0;
  double mbar = 0.0;
  for (std::size_t i = 0; i < years.size(); ++i) {
    ybar += years[i] / m;
    mbar += means[i] / m;
  }
  double sxx = 0.0;
  double sxy = 0.0;
  for (std::size_t i = 0; i < years.size(); ++i) {
    sxx += (years[i] - ybar) * (years[i] - ybar);
    sxy += (years[i] - ybar) * (means[i] - mbar);
  }
  TrendFit t;
  t.slope_m_per_yr = sxy / sxx;
  t.years = years.size();
  std::vector<double> res;
  double rss = 0.0;
  for (std::size_t i = 0; i < years.size(); ++i) {
    res.push_back(means[i] - mbar - t.slope_m_per_yr * (years[i] - ybar));
    rss += res.back() * res.back();
  }
  double lag1 = 0.0;
  for (std::size_t i = 1; i < res.size(); ++i) lag1 += res[i] * res[i - 1];
  const double r1 = std::max(0.0, lag1 / rss);
  t.se_m_per_yr = std::sqrt(rss / (m - 2.0) / sxx) * std::sqrt((1.0 + r1) / (1.0 - r1));
  return t;
}

}  // namespace

TEST(DemoRecord, SameSeedGivesTheSameBytesAndAnotherSeedDoesNot) {
  const auto design = demo::TideRecordDesign::standard_years(2010, 2012);
  const std::string a = demo::tide_record_csv(demo::generate_tide_record(design, 7));
  const std::string b = demo::tide_record_csv(demo::generate_tide_record(design, 7));
  const std::string c = demo::tide_record_csv(demo::generate_tide_record(design, 8));
  EXPECT_EQ(a, b);
  EXPECT_NE(a, c);
  EXPECT_EQ(a.size(), b.size());
}

TEST(DemoRecord, MissingRowsAndFaultsAreAsDesigned) {
  const auto& rec = standard_record();
  // 1975-01-01 to 2025-01-01: 50·365 + 13 leap days = 18,263 days = 438,312 hours.
  EXPECT_EQ(rec.hours_in_span, 438312U);
  // Absent gaps of the design (README table), counted by hand in days:
  // Feb 1978 28, Apr–Oct 1983 214, Nov 1986 30, Jul 1991 31, 1999-01-01..05-15 135,
  // 2011-08-10..2012-02-20 195, Mar 2020 31: 664 days = 15,936 hours.
  EXPECT_EQ(rec.time_s.size(), 438312U - 15936U);
  EXPECT_EQ(rec.count(RowState::na), 20U * 24U + 12U);  // 2005-06-01..20 plus 12 scattered
  EXPECT_EQ(rec.count(RowState::empty), 2U * 24U);      // 2017-10-03..04
  EXPECT_EQ(rec.count(RowState::sentinel), 24U);
  const double missing = 1.0 - static_cast<double>(rec.count(RowState::value)) / 438312.0;
  EXPECT_NEAR(missing, (15936.0 + 492 + 48 + 24) / 438312.0, 1e-12);
  // Times strictly increase by whole hours (the reader refuses duplicated or unsorted times).
  for (std::size_t i = 1; i < rec.time_s.size(); ++i) {
    ASSERT_GT(rec.time_s[i], rec.time_s[i - 1]);
    ASSERT_EQ((rec.time_s[i] - rec.time_s[i - 1]) % 3600, 0);
  }
}

TEST(DemoRecord, CsvReadsThroughTheProjectReaderWithOnlyDocumentedFaults) {
  const auto& rec = standard_record();
  const std::string text = demo::tide_record_csv(rec);
  ASSERT_NE(text.find("INVENTED DATA"), std::string::npos);
  const auto table = tidewright::CsvTable::parse(text, "quillhaven_tide_gauge.csv");
  ASSERT_EQ(table.rows().size(), rec.time_s.size());
  const std::size_t tc = table.column("time");
  const std::size_t lc = table.column("level_m");
  tidewright::MissingValues missing;
  missing.sentinels = {-99.0};
  std::size_t missing_cells = 0;
  for (std::size_t i = 0; i < table.rows().size(); ++i) {
    const auto& row = table.rows()[i];
    // Time: "YYYY-MM-DDTHH:MM:SSZ", parsed here independently of the generator.
    int y = 0;
    unsigned mo = 0;
    unsigned d = 0;
    int h = 0;
    int mi = 0;
    int s = 0;
    char z = 0;
    ASSERT_EQ(std::sscanf(row.cells[tc].c_str(), "%4d-%2u-%2uT%2d:%2d:%2d%c", &y, &mo, &d, &h, &mi,
                          &s, &z),
              7)
        << row.cells[tc];
    ASSERT_EQ(z, 'Z');
    ASSERT_EQ(unix_s(y, mo, d) + h * 3600LL + mi * 60LL + s, rec.time_s[i]);
    const auto v = table.number(row, lc, missing);  // throws on anything undocumented
    if (!v) {
      ++missing_cells;
      ASSERT_NE(rec.state[i], RowState::value);
    } else {
      ASSERT_EQ(rec.state[i], RowState::value);
      ASSERT_NEAR(*v, rec.level_m[i], 5e-10);
    }
  }
  EXPECT_EQ(missing_cells, 492U + 48U + 24U);
}

TEST(DemoRecord, AnnualMeansRecoverTheDesignTrend) {
  // Design: 2.5 mm/yr. Expected standard error (demo_coast/README.md): annual-mean noise ≈ 0.021 m
  // (inter-annual 0.02 m, surges ≈ 0.004 m), lag-1 correlation up to ≈ 0.5 after the
  // interpolation between mid-year values, ~46 complete years: 0.021·sqrt(3)/sqrt(Σ(t−t̄)²≈8000)
  // ≈ 0.4 mm/yr. The test checks the fitted trend within 3 of its own standard errors and that
  // this standard error is below 0.7 mm/yr (so the check is not loose by construction).
  const TrendFit t = annual_mean_trend(standard_record());
  EXPECT_GE(t.years, 44U);
  EXPECT_LT(t.se_m_per_yr, 0.0007);
  EXPECT_NEAR(t.slope_m_per_yr, 0.0025, 3.0 * t.se_m_per_yr) << "se " << t.se_m_per_yr;
  std::printf("[ measured ] trend %.4f mm/yr, se %.4f mm/yr, %zu years\n", t.slope_m_per_yr * 1000,
              t.se_m_per_yr * 1000, t.years);
}

TEST(DemoRecord, WithoutInterannualNoiseTheTrendIsTight) {
  // Without the inter-annual anomaly and the seasonal cycle, annual means carry only the surges
  // (≈ 0.004 m a year) and gap effects, so the slope's standard error is ≈ 0.004/90 ≈ 0.05 mm/yr.
  auto design = demo::TideRecordDesign::standard();
  design.interannual_sd_m = 0.0;
  design.seasonal_amplitude_m = 0.0;
  design.trend_m_per_yr = 0.004;
  const TrendFit t = annual_mean_trend(demo::generate_tide_record(design, 99));
  EXPECT_LT(t.se_m_per_yr, 0.0002);
  EXPECT_NEAR(t.slope_m_per_yr, 0.004, 3.0 * t.se_m_per_yr) << "se " << t.se_m_per_yr;
  std::printf("[ measured ] quiet trend %.4f mm/yr (design 4), se %.4f mm/yr\n",
              t.slope_m_per_yr * 1000, t.se_m_per_yr * 1000);
}

TEST(DemoRecord, HarmonicFitRecoversTheConstituents) {
  // Nodal modulation off, so that constant amplitudes are the truth; 30 years (1995-2024).
  auto design = demo::TideRecordDesign::standard_years(1995, 2024);
  design.nodal_modulation = false;
  const auto rec = demo::generate_tide_record(design, 20261201ULL);
  const HarmonicFit fit =
      harmonic_fit(rec, periods_of(design), unix_s(1995, 1, 1), unix_s(2025, 1, 1));
  for (std::size_t k = 0; k < design.constituents.size(); ++k) {
    const auto& c = design.constituents[k];
    // Expected standard error: σ_r·sqrt(2/N) ≈ 0.08 m·sqrt(2/258,000) ≈ 0.0002 m; 1 mm is a cap.
    EXPECT_LT(fit.amplitude_se_m[k], 0.001) << c.name;
    EXPECT_NEAR(fit.amplitude_m[k], c.amplitude_m, 4.0 * fit.amplitude_se_m[k]) << c.name;
    const double phase_se_deg = fit.amplitude_se_m[k] / c.amplitude_m * 180.0 / std::numbers::pi;
    EXPECT_NEAR(fit.phase_deg[k], c.phase_lag_deg, 4.0 * phase_se_deg) << c.name;
  }
  std::printf("[ measured ] M2 amplitude %.5f m (design 1.2), se %.5f m\n", fit.amplitude_m[0],
              fit.amplitude_se_m[0]);
}

TEST(DemoRecord, LunarNodeMatchesTheStandstills) {
  // The Moon's node is at the vernal equinox (Ω = 0) at a major lunar standstill, mid-2006, and
  // at Ω = 180° at the minor standstill of early 1997 (widely published dates; 18.61-yr cycle).
  const double n2006 = demo::lunar_node_longitude_deg(unix_s(2006, 7, 1));
  EXPECT_LT(std::min(n2006, 360.0 - n2006), 3.0);
  EXPECT_NEAR(demo::lunar_node_longitude_deg(unix_s(1997, 3, 1)), 180.0, 3.0);
}

TEST(DemoRecord, NodalCycleModulatesM2AndK1AsDesigned) {
  // Pugh 1987 Table 4.3 (from memory), the design's nodal factors: f_M2 = 1 − 0.037 cos N,
  // f_K1 = 1.006 + 0.115 cos N. In 2006 (N ≈ 0) against 1997 (N ≈ 180°), with cos N averaged
  // over each year (≈ ±0.99), the design gives A_2006/A_1997 ≈ 0.929 for M2 and ≈ 1.26 for K1.
  const auto& rec = standard_record();
  const auto periods = periods_of(rec.design);
  const HarmonicFit y1997 = harmonic_fit(rec, periods, unix_s(1997, 1, 1), unix_s(1998, 1, 1));
  const HarmonicFit y2006 = harmonic_fit(rec, periods, unix_s(2006, 1, 1), unix_s(2007, 1, 1));
  const auto mean_cos_n = [](int year) {
    double s = 0.0;
    for (int d = 0; d < 365; ++d) {
      s += std::cos(demo::lunar_node_longitude_deg(unix_s(year, 1, 1) + d * 86400LL) *
                    std::numbers::pi / 180.0);
    }
    return s / 365.0;
  };
  const double c97 = mean_cos_n(1997);
  const double c06 = mean_cos_n(2006);
  const auto check = [&](std::size_t k, double f97, double f06) {
    const double ratio = y2006.amplitude_m[k] / y1997.amplitude_m[k];
    const double ratio_se = ratio * std::hypot(y2006.amplitude_se_m[k] / y2006.amplitude_m[k],
                                               y1997.amplitude_se_m[k] / y1997.amplitude_m[k]);
    EXPECT_NEAR(ratio, f06 / f97, 4.0 * ratio_se) << rec.design.constituents[k].name;
    std::printf("[ measured ] %s A2006/A1997 %.4f (design %.4f), se %.4f\n",
                rec.design.constituents[k].name.c_str(), ratio, f06 / f97, ratio_se);
    EXPECT_LT(ratio_se, 0.2 * std::abs(f06 / f97 - 1.0)) << "the modulation must be resolved";
  };
  check(0, 1.0 - 0.037 * c97, 1.0 - 0.037 * c06);      // M2
  check(3, 1.006 + 0.115 * c97, 1.006 + 0.115 * c06);  // K1
}

TEST(DemoRecord, SurgesFollowTheSeasonalPoissonGpdDesign) {
  const auto& rec = standard_record();
  const auto& sd = rec.design.surges;
  const double n = static_cast<double>(rec.surges.size());
  // Poisson count over 50 years at 6 a year: 300 ± 3·sqrt(300).
  EXPECT_NEAR(n, 300.0, 3.0 * std::sqrt(300.0));
  // GPD excess (Coles 2001, §4.2): mean σ/(1 − ξ), variance σ²/((1 − ξ)²(1 − 2ξ)).
  double sum = 0.0;
  double max_excess = 0.0;
  for (const auto& e : rec.surges) {
    ASSERT_GE(e.peak_m, sd.threshold_m);
    sum += e.peak_m - sd.threshold_m;
    max_excess = std::max(max_excess, e.peak_m - sd.threshold_m);
  }
  const double mean = sd.gpd_scale_m / (1.0 - sd.gpd_shape);
  const double sdev = sd.gpd_scale_m / ((1.0 - sd.gpd_shape) * std::sqrt(1.0 - 2.0 * sd.gpd_shape));
  EXPECT_NEAR(sum / n, mean, 3.0 * sdev / std::sqrt(n));
  // Tail: the largest of n GPD excesses exceeds the GPD's 1 − 1/(10n) quantile with probability
  // ≈ 1 − e^(−0.1) ≈ 0.1 and falls below its 1 − 10/n quantile with probability ≈ e^(−10).
  const auto q = [&](double p) {
    return sd.gpd_scale_m / sd.gpd_shape * (std::pow(1.0 - p, -sd.gpd_shape) - 1.0);
  };
  EXPECT_GT(max_excess, q(1.0 - 10.0 / n));
  // Season: with rate ∝ 1 + m·cos(θ − θ_peak), the half year centred on the peak holds a fraction
  // 1/2 + m/π = 0.786 of the events.
  std::size_t winter = 0;
  const std::int64_t epoch = unix_s(2000, 1, 1);
  for (const auto& e : rec.surges) {
    const double day = static_cast<double>(e.peak_time_s - epoch) / 86400.0;
    const double phase = std::remainder(day - sd.peak_day_of_year, 365.2422);
    if (std::abs(phase) < 365.2422 / 4.0) ++winter;
  }
  const double p = 0.5 + sd.seasonal_modulation / std::numbers::pi;
  EXPECT_NEAR(static_cast<double>(winter) / n, p, 3.0 * std::sqrt(p * (1 - p) / n));
}

TEST(DemoRecord, BadDesignIsAnInputError) {
  auto design = demo::TideRecordDesign::standard();
  design.first_year = 2030;
  design.last_year = 2020;
  EXPECT_THROW((void)demo::generate_tide_record(design, 1), tidewright::InputError);
  design = demo::TideRecordDesign::standard();
  design.residual_ar1_per_h = 1.0;
  EXPECT_THROW((void)demo::generate_tide_record(design, 1), tidewright::InputError);
}
