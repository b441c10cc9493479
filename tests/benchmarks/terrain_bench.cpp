// Speed of the flood-threshold pass and of a whole map run on a synthetic DEM, beside two peers
// in the same run: scikit-image's morphological reconstruction by erosion on the same array
// (the same result, see tests/reference/terrain_reference_test.cpp) and gdal_translate copying
// the DEM with the same GeoTIFF creation options (the I/O floor of writing rasters).
//
// The DEM: TIDEWRIGHT_BENCH_DEM_SIZE x the same cells (default 5000), float32, 10 m cells in
// UTM 33N, seeded multi-octave value noise (6 octaves, amplitude halving; chosen here) on a
// seaward slope from -8 m to +12 m; sea = edge cells at or below 0 m.
// Two more peers bound a many-level run from below: GDAL writing the run's own products
// (BM_TerrainPeerGdalProductFloor) and GDAL writing as many constant bands
// (BM_TerrainPeerGdalConstantBands).
// Run: build/ci/tidewright_bench --benchmark_filter=Terrain (figures: docs/performance.md);
// TIDEWRIGHT_BENCH_KEEP_DEM=FILE keeps the DEM for timing the command line on it.
#include <benchmark/benchmark.h>
#include <gdal_priv.h>
#include <ogr_spatialref.h>

#include <array>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <random>
#include <string>
#include <vector>

#include "tidewright/terrain/flood_map.hpp"
#include "tidewright/terrain/flood_threshold.hpp"
#include "tidewright/terrain/raster_writer.hpp"

namespace tw = tidewright::terrain;

