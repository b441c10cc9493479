// Per-cell products of the flood-threshold raster (flood_threshold.hpp): extent class and depth
// for a still-water level, annual exceedance probability (AEP) from an annual exceedance rate
// function, and the first year a cell's AEP passes a chosen value. Each is a pure function of
// one cell's values, so rasters are made block by block (see flood_map.hpp).
//
// Glossary: z elevation above the water-level datum (m); T flood threshold (m); h still-water
// level (m); N(h) annual exceedance rate of level h (per year), N_t(h) the same in year t;
// P annual exceedance probability; p* the chosen AEP for the first-year raster.
#pragma once

#include <cstddef>
#include <cstdint>
#include <functional>
#include <limits>
#include <vector>

namespace tidewright::terrain {

// Extent raster values (byte). Sea cells are a class of their own so that flooded land area
// never counts the sea.
enum class ExtentClass : std::uint8_t {
  dry = 0,                     // above h, or T > h and z > h
  connected_flooded = 1,       // T <= h: the sea reaches the cell over land no higher than h
  cut_off_low_ground = 2,  // z <= h but T > h: low ground the sea does not reach at h
  sea = 3,                     // a sea cell (T = -inf)
  nodata = 255,                // nodata and not sea
};

[[nodiscard]] ExtentClass classify_cell(float elevation_m, float threshold_m,
                                        double level_m) noexcept;

// Water depth h - z on connected flooded land (>= 0), NaN elsewhere (dry, cut off, sea,
// nodata). On a burned-in defence z is the crest, so a wall cell shows the depth over it.
[[nodiscard]] float flood_depth_m(float elevation_m, float threshold_m, double level_m) noexcept;

// Annual exceedance rate N(h), per year; must not increase with h.
using RateFunction = std::function<double(double level_m)>;

// P(T) = 1 - exp(-N(T)) (Poisson exceedances; docs/design.md, "The one idea") through a table
// of ln N at `points` evenly spaced levels on [lowest_m, highest_m] (the range of finite
// thresholds in the map), interpolated linearly in ln N. A table because N may be expensive
// (an expectation over a sea-level ensemble) and is needed once per cell. ln N is exact for a
// Gumbel tail and its interpolation error is at most h_step^2/8 max|d^2 ln N/dz^2| (the
// linear-interpolation error bound). The table is checked to be non-increasing in level
// (ComputationError otherwise, beyond a relative slack of 1e-9 for rounding), so P never rises
// with T. Default points: 4097 (about 2.5 mm spacing over 10 m; chosen here, not from a source).
class AepLookup {
 public:
  AepLookup(const RateFunction& rate, double lowest_m, double highest_m, std::size_t points = 4097);
  // P for a cell with threshold T: NaN for NaN (nodata) and for -inf (sea: no land AEP),
  // 0 for +inf (never reached), otherwise from the table (T clamped to the table's range).
  [[nodiscard]] float operator()(float threshold_m) const noexcept;
  [[nodiscard]] double rate_per_yr(double level_m) const noexcept;  // the interpolated N

 private:
  double lowest_m_;
  double step_m_;
  std::vector<double> log_rate_;  // ln N at each table level; -inf where N = 0
};

// The first year a cell's AEP reaches p*: the year's critical level c_t solves N_t(c_t) =
// -ln(1 - p*) (N_t non-increasing, so P_t(T) >= p* exactly when T <= c_t), found by bisection
// on [lowest_m, highest_m]; a cell's value is the first year (in the given order, ascending)
// with T <= c_t.
struct YearlyRate {
  int year = 0;
  RateFunction rate;
};

class FirstPassingYear {
 public:
  static constexpr std::int16_t nodata = -32768;  // sea and nodata cells
  static constexpr std::int16_t never = 0;        // land that does not reach p* in the years given
  static constexpr std::int16_t already_today = 1;  // land whose AEP reaches p* under today's rate
  // `today`, when given, is today's rate: cells that pass under it are already_today, not the
  // first projected year.
  FirstPassingYear(const std::vector<YearlyRate>& years, double aep, double lowest_m,
                   double highest_m, const RateFunction& today = {});
  [[nodiscard]] std::int16_t operator()(float threshold_m) const noexcept;
  // c_t per year: -inf when no land in range reaches p*, +inf when all of it does.
  [[nodiscard]] const std::vector<double>& critical_levels_m() const noexcept {
    return critical_m_;
  }
  [[nodiscard]] const std::vector<int>& years() const noexcept { return years_; }

 private:
  std::vector<int> years_;
  std::vector<double> critical_m_;
  double critical_today_m_ = -std::numeric_limits<double>::infinity();
};

}  // namespace tidewright::terrain
