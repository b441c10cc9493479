// Reading a 50-year hourly water-level series (438,312 rows of "YYYY-MM-DDThh:mm:ssZ,level"),
// beside Debian's Python reading the same file in the same run: the csv module with
// datetime.fromisoformat, numpy.genfromtxt, and pandas.read_csv with to_datetime
// (tests/benchmarks/record_read_peer.py). Also the annual maxima and peaks over threshold of
// the series once read. Figures: docs/performance.md, "Reading records".
#include <benchmark/benchmark.h>

#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

#include "tidewright/common/csv.hpp"
#include "tidewright/record/block_maxima.hpp"
#include "tidewright/record/peaks_over_threshold.hpp"
#include "tidewright/record/timestamp.hpp"
#include "tidewright/record/water_level_series.hpp"

#ifndef TIDEWRIGHT_PYTHON
#define TIDEWRIGHT_PYTHON "/usr/bin/python3"  // Debian's, with numpy and pandas
#endif

namespace tr = tidewright::record;

namespace {

constexpr int record_years = 50;

// An invented series: 1970-2019 hourly, a semidiurnal tide (12.42 h, 1 m), a fortnightly
// modulation, a 2 mm/yr trend and a deterministic storm surge now and then; millimetre text.
const std::filesystem::path& series_file() {
  static const std::filesystem::path path = [] {
    auto p = std::filesystem::temp_directory_path() /
             ("tidewright-record-bench-" + std::to_string(record_years) + "y.csv");
    std::ofstream out(p);
    out << "time,level\n";
    const std::int64_t start = tr::utc_s_of_month_start(1970, 1);
    const std::int64_t end = tr::utc_s_of_month_start(1970 + record_years, 1);
    char line[64];
    for (std::int64_t t = start; t < end; t += 3600) {
      const double hours = static_cast<double>(t - start) / 3600.0;
      const double tide = std::cos(2.0 * M_PI * hours / 12.42) *
                          (1.0 + 0.3 * std::cos(2.0 * M_PI * hours / (14.77 * 24.0)));
      const double surge = std::fmod(hours * 0.618034, 500.0) < 6.0 ? 0.8 : 0.0;
      const double trend = 0.002 * hours / (365.2425 * 24.0);
      const std::string stamp = tr::format_utc_timestamp(t);
      std::snprintf(line, sizeof line, "%s,%.3f\n", stamp.c_str(), 2.0 + tide + surge + trend);
      out << line;
    }
    return p;
  }();
  return path;
}

void BM_ReadWaterLevelSeries(benchmark::State& state) {
  const auto& path = series_file();
  std::size_t n = 0;
  for (auto _ : state) {
    const auto s = tr::read_water_level_series(path);
    n = s.size();
    benchmark::DoNotOptimize(s.level_m.data());
  }
  state.counters["rows"] = static_cast<double>(n);
  state.counters["rows_per_s"] =
      benchmark::Counter(static_cast<double>(n), benchmark::Counter::kIsIterationInvariantRate);
}
BENCHMARK(BM_ReadWaterLevelSeries)->Unit(benchmark::kMillisecond);

// The shared CSV reader alone (common/csv.hpp), the floor under the record reader.
void BM_CsvTableReadOnly(benchmark::State& state) {
  for (auto _ : state) {
    const auto table = tidewright::CsvTable::read(series_file());
    benchmark::DoNotOptimize(table.rows().data());
  }
}
BENCHMARK(BM_CsvTableReadOnly)->Unit(benchmark::kMillisecond);

// The peer prints the wall-clock and CPU seconds its reading took; the wall-clock time is the
// iteration time (manual timing), so the interpreter's start-up and imports are not counted
// against it, and the CPU time is the counter cpu_ms (compare it with the CPU column of the
// tidewright rows on a loaded machine).
void peer(benchmark::State& state, const char* method) {
  const auto& path = series_file();
  const std::string cmd = std::string(TIDEWRIGHT_PYTHON) +
                          " " TIDEWRIGHT_SOURCE_DIR "/tests/benchmarks/record_read_peer.py " +
                          method + " '" + path.string() + "'";
  for (auto _ : state) {
    FILE* pipe = popen(cmd.c_str(), "r");
    if (pipe == nullptr) {
      state.SkipWithError("cannot start Debian's python3");
      return;
    }
    char buf[128] = {};
    const bool got = std::fgets(buf, sizeof buf, pipe) != nullptr;
    const int status = pclose(pipe);
    double seconds = 0.0;
    double cpu_seconds = 0.0;
    double rows = 0.0;
    if (!got || status != 0 ||
        std::sscanf(buf, "%lf %lf %lf", &seconds, &cpu_seconds, &rows) != 3) {
      state.SkipWithError("the Python peer failed (needs python3-numpy and python3-pandas)");
      return;
    }
    state.SetIterationTime(seconds);
    state.counters["rows"] = rows;
    state.counters["cpu_ms"] = 1000.0 * cpu_seconds;
  }
}
void BM_Peer_PythonCsvModule(benchmark::State& state) { peer(state, "csv"); }
void BM_Peer_NumpyGenfromtxt(benchmark::State& state) { peer(state, "genfromtxt"); }
void BM_Peer_PandasReadCsv(benchmark::State& state) { peer(state, "pandas"); }
BENCHMARK(BM_Peer_PythonCsvModule)->UseManualTime()->Iterations(3)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_Peer_NumpyGenfromtxt)->UseManualTime()->Iterations(3)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_Peer_PandasReadCsv)->UseManualTime()->Iterations(3)->Unit(benchmark::kMillisecond);

const tr::WaterLevelSeries& loaded() {
  static const tr::WaterLevelSeries s = tr::read_water_level_series(series_file());
  return s;
}

void BM_AnnualMaximaLinearDetrend(benchmark::State& state) {
  tr::AnnualMaximaOptions o;
  o.detrend = tr::DetrendMethod::linear;
  for (auto _ : state) {
    const auto am = tr::annual_maxima_from_series(loaded(), o);
    benchmark::DoNotOptimize(am.level_m.data());
  }
}
BENCHMARK(BM_AnnualMaximaLinearDetrend)->Unit(benchmark::kMillisecond);

void BM_PeaksOverThreshold997WithRateCurve(benchmark::State& state) {
  std::size_t curve = 0;
  for (auto _ : state) {
    const auto pot = tr::peaks_over_threshold(loaded());
    curve = pot.below_threshold.level_m.size();
    benchmark::DoNotOptimize(pot.level_m.data());
  }
  state.counters["curve_points"] = static_cast<double>(curve);
}
BENCHMARK(BM_PeaksOverThreshold997WithRateCurve)->Unit(benchmark::kMillisecond);

}  // namespace
