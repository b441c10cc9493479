// The priority-flood against hand-made grids whose thresholds follow from the definition
// (minimax path height from the sea, worked out by hand in each comment), and against a simple
// reference solver (repeated relaxation of T(c) = max(z(c), min over neighbours T(n)) until
// nothing changes, the Bellman-Ford form of the minimax path problem) on seeded random grids.
#include "tidewright/terrain/flood_threshold.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <random>
#include <vector>

#include "tidewright/common/error.hpp"
#include "tidewright/terrain/sea.hpp"

namespace tw = tidewright::terrain;

namespace {

constexpr float nan_f = std::numeric_limits<float>::quiet_NaN();
constexpr float inf_f = std::numeric_limits<float>::infinity();

struct Case {
  tw::GridShape shape;
  std::vector<float> z;
  std::vector<std::uint8_t> sea;
};

std::vector<float> run(const Case& c, tw::Connectivity k) {
  return tw::flood_threshold_barnes2014(c.shape, c.z, c.sea, k);
}

// Reference: relaxation to a fixed point. O(cells^2) at worst, fine for small grids.
std::vector<float> relaxation_reference(const Case& c, tw::Connectivity k) {
  const auto cols = static_cast<int>(c.shape.cols);
  const auto rows = static_cast<int>(c.shape.rows);
  std::vector<float> t(c.shape.cells());
  for (std::size_t i = 0; i < t.size(); ++i) {
    t[i] = c.sea[i] != 0 ? -inf_f : (std::isnan(c.z[i]) ? nan_f : inf_f);
  }
  bool changed = true;
  while (changed) {
    changed = false;
    for (int y = 0; y < rows; ++y) {
      for (int x = 0; x < cols; ++x) {
        const auto i = static_cast<std::size_t>(y * cols + x);
        if (c.sea[i] != 0 || std::isnan(c.z[i])) continue;
        float best = inf_f;
        for (int dy = -1; dy <= 1; ++dy) {
          for (int dx = -1; dx <= 1; ++dx) {
            if ((dx == 0 && dy == 0) || (k == tw::Connectivity::four && dx != 0 && dy != 0))
              continue;
            const int nx = x + dx;
            const int ny = y + dy;
            if (nx < 0 || ny < 0 || nx >= cols || ny >= rows) continue;
            const float tn = t[static_cast<std::size_t>(ny * cols + nx)];
            if (!std::isnan(tn) && tn < best) best = tn;
          }
        }
        const float candidate = std::max(c.z[i], best);
        if (candidate < t[i]) {
          t[i] = candidate;
          changed = true;
        }
      }
    }
  }
  return t;
}

void expect_same(const std::vector<float>& got, const std::vector<float>& want) {
  ASSERT_EQ(got.size(), want.size());
  for (std::size_t i = 0; i < got.size(); ++i) {
    if (std::isnan(want[i])) {
      EXPECT_TRUE(std::isnan(got[i])) << "cell " << i;
    } else {
      EXPECT_EQ(got[i], want[i]) << "cell " << i;
    }
  }
}

// Three identical rows of the profile `row`; column 0 is sea.
Case profile(const std::vector<float>& row) {
  Case c{{row.size(), 3}, {}, {}};
  for (int r = 0; r < 3; ++r) {
    for (std::size_t x = 0; x < row.size(); ++x) {
      c.z.push_back(row[x]);
      c.sea.push_back(x == 0 ? 1 : 0);
    }
  }
  return c;
}

// A random grid of 1..12 x 1..12 cells: elevations on a 0.5 m lattice from -2 to 4 m (many
// ties, the hard case for the queue order), about 10% nodata, sea along a random edge (70% of
// its cells) plus about 2% random sea cells.
Case random_case(std::mt19937_64& rng) {
  std::uniform_int_distribution<int> size(1, 12);
  std::uniform_int_distribution<int> level(-4, 8);
  std::uniform_real_distribution<double> u(0.0, 1.0);
  Case c;
  c.shape = {static_cast<std::size_t>(size(rng)), static_cast<std::size_t>(size(rng))};
  const int edge = static_cast<int>(u(rng) * 4.0);
  for (std::size_t y = 0; y < c.shape.rows; ++y) {
    for (std::size_t x = 0; x < c.shape.cols; ++x) {
      const double r = u(rng);
      c.z.push_back(r < 0.1 ? nan_f : 0.5F * static_cast<float>(level(rng)));
      const bool on_edge = (edge == 0 && x == 0) || (edge == 1 && y == 0) ||
                           (edge == 2 && x + 1 == c.shape.cols) ||
                           (edge == 3 && y + 1 == c.shape.rows);
      c.sea.push_back((on_edge && u(rng) < 0.7) || u(rng) < 0.02 ? 1 : 0);
    }
  }
  return c;
}

}  // namespace

