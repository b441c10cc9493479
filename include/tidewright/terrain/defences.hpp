// Defences (sea walls, levees, flood gates shut) burned into the DEM as walls: each line or
// polygon feature of an OGR layer (GeoPackage, GeoJSON, Shapefile, ...) raises every cell it
// touches to its crest level, z = max(z, crest). Rasterised with GDALRasterize's ALL_TOUCHED=TRUE;
// because that still leaves a diagonal gap where a line runs exactly through cell corners, every
// remaining diagonal gap (two wall cells on a diagonal, open land on both other corners of the
// 2 x 2 window) is then closed by raising one open cell, so water does not pass through a wall
// under 8-connectivity (tested with a 45-degree wall through corners). Where defences overlap,
// the highest crest wins. Memory: two transient float32 grids (the burn and its copy).
#pragma once

#include <string>
#include <vector>

#include "tidewright/terrain/dem.hpp"

namespace tidewright::terrain {

struct DefenceSource {
  std::string path;
  std::string layer;                    // empty = the first layer
  std::string crest_field = "crest_m";  // attribute with the crest level (m); a project name
  bool crest_in_water_datum = false;    // false: crest levels are in the DEM's datum
  std::string recorded_as{};  // how descriptions and warnings name it; empty: path
  // How the caller names the crest options in messages (a flag, or a site-file key).
  std::string crest_field_input = "--crest-field";
  std::string crest_datum_input = "--crest-datum";
};

struct DefenceBurn {
  std::size_t features = 0;
  std::size_t cells_raised = 0;
  std::size_t gaps_closed = 0;  // diagonal gaps left by the burn and closed
  std::size_t cells_touched = 0;  // DEM cells under a defence (whether raised or not)
  std::string description;
  std::vector<double> crests_m;  // each feature's crest as read (crest field's datum), ascending
  // Defences that change nothing: none over the DEM (another CRS or place?), or every crest at
  // or below the ground it stands on (the crest field or its datum?).
  std::vector<std::string> warnings;
};

// Throws InputError: unreadable file, missing layer or crest attribute, a feature with no crest
// value, a layer with no CRS.
DefenceBurn burn_defences(Dem& dem, const DefenceSource& source);

}  // namespace tidewright::terrain
