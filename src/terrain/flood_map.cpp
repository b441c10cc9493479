// The map pipeline (include/tidewright/terrain/flood_map.hpp).
// Glossary: z elevation above the water-level datum (m); T flood threshold (m); h level (m);
// A_r area of a cell in row r (m^2); d = h - z depth (m); V = sum d A_r volume (m^3).
#include "tidewright/terrain/flood_map.hpp"

#include "tidewright/terrain/map_style.hpp"

#include <gdal_alg.h>

#include <cpl_conv.h>

#include <cmath>
#include <functional>
#include <cstdlib>
#include <ctime>
#include <limits>
#include <nlohmann/json.hpp>
#include <sstream>

#include "tidewright/common/atomic_output.hpp"
#include "tidewright/common/csv.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/extremes/return_levels.hpp"
#include "gdal_support.hpp"
#include "tidewright/version.hpp"

namespace tidewright::terrain {
namespace {

constexpr float nan_f = std::numeric_limits<float>::quiet_NaN();
using Metadata = std::vector<std::pair<std::string, std::string>>;

std::string fixed(double v, int digits = 3) {
  std::ostringstream s;
  s.setf(std::ios::fixed);
  s.precision(digits);
  s << v;
  return s.str();
}

std::string level_label(const MapLevel& l) {
  std::string s = fixed(l.level_m) + " m";
  if (l.year) s += ", year " + std::to_string(*l.year);
  if (!l.scenario.empty()) s += ", scenario " + l.scenario;
  return s;
}

const char* class_name(std::uint8_t c) {
  switch (static_cast<ExtentClass>(c)) {
    case ExtentClass::connected_flooded:
      return "connected flooded";
    case ExtentClass::cut_off_low_ground:
      return "cut-off low ground";
    default:
      return "other";
  }
}

Metadata common_metadata(const MapRequest& req, const FloodThresholdMap& map,
                         const std::string& product) {
  Metadata m;
  m.emplace_back("TIDEWRIGHT_PRODUCT", product);
  m.emplace_back("TIDEWRIGHT_VERSION", version_string);
  m.emplace_back("TIDEWRIGHT_METHOD",
                 "flood threshold = lowest still-water level at which the sea reaches the cell "
                 "over land no higher than that level; priority-flood from the sea cells (Barnes, "
                 "Lehman & Mulla 2014, Computers & Geosciences 62:117, doi:10.1016/"
                 "j.cageo.2013.04.024), " +
                     std::to_string(static_cast<int>(map.connectivity)) + "-connectivity");
  m.emplace_back("TIDEWRIGHT_VERTICAL", "metres above the water-level datum");
  if (!req.datum.empty()) m.emplace_back("TIDEWRIGHT_WATER_LEVEL_DATUM", req.datum);
  for (const auto& kv : req.input_metadata) m.push_back(kv);
  m.emplace_back("TIDEWRIGHT_DEM", map.dem.description);
  m.emplace_back("TIDEWRIGHT_SEA", map.sea.description);
  m.emplace_back("TIDEWRIGHT_DEFENCES", map.defences ? map.defences->description : "none");
  if (!req.command_line.empty()) m.emplace_back("TIDEWRIGHT_COMMAND", req.command_line);
  std::string cautions;
  for (const auto& c : req.cautions) cautions += (cautions.empty() ? "" : " | ") + c;
  if (!cautions.empty()) m.emplace_back("TIDEWRIGHT_CAUTIONS", cautions);
  return m;
}

// What a level's band or polygon records of where it came from.
Metadata level_metadata(const MapLevel& l, const std::string& datum) {
  Metadata m{{"LEVEL_M", fixed(l.level_m, 4)}};
  if (l.year) m.emplace_back("YEAR", std::to_string(*l.year));
  if (!l.scenario.empty()) m.emplace_back("SCENARIO", l.scenario);
  if (l.return_period_yr) {
    m.emplace_back("RETURN_PERIOD_YR", fixed(*l.return_period_yr, 4));
    m.emplace_back("RETURN_PERIOD_DEFINITION", extremes::return_period_definition);
  }
  if (!datum.empty()) m.emplace_back("WATER_LEVEL_DATUM", datum);
  return m;
}

// Zone area from the equator to latitude phi per radian of longitude on the ellipsoid (a, e):
// a^2 q / 2 with Snyder (1987, Map Projections: A Working Manual, eq. 3-12)
// q = (1 - e^2) [sin phi / (1 - e^2 sin^2 phi) - ln((1 - e sin phi) / (1 + e sin phi)) / (2e)];
// a sphere (e = 0) gives a^2 sin phi.
double zone_area_per_radian_m2(double phi, double a, double e) {
  const double s = std::sin(phi);
  if (e < 1e-12) return a * a * s;
  const double q = (1.0 - e * e) * (s / (1.0 - e * e * s * s) - std::log((1.0 - e * s) / (1.0 + e * s)) / (2.0 * e));
  return 0.5 * a * a * q;
}

// Area of a polygon traced along cell edges of a north-up grid (GDALPolygonize's output): in a
// projected CRS the planar area in square metres; in a geographic one the exact ellipsoidal
// area, summed over the edges along parallels (those along meridians add nothing), the same
// quantity the summary adds up cell by cell.
double polygon_area_m2(const OGRGeometry& g, const OGRSpatialReference& srs) {
  if (!srs.IsGeographic()) {
    const double unit_m = srs.GetLinearUnits(nullptr);
    const auto* surface = dynamic_cast<const OGRSurface*>(&g);
    return surface != nullptr ? surface->get_Area() * unit_m * unit_m : 0.0;
  }
  const auto* polygon = dynamic_cast<const OGRPolygon*>(&g);
  if (polygon == nullptr) return 0.0;
  const double to_rad = srs.GetAngularUnits(nullptr);  // radians per CRS unit
  OGRErr err = OGRERR_NONE;
  const double a = srs.GetSemiMajor(&err);
  const double inv_f = srs.GetInvFlattening(&err);
  const double f = inv_f == 0.0 ? 0.0 : 1.0 / inv_f;
  const double e = std::sqrt(f * (2.0 - f));
  const auto ring_area = [&](const OGRLinearRing& ring) {
    double sum = 0.0;
    for (int k = 0; k + 1 < ring.getNumPoints(); ++k) {
      const double y0 = ring.getY(k);
      const double y1 = ring.getY(k + 1);
      if (y0 != y1) continue;  // an edge along a meridian
      sum += (ring.getX(k + 1) - ring.getX(k)) * to_rad * zone_area_per_radian_m2(y0 * to_rad, a, e);
    }
    return std::abs(sum);
  };
  double area = polygon->getExteriorRing() != nullptr ? ring_area(*polygon->getExteriorRing()) : 0.0;
  for (int h = 0; h < polygon->getNumInteriorRings(); ++h) area -= ring_area(*polygon->getInteriorRing(h));
  return area;
}

struct PolygonFile {
  const char* driver;
  const char* name;                       // the file the driver is given
  std::vector<const char*> side_suffixes;  // further files it writes beside it
};
PolygonFile polygon_file(PolygonFormat f) {
  switch (f) {
    case PolygonFormat::flatgeobuf:
      return {"FlatGeobuf", "extent.fgb", {}};
    case PolygonFormat::shapefile:
      return {"ESRI Shapefile", "extent.shp", {".shx", ".dbf", ".prj", ".cpg"}};
    default:
      return {"GPKG", "extent.gpkg", {}};
  }
}

// A field's name in the chosen format: a Shapefile's (dBASE) names hold at most 10 characters.
const char* field_name(const char* name, PolygonFormat f) {
  if (f != PolygonFormat::shapefile) return name;
  if (std::string_view(name) == "extent_class") return "ext_class";
  if (std::string_view(name) == "return_period_yr") return "ret_per_yr";
  return name;
}

// Extent polygons of one level: the classes 1 and 2 polygonised (GDALPolygonize) into `layer`.
void polygonise_level(const FloodThresholdMap& map, const LevelSummary& level, OGRLayer& layer,
                      const std::string& path, PolygonFormat format) {
  const GeoGrid& grid = map.dem.grid;
  const std::size_t n = grid.shape.cells();
  auto classes = gdal::mem_raster(grid, GDT_Byte, 1, 0.0);
  std::vector<std::uint8_t> values(n);
  for (std::size_t i = 0; i < n; ++i) {
    const auto c = classify_cell(map.dem.elevation_m[i], map.threshold_m[i], level.level.level_m);
    values[i] = (c == ExtentClass::connected_flooded || c == ExtentClass::cut_off_low_ground)
                    ? static_cast<std::uint8_t>(c)
                    : 0;
  }
  GDALRasterBand* band = classes->GetRasterBand(1);
  band->DeleteNoDataValue();
  if (band->RasterIO(GF_Write, 0, 0, static_cast<int>(grid.shape.cols),
                     static_cast<int>(grid.shape.rows), values.data(),
                     static_cast<int>(grid.shape.cols), static_cast<int>(grid.shape.rows), GDT_Byte,
                     0, 0, nullptr) != CE_None) {
    throw InputError(path, "preparing the extent polygons failed", "report this");
  }
  values = {};
  // Polygonise into a scratch layer, then copy with the level's attributes.
  GDALDriver* memory = GetGDALDriverManager()->GetDriverByName("Memory");
  GDALDatasetUniquePtr scratch(memory->Create("", 0, 0, 0, GDT_Unknown, nullptr));
  OGRSpatialReference srs = gdal::grid_srs(grid);
  OGRLayer* tmp = scratch->CreateLayer("p", &srs, wkbPolygon, nullptr);
  OGRFieldDefn value_field("extent_class", OFTInteger);
  tmp->CreateField(&value_field);
  const char* options[] = {map.connectivity == Connectivity::eight ? "8CONNECTED=8" : nullptr,
                           nullptr};
  if (GDALPolygonize(GDALRasterBand::ToHandle(band), GDALRasterBand::ToHandle(band),
                     OGRLayer::ToHandle(tmp), 0, const_cast<char**>(options), nullptr,
                     nullptr) != CE_None) {
    throw InputError(path, "polygonising the extent failed (" + gdal::last_error() + ")",
                     "leave out --polygons");
  }
  for (auto& f : tmp) {
    OGRFeature out(layer.GetLayerDefn());
    const int cls = f->GetFieldAsInteger(0);
    out.SetField(field_name("extent_class", format), cls);
    out.SetField("class_name", class_name(static_cast<std::uint8_t>(cls)));
    out.SetField("level_m", level.level.level_m);
    if (level.level.year) out.SetField("year", *level.level.year);
    if (!level.level.scenario.empty()) out.SetField("scenario", level.level.scenario.c_str());
    if (level.level.return_period_yr) out.SetField(field_name("return_period_yr", format), *level.level.return_period_yr);
    out.SetField("area_m2", polygon_area_m2(*f->GetGeometryRef(), srs));
    out.SetGeometry(f->GetGeometryRef());
    if (layer.CreateFeature(&out) != OGRERR_NONE) {
      throw InputError(path, "writing a polygon failed (" + gdal::last_error() + ")",
                       "free disk space or choose another folder");
    }
  }
}

// A GeoPackage records when it was written (gpkg_contents.last_change). With the
// reproducible-builds variable SOURCE_DATE_EPOCH set, that time is taken from it, so the same
// run gives the same bytes; otherwise it is the current time, as GDAL writes it.
void pin_geopackage_time() {
  const char* epoch = std::getenv("SOURCE_DATE_EPOCH");
  if (epoch == nullptr) return;
  char* end = nullptr;
  const long long seconds = std::strtoll(epoch, &end, 10);
  if (end == epoch || *end != '\0' || seconds < 0) {
    throw InputError("SOURCE_DATE_EPOCH", "is '" + std::string(epoch) + "', not a count of seconds since 1970",
                     "give a whole number of seconds, or unset it");
  }
  const auto t = static_cast<std::time_t>(seconds);
  std::tm utc{};
  gmtime_r(&t, &utc);
  char text[32];
  std::strftime(text, sizeof text, "%Y-%m-%dT%H:%M:%S.000Z", &utc);
  CPLSetConfigOption("OGR_CURRENT_DATE", text);
}

void write_polygons(const FloodThresholdMap& map, const std::vector<LevelSummary>& levels,
                    const std::filesystem::path& path, const std::string& datum, PolygonFormat format) {
  GDALDriver* driver = GetGDALDriverManager()->GetDriverByName(polygon_file(format).driver);
  if (driver == nullptr) {
    throw InputError(shown_path(path), std::string("this GDAL has no ") + polygon_file(format).driver + " driver",
                     "choose another polygon format");
  }
  GDALDatasetUniquePtr ds(driver->Create(path.c_str(), 0, 0, 0, GDT_Unknown, nullptr));
  if (!ds) {
    throw InputError(shown_path(path), "cannot be created (" + gdal::last_error() + ")",
                     "check the output folder");
  }
  OGRSpatialReference srs = gdal::grid_srs(map.dem.grid);
  OGRLayer* layer = ds->CreateLayer("extent", &srs, wkbPolygon, nullptr);
  for (const auto& [name, type] :
       std::vector<std::pair<const char*, OGRFieldType>>{{"extent_class", OFTInteger},
                                                         {"class_name", OFTString},
                                                         {"level_m", OFTReal},
                                                         {"year", OFTInteger},
                                                         {"scenario", OFTString},
                                                         {"return_period_yr", OFTReal},
                                                         {"area_m2", OFTReal}}) {
    OGRFieldDefn field(field_name(name, format), type);
    layer->CreateField(&field);
  }
  // What the fields mean, on the layer (a GeoPackage keeps layer metadata; the others do not).
  if (format == PolygonFormat::geopackage) {
    layer->SetMetadataItem("RETURN_PERIOD_DEFINITION", extremes::return_period_definition);
    layer->SetMetadataItem("AREA_M2", ("area of each polygon: " + cell_areas(map.dem.grid).method).c_str());
    layer->SetMetadataItem("VERTICAL", "level_m in metres above the water-level datum");
    if (!datum.empty()) layer->SetMetadataItem("WATER_LEVEL_DATUM", datum.c_str());
  }
  const bool transaction = ds->StartTransaction() == OGRERR_NONE;
  for (const auto& level : levels) polygonise_level(map, level, *layer, shown_path(path), format);
  if (transaction && ds->CommitTransaction() != OGRERR_NONE) {
    throw InputError(shown_path(path), "writing the polygons failed (" + gdal::last_error() + ")",
                     "free disk space or choose another folder");
  }
  gdal::close_checked(ds, shown_path(path), "closing the polygon file");
}

std::string summary_csv(const MapSummary& s) {
  std::ostringstream out;
  out << "level_m,year,scenario,connected_cells,cut_off_cells,flooded_area_m2,"
         "cut_off_area_m2,volume_m3,max_depth_m\n";
  for (const auto& l : s.levels) {
    out << fixed(l.level.level_m, 4) << ',' << (l.level.year ? std::to_string(*l.level.year) : "")
        << ',' << csv_field(l.level.scenario) << ',' << l.connected_cells << ',' << l.cut_off_cells << ','
        << fixed(l.flooded_area_m2, 2) << ',' << fixed(l.cut_off_area_m2, 2) << ','
        << fixed(l.volume_m3, 2) << ',' << fixed(l.max_depth_m, 4) << '\n';
  }
  return out.str();
}

}  // namespace

nlohmann::ordered_json level_summary_json(const LevelSummary& l) {
  nlohmann::ordered_json e;
  e["level_m"] = l.level.level_m;
  e["year"] = l.level.year ? nlohmann::ordered_json(*l.level.year) : nlohmann::ordered_json();
  e["scenario"] = l.level.scenario;
  e["return_period_yr"] = l.level.return_period_yr ? nlohmann::ordered_json(*l.level.return_period_yr)
                                                   : nlohmann::ordered_json();
  e["connected_cells"] = l.connected_cells;
  e["cut_off_cells"] = l.cut_off_cells;
  e["flooded_area_m2"] = l.flooded_area_m2;
  e["cut_off_area_m2"] = l.cut_off_area_m2;
  e["volume_m3"] = l.volume_m3;
  e["max_depth_m"] = l.max_depth_m;
  return e;
}

namespace {

nlohmann::ordered_json summary_json(const MapSummary& s, const FloodThresholdMap& map,
                                    const MapRequest& req) {
  nlohmann::ordered_json j;
  j["dem"] = map.dem.description;
  j["sea"] = map.sea.description;
  j["defences"] = map.defences ? map.defences->description : "none";
  j["connectivity"] = static_cast<int>(map.connectivity);
  j["vertical"] = "metres above the water-level datum";
  j["dem_vertical_unit"] = map.dem.vertical_unit;
  j["area_method"] = s.area_method;
  j["cells"] = s.cells;
  j["valid_cells"] = s.valid_cells;
  j["sea_cells"] = s.sea_cells;
  j["unreached_cells"] = s.unreached_cells;
  j["lowest_threshold_m"] = s.lowest_threshold_m;
  j["highest_threshold_m"] = s.highest_threshold_m;
  auto& levels = j["levels"] = nlohmann::ordered_json::array();
  for (const auto& l : s.levels) levels.push_back(level_summary_json(l));
  j["files"] = s.files;
  j["command"] = req.command_line;
  j["cautions"] = req.cautions;
  j["warnings"] = s.warnings;
  return j;
}

}  // namespace

FloodThresholdMap prepare_flood_threshold(const DemSource& dem, const SeaSource& sea,
                                          const std::optional<DefenceSource>& defences,
                                          Connectivity connectivity) {
  FloodThresholdMap map;
  map.connectivity = connectivity;
  map.dem = read_dem(dem);
  if (defences) map.defences = burn_defences(map.dem, *defences);
  map.dem.offset_m = {};  // no longer needed: free it before the threshold pass
  map.sea = find_sea_cells(map.dem, sea, connectivity);
  map.threshold_m = flood_threshold_barnes2014(map.dem.grid.shape, map.dem.elevation_m,
                                               map.sea.is_sea, connectivity);
  if (sea.spread_to_m) (void)spread_sea(map.sea, map.threshold_m, *sea.spread_to_m, sea.spread_input);
  return map;
}

namespace {

// Refuses a request's bad levels before any work: not finite, implausibly high, below the sea's
// spread; and polygons without a level.
void check_levels(const MapRequest& req) {
  for (const auto& l : req.levels) {
    if (!std::isfinite(l.level_m)) {
      throw InputError(req.names.level, "a level is not a finite number", "give levels in metres");
    }
    if (l.level_m > max_plausible_level_m && !req.accept_high_levels) {
      throw InputError(req.names.level,
                       "the level " + fixed(l.level_m) + " m lies more than " +
                           fixed(max_plausible_level_m) + " m above the water-level datum (centimetres or feet?)",
                       "give levels in metres, or " + req.names.accept_high_level);
    }
  }
  if (req.sea.spread_to_m) {
    const double spread = *req.sea.spread_to_m;
    check_spread_level(spread, req.sea.spread_input);
    for (const auto& l : req.levels) {
      if (l.level_m < spread) {
        throw InputError(req.sea.spread_input,
                         "the sea spread to " + fixed(spread) + " m lies above the mapped level " +
                             fixed(l.level_m) + " m, so dry land between the two would show as sea",
                         "give a spread level at or below every mapped level (today's high water)");
      }
    }
  }
  if (req.polygons && req.levels.empty()) {
    throw InputError(req.names.polygons, "extent polygons need at least one level", "give " + req.names.level + " M");
  }
}

// The summary's counts over the whole grid and the range of finite thresholds.
MapSummary grid_summary(const FloodThresholdMap& map, const CellAreas& areas) {
  MapSummary s;
  s.warnings = map.dem.warnings;
  if (map.defences) s.warnings.insert(s.warnings.end(), map.defences->warnings.begin(), map.defences->warnings.end());
  s.warnings.insert(s.warnings.end(), map.sea.warnings.begin(), map.sea.warnings.end());
  s.defences = map.defences;
  s.cells = map.dem.grid.shape.cells();
  s.sea_cells = map.sea.count;
  s.area_method = areas.method;
  double lo = std::numeric_limits<double>::infinity();
  double hi = -lo;
  for (std::size_t i = 0; i < s.cells; ++i) {
    const float t = map.threshold_m[i];
    if (!std::isnan(map.dem.elevation_m[i])) ++s.valid_cells;
    if (t == std::numeric_limits<float>::infinity()) ++s.unreached_cells;
    if (std::isfinite(t)) {
      lo = std::min(lo, static_cast<double>(t));
      hi = std::max(hi, static_cast<double>(t));
    }
  }
  if (!std::isfinite(lo)) lo = hi = 0.0;  // nothing reached: the tables are never read
  s.lowest_threshold_m = lo;
  s.highest_threshold_m = hi;
  return s;
}

// Every product's writer, one file per product, one band per level or rate function; the
// lookups that turn a threshold into an AEP or a first year.
struct MapWriters {
  std::unique_ptr<GeoTiffWriter> threshold;
  std::unique_ptr<GeoTiffWriter> extent;
  std::unique_ptr<GeoTiffWriter> depth;
  std::vector<std::unique_ptr<GeoTiffWriter>> classes;     // one per level
  std::vector<std::unique_ptr<GeoTiffWriter>> depths;      // one per level, when asked for
  std::unique_ptr<GeoTiffWriter> aep;
  std::vector<AepLookup> aep_tables;
  std::optional<FirstPassingYear> first;
  std::unique_ptr<GeoTiffWriter> first_writer;

