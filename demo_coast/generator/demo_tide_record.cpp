// The synthetic tide-gauge record of Quillhaven (INVENTED data; see demo_tide_record.hpp for the
// glossary and demo_coast/README.md for the equations and the design values).
#include "demo_tide_record.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdio>
#include <numbers>
#include <string_view>

#include "demo_place.hpp"
#include "demo_random.hpp"
#include "tidewright/common/atomic_output.hpp"
#include "tidewright/common/error.hpp"

namespace tidewright::demo {
namespace {

using std::chrono::days;
using std::chrono::sys_days;
using std::chrono::year;
using std::chrono::year_month_day;
namespace chr = std::chrono;

constexpr double deg = std::numbers::pi / 180.0;
constexpr double seconds_per_hour = 3600.0;
constexpr double seconds_per_day = 86400.0;
constexpr double julian_year_days = 365.25;  // IAU Julian year, for the trend's time axis
constexpr double tropical_year_days =
    365.2422;  // mean tropical year (from memory), seasonal cycles

// Sub-stream numbers for split_seed (changing one part keeps the others' draws).
enum Stream : std::uint64_t {
  s_interannual = 1,
  s_residual,
  s_noise,
  s_surge_time,
  s_surge_size,
  s_faults
};

std::int64_t unix_seconds(sys_days d) {
  return chr::duration_cast<chr::seconds>(d.time_since_epoch()).count();
}

sys_days ymd(int y, unsigned m, unsigned d) {
  return sys_days{year_month_day{year{y}, chr::month{m}, chr::day{d}}};
}

[[noreturn]] void bad_design(const std::string& what) {
  throw InputError("demo record design", what, "use TideRecordDesign::standard() or fix the value");
}

void validate(const TideRecordDesign& d) {
  if (d.first_year < 1900 || d.last_year > 2200 || d.first_year > d.last_year) {
    bad_design("years " + std::to_string(d.first_year) + ".." + std::to_string(d.last_year) +
               " are not an increasing span within 1900..2200");
  }
  for (const auto& c : d.constituents) {
    if (!(c.period_h > 0.0) || !(c.amplitude_m >= 0.0)) {
      bad_design("constituent " + c.name + " needs a positive period and amplitude >= 0");
    }
  }
  if (!(d.interannual_sd_m >= 0.0) || !(d.residual_sd_m >= 0.0) || !(d.noise_sd_m >= 0.0) ||
      !(d.seasonal_amplitude_m >= 0.0)) {
    bad_design("standard deviations and amplitudes must be >= 0");
  }
  if (!(std::abs(d.interannual_ar1) < 1.0) || !(std::abs(d.residual_ar1_per_h) < 1.0)) {
    bad_design("AR(1) coefficients must lie strictly between -1 and 1");
  }
  const auto& s = d.surges;
  if (!(s.rate_per_yr > 0.0) || !(s.gpd_scale_m > 0.0) || !(s.gpd_shape < 0.5) ||
      !(s.rise_h > 0.0) || !(s.decay_h > 0.0) || !(std::abs(s.seasonal_modulation) <= 1.0)) {
    bad_design(
        "surges need rate > 0, scale > 0, shape < 0.5, rise and decay > 0, |modulation| <= 1");
  }
  if (d.scattered_sentinel_rows < 0 || d.scattered_na_rows < 0) {
    bad_design("scattered fault counts must be >= 0");
  }
  for (const auto& g : d.gaps) {
    if (g.end <= g.first) bad_design("a gap ends before it starts");
  }
}

// Generalised Pareto draw by inversion (Coles 2001, eq. 4.2): S = u + σ/ξ·(U^−ξ − 1), and the
// exponential limit u − σ·ln U at ξ = 0.
double gpd_draw(double u_m, double sigma_m, double xi, double uniform) {
  if (std::abs(xi) < 1e-12) return u_m - sigma_m * std::log(uniform);
  return u_m + sigma_m / xi * (std::pow(uniform, -xi) - 1.0);
}

void append_level(std::string& out, double level_m) {
  std::array<char, 32> buf{};
  // +0.0 turns a rounded −0.0 into 0.0 so that no row reads "-0.000".
  const int n = std::snprintf(buf.data(), buf.size(), "%.3f", level_m + 0.0);
  out.append(buf.data(), static_cast<std::size_t>(n));
}

}  // namespace

TideRecordDesign TideRecordDesign::standard() {
  TideRecordDesign d;
  // Periods: Schureman 1958 (US Coast and Geodetic Survey SP 98), Table 2 speeds, as quoted in
  // Pugh 1987 Table 4.2 (from memory). Amplitudes and phase lags: invented, of the order of a
  // meso-tidal Atlantic coast.
  d.constituents = {
      {"M2", 1.20, 110.0, 12.4206012, NodalGroup::m2},
      {"S2", 0.40, 150.0, 12.0, NodalGroup::none},
      {"N2", 0.24, 95.0, 12.65834751, NodalGroup::m2},
      {"K1", 0.10, 200.0, 23.93447213, NodalGroup::k1},
      {"O1", 0.07, 50.0, 25.81933871, NodalGroup::o1},
  };
  // Gaps (invented): whole missing months, three partly missing years, an NA outage and a
  // stretch of empty cells. demo_coast/README.md lists them.
  d.gaps = {
      {ymd(1978, 2, 1), ymd(1978, 3, 1), GapKind::absent},
      {ymd(1983, 4, 1), ymd(1983, 11, 1), GapKind::absent},
      {ymd(1986, 11, 1), ymd(1986, 12, 1), GapKind::absent},
      {ymd(1991, 7, 1), ymd(1991, 8, 1), GapKind::absent},
      {ymd(1999, 1, 1), ymd(1999, 5, 16), GapKind::absent},
      {ymd(2005, 6, 1), ymd(2005, 6, 21), GapKind::na_rows},
      {ymd(2011, 8, 10), ymd(2012, 2, 21), GapKind::absent},
      {ymd(2017, 10, 3), ymd(2017, 10, 5), GapKind::empty_cells},
      {ymd(2020, 3, 1), ymd(2020, 4, 1), GapKind::absent},
  };
  return d;
}

TideRecordDesign TideRecordDesign::standard_years(int first_year, int last_year) {
  TideRecordDesign d = standard();
  d.first_year = first_year;
  d.last_year = last_year;
  const sys_days lo = ymd(first_year, 1, 1);
  const sys_days hi = ymd(last_year + 1, 1, 1);
  std::erase_if(d.gaps, [&](const RecordGap& g) { return g.end <= lo || g.first >= hi; });
  return d;
}

std::size_t TideRecord::count(RowState s) const {
  return static_cast<std::size_t>(std::count(state.begin(), state.end(), s));
}

NodalCorrection nodal_correction(NodalGroup group, double node_longitude_deg) {
  const double c = std::cos(node_longitude_deg * deg);
  const double s = std::sin(node_longitude_deg * deg);
  // Pugh 1987, Table 4.3 (from memory; the first terms of Schureman 1958's series).
  switch (group) {
    case NodalGroup::m2:
      return {1.000 - 0.037 * c, -2.1 * s};
    case NodalGroup::k1:
      return {1.006 + 0.115 * c, -8.9 * s};
    case NodalGroup::o1:
      return {1.009 + 0.187 * c, 10.8 * s};
    case NodalGroup::none:
      break;
  }
  return {};
}

double lunar_node_longitude_deg(std::int64_t unix_s) {
  // Meeus 1998, Astronomical Algorithms, ch. 47: Ω = 125.04452° − 1934.136261°·T, T in Julian
  // centuries from J2000.0 (2000-01-01T12:00; the 64 s between TT and UTC do not matter here).
  constexpr double j2000_unix_s = 946728000.0;
  const double t_centuries =
      (static_cast<double>(unix_s) - j2000_unix_s) / (seconds_per_day * 36525.0);
  const double omega = std::fmod(125.04452 - 1934.136261 * t_centuries, 360.0);
  return omega < 0.0 ? omega + 360.0 : omega;
}

std::string iso8601_utc(std::int64_t unix_s) {
  const chr::sys_seconds t{chr::seconds{unix_s}};
  const sys_days day = chr::floor<days>(t);
  const year_month_day date{day};
  const chr::hh_mm_ss<chr::seconds> hms{t - day};
  std::array<char, 96> buf{};
  std::snprintf(buf.data(), buf.size(), "%04d-%02u-%02uT%02lld:%02lld:%02lldZ",
                static_cast<int>(date.year()), static_cast<unsigned>(date.month()),
                static_cast<unsigned>(date.day()), static_cast<long long>(hms.hours().count()),
                static_cast<long long>(hms.minutes().count()),
                static_cast<long long>(hms.seconds().count()));
  return buf.data();
}

TideRecord generate_tide_record(const TideRecordDesign& design, unsigned long long seed) {
  validate(design);
  TideRecord rec;
  rec.design = design;
  rec.seed = seed;

  const std::int64_t start_s = unix_seconds(ymd(design.first_year, 1, 1));
  const std::int64_t end_s = unix_seconds(ymd(design.last_year + 1, 1, 1));
  const std::int64_t epoch_s = unix_seconds(ymd(2000, 1, 1));  // phase and seasonal origin
  const auto hours = static_cast<std::size_t>((end_s - start_s) / 3600);
  rec.hours_in_span = hours;

  // Inter-annual anomaly: an AR(1) value η_y at the middle of each year from first−1 to last+1,
  // linearly interpolated between them (stationary AR(1): innovation sd = sd·sqrt(1 − φ²)).
  Draws draw_year(split_seed(seed, s_interannual));
  const auto n_anchor = static_cast<std::size_t>(design.last_year - design.first_year) + 3U;
  std::vector<double> anchor_m(n_anchor);
  const double phi_y = design.interannual_ar1;
  anchor_m[0] = design.interannual_sd_m * draw_year.normal();
  for (std::size_t i = 1; i < n_anchor; ++i) {
    anchor_m[i] = phi_y * anchor_m[i - 1] +
                  design.interannual_sd_m * std::sqrt(1.0 - phi_y * phi_y) * draw_year.normal();
  }

  Draws draw_residual(split_seed(seed, s_residual));
  Draws draw_noise(split_seed(seed, s_noise));
  const double phi_h = design.residual_ar1_per_h;
  const double residual_innovation_m = design.residual_sd_m * std::sqrt(1.0 - phi_h * phi_h);
  double residual_m = design.residual_sd_m * draw_residual.normal();

  std::vector<double> speed_rad_per_h;
  std::vector<double> phase_rad;
  for (const auto& c : design.constituents) {
    speed_rad_per_h.push_back(2.0 * std::numbers::pi / c.period_h);  // ω_k = 2π / T_k
    phase_rad.push_back(c.phase_lag_deg * deg);
  }

  std::vector<double> level(hours);
  for (std::size_t k = 0; k < hours; ++k) {
    const std::int64_t t_s = start_s + static_cast<std::int64_t>(k) * 3600;
    const double t_h = static_cast<double>(t_s - epoch_s) / seconds_per_hour;
    const double t_day = t_h / 24.0;
    const double node_deg = design.nodal_modulation ? lunar_node_longitude_deg(t_s) : 0.0;
    // Harmonic tide, Pugh 1987 eq. 4.1 with nodal terms: Σ f_k H_k cos(ω_k t + u_k − g_k).
    double tide_m = 0.0;
    for (std::size_t i = 0; i < design.constituents.size(); ++i) {
      const auto& c = design.constituents[i];
      const NodalCorrection nc =
          design.nodal_modulation ? nodal_correction(c.nodal, node_deg) : NodalCorrection{};
      tide_m +=
          nc.f * c.amplitude_m * std::cos(speed_rad_per_h[i] * t_h + nc.u_deg * deg - phase_rad[i]);
    }
    // Mean sea level: Z0 + b·(year − reference) + η(year) + Sa·cos(2π(day − peak)/year).
    const double year_frac = 2000.0 + t_day / julian_year_days;
    const double pos = year_frac - (design.first_year - 1) - 0.5;
    const auto i0 = std::min(static_cast<std::size_t>(std::max(pos, 0.0)), n_anchor - 2);
    const double w = pos - static_cast<double>(i0);
    const double eta_m = (1.0 - w) * anchor_m[i0] + w * anchor_m[i0 + 1];
    const double msl_m = design.mean_level_m +
                         design.trend_m_per_yr * (year_frac - design.reference_year) + eta_m +
                         design.seasonal_amplitude_m *
                             std::cos(2.0 * std::numbers::pi * (t_day - design.seasonal_peak_day) /
                                      tropical_year_days);
    // AR(1) residual: r_k = φ·r_{k−1} + sqrt(1 − φ²)·σ·z (stationary sd σ).
    if (k > 0) residual_m = phi_h * residual_m + residual_innovation_m * draw_residual.normal();
    level[k] = msl_m + tide_m + residual_m + design.noise_sd_m * draw_noise.normal();
  }

  // Storm surges: a seasonal Poisson process drawn by thinning (Lewis & Shedler 1979, Naval
  // Res. Logist. Q. 26:403): candidates at the peak rate λ(1 + m), each kept with probability
  // λ(t)/(λ(1 + m)). Events start six days before the record so that their tails reach it.
  const auto& sd = design.surges;
  Draws draw_time(split_seed(seed, s_surge_time));
  Draws draw_size(split_seed(seed, s_surge_size));
  const double peak_rate_per_day =
      sd.rate_per_yr * (1.0 + std::abs(sd.seasonal_modulation)) / tropical_year_days;
  const double lead_s = 6.0 * seconds_per_day;
  double cand_s = static_cast<double>(start_s) - lead_s;
  while (true) {
    cand_s += draw_time.exponential(peak_rate_per_day) * seconds_per_day;
    if (cand_s >= static_cast<double>(end_s)) break;
    const double day = (cand_s - static_cast<double>(epoch_s)) / seconds_per_day;
    const double rate_ratio = (1.0 + sd.seasonal_modulation * std::cos(2.0 * std::numbers::pi *
                                                                       (day - sd.peak_day_of_year) /
                                                                       tropical_year_days)) /
                              (1.0 + std::abs(sd.seasonal_modulation));
    if (draw_time.uniform() >= rate_ratio) continue;
    const SurgeEvent ev{
        static_cast<std::int64_t>(std::llround(cand_s)),
        gpd_draw(sd.threshold_m, sd.gpd_scale_m, sd.gpd_shape, draw_size.uniform())};
    rec.surges.push_back(ev);
    // Shape: Gaussian rise (sd rise_h) to the peak, exponential decay (time decay_h) after it.
    const double from_s = static_cast<double>(ev.peak_time_s) - 5.0 * sd.rise_h * seconds_per_hour;
    const double to_s = static_cast<double>(ev.peak_time_s) + 10.0 * sd.decay_h * seconds_per_hour;
    const auto k0 = static_cast<std::int64_t>(
        std::ceil(std::max(0.0, (from_s - static_cast<double>(start_s)) / seconds_per_hour)));
    const auto k1 = std::min(static_cast<std::int64_t>(hours) - 1,
                             static_cast<std::int64_t>(std::floor(
                                 (to_s - static_cast<double>(start_s)) / seconds_per_hour)));
    for (std::int64_t k = k0; k <= k1; ++k) {
      const double dt_h =
          static_cast<double>(start_s + k * 3600 - ev.peak_time_s) / seconds_per_hour;
      const double shape = dt_h < 0.0 ? std::exp(-0.5 * (dt_h / sd.rise_h) * (dt_h / sd.rise_h))
                                      : std::exp(-dt_h / sd.decay_h);
      level[static_cast<std::size_t>(k)] += ev.peak_m * shape;
    }
  }

  // What each hour becomes in the file: absent, NA, empty or a value.
  constexpr auto absent = static_cast<std::uint8_t>(255);
  std::vector<std::uint8_t> slot(hours, static_cast<std::uint8_t>(RowState::value));
  for (const auto& g : design.gaps) {
    const std::int64_t g0 = std::max(unix_seconds(g.first), start_s);
    const std::int64_t g1 = std::min(unix_seconds(g.end), end_s);
    const std::uint8_t mark = g.kind == GapKind::absent ? absent
                              : g.kind == GapKind::na_rows
                                  ? static_cast<std::uint8_t>(RowState::na)
                                  : static_cast<std::uint8_t>(RowState::empty);
    for (std::int64_t t = g0; t < g1; t += 3600)
      slot[static_cast<std::size_t>((t - start_s) / 3600)] = mark;
  }
  Draws draw_fault(split_seed(seed, s_faults));
  const auto scatter = [&](int n, RowState as) {
    const auto free_rows = static_cast<std::size_t>(
        std::count(slot.begin(), slot.end(), static_cast<std::uint8_t>(RowState::value)));
    if (static_cast<std::size_t>(n) > free_rows / 2) {
      bad_design("too many scattered faulty rows for a record of " + std::to_string(free_rows) +
                 " values");
    }
    for (int placed = 0; placed < n;) {
      const auto k = static_cast<std::size_t>(draw_fault.index_below(hours));
      if (slot[k] != static_cast<std::uint8_t>(RowState::value)) continue;
      slot[k] = static_cast<std::uint8_t>(as);
      ++placed;
    }
  };
  scatter(design.scattered_sentinel_rows, RowState::sentinel);
  scatter(design.scattered_na_rows, RowState::na);

  for (std::size_t k = 0; k < hours; ++k) {
    if (slot[k] == absent) continue;
    rec.time_s.push_back(start_s + static_cast<std::int64_t>(k) * 3600);
    rec.level_m.push_back(std::round(level[k] * 1000.0) / 1000.0);  // the gauge reports mm
    rec.state.push_back(static_cast<RowState>(slot[k]));
  }
  return rec;
}

std::string tide_record_csv(const TideRecord& record) {
  const auto& d = record.design;
  std::string out;
  out.reserve(record.time_s.size() * 28 + 1024);
  out += "# Quillhaven harbour tide gauge, hourly still-water level. ";
  out += invented_notice;
  out += "\n# Generated by the tidewright demo generator (demo_coast/generator), seed ";
  out += std::to_string(record.seed) + ", years " + std::to_string(d.first_year) + "-" +
         std::to_string(d.last_year) + ".\n";
  out += "# time: UTC, ISO 8601. level_m: metres above ";
  out += datum_label;
  out +=
      ".\n# Deliberate faults for the cleaning to report: missing months (no rows), NA,"
      " empty cells and the sentinel -99.\n";
  out += "time,level_m\n";
  for (std::size_t i = 0; i < record.time_s.size(); ++i) {
    out += iso8601_utc(record.time_s[i]);
    out += ',';
    switch (record.state[i]) {
      case RowState::value:
        append_level(out, record.level_m[i]);
        break;
      case RowState::na:
        out += "NA";
        break;
      case RowState::empty:
        break;
      case RowState::sentinel: {
        std::array<char, 32> buf{};
        const int n = std::snprintf(buf.data(), buf.size(), "%g", d.sentinel_value);
        out.append(buf.data(), static_cast<std::size_t>(n));
        break;
      }
    }
    out += '\n';
  }
  return out;
}

void write_tide_record_csv(const TideRecord& record, const std::filesystem::path& path,
                           bool force) {
  write_text_file(path, tide_record_csv(record), force);
}

}  // namespace tidewright::demo
