// runs_declustering (Coles 2001 §5.3.2) on a hand-worked hourly series.
#include "tidewright/common/declustering.hpp"

#include <gtest/gtest.h>

#include <cstdint>
#include <vector>

TEST(RunsDeclustering, SplitsOnTheSeparationAndKeepsEachClustersFirstHighest) {
  // Hours 0..9; threshold 1.0, separation 3 h. Exceedances at hours 1, 2, 4 (gap 2 h: one
  // cluster, highest 1.5 at hour 2, the later equal 1.5 at hour 4 not taken), then 7 (gap 3 h:
  // a new cluster), and 9, which is not used.
  std::vector<std::int64_t> t;
  for (int h = 0; h < 10; ++h) t.push_back(3600 * h);
  const std::vector<double> level{0.5, 1.2, 1.5, 0.9, 1.5, 0.2, 1.0, 1.1, 0.3, 2.0};
  std::vector<bool> use(10, true);
  use[9] = false;
  std::vector<std::size_t> peaks;
  const auto exceedances = tidewright::runs_declustering(t, level, use, 1.0, 3.0 * 3600.0,
                                                         [&](std::size_t i) { peaks.push_back(i); });
  EXPECT_EQ(exceedances, 4U);  // hour 6 equals the threshold: not above it
  EXPECT_EQ(peaks, (std::vector<std::size_t>{2, 7}));
  // A separation of 2 h splits hours 2 and 4 as well.
  peaks.clear();
  (void)tidewright::runs_declustering(t, level, use, 1.0, 2.0 * 3600.0, [&](std::size_t i) { peaks.push_back(i); });
  EXPECT_EQ(peaks, (std::vector<std::size_t>{2, 4, 7}));
}
