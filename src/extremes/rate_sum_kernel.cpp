// The batch exceedance-rate sum sum_i w_i N_0(z - d_i) and its z-derivatives
// (StillWaterModel::weighted_shifted_rates), kept in a file of its own: a vector exp and log
// and one kernel in three builds chosen at run time. Why it is hand-written: docs/design.md,
// "What stays hand-written".
#include "rate_sum_kernel.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <limits>
#include <utility>

namespace tidewright::extremes::detail {
namespace {

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
// The lanes and the vector exp and log, defined after the pragmas above so they take them.
#include "vector_math.hpp"

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

std::vector<std::string_view> rate_sum_build_names() {
  std::vector<std::string_view> names;
#if defined(TIDEWRIGHT_VECTOR_RATES)
  for (const auto& b : sum_builds()) names.push_back(b.first);
#else
  names.emplace_back("scalar");
#endif
  return names;
}

RateDerivatives batch_rate_sum(const StillWaterModel& m, std::string_view build, double level_m,
                               std::span<const double> shift_m, std::span<const double> weight, bool derivatives) {
#if defined(TIDEWRIGHT_VECTOR_RATES)
  if (build.empty()) return batch_sum(m, sum_function(), level_m, shift_m, weight, derivatives);
  for (const auto& b : sum_builds()) {
    if (b.first == build) return batch_sum(m, b.second, level_m, shift_m, weight, derivatives);
  }
  return batch_sum(m, sum_function(), level_m, shift_m, weight, derivatives);
#else
  (void)build;
  RateDerivatives sum;
  for (std::size_t i = 0; i < shift_m.size(); ++i) {
    if (!(weight[i] > 0.0)) continue;
    const RateDerivatives r = derivatives ? m.annual_exceedance_rate_derivatives(level_m - shift_m[i])
                                          : RateDerivatives{m.annual_exceedance_rate(level_m - shift_m[i]), 0.0, 0.0};
    sum.rate += weight[i] * r.rate;
    sum.first += weight[i] * r.first;
    sum.second += weight[i] * r.second;
  }
  return sum;
#endif
}

}  // namespace tidewright::extremes::detail