TEST(FloodThreshold, BowlBehindRidgeFillsToRidgeCrest) {
  // Sea | beach 0.5 | ridge 3 | bowl 1 | slope 2: the bowl and the slope flood only when the
  // water tops the ridge (3 m); the beach floods at its own height.
  const auto c = profile({-1.0F, 0.5F, 3.0F, 1.0F, 2.0F});
  const auto t = run(c, tw::Connectivity::eight);
  for (int r = 0; r < 3; ++r) {
    const auto o = static_cast<std::size_t>(r * 5);
    EXPECT_EQ(t[o + 0], -inf_f);
    EXPECT_EQ(t[o + 1], 0.5F);
    EXPECT_EQ(t[o + 2], 3.0F);
    EXPECT_EQ(t[o + 3], 3.0F);
    EXPECT_EQ(t[o + 4], 3.0F);
  }
}

TEST(FloodThreshold, BreachInRidgeSetsTheSpillLevel) {
  // As above, with the middle row's ridge cell breached to 1.5 m: the bowl now fills at 1.5 m
  // and the slope (2 m) at its own height; the ridge cells beside the breach keep 3 m.
  auto c = profile({-1.0F, 0.5F, 3.0F, 1.0F, 2.0F});
  c.z[5 + 2] = 1.5F;
  for (auto k : {tw::Connectivity::four, tw::Connectivity::eight}) {
    const auto t = run(c, k);
    EXPECT_EQ(t[5 + 2], 1.5F);
    EXPECT_EQ(t[2], 3.0F);
    EXPECT_EQ(t[10 + 2], 3.0F);
    for (int r = 0; r < 3; ++r) {
      EXPECT_EQ(t[static_cast<std::size_t>(r * 5 + 3)], 1.5F);
      EXPECT_EQ(t[static_cast<std::size_t>(r * 5 + 4)], 2.0F);
    }
  }
}

TEST(FloodThreshold, DiagonalWallHoldsUnderFourButLeaksUnderEight) {
  // 4 x 4, sea at the top-left corner cell, a 5 m wall on the anti-diagonal x + y = 1 (the
  // cells (1,0) and (0,1)); ground 0 m elsewhere. Under 4-connectivity the sea must cross the
  // wall (5 m); under 8-connectivity it passes diagonally from (0,0) to (1,1) at 0 m.
  Case c{{4, 4}, std::vector<float>(16, 0.0F), std::vector<std::uint8_t>(16, 0)};
  c.sea[0] = 1;
  c.z[1] = 5.0F;
  c.z[4] = 5.0F;
  const auto t4 = run(c, tw::Connectivity::four);
  const auto t8 = run(c, tw::Connectivity::eight);
  EXPECT_EQ(t4[5], 5.0F);
  EXPECT_EQ(t4[15], 5.0F);
  EXPECT_EQ(t8[5], 0.0F);
  EXPECT_EQ(t8[15], 0.0F);
  EXPECT_EQ(t8[1], 5.0F);  // the wall cells themselves flood at their crest
}

