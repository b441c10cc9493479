// The rate sum's own vector exp and log (src/extremes/vector_math.hpp) beside SLEEF's
// (libsleef-dev; built into tidewright_bench when it is installed), on the kernel's pattern
// exp(ln t / -xi) for 65,536 values of t in [0.05, 20], xi = 0.17, in the AVX-512 and AVX2
// builds; and the largest relative error of each against the same in long double.
// Run: build/ci/tidewright_bench --benchmark_filter=VectorMath
#include <benchmark/benchmark.h>
#include <immintrin.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <random>
#include <vector>

// SLEEF 3.5's functions for AVX-512 and AVX2 (libsleef's ABI), declared here: sleef.h declares
// them only when the whole file is built for those instruction sets, and this one picks them
// function by function.
extern "C" {
__m512d Sleef_expd8_u10avx512f(__m512d);
__m512d Sleef_logd8_u10avx512f(__m512d);
__m256d Sleef_expd4_u10avx2(__m256d);
__m256d Sleef_logd4_u10avx2(__m256d);
}

namespace {

#pragma GCC diagnostic ignored "-Wpsabi"
#pragma GCC push_options
#pragma GCC optimize("fp-contract=fast")
#include "vector_math.hpp"

const std::vector<double>& values() {
  static const std::vector<double> v = [] {
    std::mt19937_64 g(20261204);
    std::uniform_real_distribution<double> u(0.05, 20.0);
    std::vector<double> out(std::size_t{1} << 16U);
    for (auto& x : out) x = u(g);
    return out;
  }();
  return v;
}
constexpr double neg_inv_shape = -1.0 / 0.17;

template <int Bytes>
__attribute__((always_inline)) inline double own_sum(const std::vector<double>& t) {
  using L = Lanes<Bytes>;
  using Vd = typename L::Vd;
  Vd acc = splat<Vd>(0.0);
  for (std::size_t i = 0; i < t.size(); i += L::count) {
    Vd x;
    std::memcpy(&x, &t[i], sizeof x);
    acc += vector_exp<L>(vector_log<L>(x) * neg_inv_shape);
  }
  double s = 0.0;
  for (std::size_t k = 0; k < L::count; ++k) s += acc[k];
  return s;
}

__attribute__((target("arch=x86-64-v4"))) double own_v4(const std::vector<double>& t) { return own_sum<64>(t); }
__attribute__((target("arch=x86-64-v3"))) double own_v3(const std::vector<double>& t) { return own_sum<32>(t); }

__attribute__((target("arch=x86-64-v4"))) double sleef_v4(const std::vector<double>& t) {
  __m512d acc = _mm512_setzero_pd();
  const __m512d c = _mm512_set1_pd(neg_inv_shape);
  for (std::size_t i = 0; i < t.size(); i += 8) {
    acc = _mm512_add_pd(acc, Sleef_expd8_u10avx512f(_mm512_mul_pd(Sleef_logd8_u10avx512f(_mm512_loadu_pd(&t[i])), c)));
  }
  double lanes[8];
  _mm512_storeu_pd(lanes, acc);
  double sum = 0.0;
  for (const double v : lanes) sum += v;
  return sum;
}

__attribute__((target("arch=x86-64-v3"))) double sleef_v3(const std::vector<double>& t) {
  __m256d acc = _mm256_setzero_pd();
  const __m256d c = _mm256_set1_pd(neg_inv_shape);
  for (std::size_t i = 0; i < t.size(); i += 4) {
    acc = _mm256_add_pd(acc, Sleef_expd4_u10avx2(_mm256_mul_pd(Sleef_logd4_u10avx2(_mm256_loadu_pd(&t[i])), c)));
  }
  double lanes[4];
  _mm256_storeu_pd(lanes, acc);
  return lanes[0] + lanes[1] + lanes[2] + lanes[3];
}

template <double (*F)(const std::vector<double>&)>
void run(benchmark::State& state, bool supported) {
  if (!supported) {
    state.SkipWithError("this processor lacks the instruction set");
    return;
  }
  const auto& t = values();
  for (auto _ : state) benchmark::DoNotOptimize(F(t));
  state.SetItemsProcessed(state.iterations() * static_cast<std::int64_t>(t.size()));
}

bool has_v4() {
  __builtin_cpu_init();
  return __builtin_cpu_supports("x86-64-v4");
}
bool has_v3() {
  __builtin_cpu_init();
  return __builtin_cpu_supports("x86-64-v3");
}

void BM_VectorMathOwnAvx512(benchmark::State& s) { run<own_v4>(s, has_v4()); }
void BM_VectorMathPeerSleefU10Avx512(benchmark::State& s) { run<sleef_v4>(s, has_v4()); }
void BM_VectorMathOwnAvx2(benchmark::State& s) { run<own_v3>(s, has_v3()); }
void BM_VectorMathPeerSleefU10Avx2(benchmark::State& s) { run<sleef_v3>(s, has_v3()); }

// Largest relative error of exp(ln t * c), each way, against long double.
__attribute__((target("arch=x86-64-v4"))) void errors(double& own, double& sleef) {
  const auto& t = values();
  using L = Lanes<64>;
  for (std::size_t i = 0; i < t.size(); i += 8) {
    L::Vd x;
    std::memcpy(&x, &t[i], sizeof x);
    const L::Vd a = vector_exp<L>(vector_log<L>(x) * neg_inv_shape);
    double b[8];
    _mm512_storeu_pd(b, Sleef_expd8_u10avx512f(
                            _mm512_mul_pd(Sleef_logd8_u10avx512f(_mm512_loadu_pd(&t[i])), _mm512_set1_pd(neg_inv_shape))));
    for (std::size_t k = 0; k < 8; ++k) {
      const long double ref = std::exp(std::log(static_cast<long double>(t[i + k])) * neg_inv_shape);
      own = std::max(own, static_cast<double>(std::fabs((a[k] - ref) / ref)));
      sleef = std::max(sleef, static_cast<double>(std::fabs((b[k] - ref) / ref)));
    }
  }
}

void BM_VectorMathRelativeErrors(benchmark::State& state) {
  if (!has_v4()) {
    state.SkipWithError("this processor lacks AVX-512");
    return;
  }
  double own = 0.0;
  double sleef = 0.0;
  for (auto _ : state) errors(own, sleef);
  state.counters["own_max_rel_err_e15"] = own * 1e15;
  state.counters["sleef_u10_max_rel_err_e15"] = sleef * 1e15;
}
#pragma GCC pop_options

}  // namespace

BENCHMARK(BM_VectorMathOwnAvx512);
BENCHMARK(BM_VectorMathPeerSleefU10Avx512);
BENCHMARK(BM_VectorMathOwnAvx2);
BENCHMARK(BM_VectorMathPeerSleefU10Avx2);
BENCHMARK(BM_VectorMathRelativeErrors)->Iterations(1);