  void finish() {
    threshold->finish();
    if (extent) extent->finish();
    for (auto& w : classes) w->finish();
    for (auto& w : depths) w->finish();
    if (depth) depth->finish();
    if (aep) aep->finish();
    if (first_writer) first_writer->finish();
  }
};

void open_level_writers(MapWriters& w, const MapRequest& req, const FloodThresholdMap& map,
                        const std::filesystem::path& dir, std::vector<std::string>& files) {
  const double nan = std::numeric_limits<double>::quiet_NaN();
  std::vector<BandInfo> extent_bands;
  std::vector<BandInfo> depth_bands;
  for (const auto& l : req.levels) {
    const Metadata m = level_metadata(l, req.datum);
    extent_bands.push_back({"extent at " + level_label(l) +
                                " (0 dry, 1 connected flooded, 2 cut-off low ground, 3 sea)",
                            "", m});
    depth_bands.push_back({"depth at " + level_label(l) + " on connected flooded land", "m", m});
  }
  w.extent = std::make_unique<GeoTiffWriter>(dir / "extent.tif", map.dem.grid, CellType::byte, 255.0, extent_bands,
                                             common_metadata(req, map, "flood extent"), req.format);
  w.depth = std::make_unique<GeoTiffWriter>(dir / "depth.tif", map.dem.grid, CellType::float32, nan, depth_bands,
                                            common_metadata(req, map, "flood depth"), req.format);
  files.emplace_back("extent.tif");
  files.emplace_back("depth.tif");
  // Each level's classes also as a single-band raster with a colour table and category
  // names, which opens as classes in a desktop GIS (a GeoTIFF palette belongs to a file).
  for (std::size_t li = 0; li < req.levels.size(); ++li) {
    BandInfo band = extent_bands[li];
    band.classes.assign(extent_classes.begin(), extent_classes.end());
    const std::string name = "extent_level_" + std::to_string(li + 1) + ".tif";
    w.classes.push_back(std::make_unique<GeoTiffWriter>(dir / name, map.dem.grid, CellType::byte, 255.0,
                                                        std::vector<BandInfo>{band},
                                                        common_metadata(req, map, "flood extent classes"), req.format));
    files.push_back(name);
    if (req.depth_per_level) {
      const std::string depth_name = "depth_level_" + std::to_string(li + 1) + ".tif";
      w.depths.push_back(std::make_unique<GeoTiffWriter>(dir / depth_name, map.dem.grid, CellType::float32, nan,
                                                         std::vector<BandInfo>{depth_bands[li]},
                                                         common_metadata(req, map, "flood depth"), req.format));
      files.push_back(depth_name);
    }
  }
}

void open_rate_writers(MapWriters& w, const MapRequest& req, const FloodThresholdMap& map,
                       const std::filesystem::path& dir, const MapSummary& s, std::vector<std::string>& files) {
  const double lo = s.lowest_threshold_m, hi = s.highest_threshold_m;
  if (!req.aep.empty()) {
    std::vector<BandInfo> bands;
    for (const auto& a : req.aep) {
      w.aep_tables.emplace_back(a.rate, lo, hi);
      Metadata m;
      if (a.year) m.emplace_back("YEAR", std::to_string(*a.year));
      if (!a.scenario.empty()) m.emplace_back("SCENARIO", a.scenario);
      bands.push_back({"annual exceedance probability of the flood threshold: " + a.description, "1", m});
    }
    w.aep = std::make_unique<GeoTiffWriter>(dir / "aep.tif", map.dem.grid, CellType::float32,
                                            std::numeric_limits<double>::quiet_NaN(), bands,
                                            common_metadata(req, map, "annual exceedance probability"), req.format);
    files.emplace_back("aep.tif");
  }
  if (req.first_year) {
    const auto& fy = *req.first_year;
    w.first.emplace(fy.years, fy.aep, lo, hi, fy.today);
    Metadata m{{"AEP_PASSED", fixed(fy.aep, 6)},
               {"NEVER_VALUE", std::to_string(FirstPassingYear::never)},
               {"ALREADY_TODAY_VALUE", std::to_string(FirstPassingYear::already_today)}};
    if (!fy.scenario.empty()) m.emplace_back("SCENARIO", fy.scenario);
    w.first_writer = std::make_unique<GeoTiffWriter>(
        dir / "first_year.tif", map.dem.grid, CellType::int16, FirstPassingYear::nodata,
        std::vector<BandInfo>{{"first year the cell's AEP reaches " + fixed(fy.aep, 6) + " (" + fy.description +
                                   "); 0: not within the years given; 1: already today",
                               "year", m}},
        common_metadata(req, map, "first year an AEP is passed"), req.format);
    files.emplace_back("first_year.tif");
  }
}

MapWriters open_writers(const MapRequest& req, const FloodThresholdMap& map, const std::filesystem::path& dir,
                        MapSummary& s) {
  MapWriters w;
  w.threshold = std::make_unique<GeoTiffWriter>(
      dir / "threshold.tif", map.dem.grid, CellType::float32, std::numeric_limits<double>::quiet_NaN(),
      std::vector<BandInfo>{{"flood threshold (lowest still-water level that reaches the cell "
                             "from the sea); nodata: sea, DEM nodata, land never reached",
                             "m",
                             {}}},
      common_metadata(req, map, "flood threshold"), req.format);
  s.files.emplace_back("threshold.tif");
  if (!req.levels.empty()) open_level_writers(w, req, map, dir, s.files);
  open_rate_writers(w, req, map, dir, s, s.files);
  return w;
}

// One streamed pass, a block of rows at a time, writing every product and adding up each
// level's cells, areas, volume and deepest depth; then a warning for each level with flooded
// cells beside a nodata cell that is not sea (the water may go on into ground the DEM does not
// cover; 4-neighbours, the whole grid is in memory).
void write_products(const MapRequest& req, const FloodThresholdMap& map, const CellAreas& areas, MapWriters& w,
                    MapSummary& s, const std::function<void(double)>& progress) {
  const GridShape shape = map.dem.grid.shape;
  std::vector<std::size_t> gap_borders(req.levels.size(), 0);
  const auto borders_gap = [&](std::size_t i) {
    const std::size_t r = i / shape.cols;
    const std::size_t c = i % shape.cols;
    const auto gap = [&](std::size_t j) { return std::isnan(map.dem.elevation_m[j]) && map.sea.is_sea[j] == 0; };
    return (c > 0 && gap(i - 1)) || (c + 1 < shape.cols && gap(i + 1)) || (r > 0 && gap(i - shape.cols)) ||
           (r + 1 < shape.rows && gap(i + shape.cols));
  };
  const std::size_t cols = shape.cols;
  std::vector<float> fbuf(cols * block_rows);
  std::vector<std::uint8_t> bbuf(cols * block_rows);
  std::vector<std::int16_t> ibuf(cols * block_rows);
  const auto& z = map.dem.elevation_m;
  const auto& t = map.threshold_m;
  for (std::size_t r0 = 0; r0 < shape.rows; r0 += block_rows) {
    const std::size_t h = std::min(block_rows, shape.rows - r0);
    const std::size_t base = r0 * cols;
    for (std::size_t k = 0; k < h * cols; ++k) fbuf[k] = std::isfinite(t[base + k]) ? t[base + k] : nan_f;
    w.threshold->write_rows(0, r0, h, fbuf.data());
    for (std::size_t li = 0; li < req.levels.size(); ++li) {
      const double level = req.levels[li].level_m;
      LevelSummary& sum = s.levels[li];
      for (std::size_t k = 0; k < h * cols; ++k) {
        const auto c = classify_cell(z[base + k], t[base + k], level);
        bbuf[k] = static_cast<std::uint8_t>(c);
        fbuf[k] = nan_f;
        const double area = areas.row_area_m2[r0 + k / cols];
        if (c == ExtentClass::connected_flooded) {
          if (borders_gap(base + k)) ++gap_borders[li];
          const double d = level - static_cast<double>(z[base + k]);
          fbuf[k] = static_cast<float>(d);
          ++sum.connected_cells;
          sum.flooded_area_m2 += area;
          sum.volume_m3 += d * area;
          sum.max_depth_m = std::max(sum.max_depth_m, d);
        } else if (c == ExtentClass::cut_off_low_ground) {
          ++sum.cut_off_cells;
          sum.cut_off_area_m2 += area;
        }
      }
      w.extent->write_rows(li, r0, h, bbuf.data());
      w.classes[li]->write_rows(0, r0, h, bbuf.data());
      if (!w.depths.empty()) w.depths[li]->write_rows(0, r0, h, fbuf.data());
      w.depth->write_rows(li, r0, h, fbuf.data());
    }
    for (std::size_t ai = 0; ai < w.aep_tables.size(); ++ai) {
      for (std::size_t k = 0; k < h * cols; ++k) fbuf[k] = w.aep_tables[ai](t[base + k]);
      w.aep->write_rows(ai, r0, h, fbuf.data());
    }
    if (w.first) {
      for (std::size_t k = 0; k < h * cols; ++k) ibuf[k] = (*w.first)(t[base + k]);
      w.first_writer->write_rows(0, r0, h, ibuf.data());
    }
    progress(0.4 + 0.5 * static_cast<double>(r0 + h) / static_cast<double>(shape.rows));
  }
  for (std::size_t li = 0; li < req.levels.size(); ++li) {
    if (gap_borders[li] == 0) continue;
    s.warnings.push_back("at " + level_label(req.levels[li]) + ", " + std::to_string(gap_borders[li]) +
                         " flooded cells border nodata cells that are not sea: the water may go on into ground the "
                         "DEM does not cover, so the extent there is a lower bound; check the DEM's gaps");
  }
}

// OGC SLD 1.0 styles beside the rasters they style (map_style.hpp), the sidecars GDAL wrote
// for what a GeoTIFF tag cannot hold (category names, statistics), and the polygons.
void write_companions(const MapRequest& req, const FloodThresholdMap& map, const MapWriters& w,
                      const std::filesystem::path& dir, MapSummary& s) {
  const auto add_style = [&](const std::string& name, const std::string& text) {
    write_text_file(dir / name, text, false);
    s.files.push_back(name);
  };
  if (w.extent) add_style("extent.sld", extent_sld("extent"));
  if (w.depth) add_style("depth.sld", depth_sld("depth"));
  if (w.aep) add_style("aep.sld", aep_sld("aep"));
  for (const auto& f : std::vector<std::string>(s.files)) {
    if (std::filesystem::exists(dir / (f + ".aux.xml"))) s.files.push_back(f + ".aux.xml");
  }
  if (!req.polygons) return;
  const PolygonFile file = polygon_file(req.polygon_format);
  write_polygons(map, s.levels, dir / file.name, req.datum, req.polygon_format);
  s.files.emplace_back(file.name);
  for (const char* suffix : file.side_suffixes) {
    const std::string side = std::filesystem::path(file.name).replace_extension(suffix).string();
    if (std::filesystem::exists(dir / side)) s.files.push_back(side);
  }
}

}  // namespace

MapSummary make_flood_maps(const MapRequest& req) {
  const std::function<void(double)> progress = [&](double f) {
    if (req.progress) req.progress(f);
  };
  // Refuse an existing folder, or one that cannot be made, before any work.
  AtomicPath folder(req.out_dir, req.force, "--out");
  const auto dir = folder.make_temp_folder();
  check_levels(req);
  if (req.polygons) pin_geopackage_time();
  FloodThresholdMap map = prepare_flood_threshold(req.dem, req.sea, req.defences, req.connectivity);
  progress(0.4);
  gdal::register_drivers();
  const CellAreas areas = cell_areas(map.dem.grid);
  MapSummary s = grid_summary(map, areas);
  MapWriters writers = open_writers(req, map, dir, s);
  for (const auto& l : req.levels) s.levels.push_back({l});
  write_products(req, map, areas, writers, s, progress);
  writers.finish();
  write_companions(req, map, writers, dir, s);
  s.files.emplace_back("summary.csv");
  s.files.emplace_back("summary.json");
  write_text_file(dir / "summary.csv", summary_csv(s), false);
  write_json_file(dir / "summary.json", summary_json(s, map, req), false);
  folder.commit();
  progress(1.0);
  return s;
}

}  // namespace tidewright::terrain
