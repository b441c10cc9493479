// Return levels and their intervals. Glossary and sources:
// include/tidewright/extremes/return_levels.hpp (T, p, y_p, z_T), fit.hpp (mu, sigma, xi, u,
// lambda_u). Further symbols here: s the argument of a(xi) = expm1(xi s)/xi, so that z_T = mu +
// sigma a(xi) with s = -log y_p (annual maxima) or z_T = u + sigma a(xi) with s = log(lambda_u T)
// (GPD); D = 2 (l_max - l_p) the deviance.
#include "tidewright/extremes/return_levels.hpp"

#include <algorithm>
#include <boost/math/distributions/chi_squared.hpp>
#include <boost/math/distributions/normal.hpp>
#include <boost/math/tools/roots.hpp>
#include <boost/math/tools/toms748_solve.hpp>
#include <cmath>
#include <limits>
#include <optional>
#include <random>
#include <string>

#include "tidewright/common/error.hpp"
#include "tidewright/extremes/distributions.hpp"
#include "tidewright/extremes/newton_maximiser.hpp"
#include "tidewright/extremes/sampling.hpp"

namespace tidewright::extremes {
namespace {

constexpr double inf = std::numeric_limits<double>::infinity();

void check_period(double t) {
  if (!std::isfinite(t) || t <= 1.0) {
    throw InputError("return period", "T = " + std::to_string(t) + " years must be > 1",
                     "give return periods longer than one year");
  }
}

void check_confidence(double c) {
  if (!(c > 0.0 && c < 1.0)) {
    throw InputError("confidence", std::to_string(c) + " is outside (0, 1)",
                     "give a confidence level such as 0.95");
  }
}

// s of z_T = location + sigma a(xi; s).
double level_argument(const FitResult& fit, double t) {
  check_period(t);
  if (fit.family == Family::gpd) {
    const double m = fit.rate_per_yr * t;  // expected exceedances in T years
    if (m <= 1.0) {
      throw InputError("return period",
                       "T = " + std::to_string(t) +
                           " years gives a level below the threshold (rate " +
                           std::to_string(fit.rate_per_yr) + " per year)",
                       "ask for return periods longer than 1/rate or lower the threshold");
    }
    return std::log(m);
  }
  // One meaning of T in every command: the level exceeded on average once in T years,
  // N_0(z_T) = -log F(z_T) = 1/T under Poisson occurrence (docs/methods-extremes.md). So y_p = 1/T
  // in Coles (2001) eq. 3.10 (not -log(1 - 1/T)), and s = -log y_p = log T.
  return std::log(t);
}

ParamVector vec2(double a, double b) {
  ParamVector p(2);
  p << a, b;
  return p;
}

// The profile objective in the nuisance parameters for a fixed level z_T.
//   GEV, r-largest: nuisance (sigma, xi), mu = z - sigma a(xi)
//   Gumbel: nuisance (sigma), mu = z - sigma s
//   GPD: nuisance (lambda_u, xi), sigma = (z - u)/a(xi; log(lambda_u T)), with the Poisson
//        log-likelihood k log lambda - lambda Y of the exceedance count added.
// Gradient and Hessian by the chain rule: g_free = J' g, H_free = J' H J + sum_k g_k d2theta_k.
struct Profile {
  const FitResult& fit;
  double s;  // annual maxima: -log y_p; GPD: unused (depends on lambda)
  double t_yr;
  double level;

  [[nodiscard]] LogLikelihood operator()(const ParamVector& q) const {
    switch (fit.family) {
      case Family::gumbel:
        return gumbel(q);
      case Family::gev:
        return gev(q);
      case Family::gpd:
        return gpd(q);
    }
    return gumbel(q);
  }

  // d l_p / d z_T at nuisance q: by the envelope theorem the derivative of the profile is the
  // partial derivative of the likelihood in z_T with the nuisance held at its maximiser
  // (mu = z - sigma a: dl/dmu; GPD sigma = (z - u)/b: dl/dsigma / b).
  [[nodiscard]] double level_derivative(const ParamVector& q) const {
    switch (fit.family) {
      case Family::gumbel:
        return fit.log_likelihood_at(vec2(level - q(0) * s, q(0))).gradient(0);
      case Family::gev: {
        ParamVector theta(3);
        theta << level - q(0) * expm1_over_shape(s, q(1)).a, q(0), q(1);
        return fit.log_likelihood_at(theta).gradient(0);
      }
      case Family::gpd: {
        const double b = expm1_over_shape(std::log(q(0) * t_yr), q(1)).a;
        const double sigma = (level - fit.threshold_m) / b;
        return fit.log_likelihood_at(vec2(sigma, q(1))).gradient(0) / b;
      }
    }
    return 0.0;
  }

