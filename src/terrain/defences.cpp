// Burning defences into the DEM (include/tidewright/terrain/defences.hpp).
#include "tidewright/terrain/defences.hpp"

#include <gdal_alg.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <numeric>

#include "tidewright/common/error.hpp"
#include "gdal_support.hpp"

namespace tidewright::terrain {
namespace {

// GDALRasterize with ALL_TOUCHED=TRUE still burns only the diagonal cells of a line that runs
// exactly through cell corners (a 45-degree wall on the grid's corners; seen in the tests), so
// two diagonal wall cells can have open land on both sides that is itself diagonally connected:
//   W .        the two '.' cells are 8-neighbours, so water passes between them.
//   . W
// Each such 2 x 2 window gets one of its open cells raised to the lower of the two crests (the
// one on higher ground, so the least land is given up; ties: the upper one), which makes the
// wall 4-connected there. Repeated until no window is open (raising a cell can open a window
// already visited). Only valid DEM cells count as open.
std::size_t close_diagonal_gaps(const Dem& dem, std::vector<float>& crest) {
  const std::size_t cols = dem.grid.shape.cols;
  const std::size_t rows = dem.grid.shape.rows;
  const auto wall = [&](std::size_t i) { return !std::isnan(crest[i]); };
  const auto open = [&](std::size_t i) { return !wall(i) && !std::isnan(dem.elevation_m[i]); };
  const auto raise_one = [&](std::size_t p, std::size_t q, float level) {
    const std::size_t pick = dem.elevation_m[q] > dem.elevation_m[p] ? q : p;
    crest[pick] = level;
  };
  std::size_t closed = 0;
  bool changed = rows > 1 && cols > 1;
  while (changed) {
    changed = false;
    for (std::size_t r = 0; r + 1 < rows; ++r) {
      for (std::size_t c = 0; c + 1 < cols; ++c) {
        const std::size_t tl = r * cols + c;
        const std::size_t tr = tl + 1;
        const std::size_t bl = tl + cols;
        const std::size_t br = bl + 1;
        if (wall(tl) && wall(br) && open(tr) && open(bl)) {
          raise_one(tr, bl, std::min(crest[tl], crest[br]));
        } else if (wall(tr) && wall(bl) && open(tl) && open(br)) {
          raise_one(tl, br, std::min(crest[tr], crest[bl]));
        } else {
          continue;
        }
        ++closed;
        changed = true;
      }
    }
  }
  return closed;
}

// The crest level of each feature with a geometry, in the layer's order; InputError for a
// missing attribute or a feature without a finite crest.
std::vector<double> read_crests(OGRLayer& layer, const DefenceSource& source) {
  OGRFeatureDefn* defn = layer.GetLayerDefn();
  const int field = defn->GetFieldIndex(source.crest_field.c_str());
  if (field < 0) {
    std::string fields;
    for (int i = 0; i < defn->GetFieldCount(); ++i) {
      fields += (i != 0 ? ", " : "") + std::string(defn->GetFieldDefn(i)->GetNameRef());
    }
    throw InputError(source.path + ": " + source.crest_field,
                     "the defence layer has no crest-level attribute '" + source.crest_field +
                         "' (its attributes: " + (fields.empty() ? "none" : fields) + ")",
                     "name the crest-level attribute with " + source.crest_field_input);
  }
  std::vector<double> crests;
  layer.ResetReading();
  for (auto& feature : layer) {
    const OGRGeometry* g = feature->GetGeometryRef();
    if (g == nullptr || g->IsEmpty()) continue;
    if (!feature->IsFieldSetAndNotNull(field)) {
      throw InputError(source.path + ": feature " + std::to_string(feature->GetFID()),
                       "has no value in '" + source.crest_field + "'", "give every defence a crest level");
    }
    const double crest = feature->GetFieldAsDouble(field);
    if (!std::isfinite(crest)) {
      throw InputError(source.path + ": feature " + std::to_string(feature->GetFID()),
                       "crest level is not a finite number", "correct the attribute");
    }
    crests.push_back(crest);
  }
  return crests;
}

// The crests on the DEM's grid (NaN where no defence), burnt ALL_TOUCHED in ascending crest
// order, so that where defences overlap the highest crest stays; `crests_m` comes back sorted.
std::vector<float> rasterise_crests(const Dem& dem, const std::vector<gdal::LayerGeometry>& geometries,
                                    std::vector<double>& crests_m, const std::string& path) {
  std::vector<std::size_t> order(crests_m.size());
  std::iota(order.begin(), order.end(), std::size_t{0});
  std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) { return crests_m[a] < crests_m[b]; });
  std::vector<OGRGeometryH> handles;
  std::vector<double> burn;
  for (auto i : order) {
    handles.push_back(OGRGeometry::ToHandle(geometries[i].geometry.get()));
    burn.push_back(crests_m[i]);
  }
  crests_m = burn;
  auto mem = gdal::mem_raster(dem.grid, GDT_Float32, 1, std::numeric_limits<double>::quiet_NaN());
  int band = 1;
  const char* options[] = {"ALL_TOUCHED=TRUE", nullptr};
  if (!handles.empty() &&
      GDALRasterizeGeometries(GDALDataset::ToHandle(mem.get()), 1, &band, static_cast<int>(handles.size()),
                              handles.data(), nullptr, nullptr, burn.data(), const_cast<char**>(options), nullptr,
                              nullptr) != CE_None) {
    throw InputError(path, "rasterising the defences failed (" + gdal::last_error() + ")",
                     "check their geometries with ogrinfo");
  }
  const auto cols = static_cast<int>(dem.grid.shape.cols);
  const auto rows = static_cast<int>(dem.grid.shape.rows);
  std::vector<float> crest(dem.grid.shape.cells());
  if (mem->GetRasterBand(1)->RasterIO(GF_Read, 0, 0, cols, rows, crest.data(), cols, rows, GDT_Float32, 0, 0,
                                      nullptr) != CE_None) {
    throw InputError(path, "reading the rasterised defences failed", "check the file");
  }
  return crest;
}

}  // namespace

