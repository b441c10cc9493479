// Priority-flood from the sea (Barnes, Lehman & Mulla 2014, Computers & Geosciences 62:117,
// Algorithm 2). Glossary and conventions: include/tidewright/terrain/flood_threshold.hpp.
//
// Hand-written rather than taken from a library: GDAL has no priority-flood, and the one
// general-purpose implementation in Debian (scikit-image's reconstruction) is Python and about
// an order of magnitude slower (docs/performance.md, "Maps").
#include "tidewright/terrain/flood_threshold.hpp"

#include <algorithm>
#include <array>
#include <bit>
#include <cmath>
#include <limits>
#include <string>

#include "tidewright/common/error.hpp"

namespace tidewright::terrain {
namespace {

// The priority queue: a radix heap (Ahuja, Mehlhorn, Orlin & Tarjan 1990, "Faster algorithms
// for the shortest path problem", J. ACM 37:213), valid because the priority-flood is monotone:
// a cell enters the queue only with an elevation above the level of the cell being processed,
// which is at least the last level taken out. Cells leave by level, then by insertion counter
// (the paper's §2.3 stable order on ties: cells at one level are sorted by counter when they
// reach the front), exactly the order of a binary heap on (level, counter).
// Hand-written: neither the standard library nor Boost has a monotone radix heap.
class RadixHeap {
 public:
  // Order-preserving map of a float (not NaN) to unsigned bits: IEEE 754 sign-magnitude to an
  // unsigned order (flip all bits of a negative number, the sign bit of a positive one).
  static std::uint32_t ordered_bits(float level) noexcept {
    const auto b = std::bit_cast<std::uint32_t>(level);
    return (b & 0x80000000U) != 0 ? ~b : (b | 0x80000000U);
  }
  // Keys pushed are always above the last key taken out (the flood is monotone, see above).
  void push(float level, std::uint32_t counter, std::uint32_t index) {
    const std::uint32_t key = ordered_bits(level);
    buckets_[bucket_of(key)].push_back({key, counter, index});
    ++size_;
  }
  [[nodiscard]] bool empty() const noexcept { return size_ == 0; }
  // The cell with the smallest (level, counter); the heap must not be empty.
  std::uint32_t pop() {
    if (buckets_[0].empty()) {
      std::size_t b = 1;
      while (buckets_[b].empty()) ++b;
      auto& from = buckets_[b];
      std::uint32_t least = from.front().key;
      for (const auto& e : from) least = std::min(least, e.key);
      last_ = least;
      for (const auto& e : from) buckets_[bucket_of(e.key)].push_back(e);
      from.clear();
      // Bucket 0 now holds every queued cell at the least level (usually one): take them by
      // insertion counter, smallest last so that pop_back gives it.
      auto& ties = buckets_[0];
      if (ties.size() > 1) {
        std::sort(ties.begin(), ties.end(),
                  [](const Entry& a, const Entry& c) { return a.counter > c.counter; });
      }
    }
    const std::uint32_t index = buckets_[0].back().index;
    buckets_[0].pop_back();
    --size_;
    return index;
  }

