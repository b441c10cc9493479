// The inputs of tidewright's demo study of Quillhaven, an INVENTED harbour (invented data — not
// a real place, not for any real decision), written into one folder by `tidewright demo`.
#pragma once

#include <cstddef>
#include <filesystem>
#include <string>
#include <vector>

#include "demo_terrain.hpp"
#include "demo_tide_record.hpp"

namespace tidewright::demo {

// The demo command's --seed default: the seed whose record fits a still-water shape (demo_coast/README.md).
inline constexpr unsigned long long demo_default_seed = 20261203ULL;

struct DemoOptions {
  // Small variant for end-to-end tests: record 1995–2024 and 20 m DEM cells (300 x 225)
  // instead of 1975–2024 and 5 m cells (1,200 x 900). Same place, same features.
  bool small = false;
  bool force = false;  // replace files that already exist in the folder
  // DEM cell size; 0 keeps the variant's (5 m full, 20 m small). 2.5 m gives 2,400 x 1,800 cells.
  double dem_cell_size_m = 0.0;
};

struct DemoInputs {
  std::filesystem::path folder;
  std::filesystem::path record_csv;        // quillhaven_tide_gauge.csv
  std::filesystem::path dem_tif;           // quillhaven_dem.tif
  std::filesystem::path defences_geojson;  // quillhaven_defences.geojson
  std::filesystem::path sea_geojson;       // quillhaven_sea.geojson
  std::filesystem::path site_toml;         // site.toml (demo_site_toml's text)
  unsigned long long seed = 0;
  bool small = false;
  // Summary of what was written.
  int first_year = 0;
  int last_year = 0;
  std::size_t hours_in_span = 0;
  std::size_t rows_written = 0;
  std::size_t rows_with_value = 0;
  std::size_t rows_na = 0;
  std::size_t rows_empty = 0;
  std::size_t rows_sentinel = 0;
  std::size_t surge_events = 0;
  int dem_columns = 0;
  int dem_rows = 0;
  double dem_cell_size_m = 0.0;
  std::vector<Landmark> landmarks;

  // A few lines for the terminal, starting with the invented-data notice.
  [[nodiscard]] std::string summary_text() const;
};

// The study's record and terrain designs for the given variant.
[[nodiscard]] TideRecordDesign demo_record_design(bool small);
[[nodiscard]] TerrainDesign demo_terrain_design(bool small, double cell_size_m = 0.0);

// Creates `folder` if needed and writes the five files into it, each atomically. Refuses (with
// an InputError, before writing anything) when one of them exists and !options.force.
DemoInputs write_demo_inputs(const std::filesystem::path& folder, unsigned long long seed,
                             const DemoOptions& options = {});

// The draft site file (TOML) for the files of `inputs`, with paths relative to the folder.
// demo_coast/site.toml is this text for demo_default_seed and the full variant.
[[nodiscard]] std::string demo_site_toml(unsigned long long seed, bool small);

}  // namespace tidewright::demo