DefenceBurn burn_defences(Dem& dem, const DefenceSource& source) {
  auto ds = gdal::open_vector(source.path, "defence layer");
  OGRLayer* layer =
      source.layer.empty() ? ds->GetLayer(0) : ds->GetLayerByName(source.layer.c_str());
  if (layer == nullptr) {
    throw InputError(source.path, "has no layer '" + source.layer + "'",
                     "name one of its layers (ogrinfo " + source.path + ")");
  }
  // Crest per feature, read before the geometries are reprojected (same feature order).
  std::vector<double> crests = read_crests(*layer, source);
  auto geometries = gdal::layer_geometries(*layer, dem.grid, source.path);
  if (geometries.size() != crests.size()) {
    throw InputError(source.path, "the layer changed while it was read", "read it again");
  }
  std::vector<float> crest = rasterise_crests(dem, geometries, crests, source.path);
  DefenceBurn out;
  out.features = crests.size();
  out.crests_m = crests;  // ascending
  out.gaps_closed = close_diagonal_gaps(dem, crest);
  for (std::size_t i = 0; i < crest.size(); ++i) {
    if (std::isnan(crest[i]) || std::isnan(dem.elevation_m[i])) continue;
    ++out.cells_touched;
    // Crest above the water-level datum: z_water = z_dem + offset (dem.hpp) unless given so.
    const double c = static_cast<double>(crest[i]);
    const double crest_m = source.crest_in_water_datum ? c : c + dem.offset_at(i);
    if (crest_m > static_cast<double>(dem.elevation_m[i])) {
      dem.elevation_m[i] = static_cast<float>(crest_m);
      ++out.cells_raised;
    }
  }
  const std::string& shown = source.recorded_as.empty() ? source.path : source.recorded_as;
  out.description = shown + " (" + std::to_string(out.features) + " features, crest '" +
                    source.crest_field + "' in the " +
                    (source.crest_in_water_datum ? "water-level" : "DEM") +
                    " datum, ALL_TOUCHED burn, " + std::to_string(out.gaps_closed) +
                    " diagonal gaps closed, " + std::to_string(out.cells_raised) + " cells raised)";
  if (out.cells_touched == 0) {
    out.warnings.push_back(shown + ": the " + std::to_string(out.features) +
                           " defences touch none of the DEM's cells, so they change nothing: check their CRS and "
                           "extent against the DEM (ogrinfo -so, gdalinfo)");
  } else if (out.cells_raised == 0) {
    out.warnings.push_back(shown + ": every defence crest is at or below the ground under it (" +
                           std::to_string(out.cells_touched) + " cells), so none was raised: check " +
                           source.crest_field_input + " and " + source.crest_datum_input);
  }
  return out;
}

}  // namespace tidewright::terrain