  [[nodiscard]] LogLikelihood gumbel(const ParamVector& q) const {
    const double sigma = q(0);
    ParamVector theta = vec2(level - sigma * s, sigma);
    const LogLikelihood l = fit.log_likelihood_at(theta);
    LogLikelihood r;
    r.value = l.value;
    r.gradient.resize(1);
    r.hessian.resize(1, 1);
    Eigen::Vector2d j(-s, 1.0);
    r.gradient(0) = j.dot(Eigen::Vector2d(l.gradient(0), l.gradient(1)));
    Eigen::Matrix2d h = l.hessian;
    r.hessian(0, 0) = j.dot(h * j);
    return r;
  }

  [[nodiscard]] LogLikelihood gev(const ParamVector& q) const {
    const double sigma = q(0);
    const double xi = q(1);
    const ExpShape a = expm1_over_shape(s, xi);
    ParamVector theta(3);
    theta << level - sigma * a.a, sigma, xi;
    const LogLikelihood l = fit.log_likelihood_at(theta);
    LogLikelihood r;
    r.value = l.value;
    if (!l.inside()) {
      r.gradient = ParamVector::Zero(2);
      r.hessian = ParamMatrix::Zero(2, 2);
      return r;
    }
    Eigen::Matrix<double, 3, 2> j;
    j << -a.a, -sigma * a.da_dxi, 1.0, 0.0, 0.0, 1.0;
    Eigen::Matrix2d mu2;  // second derivatives of mu in (sigma, xi)
    mu2 << 0.0, -a.da_dxi, -a.da_dxi, -sigma * a.d2a_dxi2;
    const Eigen::Vector3d g = l.gradient;
    const Eigen::Matrix3d h = l.hessian;
    r.gradient = j.transpose() * g;
    r.hessian = j.transpose() * h * j + g(0) * mu2;
    return r;
  }

