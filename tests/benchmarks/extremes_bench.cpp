// Speed of the extreme-value fits on Port Pirie (Coles 2001, sec. 3.4.1; data
// tests/reference/data/portpirie.csv from R evd), with the peers R evd::fgev and SciPy
// genextreme.fit timed in the same run by tests/benchmarks/extremes_peer.R and .py.
//
//   build/release/tidewright_bench --benchmark_filter=Extremes
//
// The peer benchmarks run their script once (Rscript or /usr/bin/python3 must be installed)
// and report the script's own per-fit CPU time as manual time (the "Time" column of those two
// rows); compare it with the CPU column of ours: one fit of the same 65 values each.
#include <benchmark/benchmark.h>

#include <array>
#include <cstdio>
#include <memory>
#include <sstream>
#include <string>
#include <vector>

#include "tidewright/common/csv.hpp"
#include "tidewright/extremes/fit.hpp"
#include "tidewright/extremes/return_levels.hpp"

namespace tx = tidewright::extremes;

namespace {

const std::string data_path =
    std::string(TIDEWRIGHT_SOURCE_DIR) + "/tests/reference/data/portpirie.csv";

const std::vector<double>& port_pirie() {
  static const std::vector<double> v = [] {
    const auto table = tidewright::CsvTable::read(data_path);
    const std::size_t col = table.column("level_m");
    std::vector<double> out;
    for (const auto& row : table.rows()) out.push_back(*table.number(row, col));
    return out;
  }();
  return v;
}

void BM_ExtremesGevFit(benchmark::State& state) {
  for (auto _ : state) benchmark::DoNotOptimize(tx::fit_gev(port_pirie()));
}
BENCHMARK(BM_ExtremesGevFit)->Unit(benchmark::kMicrosecond);

// Fit plus delta and profile 95% intervals for the 10- and 100-year levels (Coles' example).
void BM_ExtremesGevFitDeltaProfile10And100(benchmark::State& state) {
  const std::vector<double> periods{10.0, 100.0};
  for (auto _ : state) {
    const auto f = tx::fit_gev(port_pirie());
    benchmark::DoNotOptimize(tx::return_levels_delta(f, periods));
    benchmark::DoNotOptimize(tx::return_levels_profile(f, periods));
  }
}
BENCHMARK(BM_ExtremesGevFitDeltaProfile10And100)->Unit(benchmark::kMicrosecond);

// Fit plus delta and profile intervals for the standard list of nine return periods.
void BM_ExtremesGevFitDeltaProfileStandard(benchmark::State& state) {
  for (auto _ : state) {
    const auto f = tx::fit_gev(port_pirie());
    benchmark::DoNotOptimize(tx::return_levels_delta(f, tx::standard_return_periods_yr));
    benchmark::DoNotOptimize(tx::return_levels_profile(f, tx::standard_return_periods_yr));
  }
}
BENCHMARK(BM_ExtremesGevFitDeltaProfileStandard)->Unit(benchmark::kMicrosecond);

// 1,000-sample parametric bootstrap of the standard return levels (fit included).
void BM_ExtremesGevBootstrap1000(benchmark::State& state) {
  tx::BootstrapOptions o;
  o.samples = 1000;
  for (auto _ : state) {
    const auto f = tx::fit_gev(port_pirie());
    benchmark::DoNotOptimize(tx::return_levels_bootstrap(f, tx::standard_return_periods_yr, o));
  }
}
BENCHMARK(BM_ExtremesGevBootstrap1000)->Unit(benchmark::kMillisecond);

// Runs a peer script and returns its per-fit seconds (first number after the tag), or -1.
double run_peer(const std::string& command, const std::string& tag) {
  std::unique_ptr<FILE, int (*)(FILE*)> pipe(popen(command.c_str(), "r"), pclose);
  if (!pipe) return -1.0;
  std::string out;
  std::array<char, 512> buf{};
  while (fgets(buf.data(), buf.size(), pipe.get()) != nullptr) out += buf.data();
  std::istringstream in(out);
  std::string word;
  while (in >> word) {
    if (word == tag) {
      double s = -1.0;
      in >> s;
      return s;
    }
  }
  return -1.0;
}

void peer(benchmark::State& state, const std::string& command, const std::string& tag) {
  for (auto _ : state) {
    const double s = run_peer(command, tag);
    if (s <= 0.0) {
      state.SkipWithError(("peer failed: " + command).c_str());
      return;
    }
    state.SetIterationTime(s);
  }
}

void BM_ExtremesPeerEvdFgev(benchmark::State& state) {
  peer(state,
       "Rscript " + std::string(TIDEWRIGHT_SOURCE_DIR) + "/tests/benchmarks/extremes_peer.R " +
           data_path + " 200",
       "fgev_seconds_per_fit");
}
BENCHMARK(BM_ExtremesPeerEvdFgev)->UseManualTime()->Iterations(1)->Unit(benchmark::kMicrosecond);

void BM_ExtremesPeerScipyGenextreme(benchmark::State& state) {
  peer(state,
       "/usr/bin/python3 " + std::string(TIDEWRIGHT_SOURCE_DIR) +
           "/tests/benchmarks/extremes_peer.py " + data_path + " 50",
       "genextreme_seconds_per_fit");
}
BENCHMARK(BM_ExtremesPeerScipyGenextreme)
    ->UseManualTime()
    ->Iterations(1)
    ->Unit(benchmark::kMicrosecond);

}  // namespace