 private:
  struct Entry {
    std::uint32_t key;
    std::uint32_t counter;
    std::uint32_t index;
  };
  // Bucket 0 holds the keys equal to the last minimum; bucket b the keys whose highest bit
  // differing from it is bit b - 1.
  [[nodiscard]] std::size_t bucket_of(std::uint32_t key) const noexcept {
    return key == last_ ? 0 : static_cast<std::size_t>(32 - std::countl_zero(key ^ last_));
  }
  std::array<std::vector<Entry>, 33> buckets_;
  std::uint32_t last_ = 0;
  std::size_t size_ = 0;
};

}  // namespace

std::vector<float> flood_threshold_barnes2014(GridShape shape, std::span<const float> elevation_m,
                                              std::span<const std::uint8_t> is_sea,
                                              Connectivity connectivity) {
  const std::size_t n = shape.cells();
  if (elevation_m.size() != n || is_sea.size() != n) {
    throw InputError("flood threshold", "the elevation and sea grids do not match the grid shape",
                     "give one value per cell in both");
  }
  if ((shape.cols + 2) * (shape.rows + 2) > std::numeric_limits<std::uint32_t>::max()) {
    throw InputError("flood threshold",
                     "the DEM has more than 2^32 - 1 cells, too many for one in-memory pass",
                     "cut the DEM into tiles (docs/methods-terrain.md, \"Larger than memory\")");
  }
  constexpr float inf = std::numeric_limits<float>::infinity();
  // Work on a copy padded with a closed one-cell border, so neighbours are fixed index offsets
  // with no bounds checks. Open cells hold their elevation, which becomes their threshold when
  // they close (the paper fills the DEM in place the same way); the border is cut off at the end.
  const std::size_t pc = shape.cols + 2;
  const std::size_t pr = shape.rows + 2;
  std::vector<float> threshold(pc * pr, std::numeric_limits<float>::quiet_NaN());
  // One bit per padded cell, set while the cell is open: 1/8 of a byte array's memory, so more
  // of it stays in cache on large grids (the pass is bound by memory access).
  std::vector<std::uint64_t> open_bits((pc * pr + 63) / 64, 0);
  const auto is_open = [&](std::size_t p) { return ((open_bits[p >> 6] >> (p & 63)) & 1U) != 0; };
  const auto close = [&](std::size_t p) { open_bits[p >> 6] &= ~(std::uint64_t{1} << (p & 63)); };
  for (std::size_t y = 0; y < shape.rows; ++y) {
    for (std::size_t x = 0; x < shape.cols; ++x) {
      const std::size_t i = y * shape.cols + x;
      const std::size_t p = (y + 1) * pc + x + 1;
      if (is_sea[i] != 0) {
        threshold[p] = -inf;
      } else if (!std::isnan(elevation_m[i])) {
        threshold[p] = elevation_m[i];
        open_bits[p >> 6] |= std::uint64_t{1} << (p & 63);
      }  // else nodata: a closed barrier, never entered, NaN
    }
  }

  const auto stride = static_cast<std::ptrdiff_t>(pc);
  // The four edge neighbours first, then the diagonals.
  const std::array<std::ptrdiff_t, 8> offset{1,          -1,         stride,      -stride,
                                             stride + 1, stride - 1, -stride + 1, -stride - 1};
  const int neighbours = connectivity == Connectivity::eight ? 8 : 4;

  RadixHeap open;
  std::vector<std::uint32_t> pit;  // the paper's plain queue; drained before the next pop
  std::size_t pit_head = 0;
  std::uint32_t order = 0;  // each cell is queued at most once, so it fits in 32 bits

  // Visit the open neighbours of cell c whose fill level is `level`: a neighbour at or below
  // it lies in a depression that fills to `level` (plain queue); one above it starts at its
  // own elevation (priority queue). Paper, Algorithm 2, lines 14-22.
  const auto spread_from = [&](std::size_t c, float level) {
    for (int k = 0; k < neighbours; ++k) {
      const auto m = static_cast<std::size_t>(static_cast<std::ptrdiff_t>(c) +
                                              offset[static_cast<std::size_t>(k)]);
      if (!is_open(m)) continue;
      close(m);
      const float z = threshold[m];  // still the elevation: the cell was open
      if (z <= level) {
        threshold[m] = level;
        pit.push_back(static_cast<std::uint32_t>(m));
      } else {
        open.push(z, order++, static_cast<std::uint32_t>(m));
      }
    }
  };

  // Seeds: every sea cell is at level -inf, the lowest possible, so taking them in index order
  // is the order a queue would give; no queue memory is spent on them.
  for (std::size_t y = 0; y < shape.rows; ++y) {
    for (std::size_t x = 0; x < shape.cols; ++x) {
      if (is_sea[y * shape.cols + x] != 0) spread_from((y + 1) * pc + x + 1, -inf);
    }
  }
  while (true) {
    std::size_t c = 0;
    if (pit_head < pit.size()) {
      c = pit[pit_head++];
    } else {
      pit.clear();
      pit_head = 0;
      if (open.empty()) break;
      c = open.pop();
    }
    spread_from(c, threshold[c]);
  }
  // Open cells left are valid land no path of valid cells joins to the sea.
  for (std::size_t p = 0; p < threshold.size(); ++p) {
    if (is_open(p)) threshold[p] = inf;
  }
  open_bits = {};
  // Cut the border off in place: row y moves from (y + 1) pc + 1 down to y cols.
  for (std::size_t y = 0; y < shape.rows; ++y) {
    std::copy_n(threshold.begin() + static_cast<std::ptrdiff_t>((y + 1) * pc + 1), shape.cols,
                threshold.begin() + static_cast<std::ptrdiff_t>(y * shape.cols));
  }
  threshold.resize(n);  // keeps the padded capacity (0.1% more) rather than copy to shrink it
  return threshold;
}

}  // namespace tidewright::terrain