TEST(FloodThreshold, PitSealedByNodataIsNeverReached) {
  // 5 x 5: sea row on top; a ring of nodata around the centre cell (a -2 m pit). The pit is
  // low but no path of valid cells joins it to the sea: +inf. Nodata cells stay NaN.
  Case c{{5, 5}, std::vector<float>(25, 1.0F), std::vector<std::uint8_t>(25, 0)};
  for (std::size_t x = 0; x < 5; ++x) c.sea[x] = 1;
  for (std::size_t y = 1; y <= 3; ++y) {
    for (std::size_t x = 1; x <= 3; ++x) c.z[y * 5 + x] = nan_f;
  }
  c.z[12] = -2.0F;
  for (auto k : {tw::Connectivity::four, tw::Connectivity::eight}) {
    const auto t = run(c, k);
    EXPECT_EQ(t[12], inf_f);
    EXPECT_TRUE(std::isnan(t[6]));
    EXPECT_EQ(t[5], 1.0F);   // valid land beside the sea row
    EXPECT_EQ(t[24], 1.0F);  // reached round the outside of the ring
  }
}

TEST(FloodThreshold, SeaCellsAreWaterWhateverTheirElevation) {
  // A sea cell on 9 m ground (a mask drawn over a cliff) still seeds its 0 m neighbour at 0 m.
  Case c{{3, 1}, {9.0F, 0.0F, 4.0F}, {1, 0, 0}};
  const auto t = run(c, tw::Connectivity::four);
  EXPECT_EQ(t[0], -inf_f);
  EXPECT_EQ(t[1], 0.0F);
  EXPECT_EQ(t[2], 4.0F);
}

TEST(FloodThreshold, NodataDeclaredSeaSeedsTheFlood) {
  // Nodata offshore declared sea: the cell is sea (-inf), its neighbour floods at its own level.
  Case c{{3, 1}, {nan_f, 0.25F, 0.1F}, {1, 0, 0}};
  const auto t = run(c, tw::Connectivity::eight);
  EXPECT_EQ(t[0], -inf_f);
  EXPECT_EQ(t[1], 0.25F);
  EXPECT_EQ(t[2], 0.25F);  // behind the 0.25 m cell
}

TEST(FloodThreshold, NoSeaLeavesEveryValidCellUnreached) {
  Case c{{2, 2}, {0.0F, 1.0F, nan_f, -3.0F}, {0, 0, 0, 0}};
  const auto t = run(c, tw::Connectivity::eight);
  EXPECT_EQ(t[0], inf_f);
  EXPECT_EQ(t[3], inf_f);
  EXPECT_TRUE(std::isnan(t[2]));
}

TEST(FloodThreshold, MismatchedGridsAreInputErrors) {
  const std::vector<float> z(6, 0.0F);
  const std::vector<std::uint8_t> sea(5, 0);
  EXPECT_THROW((void)tw::flood_threshold_barnes2014({3, 2}, z, sea, tw::Connectivity::four),
               tidewright::InputError);
}

TEST(FloodThreshold, AgreesWithRelaxationOnThousandsOfRandomGrids) {
  // Seed 20261201; 3000 grids from random_case. Measured: all 3000 x 2 connectivities agree
  // cell for cell.
  std::mt19937_64 rng(20261201ULL);
  int compared = 0;
  for (int trial = 0; trial < 3000; ++trial) {
    const Case c = random_case(rng);
    for (auto k : {tw::Connectivity::four, tw::Connectivity::eight}) {
      SCOPED_TRACE("trial " + std::to_string(trial) + " k=" + std::to_string(static_cast<int>(k)));
      expect_same(run(c, k), relaxation_reference(c, k));
      ++compared;
    }
    if (::testing::Test::HasFailure()) break;
  }
  EXPECT_EQ(compared, 6000);
}

