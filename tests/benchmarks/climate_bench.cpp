// Speed of the climate ensemble (10,000 members, built-in pathway "midway", all components)
// against a named peer in the same run: the same model vectorised in numpy
// (tests/reference/scripts/climate_ensemble_numpy.py, run with Debian's /usr/bin/python3).
// The peer's time is the CPU time of the ensemble computation it reports itself (imports
// excluded), fed to Google Benchmark as manual time; compare it with the C++ rows' CPU column
// (the machine is shared, so wall times are noisy). The peer's wall time is a counter. Figures go to docs/performance.md, "Projections".
#include <benchmark/benchmark.h>

#include <cstdio>
#include <string>

#include "tidewright/climate/projection.hpp"

namespace {

using tidewright::climate::builtin_pathway;
using tidewright::climate::ComponentEnsemble;
using tidewright::climate::project_global_components;
using tidewright::climate::ProjectionOptions;

void run_cpp(benchmark::State& state, int first, int last) {
  const auto scenario = builtin_pathway("midway", 2300);
  ProjectionOptions o;
  o.first_year = first;
  o.last_year = last;
  o.member_count = 10000;
  for (auto _ : state) {  // NOLINT(clang-analyzer-deadcode.DeadStores): Google Benchmark's loop idiom
    ComponentEnsemble e = project_global_components(scenario, o);
    benchmark::DoNotOptimize(e.rise_m.front().data());
  }
  state.counters["members"] = 10000;
  state.counters["output_years"] = last - first + 1;
}

void run_numpy(benchmark::State& state, int first, int last) {
  const std::string cmd = std::string("/usr/bin/python3 ") + TIDEWRIGHT_SOURCE_DIR +
                          "/tests/reference/scripts/climate_ensemble_numpy.py 10000 " + std::to_string(first) + " " +
                          std::to_string(last);
  for (auto _ : state) {  // NOLINT(clang-analyzer-deadcode.DeadStores): Google Benchmark's loop idiom
    FILE* pipe = popen(cmd.c_str(), "r");
    double seconds = -1.0;
    double wall = -1.0;
    double median = 0.0;
    if (pipe == nullptr || std::fscanf(pipe, "%lf %lf %lf", &seconds, &wall, &median) != 3) {
      if (pipe != nullptr) pclose(pipe);
      state.SkipWithError("numpy peer failed: needs /usr/bin/python3 with python3-numpy");
      return;
    }
    pclose(pipe);
    state.SetIterationTime(seconds);
    state.counters["wall_s"] = wall;
    state.counters["median_2100_m"] = median;
  }
}

void BM_ClimateEnsemble_Cpp_2020_2150(benchmark::State& s) { run_cpp(s, 2020, 2150); }
void BM_ClimateEnsemble_Cpp_1850_2149(benchmark::State& s) { run_cpp(s, 1850, 2149); }
void BM_ClimateEnsemble_Numpy_2020_2150(benchmark::State& s) { run_numpy(s, 2020, 2150); }
void BM_ClimateEnsemble_Numpy_1850_2149(benchmark::State& s) { run_numpy(s, 1850, 2149); }

}  // namespace

BENCHMARK(BM_ClimateEnsemble_Cpp_2020_2150)->Unit(benchmark::kMillisecond)->MinTime(2.0);
BENCHMARK(BM_ClimateEnsemble_Cpp_1850_2149)->Unit(benchmark::kMillisecond)->MinTime(2.0);
BENCHMARK(BM_ClimateEnsemble_Numpy_2020_2150)->Unit(benchmark::kMillisecond)->UseManualTime()->Iterations(3);
BENCHMARK(BM_ClimateEnsemble_Numpy_1850_2149)->Unit(benchmark::kMillisecond)->UseManualTime()->Iterations(3);
