// Gumbel, GEV and GPD functions. Glossary: see include/tidewright/extremes/distributions.hpp
// (mu, sigma, xi, u, y, t, w, p, q as in Coles 2001).
#include "tidewright/extremes/distributions.hpp"

#include <array>
#include <cmath>
#include <limits>
#include <string>

#include "tidewright/common/error.hpp"

namespace tidewright::extremes {
namespace {

constexpr double inf = std::numeric_limits<double>::infinity();
constexpr int series_terms = 24;  // with |xi y| < 0.1: truncation below 0.1^24

// Series coefficients (see shape_transform and expm1_over_shape).
template <int Which>
constexpr std::array<double, series_terms> log1p_coefficients() {
  std::array<double, series_terms> c{};
  for (int j = 0; j < series_terms; ++j) {
    const double sign = (j % 2 == 0) ? 1.0 : -1.0;
    const double jd = j;
    if (Which == 0) c[j] = sign / (jd + 1.0);
    if (Which == 1) c[j] = -sign * (jd + 1.0) / (jd + 2.0);
    if (Which == 2) c[j] = sign * (jd + 1.0) * (jd + 2.0) / (jd + 3.0);
  }
  return c;
}
template <int Which>
constexpr std::array<double, series_terms> expm1_coefficients() {
  std::array<double, series_terms> c{};
  double f = 1.0;  // (j+1)!
  for (int j = 0; j < series_terms; ++j) {
    const double jd = j;
    f *= jd + 1.0;
    const double f1 = f * (jd + 2.0);
    const double f2 = f1 * (jd + 3.0);
    if (Which == 0) c[j] = 1.0 / f;
    if (Which == 1) c[j] = (jd + 1.0) / f1;
    if (Which == 2) c[j] = (jd + 1.0) * (jd + 2.0) / f2;
  }
  return c;
}
constexpr auto log1p_c0 = log1p_coefficients<0>();
constexpr auto log1p_c1 = log1p_coefficients<1>();
constexpr auto log1p_c2 = log1p_coefficients<2>();
constexpr auto expm1_c0 = expm1_coefficients<0>();
constexpr auto expm1_c1 = expm1_coefficients<1>();
constexpr auto expm1_c2 = expm1_coefficients<2>();

std::string number(double v) {
  std::string s = std::to_string(v);
  if (!std::isfinite(v)) s = std::isnan(v) ? "nan" : (v > 0 ? "inf" : "-inf");
  return s;
}

}  // namespace

void check_finite(std::string_view function, std::string_view parameter, double value) {
  if (!std::isfinite(value)) {
    throw InputError(std::string(function),
                     std::string(parameter) + " = " + number(value) + " is not a finite number",
                     "give a finite value");
  }
}

void check_scale(std::string_view function, double scale) {
  if (!std::isfinite(scale) || scale <= 0.0) {
    throw InputError(std::string(function), "scale = " + number(scale) + " must be > 0 and finite",
                     "give a positive scale");
  }
}

void check_probability(std::string_view function, double p) {
  if (!(p >= 0.0 && p <= 1.0)) {
    throw InputError(std::string(function), "probability = " + number(p) + " is outside [0, 1]",
                     "give a probability between 0 and 1");
  }
}

// Series of log1p(x)/xi, x = xi y: w = sum_k (-1)^(k+1) xi^(k-1) y^k / k (Taylor series of
// log1p, Abramowitz & Stegun 4.1.24), differentiated term by term in xi.
ShapeTransform shape_transform(double y, double xi) {
  const double x = xi * y;
  ShapeTransform r;
  if (std::abs(x) < small_shape_argument) {
    // Term j (power x^j): w gets (-1)^j/(j+1); dw/dxi gets -(-1)^j (j+1)/(j+2) (times y^2);
    // d2w/dxi2 gets (-1)^j (j+1)(j+2)/(j+3) (times y^3). Coefficients tabulated; the sum stops
    // once (j+3)|x|^j < 1e-17, below rounding of the leading terms.
    double w = 0.0;
    double w1 = 0.0;
    double w2 = 0.0;
    double xp = 1.0;
    for (int j = 0; j < series_terms; ++j) {
      w += log1p_c0[j] * xp;
      w1 += log1p_c1[j] * xp;
      w2 += log1p_c2[j] * xp;
      xp *= x;
      if (std::abs(xp) * (j + 4) < 1e-17) break;
    }
    r.w = y * w;
    r.dw_dxi = y * y * w1;
    r.d2w_dxi2 = y * y * y * w2;
    return r;
  }
  const double t = 1.0 + x;
  if (!(t > 0.0)) {
    r.w = r.dw_dxi = r.d2w_dxi2 = std::numeric_limits<double>::quiet_NaN();
    return r;
  }
  // Closed forms: w = log1p(xi y)/xi; dw/dxi = (y/t - w)/xi; d2w/dxi2 = -(y^2/t^2 + 2 dw/dxi)/xi.
  r.w = std::log1p(x) / xi;
  r.dw_dxi = (y / t - r.w) / xi;
  r.d2w_dxi2 = -(y * y / (t * t) + 2.0 * r.dw_dxi) / xi;
  return r;
}

double log1p_over_shape(double y, double xi) {
  if (xi == 0.0) return y;
  const double x = xi * y;
  if (!(x > -1.0)) return std::numeric_limits<double>::quiet_NaN();
  return std::log1p(x) / xi;  // accurate for small xi: log1p keeps its relative accuracy
}

// expm1(xi s)/xi = sum_k xi^(k-1) s^k / k! (exponential series), differentiated term by term.
ExpShape expm1_over_shape(double s, double xi) {
  ExpShape r;
  if (xi == 0.0) {
    r.a = s;
    r.da_dxi = s * s / 2.0;
    r.d2a_dxi2 = s * s * s / 3.0;
    return r;
  }
  const double x = xi * s;
  if (std::abs(x) < small_shape_argument) {
    // Term j (power x^j): a gets 1/(j+1)!; da gets (j+1)/(j+2)! (times s^2); d2a gets
    // (j+1)(j+2)/(j+3)! (times s^3). Coefficients tabulated; factorial decay ends it early.
    double a = 0.0;
    double a1 = 0.0;
    double a2 = 0.0;
    double xp = 1.0;
    for (int j = 0; j < series_terms; ++j) {
      a += expm1_c0[j] * xp;
      a1 += expm1_c1[j] * xp;
      a2 += expm1_c2[j] * xp;
      xp *= x;
      if (std::abs(xp) * expm1_c0[j] < 1e-18) break;
    }
    r.a = s * a;
    r.da_dxi = s * s * a1;
    r.d2a_dxi2 = s * s * s * a2;
    return r;
  }
  // Closed forms: a = expm1(xi s)/xi; da/dxi = (s e^(xi s) - a)/xi; d2a/dxi2 = (s^2 e^(xi s) - 2
  // da/dxi)/xi.
  const double e = std::exp(x);
  r.a = std::expm1(x) / xi;
  r.da_dxi = (s * e - r.a) / xi;
  r.d2a_dxi2 = (s * s * e - 2.0 * r.da_dxi) / xi;
  return r;
}

Gumbel::Gumbel(double location, double scale) : mu_(location), sigma_(scale) {
  check_finite("Gumbel", "location", location);
  check_scale("Gumbel", scale);
}

Gev::Gev(double location, double scale, double shape) : mu_(location), sigma_(scale), xi_(shape) {
  check_finite("Gev", "location", location);
  check_scale("Gev", scale);
  check_finite("Gev", "shape", shape);
}

Gpd::Gpd(double threshold, double scale, double shape) : u_(threshold), sigma_(scale), xi_(shape) {
  check_finite("Gpd", "threshold", threshold);
  check_scale("Gpd", scale);
  check_finite("Gpd", "shape", shape);
}

namespace {

// GEV standardised pieces; Gumbel is xi = 0. Returns w, or NaN outside the support, in which
// case below_support says on which side the level lies.
struct GevPoint {
  double w;
  bool inside;
  bool below;  // outside and below the lower end point (xi > 0)
};
GevPoint gev_point(double mu, double sigma, double xi, double z) {
  const double y = (z - mu) / sigma;
  const double w = log1p_over_shape(y, xi);
  if (std::isnan(w)) return {w, false, xi > 0.0};
  return {w, true, false};
}

// GEV: F(z) = exp(-t^(-1/xi)) = exp(-exp(-w)) (Coles 2001, eq. 3.2).
double gev_cdf(double mu, double sigma, double xi, double z) {
  const GevPoint g = gev_point(mu, sigma, xi, z);
  if (!g.inside) return g.below ? 0.0 : 1.0;
  return std::exp(-std::exp(-g.w));
}
// 1 - F(z) = -expm1(-exp(-w)), accurate for small exceedance probabilities.
double gev_sf(double mu, double sigma, double xi, double z) {
  const GevPoint g = gev_point(mu, sigma, xi, z);
  if (!g.inside) return g.below ? 1.0 : 0.0;
  return -std::expm1(-std::exp(-g.w));
}
// log f(z) = -log sigma - (1 + xi) w - exp(-w) (Coles 2001, eq. 3.7 for one observation).
double gev_log_pdf(double mu, double sigma, double xi, double z) {
  const GevPoint g = gev_point(mu, sigma, xi, z);
  if (!g.inside) return -inf;
  return -std::log(sigma) - (1.0 + xi) * g.w - std::exp(-g.w);
}
// z_p = mu + sigma [(-log p)^(-xi) - 1]/xi (Coles 2001, eq. 3.4), written with s = -log(-log p)
// as mu + sigma expm1(xi s)/xi. minus_log_p = -log p.
double gev_quantile_from_minus_log_p(double mu, double sigma, double xi, double minus_log_p) {
  const double s = -std::log(minus_log_p);
  if (std::isinf(s)) {
    // p = 0 (s = -inf) gives the lower end point, p = 1 (s = +inf) the upper end point.
    if (s < 0.0) return xi > 0.0 ? mu - sigma / xi : -inf;
    return xi < 0.0 ? mu - sigma / xi : inf;
  }
  return mu + sigma * expm1_over_shape(s, xi).a;
}

}  // namespace

double pdf(const Gumbel& d, double z) { return std::exp(log_pdf(d, z)); }
double log_pdf(const Gumbel& d, double z) { return gev_log_pdf(d.location(), d.scale(), 0.0, z); }
double cdf(const Gumbel& d, double z) { return gev_cdf(d.location(), d.scale(), 0.0, z); }
double cdf(const Complement<Gumbel>& c) {
  return gev_sf(c.dist.location(), c.dist.scale(), 0.0, c.value);
}
double quantile(const Gumbel& d, double p) {
  check_probability("quantile(Gumbel)", p);
  return gev_quantile_from_minus_log_p(d.location(), d.scale(), 0.0, -std::log(p));
}
double quantile(const Complement<Gumbel>& c) {
  check_probability("quantile(complement(Gumbel))", c.value);
  return gev_quantile_from_minus_log_p(c.dist.location(), c.dist.scale(), 0.0,
                                       -std::log1p(-c.value));
}

double pdf(const Gev& d, double z) { return std::exp(log_pdf(d, z)); }
double log_pdf(const Gev& d, double z) {
  return gev_log_pdf(d.location(), d.scale(), d.shape(), z);
}
double cdf(const Gev& d, double z) { return gev_cdf(d.location(), d.scale(), d.shape(), z); }
double cdf(const Complement<Gev>& c) {
  return gev_sf(c.dist.location(), c.dist.scale(), c.dist.shape(), c.value);
}
double quantile(const Gev& d, double p) {
  check_probability("quantile(Gev)", p);
  return gev_quantile_from_minus_log_p(d.location(), d.scale(), d.shape(), -std::log(p));
}
double quantile(const Complement<Gev>& c) {
  check_probability("quantile(complement(Gev))", c.value);
  return gev_quantile_from_minus_log_p(c.dist.location(), c.dist.scale(), c.dist.shape(),
                                       -std::log1p(-c.value));
}

// GPD of the excess x - u: F = 1 - t^(-1/xi) = -expm1(-w); f = sigma^-1 t^(-1/xi - 1)
// (Coles 2001, eq. 4.2 and 4.10).
double pdf(const Gpd& d, double x) { return std::exp(log_pdf(d, x)); }
double log_pdf(const Gpd& d, double x) {
  if (x < d.threshold()) return -inf;
  const double w = log1p_over_shape((x - d.threshold()) / d.scale(), d.shape());
  if (std::isnan(w)) return -inf;
  return -std::log(d.scale()) - (1.0 + d.shape()) * w;
}
double cdf(const Gpd& d, double x) {
  if (x <= d.threshold()) return 0.0;
  const double w = log1p_over_shape((x - d.threshold()) / d.scale(), d.shape());
  if (std::isnan(w)) return 1.0;
  return -std::expm1(-w);
}
double cdf(const Complement<Gpd>& c) {
  const Gpd& d = c.dist;
  if (c.value <= d.threshold()) return 1.0;
  const double w = log1p_over_shape((c.value - d.threshold()) / d.scale(), d.shape());
  if (std::isnan(w)) return 0.0;
  return std::exp(-w);
}
namespace {
// x_q = u + sigma (q^(-xi) - 1)/xi (Coles 2001, inverse of eq. 4.2) = u + sigma expm1(xi s)/xi with
// s = -log q, q the exceedance probability.
double gpd_quantile_from_minus_log_q(const Gpd& d, double s) {
  if (std::isinf(s)) return d.shape() < 0.0 ? d.threshold() - d.scale() / d.shape() : inf;
  return d.threshold() + d.scale() * expm1_over_shape(s, d.shape()).a;
}
}  // namespace
double quantile(const Gpd& d, double p) {
  check_probability("quantile(Gpd)", p);
  return gpd_quantile_from_minus_log_q(d, -std::log1p(-p));
}
double quantile(const Complement<Gpd>& c) {
  check_probability("quantile(complement(Gpd))", c.value);
  return gpd_quantile_from_minus_log_q(c.dist, -std::log(c.value));
}

}  // namespace tidewright::extremes
