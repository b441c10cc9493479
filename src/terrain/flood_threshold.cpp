// Priority-flood from the sea (Barnes, Lehman & Mulla 2014, Computers & Geosciences 62:117,
// Algorithm 2). Glossary and conventions: include/tidewright/terrain/flood_threshold.hpp.
//
// Hand-written rather than taken from a library: GDAL has no priority-flood, and the one
// general-purpose implementation in Debian (scikit-image's reconstruction) is Python and about
// an order of magnitude slower (docs/performance.md, "Maps").
#include "tidewright/terrain/flood_threshold.hpp"

#include <array>
#include <cmath>
#include <limits>
#include <queue>
#include <string>

#include "tidewright/common/error.hpp"

namespace tidewright::terrain {
namespace {

// One cell on the priority queue: its fill level, then the order it was queued in (the
// insertion counter that makes ties stable, as in the paper's §2.3), then its index.
struct QueuedCell {
  float level_m;
  std::uint32_t index;
  std::uint64_t order;
};

struct HigherFirst {  // std::priority_queue keeps the "largest" on top: invert for a min-heap
  bool operator()(const QueuedCell& a, const QueuedCell& b) const noexcept {
    if (a.level_m != b.level_m) return a.level_m > b.level_m;
    return a.order > b.order;
  }
};

constexpr std::uint8_t open_cell = 0;
constexpr std::uint8_t closed_cell = 1;

}  // namespace

std::vector<float> flood_threshold_barnes2014(GridShape shape, std::span<const float> elevation_m,
                                              std::span<const std::uint8_t> is_sea,
                                              Connectivity connectivity) {
  const std::size_t n = shape.cells();
  if (elevation_m.size() != n || is_sea.size() != n) {
    throw InputError("flood threshold", "the elevation and sea grids do not match the grid shape",
                     "give one value per cell in both");
  }
  if (n > std::numeric_limits<std::uint32_t>::max()) {
    throw InputError("flood threshold",
                     "the DEM has more than 2^32 - 1 cells, too many for one in-memory pass",
                     "cut the DEM into tiles (docs/methods-terrain.md, \"Larger than memory\")");
  }
  constexpr float inf = std::numeric_limits<float>::infinity();
  std::vector<float> threshold(n);
  std::vector<std::uint8_t> state(n, open_cell);
  for (std::size_t i = 0; i < n; ++i) {
    if (is_sea[i] != 0) {
      threshold[i] = -inf;
      state[i] = closed_cell;
    } else if (std::isnan(elevation_m[i])) {
      threshold[i] = std::numeric_limits<float>::quiet_NaN();
      state[i] = closed_cell;  // a barrier: never entered
    } else {
      threshold[i] = inf;  // stays so if no path of valid cells reaches the sea
    }
  }

  const auto cols = static_cast<std::ptrdiff_t>(shape.cols);
  const auto rows = static_cast<std::ptrdiff_t>(shape.rows);
  // The four edge neighbours first, then the diagonals.
  constexpr std::array<std::ptrdiff_t, 8> dx{1, -1, 0, 0, 1, 1, -1, -1};
  constexpr std::array<std::ptrdiff_t, 8> dy{0, 0, 1, -1, 1, -1, 1, -1};
  const int neighbours = connectivity == Connectivity::eight ? 8 : 4;

  std::priority_queue<QueuedCell, std::vector<QueuedCell>, HigherFirst> open;
  std::vector<std::uint32_t> pit;  // the paper's plain queue; drained before the next pop
  std::size_t pit_head = 0;
  std::uint64_t order = 0;

  // Visit the open neighbours of cell c whose fill level is `level`: a neighbour at or below
  // it lies in a depression that fills to `level` (plain queue); one above it starts at its
  // own elevation (priority queue). Paper, Algorithm 2, lines 14-22.
  const auto spread_from = [&](std::size_t c, float level) {
    const auto x = static_cast<std::ptrdiff_t>(c) % cols;
    const auto y = static_cast<std::ptrdiff_t>(c) / cols;
    for (int k = 0; k < neighbours; ++k) {
      const std::ptrdiff_t nx = x + dx[static_cast<std::size_t>(k)];
      const std::ptrdiff_t ny = y + dy[static_cast<std::size_t>(k)];
      if (nx < 0 || ny < 0 || nx >= cols || ny >= rows) continue;
      const auto m = static_cast<std::size_t>(ny * cols + nx);
      if (state[m] != open_cell) continue;
      state[m] = closed_cell;
      const float z = elevation_m[m];
      if (z <= level) {
        threshold[m] = level;
        pit.push_back(static_cast<std::uint32_t>(m));
      } else {
        threshold[m] = z;
        open.push(QueuedCell{z, static_cast<std::uint32_t>(m), order++});
      }
    }
  };

  // Seeds: every sea cell is at level -inf, the lowest possible, so taking them in index order
  // is the order a queue would give; no queue memory is spent on them.
  for (std::size_t i = 0; i < n; ++i) {
    if (is_sea[i] != 0) spread_from(i, -inf);
  }
  while (true) {
    std::size_t c = 0;
    if (pit_head < pit.size()) {
      c = pit[pit_head++];
    } else {
      pit.clear();
      pit_head = 0;
      if (open.empty()) break;
      c = open.top().index;
      open.pop();
    }
    spread_from(c, threshold[c]);
  }
  return threshold;
}

}  // namespace tidewright::terrain
