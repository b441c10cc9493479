#include "tidewright/extremes/still_water_model.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <limits>
#include <utility>

#include "tidewright/common/error.hpp"

namespace tidewright::extremes {
namespace {

// Below this |xi| the xi -> 0 limit is used through log1p/expm1 series, avoiding 0/0.
constexpr double xi_small = 1e-9;

// [1 + xi y]^(-1/xi) with y = (z - m)/sigma; the xi -> 0 limit is exp(-y) (Coles 2001, §3.1.3).
double tail_power(double y, double xi) {
  if (std::abs(xi) < xi_small) return std::exp(-y);
  const double t = 1.0 + xi * y;
  if (t <= 0.0) return xi < 0.0 ? 0.0 : std::numeric_limits<double>::infinity();
  return std::exp(-std::log1p(xi * y) / xi);
}

// Inverse of tail_power: y with [1 + xi y]^(-1/xi) = r.
double inverse_tail_power(double r, double xi) {
  if (std::abs(xi) < xi_small) return -std::log(r);
  return std::expm1(-xi * std::log(r)) / xi;
}

// Below a GPD threshold: log-linear interpolation on the empirical curve, joined to lambda_u at
// u, without copying the curve; `slope` gets d ln N / dz of the segment used (0 below the
// first point).
double below_threshold_rate(const StillWaterModel& m, double level_m, double& slope) {
  const auto& c = m.below_threshold;
  if (c.level_m.empty()) {
    throw ComputationError("GPD model", "level " + std::to_string(level_m) +
                               " m lies below the threshold and no empirical rate curve is given",
                           "give the declustered peaks below the threshold or lower the threshold");
  }
  slope = 0.0;
  if (level_m <= c.level_m.front()) return c.rate_per_yr.front();
  // Points 0..n-1 of the curve, then u itself when the curve stops short of it.
  const std::size_t n = c.level_m.size();
  const std::size_t points = c.level_m.back() < m.threshold_m ? n + 1 : n;
  const auto level_at = [&](std::size_t j) { return j < n ? c.level_m[j] : m.threshold_m; };
  const auto rate_at = [&](std::size_t j) { return j < n ? c.rate_per_yr[j] : m.rate_per_yr; };
  const auto pos = static_cast<std::size_t>(std::upper_bound(c.level_m.begin(), c.level_m.end(), level_m) -
                                            c.level_m.begin());
  const std::size_t hi = std::min(pos, points - 1);
  const std::size_t lo = hi - 1;
  const double w = (level_m - level_at(lo)) / (level_at(hi) - level_at(lo));
  const double log_lo = std::log(rate_at(lo));
  const double log_hi = std::log(rate_at(hi));
  slope = (log_hi - log_lo) / (level_at(hi) - level_at(lo));
  return std::exp((1.0 - w) * log_lo + w * log_hi);
}

// N and its z-derivatives for c [1 + xi y]^(-1/xi), y = (z - m)/sigma (see the header).
RateDerivatives tail_derivatives(double y, double xi, double scale_m, double factor) {
  const double n = factor * tail_power(y, xi);
  if (std::abs(xi) < xi_small) return {n, -n / scale_m, n / (scale_m * scale_m)};
  const double t = 1.0 + xi * y;
  if (t <= 0.0) {
    return xi < 0.0 ? RateDerivatives{}
                    : RateDerivatives{n, -std::numeric_limits<double>::infinity(), n};
  }
  const double st = scale_m * t;
  return {n, -n / st, (1.0 + xi) * n / (st * st)};
}

// --- Batch sums -------------------------------------------------------------------------
// Lanes of doubles through the GCC/Clang vector extension, in three builds of one kernel
// chosen at run time: 8 lanes in AVX-512 registers (x86-64-v4), 4 in AVX2 registers with FMA
// (x86-64-v3), and the portable SSE2 build, where 8 lanes (four register pairs per operation)
// measured faster than 4.
#if defined(__GNUC__)
#define TIDEWRIGHT_VECTOR_RATES 1
// The vector helpers are inlined, never called across an ABI boundary; GCC still warns about
// their vector arguments at the end of the file, so the note is silenced for the whole file.
#pragma GCC diagnostic ignored "-Wpsabi"
#if !defined(__clang__)
// Let the x86-64-v3/v4 builds fuse multiply-adds (ISO mode turns contraction off); the
// portable build has no FMA instruction, so its code is unchanged.
#pragma GCC push_options
#pragma GCC optimize("fp-contract=fast")
#endif
#define TIDEWRIGHT_INLINE inline __attribute__((always_inline))

template <int Bytes>
struct Lanes {
  typedef double Vd __attribute__((vector_size(Bytes)));
  typedef std::uint64_t Vu __attribute__((vector_size(Bytes)));
  typedef std::int64_t Vm __attribute__((vector_size(Bytes)));
  static constexpr std::size_t count = Bytes / sizeof(double);
};

template <class To, class From>
TIDEWRIGHT_INLINE To reinterpret(const From& from) {
  static_assert(sizeof(To) == sizeof(From));
  To to;
  std::memcpy(&to, &from, sizeof to);
  return to;
}
template <class V>
TIDEWRIGHT_INLINE V splat(double x) {
  return V{} + x;
}
// mask ? a : b, lane by lane (mask lanes all ones or all zeros, as comparisons give them).
template <class M, class V>
TIDEWRIGHT_INLINE V select(const M& mask, const V& a, const V& b) {
  return reinterpret<V>((mask & reinterpret<M>(a)) | (~mask & reinterpret<M>(b)));
}

// ln t for normal t > 0: t = 2^k m with m in [sqrt(2)/2, sqrt(2)), then the polynomial in
// s = (m - 1)/(m + 1) of fdlibm's e_log.c (Sun Microsystems 1993; error below 1 ulp).
template <class L>
TIDEWRIGHT_INLINE typename L::Vd vector_log(const typename L::Vd& t) {
  using Vd = typename L::Vd;
  using Vu = typename L::Vu;
  constexpr std::uint64_t sqrt_half_bits = 0x3fe6a09e667f3bcdULL;
  const Vu bits = reinterpret<Vu>(t);
  const Vu biased_k = (bits - sqrt_half_bits + (0x3ffULL << 52U)) >> 52U;  // k + 1023, logical shift
  const Vd m = reinterpret<Vd>(bits - ((biased_k - 0x3ffULL) << 52U));
  // k + 1023 placed in the mantissa of 2^52, then 2^52 + 1023 taken off: k as a double.
  const Vd k = reinterpret<Vd>(biased_k | 0x4330000000000000ULL) - (0x1p52 + 1023.0);
  const Vd f = m - 1.0;
  const Vd hfsq = 0.5 * f * f;
  const Vd s = f / (2.0 + f);
  const Vd z = s * s;
  const Vd w = z * z;
  const Vd t1 = w * (3.999999999940941908e-01 + w * (2.222219843214978396e-01 + w * 1.531383769920937332e-01));
  const Vd t2 = z * (6.666666666666735130e-01 +
                     w * (2.857142874366239149e-01 + w * (1.818357216161805012e-01 + w * 1.479819860511658591e-01)));
  const Vd r = t2 + t1;
  constexpr double ln2_hi = 6.93147180369123816490e-01;  // fdlibm's split of ln 2
  constexpr double ln2_lo = 1.90821492927058770002e-10;
  return k * ln2_hi - ((hfsq - (s * (hfsq + r) + k * ln2_lo)) - f);
}

// e^x: x = k ln2 + r with |r| <= ln2/2 (Cody & Waite 1980 reduction, fdlibm's split of ln 2),
// e^r by its Taylor polynomial of degree 13 (truncation below 5e-18 relative), times 2^k built
// in two factors so that results down to the smallest subnormal come out right.
template <class L>
TIDEWRIGHT_INLINE typename L::Vd vector_exp(const typename L::Vd& x_in) {
  using Vd = typename L::Vd;
  using Vu = typename L::Vu;
  const Vd lo = splat<Vd>(-746.0);  // below: 0; above 710: +inf
  const Vd hi = splat<Vd>(710.0);
  Vd x = select(x_in < lo, lo, x_in);
  x = select(x > hi, hi, x);
  constexpr double shifter = 0x1.8p52;  // adding it rounds to an integer kept in the low bits
  Vd kd = x * 1.44269504088896338700e+00 + shifter;
  const Vu kbits = reinterpret<Vu>(kd);
  kd = kd - shifter;
  const Vd r = (x - kd * 6.93147180369123816490e-01) - kd * 1.90821492927058770002e-10;
  // Estrin's scheme (pairs, then powers r^2, r^4, r^8): a short chain of dependent operations.
  const Vd r2 = r * r;
  const Vd r4 = r2 * r2;
  const Vd r8 = r4 * r4;
  const Vd q0 = 1.0 + r;
  const Vd q1 = 1.0 / 2.0 + r * (1.0 / 6.0);
  const Vd q2 = 1.0 / 24.0 + r * (1.0 / 120.0);
  const Vd q3 = 1.0 / 720.0 + r * (1.0 / 5040.0);
  const Vd q4 = 1.0 / 40320.0 + r * (1.0 / 362880.0);
  const Vd q5 = 1.0 / 3628800.0 + r * (1.0 / 39916800.0);
  const Vd q6 = 1.0 / 479001600.0 + r * (1.0 / 6227020800.0);
  const Vd p = (q0 + q1 * r2 + (q2 + q3 * r2) * r4) + ((q4 + q5 * r2) + q6 * r4) * r8;
  const Vu kb = kbits - 0x4338000000000000ULL + 2048ULL;        // k + 2048 >= 0
  const Vu half = kb >> 1U;                                     // floor(k/2) + 1024
  const Vd scale1 = reinterpret<Vd>((half - 1ULL) << 52U);      // 2^floor(k/2)
  const Vd scale2 = reinterpret<Vd>((kb - half - 1ULL) << 52U); // 2^(k - floor(k/2))
  return p * scale1 * scale2;
}

struct SumParameters {
  double origin_m;   // mu, or u for GPD
  double inv_scale;  // 1/sigma
  double shape;      // xi
  double factor;     // 1, or lambda_u for GPD
  bool power;        // |xi| >= xi_small: the power form, else exp(-y)
  bool gpd;
};

// Loop invariants held in registers; `outside_*` are N and N' beyond an end point (t <= 0).
template <class L>
struct Invariants {
  using Vd = typename L::Vd;
  Vd level, origin, inv_scale, shape, neg_inv_shape, factor, one_plus_shape, outside_n, outside_d1, threshold;
  Invariants(const SumParameters& p, double level_m, double threshold_m)
      : level(splat<Vd>(level_m)),
        origin(splat<Vd>(p.origin_m)),
        inv_scale(splat<Vd>(p.inv_scale)),
        shape(splat<Vd>(p.shape)),
        neg_inv_shape(splat<Vd>(p.power ? -1.0 / p.shape : 0.0)),
        factor(splat<Vd>(p.factor)),
        one_plus_shape(splat<Vd>(1.0 + p.shape)),
        outside_n(splat<Vd>(p.shape < 0.0 ? 0.0 : std::numeric_limits<double>::infinity())),
        outside_d1(splat<Vd>(p.shape < 0.0 ? 0.0 : -std::numeric_limits<double>::infinity())),
        threshold(splat<Vd>(threshold_m)) {}
};

template <class L, bool Derivatives, bool Power, bool Gpd>
TIDEWRIGHT_INLINE void accumulate_lanes(const StillWaterModel& model, const Invariants<L>& c,
                                        const typename L::Vd& shift, const typename L::Vd& w, typename L::Vd& sum0,
                                        typename L::Vd& sum1, typename L::Vd& sum2) {
  using Vd = typename L::Vd;
  using Vm = typename L::Vm;
  const Vd x = c.level - shift;
  const Vd y = (x - c.origin) * c.inv_scale;
  Vd n;
  Vd d1;
  Vd d2;
  if constexpr (Power) {
    const Vd u = c.shape * y;
    const Vd t = 1.0 + u;
    const Vd inv_t = 1.0 / t;
    // ln(1 + u) from ln t with t = fl(1 + u), corrected by (u - (t - 1))/t (Goldberg 1991,
    // ACM Comput. Surv. 23:5, theorem 4), so small xi y keeps log1p's accuracy.
    const Vd log1p_u = vector_log<L>(t) + (u - (t - 1.0)) * inv_t;
    const Vm inside = t > 0.0;
    n = select(inside, c.factor * vector_exp<L>(log1p_u * c.neg_inv_shape), c.outside_n);
    if constexpr (Derivatives) {
      const Vd g = c.inv_scale * inv_t;  // 1/(sigma t)
      d1 = select(inside, -n * g, c.outside_d1);
      d2 = select(inside, c.one_plus_shape * n * g * g, n);
    }
  } else {
    n = c.factor * vector_exp<L>(-y);
    if constexpr (Derivatives) {
      d1 = -n * c.inv_scale;
      d2 = n * (c.inv_scale * c.inv_scale);
    }
  }
  if constexpr (Gpd) {
    const Vm below = x < c.threshold;
    bool any = false;
    for (std::size_t j = 0; j < L::count; ++j) any = any || below[j] != 0;
    if (any) {
      for (std::size_t j = 0; j < L::count; ++j) {
        if (below[j] == 0) continue;
        double slope = 0.0;
        const double r = below_threshold_rate(model, x[j], slope);
        n[j] = r;
        if constexpr (Derivatives) {
          d1[j] = slope * r;
          d2[j] = slope * slope * r;
        }
      }
    }
  }
  const Vm used = w > 0.0;
  const Vd zero = splat<Vd>(0.0);
  sum0 += select(used, w * n, zero);
  if constexpr (Derivatives) {
    sum1 += select(used, w * d1, zero);
    sum2 += select(used, w * d2, zero);
  }
}

template <class L, bool Derivatives, bool Power, bool Gpd>
TIDEWRIGHT_INLINE RateDerivatives sum_lanes(const StillWaterModel& model, const SumParameters& p, double level_m,
                                            const double* shift, const double* weight, std::size_t count) {
  using Vd = typename L::Vd;
  constexpr std::size_t lanes = L::count;
  const Invariants<L> c(p, level_m, model.threshold_m);
  Vd sum0 = splat<Vd>(0.0);
  Vd sum1 = sum0;
  Vd sum2 = sum0;
  std::size_t i = 0;
  for (; i + lanes <= count; i += lanes) {
    Vd s;
    Vd w;
    std::memcpy(&s, shift + i, sizeof s);
    std::memcpy(&w, weight + i, sizeof w);
    accumulate_lanes<L, Derivatives, Power, Gpd>(model, c, s, w, sum0, sum1, sum2);
  }
  if (i < count) {  // the last few nodes, padded with zero weights
    Vd s = splat<Vd>(0.0);
    Vd w = s;
    for (std::size_t j = 0; i + j < count; ++j) {
      s[j] = shift[i + j];
      w[j] = weight[i + j];
    }
    accumulate_lanes<L, Derivatives, Power, Gpd>(model, c, s, w, sum0, sum1, sum2);
  }
  RateDerivatives out;
  for (std::size_t j = 0; j < lanes; ++j) {
    out.rate += sum0[j];
    out.first += sum1[j];
    out.second += sum2[j];
  }
  return out;
}

template <class L>
TIDEWRIGHT_INLINE RateDerivatives sum_kernel(const StillWaterModel& model, const SumParameters& p, double level_m,
                                             const double* shift, const double* weight, std::size_t count,
                                             bool derivatives) {
  // Spelt out rather than through a generic lambda: a lambda would not take on the target of
  // the function it sits in.
  if (derivatives) {
    if (p.gpd) {
      return p.power ? sum_lanes<L, true, true, true>(model, p, level_m, shift, weight, count)
                     : sum_lanes<L, true, false, true>(model, p, level_m, shift, weight, count);
    }
    return p.power ? sum_lanes<L, true, true, false>(model, p, level_m, shift, weight, count)
                   : sum_lanes<L, true, false, false>(model, p, level_m, shift, weight, count);
  }
  if (p.gpd) {
    return p.power ? sum_lanes<L, false, true, true>(model, p, level_m, shift, weight, count)
                   : sum_lanes<L, false, false, true>(model, p, level_m, shift, weight, count);
  }
  return p.power ? sum_lanes<L, false, true, false>(model, p, level_m, shift, weight, count)
                 : sum_lanes<L, false, false, false>(model, p, level_m, shift, weight, count);
}

using SumFunction = RateDerivatives (*)(const StillWaterModel&, const SumParameters&, double, const double*,
                                        const double*, std::size_t, bool);

RateDerivatives sum_portable(const StillWaterModel& model, const SumParameters& p, double level_m,
                             const double* shift, const double* weight, std::size_t count, bool derivatives) {
  return sum_kernel<Lanes<64>>(model, p, level_m, shift, weight, count, derivatives);
}

#if defined(__x86_64__) && !defined(__clang__)
__attribute__((target("arch=x86-64-v3"))) RateDerivatives sum_v3(const StillWaterModel& model,
                                                                 const SumParameters& p, double level_m,
                                                                 const double* shift, const double* weight,
                                                                 std::size_t count, bool derivatives) {
  return sum_kernel<Lanes<32>>(model, p, level_m, shift, weight, count, derivatives);
}
__attribute__((target("arch=x86-64-v4"))) RateDerivatives sum_v4(const StillWaterModel& model,
                                                                 const SumParameters& p, double level_m,
                                                                 const double* shift, const double* weight,
                                                                 std::size_t count, bool derivatives) {
  return sum_kernel<Lanes<64>>(model, p, level_m, shift, weight, count, derivatives);
}
#endif

// The builds this processor runs, best first.
std::vector<std::pair<std::string_view, SumFunction>> sum_builds() {
  std::vector<std::pair<std::string_view, SumFunction>> builds;
#if defined(__x86_64__) && !defined(__clang__)
  __builtin_cpu_init();
  if (__builtin_cpu_supports("x86-64-v4")) builds.emplace_back("x86-64-v4", &sum_v4);
  if (__builtin_cpu_supports("x86-64-v3")) builds.emplace_back("x86-64-v3", &sum_v3);
#endif
  builds.emplace_back("portable", &sum_portable);
  return builds;
}

// The best build, chosen once.
SumFunction sum_function() {
  static const SumFunction chosen = sum_builds().front().second;
  return chosen;
}
#if !defined(__clang__)
#pragma GCC pop_options
#endif

RateDerivatives batch_sum(const StillWaterModel& m, SumFunction build, double level_m,
                          std::span<const double> shift_m, std::span<const double> weight, bool derivatives) {
  // Errors are raised here, before a kernel runs: an exception thrown inside a run-time
  // dispatched build (GCC target_clones) ended in std::terminate, so the kernels throw nothing.
  // A GPD without a curve below u meets its error at the first node that falls below u.
  if (m.family == Family::gpd && m.below_threshold.level_m.empty()) {
    for (const double d : shift_m) {
      if (level_m - d < m.threshold_m) (void)m.annual_exceedance_rate(level_m - d);
    }
  }
  const double xi = m.family == Family::gumbel ? 0.0 : m.shape;
  const bool gpd = m.family == Family::gpd;
  const SumParameters p{gpd ? m.threshold_m : m.location_m, 1.0 / m.scale_m, xi, gpd ? m.rate_per_yr : 1.0,
                        std::abs(xi) >= xi_small, gpd};
  return build(m, p, level_m, shift_m.data(), weight.data(), shift_m.size(), derivatives);
}
#endif

}  // namespace

std::string_view family_name(Family family) {
  switch (family) {
    case Family::gumbel: return "gumbel";
    case Family::gev: return "gev";
    case Family::gpd: return "gpd";
  }
  return "unknown";
}

StillWaterModel StillWaterModel::squared_rates() const {
  StillWaterModel m = *this;
  m.scale_m = 0.5 * scale_m;
  m.shape = 0.5 * shape;
  m.rate_per_yr = rate_per_yr * rate_per_yr;
  for (double& r : m.below_threshold.rate_per_yr) r *= r;
  return m;
}

double StillWaterModel::annual_exceedance_rate(double level_m) const {
  const double xi = family == Family::gumbel ? 0.0 : shape;
  if (family != Family::gpd) return tail_power((level_m - location_m) / scale_m, xi);
  if (level_m >= threshold_m) return rate_per_yr * tail_power((level_m - threshold_m) / scale_m, xi);
  double slope = 0.0;
  return below_threshold_rate(*this, level_m, slope);
}

RateDerivatives StillWaterModel::annual_exceedance_rate_derivatives(double level_m) const {
  const double xi = family == Family::gumbel ? 0.0 : shape;
  if (family != Family::gpd) return tail_derivatives((level_m - location_m) / scale_m, xi, scale_m, 1.0);
  if (level_m >= threshold_m) {
    return tail_derivatives((level_m - threshold_m) / scale_m, xi, scale_m, rate_per_yr);
  }
  double slope = 0.0;
  const double r = below_threshold_rate(*this, level_m, slope);
  return {r, slope * r, slope * slope * r};
}

RateDerivatives StillWaterModel::weighted_shifted_rates(double level_m, std::span<const double> shift_m,
                                                        std::span<const double> weight, bool derivatives) const {
  if (shift_m.size() != weight.size()) {
    throw InputError("weighted rates", std::to_string(shift_m.size()) + " shifts for " +
                                           std::to_string(weight.size()) + " weights",
                     "give one weight per shift");
  }
#if defined(TIDEWRIGHT_VECTOR_RATES)
  return batch_sum(*this, sum_function(), level_m, shift_m, weight, derivatives);
#else
  RateDerivatives sum;
  for (std::size_t i = 0; i < shift_m.size(); ++i) {
    if (!(weight[i] > 0.0)) continue;
    const RateDerivatives r = derivatives ? annual_exceedance_rate_derivatives(level_m - shift_m[i])
                                          : RateDerivatives{annual_exceedance_rate(level_m - shift_m[i]), 0.0, 0.0};
    sum.rate += weight[i] * r.rate;
    sum.first += weight[i] * r.first;
    sum.second += weight[i] * r.second;
  }
  return sum;
#endif
}

std::vector<std::string_view> rate_sum_builds() {
  std::vector<std::string_view> names;
#if defined(TIDEWRIGHT_VECTOR_RATES)
  for (const auto& b : sum_builds()) names.push_back(b.first);
#else
  names.emplace_back("scalar");
#endif
  return names;
}

RateDerivatives weighted_shifted_rates_in_build(const StillWaterModel& m, std::string_view build, double level_m,
                                                std::span<const double> shift_m, std::span<const double> weight,
                                                bool derivatives) {
  const std::vector<std::string_view> names = rate_sum_builds();
  if (std::find(names.begin(), names.end(), build) == names.end()) {
    throw InputError("rate sum build '" + std::string(build) + "'", "is not one this processor runs",
                     "pick one of rate_sum_builds()");
  }
  if (shift_m.size() != weight.size()) return m.weighted_shifted_rates(level_m, shift_m, weight, derivatives);
#if defined(TIDEWRIGHT_VECTOR_RATES)
  for (const auto& b : sum_builds()) {
    if (b.first == build) return batch_sum(m, b.second, level_m, shift_m, weight, derivatives);
  }
#endif
  return m.weighted_shifted_rates(level_m, shift_m, weight, derivatives);
}

double StillWaterModel::level_for_rate(double rate) const {
  const double xi = family == Family::gumbel ? 0.0 : shape;
  if (family != Family::gpd) return location_m + scale_m * inverse_tail_power(rate, xi);
  if (rate <= rate_per_yr) return threshold_m + scale_m * inverse_tail_power(rate / rate_per_yr, xi);
  const auto& c = below_threshold;
  for (std::size_t i = c.level_m.size(); i-- > 0;) {
    const double r_hi = (i + 1 < c.level_m.size()) ? c.rate_per_yr[i + 1] : rate_per_yr;
    const double z_hi = (i + 1 < c.level_m.size()) ? c.level_m[i + 1] : threshold_m;
    if (rate <= c.rate_per_yr[i] && rate >= r_hi) {
      const double w = (std::log(rate) - std::log(c.rate_per_yr[i])) /
                       (std::log(r_hi) - std::log(c.rate_per_yr[i]));
      return c.level_m[i] + w * (z_hi - c.level_m[i]);
    }
  }
  throw ComputationError("GPD model", "rate " + std::to_string(rate) +
                             " per year is above every rate the model covers",
                         "ask for a rarer level or give more peaks below the threshold");
}

}  // namespace tidewright::extremes
