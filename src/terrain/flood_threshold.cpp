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
#include <utility>

#include "tidewright/common/error.hpp"

namespace tidewright::terrain {
namespace {

// The priority queue: a radix heap (Ahuja, Mehlhorn, Orlin & Tarjan 1990, "Faster algorithms
// for the shortest path problem", J. ACM 37:213), valid because the priority-flood is monotone:
// a cell enters the queue only with an elevation above the level of the cell being processed,
// which is at least the last level taken out. T is the minimax path height, one value per cell
// whatever order cells at equal levels leave in, so ties need no counter; the order is still a
// function of the input alone (deterministic).
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
  void push(float level, std::uint32_t index) {
    const std::uint32_t key = ordered_bits(level);
    buckets_[bucket_of(key)].push_back({key, index});
    ++size_;
  }
  [[nodiscard]] bool empty() const noexcept { return size_ == 0; }
  // Inverse of ordered_bits.
  static float level_of(std::uint32_t key) noexcept {
    return std::bit_cast<float>((key & 0x80000000U) != 0 ? (key & 0x7fffffffU) : ~key);
  }
  // A cell with the smallest level, and that level (carried in the entry, so the popped cell's
  // memory is not read for it); the heap must not be empty.
  std::pair<std::uint32_t, float> pop() {
    if (buckets_[0].empty()) {
      std::size_t b = 1;
      while (buckets_[b].empty()) ++b;
      auto& from = buckets_[b];
      std::uint32_t least = from.front().key;
      for (const auto& e : from) least = std::min(least, e.key);
      last_ = least;
      for (const auto& e : from) buckets_[bucket_of(e.key)].push_back(e);
      from.clear();
    }
    const Entry e = buckets_[0].back();
    buckets_[0].pop_back();
    --size_;
    return {e.index, level_of(e.key)};
  }

 private:
  struct Entry {  // 8 bytes: the level's ordered bits and the cell
    std::uint32_t key;
    std::uint32_t index;
  };
  // Bucket 0 holds the keys equal to the last minimum; bucket b the keys whose highest bit
  // differing from it is bit b - 1.
  [[nodiscard]] std::size_t bucket_of(std::uint32_t key) const noexcept {
    return static_cast<std::size_t>(32 - std::countl_zero(key ^ last_));
  }
  std::array<std::vector<Entry>, 33> buckets_;
  std::uint32_t last_ = 0;
  std::size_t size_ = 0;
};

// The work grid's storage order: 8 x 8 tiles of cells (64 floats, four 64-byte cache lines,
// and one 64-bit word of open bits), tiles in row-major order. The flood front visits cells in
// level order, all over the grid; with tiles, a cell's 8 neighbours mostly share its lines
// instead of lying in three rows a DEM width apart, so fewer lines come from memory per visit.
// On the benchmark DEM it was faster than row-major order and than 4 x 4 or 16 x 16 tiles
// (docs/performance.md, "Maps"). The cell's place in its tile is the index's
// low 6 bits, so a neighbour is still a fixed offset, taken from a 64 x 8 table.
constexpr std::size_t tile = 8;
constexpr std::size_t tile_cells = tile * tile;

struct TiledGrid {
  std::size_t width = 0;   // padded columns, a multiple of the tile side
  std::size_t height = 0;  // padded rows, a multiple of the tile side
  [[nodiscard]] std::size_t tiles_across() const noexcept { return width / tile; }
  [[nodiscard]] std::size_t index(std::size_t px, std::size_t py) const noexcept {
    return ((py / tile) * tiles_across() + px / tile) * tile_cells + (py % tile) * tile + px % tile;
  }
};

// Offsets of the 8 neighbours (the four edge neighbours first, then the diagonals) of a cell at
// place s = (row in tile) * tile + (column in tile).
using OffsetTable = std::array<std::array<std::ptrdiff_t, 8>, tile_cells>;
OffsetTable neighbour_offsets(const TiledGrid& g) {
  constexpr std::array<int, 8> dx{1, -1, 0, 0, 1, -1, 1, -1};
  constexpr std::array<int, 8> dy{0, 0, 1, -1, 1, 1, -1, -1};
  const auto across = static_cast<std::ptrdiff_t>(g.tiles_across());
  constexpr int t = static_cast<int>(tile);
  OffsetTable table{};
  for (int s = 0; s < t * t; ++s) {
    const int lx = s % t;
    const int ly = s / t;
    for (std::size_t k = 0; k < 8; ++k) {
      const int nx = lx + dx[k];
      const int ny = ly + dy[k];
      const int carry_x = nx < 0 ? -1 : (nx >= t ? 1 : 0);
      const int carry_y = ny < 0 ? -1 : (ny >= t ? 1 : 0);
      const int place = (ny - carry_y * t) * t + (nx - carry_x * t);
      table[static_cast<std::size_t>(s)][k] = (carry_y * across + carry_x) * t * t + place - s;
    }
  }
  return table;
}

}  // namespace