TEST(SeaSpread, CoversTheWaterBodyButNotTheBowlBehindTheRidge) {
  // Profile sea 0 | beach 0.5 | ridge 3 | bowl 1 | slope 2. Spread to 1.0: the beach (T 0.5) is
  // reached at or below 1.0 and becomes sea; the bowl lies below 1.0 but is reached only over
  // the ridge (T 3), so it stays land with its threshold; ridge and slope keep theirs.
  const Case c = profile({0.0F, 0.5F, 3.0F, 1.0F, 2.0F});
  auto t = run(c, tw::Connectivity::eight);
  tw::SeaCells sea{c.sea, 3, "test"};
  EXPECT_EQ(tw::spread_sea(sea, t, 1.0), 3U);
  EXPECT_EQ(sea.count, 6U);
  for (std::size_t r = 0; r < 3; ++r) {
    EXPECT_EQ(t[r * 5 + 1], -inf_f);
    EXPECT_EQ(sea.is_sea[r * 5 + 1], 1);
    EXPECT_EQ(t[r * 5 + 2], 3.0F);
    EXPECT_EQ(t[r * 5 + 3], 3.0F);
    EXPECT_EQ(sea.is_sea[r * 5 + 3], 0);
    EXPECT_EQ(t[r * 5 + 4], 3.0F);
  }
  EXPECT_NE(sea.description.find("spread over the 3 cells"), std::string::npos);
}

TEST(SeaSpread, RelabellingEqualsAPassSeededFromTheSpreadSea) {
  // Seed 20261202; 1000 grids from random_case, a spread level drawn from the same lattice (so
  // cells lie exactly on it): the relabelled thresholds equal those of the relaxation reference
  // seeded from the spread sea, cell for cell, both connectivities. Where the spread would cover
  // all reachable land, spread_sea must refuse instead. Measured: 325 of the 2000 cases were
  // refused (many grids are tiny); of the 1675 compared, the spread added no cell in 262 and up
  // to 99 cells in others.
  std::mt19937_64 rng(20261202ULL);
  std::uniform_int_distribution<int> level(-4, 8);
  int compared = 0;
  int refused = 0;
  std::size_t most_added = 0;
  for (int trial = 0; trial < 1000; ++trial) {
    const Case c = random_case(rng);
    const double spread_m = 0.5 * level(rng);
    for (auto k : {tw::Connectivity::four, tw::Connectivity::eight}) {
      SCOPED_TRACE("trial " + std::to_string(trial) + " k=" + std::to_string(static_cast<int>(k)));
      auto t = run(c, k);
      Case reseeded = c;
      bool land_left = false;
      for (std::size_t i = 0; i < t.size(); ++i) {
        if (!std::isfinite(t[i])) continue;
        if (static_cast<double>(t[i]) <= spread_m) {
          reseeded.sea[i] = 1;
        } else {
          land_left = true;
        }
      }
      tw::SeaCells sea{c.sea, 0, ""};
      if (!land_left) {
        EXPECT_THROW((void)tw::spread_sea(sea, t, spread_m), tidewright::InputError);
        ++refused;
        continue;
      }
      most_added = std::max(most_added, tw::spread_sea(sea, t, spread_m));
      expect_same(t, relaxation_reference(reseeded, k));
      ++compared;
    }
    if (::testing::Test::HasFailure()) break;
  }
  EXPECT_EQ(compared + refused, 2000);
  EXPECT_GT(compared, 1000);
  EXPECT_GT(most_added, 20U);  // the spread did real work in some grids
}

TEST(SeaSpread, RefusesToCoverAllLand) {
  const Case c = profile({0.0F, 0.5F, 3.0F, 1.0F, 2.0F});
  auto t = run(c, tw::Connectivity::eight);
  tw::SeaCells sea{c.sea, 3, "test"};
  try {
    (void)tw::spread_sea(sea, t, 3.0);
    ADD_FAILURE() << "no error";
  } catch (const tidewright::InputError& e) {
    EXPECT_NE(std::string(e.what()).find("covers all the land it can reach"), std::string::npos)
        << e.what();
  }
}
