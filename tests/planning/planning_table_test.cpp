#include "tidewright/planning/planning_table.hpp"

#include <gtest/gtest.h>

#include "planning/planning_test_support.hpp"
#include "tidewright/common/error.hpp"

using tidewright::extremes::StillWaterModel;
using namespace tidewright::planning;

namespace {
std::vector<YearConditions> some_years() {
  Eigen::MatrixXd rise(4, 2);
  rise << 0.0, 0.6, 0.0, 0.8, 0.0, 1.1, 0.0, 0.5;
  return conditions_over_years(tidewright::testing::ensemble({2020, 2100}, rise), 2030, 2040);
}
}  // namespace

// The table is the per-cell calls in year-major order, bit for bit, for any thread count.
TEST(PlanningTable, MatchesPerCellCallsWhateverTheThreads) {
  const StillWaterModel m = tidewright::testing::gev(2.0, 0.15, -0.1);
  const auto years = some_years();
  const std::vector<double> periods{10, 100, 1000};
  for (unsigned threads : {1U, 2U, 3U, 0U}) {
    const auto a = allowance_table(m, years, periods, {}, threads);
    const auto f = amplification_table(m, years, periods, threads);
    ASSERT_EQ(a.size(), years.size() * periods.size());
    for (std::size_t y = 0; y < years.size(); ++y) {
      for (std::size_t p = 0; p < periods.size(); ++p) {
        EXPECT_EQ(a[y * 3 + p].allowance_m, allowance(m, years[y], periods[p]).allowance_m);
        EXPECT_EQ(a[y * 3 + p].first_year, years[y].year);
        EXPECT_EQ(f[y * 3 + p].amplification_factor,
                  amplification_of_return_level(m, years[y], periods[p]).amplification_factor);
      }
    }
  }
}

TEST(PlanningTable, ErrorsComeOutOfTheThreads) {
  const StillWaterModel m = tidewright::testing::gumbel(2.0, 0.1);
  const auto years = some_years();
  const std::vector<double> bad{100, 1.0};
  EXPECT_THROW((void)allowance_table(m, years, bad, {}, 2), tidewright::InputError);
  EXPECT_THROW((void)amplification_table(m, years, std::vector<double>{}, 2), tidewright::InputError);
}
