#include "tidewright/planning/planning_table.hpp"

#include <algorithm>
#include <exception>
#include <iterator>
#include <thread>

#include "tidewright/common/error.hpp"

namespace tidewright::planning {
namespace {

// Runs year_rows(year_index), which gives the n_periods cells of that year, for every year,
// years split over threads in contiguous blocks; rethrows the exception of the first failing
// year (by index), so errors are the same whatever the thread count.
template <class Row, class YearRows>
std::vector<Row> fill_table(std::size_t n_years, std::size_t n_periods, unsigned threads, YearRows year_rows) {
  std::vector<Row> rows(n_years * n_periods);
  std::vector<std::exception_ptr> errors(n_years);
  const auto work = [&](std::size_t first, std::size_t last) {
    for (std::size_t y = first; y < last; ++y) {
      try {
        std::vector<Row> r = year_rows(y);
        std::move(r.begin(), r.end(), rows.begin() + static_cast<std::ptrdiff_t>(y * n_periods));
      } catch (...) {
        errors[y] = std::current_exception();
      }
    }
  };
  unsigned t = threads == 0 ? std::max(1U, std::thread::hardware_concurrency()) : threads;
  t = static_cast<unsigned>(std::min<std::size_t>(t, std::max<std::size_t>(n_years, 1)));
  if (t <= 1) {
    work(0, n_years);
  } else {
    std::vector<std::thread> pool;
    const std::size_t block = (n_years + t - 1) / t;
    for (std::size_t first = 0; first < n_years; first += block) {
      pool.emplace_back(work, first, std::min(n_years, first + block));
    }
    for (auto& th : pool) th.join();
  }
  for (const auto& e : errors) {
    if (e) std::rethrow_exception(e);
  }
  return rows;
}

void check_periods(std::span<const double> return_periods_yr) {
  if (return_periods_yr.empty()) throw InputError("return periods", "none given", "give at least one return period");
}

}  // namespace

std::vector<Allowance> allowance_table(const extremes::StillWaterModel& present, std::span<const YearConditions> years,
                                       std::span<const double> return_periods_yr, const AllowanceOptions& options,
                                       unsigned threads) {
  check_periods(return_periods_yr);
  return fill_table<Allowance>(years.size(), return_periods_yr.size(), threads, [&](std::size_t y) {
    return allowances(present, years[y], return_periods_yr, options);
  });
}

std::vector<Amplification> amplification_table(const extremes::StillWaterModel& present,
                                               std::span<const YearConditions> years,
                                               std::span<const double> return_periods_yr, unsigned threads) {
  check_periods(return_periods_yr);
  return fill_table<Amplification>(years.size(), return_periods_yr.size(), threads, [&](std::size_t y) {
    std::vector<Amplification> row;
    row.reserve(return_periods_yr.size());
    // Bulk tables leave future_aep out (a pass member by member per row).
    for (const double t : return_periods_yr) {
      row.push_back(amplification_of_return_level(present, years[y], t, AmplificationOptions{false}));
    }
    return row;
  });
}

}  // namespace tidewright::planning