  [[nodiscard]] LogLikelihood gpd(const ParamVector& q) const {
    const double lambda = q(0);
    const double xi = q(1);
    LogLikelihood r;
    r.gradient = ParamVector::Zero(2);
    r.hessian = ParamMatrix::Zero(2, 2);
    r.value = -inf;
    const double sl = lambda > 0.0 ? std::log(lambda * t_yr) : -inf;
    const double d = level - fit.threshold_m;
    if (!(sl > 0.0) || !(d > 0.0)) return r;
    const ExpShape b = expm1_over_shape(sl, xi);
    const double e = std::exp(xi * sl);
    // b and its derivatives in (lambda, xi): b_s = e^(xi s), b_ss = xi e^(xi s), b_sxi = s e^(xi
    // s), s_lambda = 1/lambda, s_lambdalambda = -1/lambda^2.
    const double b_l = e / lambda;
    const double b_ll = (xi * e - e) / (lambda * lambda);
    const double b_lx = sl * e / lambda;
    const double B_l = b_l / b.a;
    const double B_x = b.da_dxi / b.a;
    const double B_ll = b_ll / b.a - B_l * B_l;
    const double B_lx = b_lx / b.a - B_l * B_x;
    const double B_xx = b.d2a_dxi2 / b.a - B_x * B_x;
    const double sigma = d / b.a;  // sigma = D exp(-B), B = log b
    const double s_l = -sigma * B_l;
    const double s_x = -sigma * B_x;
    const double s_ll = sigma * (B_l * B_l - B_ll);
    const double s_lx = sigma * (B_l * B_x - B_lx);
    const double s_xx = sigma * (B_x * B_x - B_xx);
    const LogLikelihood l = fit.log_likelihood_at(vec2(sigma, xi));
    if (!l.inside()) return r;
    const double k = static_cast<double>(fit.n);
    const double years = fit.years_of_record;
    const double g_s = l.gradient(0);
    const double g_x = l.gradient(1);
    const double h_ss = l.hessian(0, 0);
    const double h_sx = l.hessian(0, 1);
    const double h_xx = l.hessian(1, 1);
    // Poisson log-likelihood of the count: k log lambda - lambda Y (Coles 2001, sec. 4.4.1).
    r.value = l.value + k * std::log(lambda) - lambda * years;
    r.gradient(0) = k / lambda - years + g_s * s_l;
    r.gradient(1) = g_s * s_x + g_x;
    r.hessian(0, 0) = -k / (lambda * lambda) + h_ss * s_l * s_l + g_s * s_ll;
    r.hessian(0, 1) = h_ss * s_l * s_x + h_sx * s_l + g_s * s_lx;
    r.hessian(1, 0) = r.hessian(0, 1);
    r.hessian(1, 1) = h_ss * s_x * s_x + 2.0 * h_sx * s_x + h_xx + g_s * s_xx;
    return r;
  }
};

// Log-likelihood at the overall maximum on the profile's scale (GPD: with the Poisson term).
double full_maximum(const FitResult& fit) {
  if (fit.family != Family::gpd) return fit.log_likelihood;
  const double k = static_cast<double>(fit.n);
  return fit.log_likelihood + k * std::log(fit.rate_per_yr) - fit.rate_per_yr * fit.years_of_record;
}

ParamVector nuisance_at_maximum(const FitResult& fit) {
  switch (fit.family) {
    case Family::gumbel: {
      ParamVector p(1);
      p << fit.scale();
      return p;
    }
    case Family::gev:
      return vec2(fit.scale(), fit.shape());
    case Family::gpd:
      return vec2(fit.rate_per_yr, fit.shape());
  }
  return vec2(fit.scale(), fit.shape());
}

// Smallest and largest value the GEV support must hold (all r-largest values included).
std::pair<double, double> data_range(const FitResult& fit) {
  double lo = std::numeric_limits<double>::infinity();
  double hi = -lo;
  for (double x : fit.data) {
    lo = std::min(lo, x);
    hi = std::max(hi, x);
  }
  for (const auto& year : fit.data_r_largest) {
    for (double x : year) lo = std::min(lo, x);
  }
  return {lo, hi};
}

// GEV start repair: keep xi and raise sigma until the end point z - sigma e^(xi s)/xi (from
// mu = z - sigma a(xi)) clears the data with a margin, i.e. sigma >= 1.25 (z - min x) xi e^(-xi s)
// for xi > 0 and sigma >= 1.25 (max x - z) |xi| e^(-xi s) for xi < 0. A start close to the
// edge has huge gradients and the ascent from it can run to the xi = -1 edge (measured on a
// heavy-tailed sample); the margin of 25% is this project's choice.
ParamVector repaired_gev_start(const Profile& p, ParamVector q) {
  const auto [lo, hi] = data_range(p.fit);
  const double xi = q(1);
  const double e = std::exp(-xi * p.s);
  double need = 0.0;
  if (xi > 0.0) need = (p.level - lo) * xi * e;
  if (xi < 0.0) need = (hi - p.level) * (-xi) * e;
  q(0) = std::max(q(0), 1.25 * need);
  return q;
}

// Maximises the profile at `level`, warm-started from `start`. If that search fails, it is
// repeated from further starts (GEV: shapes 0, +-0.2, 0.4 with sigma repaired as above; GPD:
// xi = 0, no upper end point) and the best converged maximum kept; if none converges the first
// error is thrown.
MaximiserResult maximise_profile(const Profile& p, const ParamVector& start) {
  const std::string what = "profile likelihood of the " + std::to_string(p.t_yr) + "-year level";
  const bool gev = p.fit.family == Family::gev;
  std::vector<ParamVector> starts{gev ? repaired_gev_start(p, start) : start};
  if (gev) {
    for (double xi : {0.0, 0.2, -0.2, 0.4}) {
      ParamVector q = start;
      q(1) = xi;
      starts.push_back(repaired_gev_start(p, q));
    }
  } else if (start.size() == 2) {
    ParamVector q = start;
    q(1) = 0.0;
    starts.push_back(q);
  }
  std::optional<MaximiserResult> best;
  std::optional<ComputationError> first_error;
  for (const auto& q : starts) {
    if (!p(q).inside()) continue;
    try {
      MaximiserResult m = maximise_newton(p, q, what);
      if (!best || m.at_estimate.value > best->at_estimate.value) best = std::move(m);
      break;  // the first converged search is kept (warm starts make it the right basin)
    } catch (const ComputationError& e) {
      if (!first_error) first_error = e;
    }
  }
  if (best) return *best;
  if (first_error) throw *first_error;
  throw ComputationError(what, "no starting values inside the support of the model were found",
                         "check the data for outliers or give another model");
}

double delta_se(const FitResult& fit, double t);

// One end of the profile interval on side dir (-1 lower, +1 upper), by stepping outward until
// the deviance passes the critical value and then TOMS 748 on the bracket. The fallback of
// profile_end when Newton's method does not find the end (e.g. an unbounded side).
double profile_end_bracketed(const FitResult& fit, double t, double z_hat, double se,
                             double critical, int dir) {
  const double l_max = full_maximum(fit);
  Profile prof{fit, fit.family == Family::gpd ? 0.0 : level_argument(fit, t), t, z_hat};
  ParamVector last = nuisance_at_maximum(fit);
  auto deviance_minus_critical = [&](double z) {
    prof.level = z;
    const MaximiserResult m = maximise_profile(prof, last);
    last = m.estimate;
    return 2.0 * (l_max - m.at_estimate.value) - critical;
  };
  // Small first step, growing by 1.5: each level warm-starts the next close to its maximum.
  double step = (std::isfinite(se) && se > 0.0) ? 0.25 * se : 0.1 * fit.scale();
  double z_prev = z_hat;
  ParamVector n_prev = last;
  double f_prev = -critical;
  for (int i = 0; i < 80; ++i) {
    double z = z_prev + dir * step;
    if (fit.family == Family::gpd && z <= fit.threshold_m) z = 0.5 * (z_prev + fit.threshold_m);
    last = n_prev;
    const double f = deviance_minus_critical(z);
    if (f > 0.0) {
      // Bracketed: solve D(z) = critical with TOMS 748 (Alefeld, Potra & Shi 1995, via Boost.Math).
      last = n_prev;
      double lo = std::min(z_prev, z);
      double hi = std::max(z_prev, z);
      double f_lo = dir > 0 ? f_prev : f;
      double f_hi = dir > 0 ? f : f_prev;
      std::uintmax_t max_iter = 60;
      const auto root = boost::math::tools::toms748_solve(
          deviance_minus_critical, lo, hi, f_lo, f_hi,
          boost::math::tools::eps_tolerance<double>(36), max_iter);
      return 0.5 * (root.first + root.second);
    }
    z_prev = z;
    n_prev = last;
    f_prev = f;
    step *= 1.5;
  }
  return dir > 0 ? inf : -inf;
}

// One end of the profile interval: the root of sqrt(D(z)) = sqrt(critical) on side dir, by
// Boost.Math's newton_raphson_iterate started at the delta-method end. The signed root of the
// deviance is close to linear in z, so Newton converges in a few steps; its derivative is
// -l_p'(z)/sqrt(D) with l_p' from the envelope theorem (Profile::level_derivative).
double profile_end(const FitResult& fit, double t, double z_hat, double se, double critical,
                   int dir) {
  if (!(std::isfinite(se) && se > 0.0))
    return profile_end_bracketed(fit, t, z_hat, se, critical, dir);
  const double l_max = full_maximum(fit);
  const double target = std::sqrt(critical);
  Profile prof{fit, fit.family == Family::gpd ? 0.0 : level_argument(fit, t), t, z_hat};
  ParamVector last = nuisance_at_maximum(fit);
  double last_root_deviance = 0.0;
  auto f = [&](double z) {
    prof.level = z;
    const MaximiserResult m = maximise_profile(prof, last);
    last = m.estimate;
    const double d = std::max(0.0, 2.0 * (l_max - m.at_estimate.value));
    const double r = std::sqrt(d);
    last_root_deviance = r;
    const double dr = r > 0.0 ? -prof.level_derivative(m.estimate) / r : 0.0;
    return std::make_pair(r - target, dr);
  };
  double lo = dir > 0 ? z_hat : z_hat - 1000.0 * se;
  double hi = dir > 0 ? z_hat + 1000.0 * se : z_hat;
  if (fit.family == Family::gpd && dir < 0) lo = std::max(lo, fit.threshold_m);
  const double guess = z_hat + dir * target * se;
  try {
    // Where the delta-method end lies far beyond the profile end (heavy tails, strongly
    // asymmetric profiles: measured D = 492 at the guess on a sample with xi = 0.5) the inner
    // search from the maximum can land in a wrong basin; step out gradually instead.
    const auto at_guess = f(guess);
    if (at_guess.first + target > 2.0 * target) {
      return profile_end_bracketed(fit, t, z_hat, se, critical, dir);
    }
  } catch (const ComputationError&) {
    return profile_end_bracketed(fit, t, z_hat, se, critical, dir);
  }
  try {
    std::uintmax_t max_iter = 40;
    const double z = boost::math::tools::newton_raphson_iterate(f, guess, lo, hi, 36, max_iter);
    (void)f(z);
    if (max_iter < 40 && std::abs(last_root_deviance - target) < 1e-7 && dir * (z - z_hat) > 0.0) {
      return z;
    }
  } catch (const boost::math::evaluation_error&) {
    // No root found from this start: fall through to the bracketing search.
  }
  return profile_end_bracketed(fit, t, z_hat, se, critical, dir);
}
}  // namespace

double annual_exceedance_probability_of_period(double return_period_yr) {
  return -std::expm1(-1.0 / return_period_yr);
}

const char* interval_method_name(IntervalMethod method) {
  switch (method) {
    case IntervalMethod::delta:
      return "delta";
    case IntervalMethod::profile:
      return "profile";
    case IntervalMethod::bootstrap:
      return "bootstrap";
  }
  return "unknown";
}

double return_level(const FitResult& fit, double return_period_yr) {
  const double s = level_argument(fit, return_period_yr);
  const double xi = fit.shape();
  return fit.location() + fit.scale() * expm1_over_shape(s, xi).a;
}

namespace {
// grad z_T: annual maxima (1, a, sigma a') in (mu, sigma, xi) (Coles 2001, p. 56, with
// a = [y_p^(-xi) - 1]/xi); Gumbel (1, s); GPD (sigma e^(xi s)/lambda, a, sigma a') in
// (lambda, sigma, xi) with lambda independent of (sigma, xi) (Coles 2001, sec. 4.4.1).
double delta_se(const FitResult& fit, double t) {
  const double s = level_argument(fit, t);
  const double sigma = fit.scale();
  const double xi = fit.shape();
  const ExpShape a = expm1_over_shape(s, xi);
  if (fit.family == Family::gumbel) {
    const Eigen::Vector2d g(1.0, s);
    const Eigen::Matrix2d v = fit.covariance;
    return std::sqrt(g.dot(v * g));
  }
  if (fit.family == Family::gev) {
    const Eigen::Vector3d g(1.0, a.a, sigma * a.da_dxi);
    const Eigen::Matrix3d v = fit.covariance;
    return std::sqrt(g.dot(v * g));
  }
  const double lambda = fit.rate_per_yr;
  const Eigen::Vector3d g(sigma * std::exp(xi * s) / lambda, a.a, sigma * a.da_dxi);
  Eigen::Matrix3d v = Eigen::Matrix3d::Zero();
  v(0, 0) = fit.rate_standard_error_per_yr * fit.rate_standard_error_per_yr;
  v.block<2, 2>(1, 1) = fit.covariance;
  return std::sqrt(g.dot(v * g));
}
}  // namespace

std::vector<ReturnLevel> return_levels_delta(const FitResult& fit,
                                             std::span<const double> periods_yr,
                                             double confidence) {
  check_confidence(confidence);
  const double zq = boost::math::quantile(boost::math::normal(), 0.5 + confidence / 2.0);
  std::vector<ReturnLevel> out;
  for (double t : periods_yr) {
    ReturnLevel r;
    r.return_period_yr = t;
    r.level_m = return_level(fit, t);
    r.standard_error_m = delta_se(fit, t);
    r.lower_m = r.level_m - zq * r.standard_error_m;
    r.upper_m = r.level_m + zq * r.standard_error_m;
    r.method = IntervalMethod::delta;
    out.push_back(r);
  }
  return out;
}

double profile_log_likelihood(const FitResult& fit, double return_period_yr, double level_m) {
  const double s = fit.family == Family::gpd ? 0.0 : level_argument(fit, return_period_yr);
  if (fit.family == Family::gpd) (void)level_argument(fit, return_period_yr);
  const Profile prof{fit, s, return_period_yr, level_m};
  return maximise_profile(prof, nuisance_at_maximum(fit)).at_estimate.value;
}

std::vector<ReturnLevel> return_levels_profile(const FitResult& fit,
                                               std::span<const double> periods_yr,
                                               double confidence) {
  check_confidence(confidence);
  // chi-square_1 quantile: 3.841 at 95% (Coles 2001, sec. 2.6.5).
  const double critical = boost::math::quantile(boost::math::chi_squared(1.0), confidence);
  std::vector<ReturnLevel> out;
  for (double t : periods_yr) {
    ReturnLevel r;
    r.return_period_yr = t;
    r.level_m = return_level(fit, t);
    r.standard_error_m = delta_se(fit, t);
    r.method = IntervalMethod::profile;
    r.lower_m = profile_end(fit, t, r.level_m, r.standard_error_m, critical, -1);
    r.upper_m = profile_end(fit, t, r.level_m, r.standard_error_m, critical, +1);
    out.push_back(r);
  }
  return out;
}

namespace {

// Type-7 sample quantile of sorted values (Hyndman & Fan 1996, definition 7; R's default).
double type7_quantile(const std::vector<double>& sorted, double p) {
  const double h = (static_cast<double>(sorted.size()) - 1.0) * p;
  const auto lo = static_cast<std::size_t>(std::floor(h));
  const std::size_t hi = std::min(lo + 1, sorted.size() - 1);
  return sorted[lo] + (h - std::floor(h)) * (sorted[hi] - sorted[lo]);
}

}  // namespace

BootstrapResult return_levels_bootstrap(const FitResult& fit, std::span<const double> periods_yr,
                                        const BootstrapOptions& options) {
  check_confidence(options.confidence);
  if (fit.r_largest) {
    throw InputError("bootstrap", "the parametric bootstrap is not available for r-largest fits",
                     "use the delta or profile intervals");
  }
  if (options.samples < 10) {
    throw InputError("bootstrap", std::to_string(options.samples) + " samples asked for",
                     "ask for at least 10 (1000 is usual)");
  }
  for (double t : periods_yr) (void)level_argument(fit, t);
  std::mt19937_64 rng(options.seed);
  std::vector<std::vector<double>> draws(periods_yr.size());
  BootstrapResult out;
  std::vector<double> sample(fit.n);
  FitOptions fo;
  fo.start = fit.estimate;
  for (std::size_t b = 0; b < options.samples; ++b) {
    try {
      FitResult refit;
      if (fit.family == Family::gpd) {
        std::poisson_distribution<long> count(fit.rate_per_yr * fit.years_of_record);
        const auto k = static_cast<std::size_t>(count(rng));
        sample.resize(k);
        const Gpd d(fit.threshold_m, fit.scale(), fit.shape());
        draw_into(d, sample, rng);
        if (k < min_values_gpd) throw ComputationError("bootstrap", "too few exceedances", "");
        try {
          refit = fit_gpd(sample, fit.threshold_m, fit.years_of_record, fo);
        } catch (const ComputationError&) {
          refit = fit_gpd(sample, fit.threshold_m, fit.years_of_record);
        }
      } else if (fit.family == Family::gev) {
        const Gev d(fit.location(), fit.scale(), fit.shape());
        draw_into(d, sample, rng);
        try {
          refit = fit_gev(sample, fo);
        } catch (const ComputationError&) {
          refit = fit_gev(sample);
        }
      } else {
        const Gumbel d(fit.location(), fit.scale());
        draw_into(d, sample, rng);
        refit = fit_gumbel(sample, fo);
      }
      std::vector<double> levels;
      for (double t : periods_yr) levels.push_back(return_level(refit, t));
      for (std::size_t i = 0; i < levels.size(); ++i) draws[i].push_back(levels[i]);
      ++out.samples_used;
    } catch (const Error&) {
      ++out.failed_fits;
    }
  }
  if (out.failed_fits * 10 > options.samples) {
    throw ComputationError("bootstrap",
                           std::to_string(out.failed_fits) + " of " +
                               std::to_string(options.samples) + " refits failed",
                           "the fitted model is not stable enough for a bootstrap; use the "
                           "profile intervals");
  }
  const double lo_p = 0.5 - options.confidence / 2.0;
  const double hi_p = 0.5 + options.confidence / 2.0;
  for (std::size_t i = 0; i < periods_yr.size(); ++i) {
    auto& v = draws[i];
    std::sort(v.begin(), v.end());
    ReturnLevel r;
    r.return_period_yr = periods_yr[i];
    r.level_m = return_level(fit, periods_yr[i]);
    r.method = IntervalMethod::bootstrap;
    r.lower_m = type7_quantile(v, lo_p);
    r.upper_m = type7_quantile(v, hi_p);
    double mean = 0.0;
    for (double x : v) mean += x / static_cast<double>(v.size());
    double ss = 0.0;
    for (double x : v) ss += (x - mean) * (x - mean);
    r.standard_error_m = std::sqrt(ss / static_cast<double>(v.size() - 1));
    out.levels.push_back(r);
  }
  return out;
}

}  // namespace tidewright::extremes