namespace {

std::size_t dem_size() {
  const char* v = std::getenv("TIDEWRIGHT_BENCH_DEM_SIZE");
  return v != nullptr ? static_cast<std::size_t>(std::stoul(v)) : 5000;
}

struct BenchDem {
  tw::GridShape shape;
  std::vector<float> z;
  std::vector<std::uint8_t> sea;
  std::filesystem::path folder;
  std::string path;
};

// Removes the benchmark's temporary folder when the program ends.
struct FolderRemover {
  std::filesystem::path folder;
  FolderRemover() = default;
  FolderRemover(const FolderRemover&) = delete;
  FolderRemover& operator=(const FolderRemover&) = delete;
  ~FolderRemover() {
    std::error_code ec;
    // TIDEWRIGHT_BENCH_KEEP_DEM=FILE keeps a copy of the DEM, to time the CLI on it.
    if (const char* keep = std::getenv("TIDEWRIGHT_BENCH_KEEP_DEM");
        keep != nullptr && !folder.empty()) {
      std::filesystem::copy_file(folder / "dem.tif", keep,
                                 std::filesystem::copy_options::overwrite_existing, ec);
    }
    if (!folder.empty()) std::filesystem::remove_all(folder, ec);
  }
};

const BenchDem& bench_dem() {
  static FolderRemover remover;
  static const BenchDem dem = [] {
    BenchDem d;
    const std::size_t n = dem_size();
    d.shape = {n, n};
    d.z.assign(n * n, 0.0F);
    std::mt19937_64 rng(20261201ULL);
    std::uniform_real_distribution<float> u(-1.0F, 1.0F);
    float amplitude = 4.0F;
    for (std::size_t cell = 256; cell >= 8; cell /= 2, amplitude *= 0.5F) {
      const std::size_t g = n / cell + 2;
      std::vector<float> lattice(g * g);
      for (auto& v : lattice) v = u(rng);
      for (std::size_t y = 0; y < n; ++y) {
        const float fy = static_cast<float>(y) / static_cast<float>(cell);
        const auto iy = static_cast<std::size_t>(fy);
        const float wy = fy - static_cast<float>(iy);
        for (std::size_t x = 0; x < n; ++x) {
          const float fx = static_cast<float>(x) / static_cast<float>(cell);
          const auto ix = static_cast<std::size_t>(fx);
          const float wx = fx - static_cast<float>(ix);
          const float a = lattice[iy * g + ix] * (1 - wx) + lattice[iy * g + ix + 1] * wx;
          const float b =
              lattice[(iy + 1) * g + ix] * (1 - wx) + lattice[(iy + 1) * g + ix + 1] * wx;
          d.z[y * n + x] += amplitude * (a * (1 - wy) + b * wy);
        }
      }
    }
    for (std::size_t y = 0; y < n; ++y) {
      for (std::size_t x = 0; x < n; ++x) {
        d.z[y * n + x] += -8.0F + 20.0F * static_cast<float>(x) / static_cast<float>(n);
      }
    }
    d.sea.assign(n * n, 0);
    for (std::size_t y = 0; y < n; ++y) {
      for (std::size_t x = 0; x < n; ++x) {
        const bool edge = x == 0 || y == 0 || x + 1 == n || y + 1 == n;
        if (edge && d.z[y * n + x] <= 0.0F) d.sea[y * n + x] = 1;
      }
    }
    d.folder = std::filesystem::temp_directory_path() /
               ("tidewright-bench-" + std::to_string(std::random_device{}()));
    std::filesystem::create_directories(d.folder);
    remover.folder = d.folder;
    d.path = (d.folder / "dem.tif").string();
    GDALAllRegister();
    GDALDriver* drv = GetGDALDriverManager()->GetDriverByName("GTiff");
    const char* opts[] = {"TILED=YES", nullptr};
    GDALDatasetUniquePtr ds(drv->Create(d.path.c_str(), static_cast<int>(n), static_cast<int>(n), 1,
                                        GDT_Float32, const_cast<char**>(opts)));
    std::array<double, 6> gt{500000.0, 10.0, 0.0, 6000000.0, 0.0, -10.0};
    ds->SetGeoTransform(gt.data());
    OGRSpatialReference srs;
    srs.importFromEPSG(32633);
    ds->SetSpatialRef(&srs);
    if (ds->GetRasterBand(1)->RasterIO(GF_Write, 0, 0, static_cast<int>(n), static_cast<int>(n),
                                       d.z.data(), static_cast<int>(n), static_cast<int>(n),
                                       GDT_Float32, 0, 0, nullptr) != CE_None) {
      std::abort();
    }
    return d;
  }();
  return dem;
}

double seconds_of(const std::string& cmd, std::string* output = nullptr) {
  const auto t0 = std::chrono::steady_clock::now();
  FILE* p = popen(cmd.c_str(), "r");
  std::string out;
  std::array<char, 256> buf{};
  std::size_t got = 0;
  while (p != nullptr && (got = std::fread(buf.data(), 1, buf.size(), p)) > 0)
    out.append(buf.data(), got);
  const int status = p != nullptr ? pclose(p) : -1;
  const auto t1 = std::chrono::steady_clock::now();
  if (output != nullptr) *output = out;
  return status == 0 ? std::chrono::duration<double>(t1 - t0).count() : -1.0;
}

// The map writer's creation options for a cell type (terrain::geotiff_creation_options, the
// default RasterFormat) joined by `separator`, each prefixed by `prefix`: "-co " for
// gdal_translate, "" with "," for the constant-band peer script.
std::string creation_options(tw::CellType type, const std::string& prefix,
                             const std::string& separator) {
  std::string out;
  for (const auto& [name, value] : tw::geotiff_creation_options(type, tw::RasterFormat{})) {
    out += (out.empty() ? "" : separator) + prefix + name + "=" + value;
  }
  return out;
}

void BM_TerrainFloodThreshold(benchmark::State& state) {
  const auto& d = bench_dem();
  for (auto _ : state) {
    auto t = tw::flood_threshold_barnes2014(d.shape, d.z, d.sea, tw::Connectivity::eight);
    benchmark::DoNotOptimize(t.data());
  }
  state.counters["cells_per_s"] = benchmark::Counter(static_cast<double>(d.shape.cells()),
                                                     benchmark::Counter::kIsIterationInvariantRate);
}

// Peer: skimage.morphology.reconstruction (erosion) on the same array; the CPU time of the
// reconstruction call alone, as the script measures it (its wall time as a counter). Compare
// with the CPU column of BM_TerrainFloodThreshold: the machine is shared.
void BM_TerrainPeerSkimageReconstruction(benchmark::State& state) {
  const auto& d = bench_dem();
  const std::string script =
      std::string(TIDEWRIGHT_SOURCE_DIR) + "/tests/benchmarks/terrain_peer_reconstruction.py";
  for (auto _ : state) {
    std::string out;
    if (seconds_of("/usr/bin/python3 '" + script + "' '" + d.path + "'", &out) < 0) {
      state.SkipWithError("the peer needs /usr/bin/python3 with python3-skimage and python3-gdal");
      return;
    }
    std::size_t used = 0;
    const double cpu_s = std::stod(out, &used);
    state.SetIterationTime(cpu_s);
    state.counters["wall_s"] = std::stod(out.substr(used));
  }
  state.counters["cells_per_s"] = benchmark::Counter(static_cast<double>(d.shape.cells()),
                                                     benchmark::Counter::kIsIterationInvariantRate);
}

// I/O floor: gdal_translate with the map's creation options (creation_options), compression
// threads included (RasterFormat's default, NUM_THREADS=ALL_CPUS).
void BM_TerrainPeerGdalTranslate(benchmark::State& state) {
  const auto& d = bench_dem();
  const auto out = (d.folder / "copy.tif").string();
  for (auto _ : state) {
    std::filesystem::remove(out);
    const double s =
        seconds_of("gdal_translate -q " + creation_options(tw::CellType::float32, "-co ", " ") +
                   " '" + d.path + "' '" + out + "'");
    if (s < 0) {
      state.SkipWithError("gdal_translate (Debian gdal-bin) failed");
      return;
    }
    state.SetIterationTime(s);
  }
}

// The map request of the whole-run benchmarks: N levels 0.25, 0.50, ... m; sea = the edge cells
// at or below 0 m, spread (--sea-spread-to 0) over all they reach at or below 0 m when `spread`.
tw::MapRequest map_request(const BenchDem& d, std::int64_t levels, bool spread,
                           const std::string& folder) {
  tw::MapRequest req;
  req.dem.path = d.path;
  req.dem.datum.kind = tw::DatumRelation::Kind::same;
  req.sea.edge_at_or_below_m = 0.0;
  if (spread) req.sea.spread_to_m = 0.0;
  for (std::int64_t i = 0; i < levels; ++i) {
    req.levels.push_back({0.25 * static_cast<double>(i + 1), {}, ""});
  }
  req.out_dir = d.folder / folder;
  req.force = true;
  return req;
}

// The whole map run: read the DEM, threshold, and extent + depth for N levels written as
// compressed GeoTIFF (arguments: N levels, sea spread 0/1, internal overviews 0/1).
void BM_TerrainMapRun(benchmark::State& state) {
  const auto& d = bench_dem();
  auto req = map_request(d, state.range(0), state.range(1) != 0, "maps");
  req.format.overviews = state.range(2) != 0;
  for (auto _ : state) {
    auto s = tw::make_flood_maps(req);
    benchmark::DoNotOptimize(s.levels.data());
  }
  state.counters["cells_per_s"] = benchmark::Counter(static_cast<double>(d.shape.cells()),
                                                     benchmark::Counter::kIsIterationInvariantRate);
}

// The floor of the run's own outputs: gdal_translate writing the same three products
// (threshold.tif, extent.tif, depth.tif of the same run, first copied uncompressed, untimed)
// with the same creation options as the map writer (raster_writer.cpp). Whatever computes the
// products, writing them costs at least this; compare BM_TerrainMapRun with the same arguments.
// Counters: the seconds of each file.
void BM_TerrainPeerGdalProductFloor(benchmark::State& state) {
  const auto& d = bench_dem();
  const auto folder =
      "floor-" + std::to_string(state.range(0)) + "-" + std::to_string(state.range(1));
  (void)tw::make_flood_maps(map_request(d, state.range(0), state.range(1) != 0, folder));
  const auto dir = d.folder / folder;
  const std::vector<std::pair<std::string, tw::CellType>> products{
      {"threshold", tw::CellType::float32},
      {"extent", tw::CellType::byte},
      {"depth", tw::CellType::float32}};
  for (const auto& [name, type] : products) {
    const auto src = (dir / (name + ".tif")).string();
    const auto raw = (dir / ("raw-" + name + ".tif")).string();
    if (seconds_of("gdal_translate -q -co TILED=YES -co BIGTIFF=YES '" + src + "' '" + raw + "'") <
        0) {
      state.SkipWithError("gdal_translate (Debian gdal-bin) failed");
      return;
    }
  }
  for (auto _ : state) {
    double total = 0.0;
    for (const auto& [name, type] : products) {
      const auto raw = (dir / ("raw-" + name + ".tif")).string();
      const auto out = (dir / ("copy-" + name + ".tif")).string();
      std::filesystem::remove(out);
      const double s = seconds_of("gdal_translate -q " + creation_options(type, "-co ", " ") +
                                  " '" + raw + "' '" + out + "'");
      if (s < 0) {
        state.SkipWithError("gdal_translate (Debian gdal-bin) failed");
        return;
      }
      state.counters[name + "_s"] = s;
      total += s;
    }
    state.SetIterationTime(total);
  }
  std::error_code ec;
  std::filesystem::remove_all(dir, ec);
}

// Lower bound without tidewright: GDAL writing N all-NaN float32 bands and N all-zero byte
// bands of the DEM's size with the map writer's options (terrain_peer_constant_bands.py, Debian
// /usr/bin/python3 with python3-gdal). Counters: the seconds of each file.
void BM_TerrainPeerGdalConstantBands(benchmark::State& state) {
  const auto& d = bench_dem();
  const std::string script =
      std::string(TIDEWRIGHT_SOURCE_DIR) + "/tests/benchmarks/terrain_peer_constant_bands.py";
  for (auto _ : state) {
    std::string out;
    if (seconds_of("/usr/bin/python3 '" + script + "' " + std::to_string(d.shape.cols) + " " +
                       std::to_string(d.shape.rows) + " " + std::to_string(state.range(0)) + " '" +
                       d.folder.string() + "' " + creation_options(tw::CellType::float32, "", ",") +
                       " " + creation_options(tw::CellType::byte, "", ","),
                   &out) < 0) {
      state.SkipWithError("the peer needs /usr/bin/python3 with python3-gdal and python3-numpy");
      return;
    }
    std::size_t used = 0;
    const double float_s = std::stod(out, &used);
    const double byte_s = std::stod(out.substr(used));
    state.counters["nan_float32_s"] = float_s;
    state.counters["zero_byte_s"] = byte_s;
    state.SetIterationTime(float_s + byte_s);
  }
}

}  // namespace