// The priority-flood kernel (Barnes, Lehman & Mulla 2014, Algorithm 2) kept whole: its loop
// reads as the paper's, and split, the tiled layout's indexing would spread over several functions.
std::vector<float> flood_threshold_barnes2014(GridShape shape,  // NOLINT(readability-function-size)
                                              std::span<const float> elevation_m,
                                              std::span<const std::uint8_t> is_sea,
                                              Connectivity connectivity) {
  const std::size_t n = shape.cells();
  if (elevation_m.size() != n || is_sea.size() != n) {
    throw InputError("flood threshold", "the elevation and sea grids do not match the grid shape",
                     "give one value per cell in both");
  }
  const TiledGrid g{(shape.cols + 2 + tile - 1) / tile * tile,
                    (shape.rows + 2 + tile - 1) / tile * tile};
  // One cache line of slack to align the tiles on cache lines.
  constexpr std::size_t align_slack = 64 / sizeof(float);
  if (g.width * g.height + align_slack > std::numeric_limits<std::uint32_t>::max()) {
    throw InputError("flood threshold",
                     "the DEM has more than 2^32 - 1 cells, too many for one in-memory pass",
                     "cut the DEM into tiles (docs/methods-terrain.md, \"Larger than memory\")");
  }
  constexpr float inf = std::numeric_limits<float>::infinity();
  // Work on a copy padded with a closed border of at least one cell, so neighbours are fixed
  // index offsets with no bounds checks. Open cells hold their elevation, which becomes their
  // threshold when they close (the paper fills the DEM in place the same way). The result is
  // this same vector, turned back into row-major order and cut to size at the end.
  std::vector<float> threshold(g.width * g.height + align_slack,
                               std::numeric_limits<float>::quiet_NaN());
  const std::size_t lead =
      (64 - reinterpret_cast<std::uintptr_t>(threshold.data()) % 64) % 64 / sizeof(float);
  float* const work = threshold.data() + lead;
  // One bit per work cell, set while the cell is open: 1/32 of the grid's memory, so it stays
  // in cache far longer than the grid (the pass is bound by memory access); one word per tile.
  std::vector<std::uint64_t> open_bits((g.width * g.height + 63) / 64, 0);
  std::uint64_t* const bits = open_bits.data();
  const auto is_open = [bits](std::size_t p) { return (bits[p >> 6] >> (p & 63)) & 1U; };
  const auto close = [bits](std::size_t p) { bits[p >> 6] &= ~(std::uint64_t{1} << (p & 63)); };
  for (std::size_t y = 0; y < shape.rows; ++y) {
    for (std::size_t x = 0; x < shape.cols; ++x) {
      const std::size_t i = y * shape.cols + x;
      const std::size_t p = g.index(x + 1, y + 1);
      if (is_sea[i] != 0) {
        work[p] = -inf;
      } else if (!std::isnan(elevation_m[i])) {
        work[p] = elevation_m[i];
        bits[p >> 6] |= std::uint64_t{1} << (p & 63);
      }  // else nodata: a closed barrier, never entered, NaN
    }
  }

  const OffsetTable offsets = neighbour_offsets(g);
  const std::size_t neighbours = connectivity == Connectivity::eight ? 8 : 4;

  RadixHeap open;
  std::vector<std::uint32_t> pit;  // the paper's plain queue; drained before the next pop
  std::size_t pit_head = 0;

  // Visit the open neighbours of cell c whose fill level is `level`: a neighbour at or below
  // it lies in a depression that fills to `level` (plain queue); one above it starts at its
  // own elevation (priority queue). Paper, Algorithm 2, lines 14-22. The open neighbours are
  // gathered into a bit mask first, so closed ones cost no branch.
  const auto spread_from = [&](std::size_t c, float level) {
    const auto& off = offsets[c % tile_cells];
    unsigned mask = 0;
    for (std::size_t k = 0; k < neighbours; ++k) {
      const auto m = static_cast<std::size_t>(static_cast<std::ptrdiff_t>(c) + off[k]);
      mask |= static_cast<unsigned>(is_open(m)) << k;
    }
    while (mask != 0) {
      const auto k = static_cast<std::size_t>(std::countr_zero(mask));
      mask &= mask - 1;
      const auto m = static_cast<std::size_t>(static_cast<std::ptrdiff_t>(c) + off[k]);
      close(m);
      const float z = work[m];  // still the elevation: the cell was open
      if (z <= level) {
        work[m] = level;
        pit.push_back(static_cast<std::uint32_t>(m));
      } else {
        open.push(z, static_cast<std::uint32_t>(m));
      }
    }
  };

  // Seeds: every sea cell is at level -inf, the lowest possible, so they can be taken in any
  // order (here the input's); no queue memory is spent on them.
  for (std::size_t y = 0; y < shape.rows; ++y) {
    for (std::size_t x = 0; x < shape.cols; ++x) {
      if (is_sea[y * shape.cols + x] != 0) spread_from(g.index(x + 1, y + 1), -inf);
    }
  }
  while (true) {
    if (pit_head < pit.size()) {
      const std::uint32_t c = pit[pit_head++];
      spread_from(c, work[c]);
      continue;
    }
    pit.clear();
    pit_head = 0;
    if (open.empty()) break;
    const auto [c, level] = open.pop();
    spread_from(c, level);
  }
  // Open cells left are valid land no path of valid cells joins to the sea.
  for (std::size_t w = 0; w < open_bits.size(); ++w) {
    for (std::uint64_t left = bits[w]; left != 0; left &= left - 1) {
      work[w * 64 + static_cast<std::size_t>(std::countr_zero(left))] = inf;
    }
  }
  open_bits = {};
  // Back to row-major order, in place: a strip of tiles (tile-side padded rows) is copied out
  // to a scratch buffer and its rows written to their places in the result; a result row is
  // shorter than a padded row, so a strip's rows end before the next strip starts and no
  // strip is overwritten before it is read.
  std::vector<float> strip(tile * g.width);
  for (std::size_t ty = 0; ty < g.height / tile; ++ty) {
    std::copy_n(work + ty * strip.size(), strip.size(), strip.begin());
    for (std::size_t py = ty * tile; py < (ty + 1) * tile; ++py) {
      if (py == 0 || py > shape.rows) continue;  // the border
      float* out = threshold.data() + (py - 1) * shape.cols;
      for (std::size_t x = 0; x < shape.cols; ++x) {
        const std::size_t px = x + 1;
        out[x] = strip[(px / tile) * tile_cells + (py % tile) * tile + px % tile];
      }
    }
  }
  threshold.resize(n);  // keeps the padded capacity rather than copy to shrink it
  return threshold;
}

}  // namespace tidewright::terrain
