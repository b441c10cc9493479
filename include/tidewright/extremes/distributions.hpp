// Gumbel, GEV and GPD distributions behind a Boost.Math-like interface: a small value type per
// distribution, validated on construction, and free functions pdf, log_pdf, cdf, quantile, with
// complement(dist, x) for upper tails computed through expm1/log1p (small exceedance
// probabilities keep their relative accuracy). Boost.Math has a Gumbel (extreme_value) but no
// GEV or GPD, hence these.
//
// Glossary (Coles 2001, An Introduction to Statistical Modeling of Extreme Values):
//   z, x      level (any unit; metres in tidewright)
//   mu        location, sigma scale (> 0), xi shape (xi > 0 heavy tail, Coles' sign; SciPy's
//             genextreme c is -xi, Hosking's k is -xi)
//   u         GPD threshold; y = (z - mu)/sigma or (x - u)/sigma the standardised level
//   t         1 + xi y, which must be > 0 inside the support
//   w         log(t)/xi (-> y as xi -> 0), so that t^(-1/xi) = exp(-w)
//   p         non-exceedance probability F(z); q = 1 - p the exceedance probability
#pragma once

#include <string_view>

namespace tidewright::extremes {

// Below this |xi y| the functions use the series of log1p(xi y)/xi in xi rather than the
// closed form (see docs/methods-extremes.md, "xi near 0"). At the switch the closed forms lose
// about eps/|xi y| to cancellation in the first derivative in xi and, measured against long
// double, up to 1.3e-13 relative in the second (tests/extremes/distributions_test.cpp); the
// 24-term series leaves a truncation error below 0.1^24.
inline constexpr double small_shape_argument = 0.1;

// log(1 + xi y)/xi and its first two derivatives in xi, stable as xi -> 0.
struct ShapeTransform {
  double w = 0.0;         // log1p(xi y)/xi
  double dw_dxi = 0.0;    // d w / d xi
  double d2w_dxi2 = 0.0;  // d^2 w / d xi^2
};
[[nodiscard]] ShapeTransform shape_transform(double y, double xi);
// log1p(xi y)/xi alone (y when xi = 0); -inf scaled: returns NaN outside 1 + xi y > 0.
[[nodiscard]] double log1p_over_shape(double y, double xi);
// expm1(xi s)/xi and its first two derivatives in xi, stable as xi -> 0 (s when xi = 0).
struct ExpShape {
  double a = 0.0;
  double da_dxi = 0.0;
  double d2a_dxi2 = 0.0;
};
[[nodiscard]] ExpShape expm1_over_shape(double s, double xi);

class Gumbel {
 public:
  Gumbel(double location, double scale);
  [[nodiscard]] double location() const { return mu_; }
  [[nodiscard]] double scale() const { return sigma_; }

 private:
  double mu_;
  double sigma_;
};

class Gev {
 public:
  Gev(double location, double scale, double shape);
  [[nodiscard]] double location() const { return mu_; }
  [[nodiscard]] double scale() const { return sigma_; }
  [[nodiscard]] double shape() const { return xi_; }

 private:
  double mu_;
  double sigma_;
  double xi_;
};

// Generalised Pareto distribution of X for X > u (the excess X - u is GPD(sigma, xi)).
class Gpd {
 public:
  Gpd(double threshold, double scale, double shape);
  [[nodiscard]] double threshold() const { return u_; }
  [[nodiscard]] double scale() const { return sigma_; }
  [[nodiscard]] double shape() const { return xi_; }

 private:
  double u_;
  double sigma_;
  double xi_;
};

// complement(dist, x) as in Boost.Math: cdf(complement(d, x)) = 1 - F(x) computed directly,
// quantile(complement(d, q)) = the level exceeded with probability q.
template <class Dist>
struct Complement {
  const Dist& dist;
  double value;
};
template <class Dist>
[[nodiscard]] Complement<Dist> complement(const Dist& dist, double value) {
  return Complement<Dist>{dist, value};
}

[[nodiscard]] double pdf(const Gumbel& d, double z);
[[nodiscard]] double log_pdf(const Gumbel& d, double z);
[[nodiscard]] double cdf(const Gumbel& d, double z);
[[nodiscard]] double cdf(const Complement<Gumbel>& c);
[[nodiscard]] double quantile(const Gumbel& d, double p);
[[nodiscard]] double quantile(const Complement<Gumbel>& c);

[[nodiscard]] double pdf(const Gev& d, double z);
[[nodiscard]] double log_pdf(const Gev& d, double z);  // -inf outside the support
[[nodiscard]] double cdf(const Gev& d, double z);
[[nodiscard]] double cdf(const Complement<Gev>& c);
[[nodiscard]] double quantile(const Gev& d, double p);
[[nodiscard]] double quantile(const Complement<Gev>& c);

[[nodiscard]] double pdf(const Gpd& d, double x);
[[nodiscard]] double log_pdf(const Gpd& d, double x);  // -inf outside the support
[[nodiscard]] double cdf(const Gpd& d, double x);
[[nodiscard]] double cdf(const Complement<Gpd>& c);
[[nodiscard]] double quantile(const Gpd& d, double p);
[[nodiscard]] double quantile(const Complement<Gpd>& c);

// Throws InputError naming function, parameter and value; shared by the distributions and fits.
void check_scale(std::string_view function, double scale);
void check_finite(std::string_view function, std::string_view parameter, double value);
void check_probability(std::string_view function, double p);

}  // namespace tidewright::extremes