BENCHMARK(BM_TerrainFloodThreshold)->Unit(benchmark::kMillisecond)->Iterations(3);
BENCHMARK(BM_TerrainPeerSkimageReconstruction)
    ->Unit(benchmark::kMillisecond)
    ->UseManualTime()
    ->Iterations(1);
BENCHMARK(BM_TerrainPeerGdalTranslate)
    ->Unit(benchmark::kMillisecond)
    ->UseManualTime()
    ->Iterations(3);
BENCHMARK(BM_TerrainMapRun)
    ->ArgsProduct({{1, 20}, {0, 1}, {1}})
    ->Args({20, 0, 0})
    ->ArgNames({"levels", "spread", "overviews"})
    ->Unit(benchmark::kMillisecond)
    ->Iterations(1);
BENCHMARK(BM_TerrainPeerGdalConstantBands)
    ->Arg(20)
    ->ArgName("levels")
    ->Unit(benchmark::kMillisecond)
    ->UseManualTime()
    ->Iterations(1);
BENCHMARK(BM_TerrainPeerGdalProductFloor)
    ->Args({20, 0})
    ->Args({20, 1})
    ->ArgNames({"levels", "spread"})
    ->Unit(benchmark::kMillisecond)
    ->UseManualTime()
    ->Iterations(1);
