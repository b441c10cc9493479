// A georeferenced grid: its shape, GDAL geotransform and coordinate reference system, and the
// area of its cells. Areas are planar (the geotransform's cell size in the CRS's linear unit,
// converted to metres) for a projected CRS and geodesic on the CRS's ellipsoid for a geographic
// one (PROJ's geodesic routines, Karney 2013, "Algorithms for geodesics", J. Geodesy 87:43,
// doi:10.1007/s00190-012-0578-z).
#pragma once

#include <array>
#include <string>
#include <vector>

#include "tidewright/terrain/flood_threshold.hpp"

namespace tidewright::terrain {

struct GeoGrid {
  GridShape shape;
  // GDAL's affine geotransform: x = g0 + col g1 + row g2, y = g3 + col g4 + row g5 (cell corner).
  std::array<double, 6> geotransform{0.0, 1.0, 0.0, 0.0, 0.0, 1.0};
  std::string crs_wkt;  // WKT2 of the horizontal CRS; never empty for a grid read by read_dem
};

// Cell areas in square metres, one value per row (a north-up geographic grid's cells share an
// area along a row; a projected grid's cells all have the same area).
struct CellAreas {
  bool geodesic = false;
  std::string method;  // e.g. "planar, EPSG:32633 metre cells" or "geodesic on WGS 84 ..."
  std::vector<double> row_area_m2;
};

// Throws InputError for a geographic grid with a rotated geotransform (g2 or g4 non-zero).
[[nodiscard]] CellAreas cell_areas(const GeoGrid& grid);

// Geodesic area (m^2) of the cell bounded by the meridians lon0, lon1 and the parallels lat0,
// lat1 (degrees) on the ellipsoid (a, 1/f): PROJ's geod_polygonarea on the cell outline with
// its parallel edges densified (a parallel is not a geodesic): 64 points per edge for cells up
// to 0.1 degree wide, 256 above; against the closed-form zone area the tests see relative
// differences below 1e-9 for 0.01- and 1-degree cells.
[[nodiscard]] double geodesic_cell_area_m2(double lon0_deg, double lon1_deg, double lat0_deg,
                                           double lat1_deg, double semi_major_m,
                                           double inverse_flattening);

}  // namespace tidewright::terrain
