// The synthetic hourly tide-gauge record of Quillhaven, an INVENTED harbour (invented data —
// not a real place, not for any real decision). A seeded generator: the same design and seed
// give the same rows and the same CSV bytes.
//
// Glossary (names in code → symbols in demo_coast/README.md):
//   t                    time, UTC (Unix seconds); t_h = hours since 2000-01-01T00:00Z
//   mean_level_m         Z0, mean sea level above QCD at reference_year
//   trend_m_per_yr       b, linear mean-sea-level trend
//   interannual_*        η_y, AR(1) year-to-year mean-sea-level anomaly (sd, lag-1 correlation)
//   seasonal_*           Sa, annual mean-sea-level cycle (amplitude, day of the peak)
//   constituents         H_k, g_k, ω_k: amplitude, phase lag, angular speed of constituent k
//   f_k(N), u_k(N)       nodal amplitude factor and phase correction, N = lunar node longitude
//   residual_*           r, AR(1) hourly meteorological residual (sd, lag-1 correlation)
//   surges               storm surges: seasonal Poisson events, GPD peak heights S
//   noise_sd_m           ε, white measurement noise
#pragma once

#include <chrono>
#include <cstddef>
#include <cstdint>
#include <filesystem>
#include <string>
#include <vector>

namespace tidewright::demo {

// Which nodal correction a constituent takes (Pugh 1987, Table 4.3).
enum class NodalGroup { none, m2, k1, o1 };

struct TidalConstituent {
  std::string name;
  double amplitude_m = 0.0;
  double phase_lag_deg = 0.0;  // relative to 2000-01-01T00:00Z (invented, not Greenwich)
  double period_h = 0.0;
  NodalGroup nodal = NodalGroup::none;
};

struct SurgeDesign {
  double rate_per_yr = 6.0;          // mean number of events a year (invented)
  double seasonal_modulation = 0.9;  // rate(t) = rate·(1 + m·cos(2π(day − peak)/365.2422))
  double peak_day_of_year = 10.0;    // mid-January storm season peak (invented)
  double threshold_m = 0.30;         // u: smallest peak height
  double gpd_scale_m = 0.15;         // σ of the peak excess over u
  double gpd_shape = -0.1;           // ξ (Coles 2001 sign: > 0 is a heavy tail)
  double rise_h = 9.0;               // Gaussian rise, standard deviation in hours
  double decay_h = 20.0;             // exponential decay time after the peak, hours
};

enum class GapKind {
  absent,       // no rows at all for these hours (the reader sees irregular sampling)
  na_rows,      // rows present, level written "NA"
  empty_cells,  // rows present, level cell empty
};

struct RecordGap {
  std::chrono::sys_days first;  // first missing day, 00:00 UTC
  std::chrono::sys_days end;    // first day after the gap (exclusive)
  GapKind kind = GapKind::absent;
};

struct TideRecordDesign {
  int first_year = 1975;
  int last_year = 2024;
  double reference_year = 2000.0;      // epoch of mean_level_m
  double mean_level_m = 2.10;          // invented
  double trend_m_per_yr = 0.0025;      // 2.5 mm/yr, invented (of the order of 20th-century rise)
  double interannual_sd_m = 0.02;      // invented
  double interannual_ar1 = 0.3;        // invented
  double seasonal_amplitude_m = 0.05;  // invented
  double seasonal_peak_day = 320.0;    // mid-November, invented
  double residual_sd_m = 0.05;         // invented
  double residual_ar1_per_h = 0.97;    // e-folding time about 33 h, invented
  double noise_sd_m = 0.005;           // invented
  bool nodal_modulation = true;
  std::vector<TidalConstituent> constituents;
  SurgeDesign surges;
  std::vector<RecordGap> gaps;
  int scattered_sentinel_rows = 24;  // single rows written as the sentinel
  int scattered_na_rows = 12;        // single rows written "NA"
  double sentinel_value = -99.0;     // written "-99"

  // The design of the demo study (the values above, five constituents and the gap list in
  // demo_coast/README.md).
  [[nodiscard]] static TideRecordDesign standard();
  // The standard design cut to the years first_year..last_year (gaps outside dropped).
  [[nodiscard]] static TideRecordDesign standard_years(int first_year, int last_year);
};

enum class RowState : std::uint8_t { value, na, empty, sentinel };

struct SurgeEvent {
  std::int64_t peak_time_s = 0;  // Unix seconds, UTC
  double peak_m = 0.0;
};

struct TideRecord {
  TideRecordDesign design;
  unsigned long long seed = 0;
  std::size_t hours_in_span = 0;     // hourly slots from first_year-01-01 to last_year-12-31 23h
  std::vector<std::int64_t> time_s;  // the rows written (absent gaps left out), Unix seconds
  std::vector<double> level_m;       // the generated level of each row, rounded to mm
  std::vector<RowState> state;       // what the CSV holds for the row
  std::vector<SurgeEvent> surges;    // every event drawn, also those in gaps

  [[nodiscard]] std::size_t count(RowState s) const;
};

// Nodal factor f and phase correction u (degrees) of a group at lunar node longitude N
// (degrees). Pugh 1987, Tides, Surges and Mean Sea-Level, Table 4.3 (from memory).
struct NodalCorrection {
  double f = 1.0;
  double u_deg = 0.0;
};
[[nodiscard]] NodalCorrection nodal_correction(NodalGroup group, double node_longitude_deg);
// Longitude of the Moon's mean ascending node at Unix time t (degrees, in [0, 360)).
[[nodiscard]] double lunar_node_longitude_deg(std::int64_t unix_s);

// Throws InputError (where = "demo record design") for a design that cannot be generated.
[[nodiscard]] TideRecord generate_tide_record(const TideRecordDesign& design,
                                              unsigned long long seed);

// The CSV text: '#' comment lines saying the data are invented, a header "time,level_m",
// one row per hour with an ISO 8601 UTC time ("2001-01-01T00:00:00Z") and metres above QCD to
// mm ("NA", "" or "-99" for the faulty rows).
[[nodiscard]] std::string tide_record_csv(const TideRecord& record);
// Writes the CSV through common/atomic_output.hpp (refuses an existing file unless force).
void write_tide_record_csv(const TideRecord& record, const std::filesystem::path& path, bool force);

// "1975-01-01T00:00:00Z"
[[nodiscard]] std::string iso8601_utc(std::int64_t unix_s);

}  // namespace tidewright::demo
