// Cell areas of a georeferenced grid (include/tidewright/terrain/geo_grid.hpp).
#include "tidewright/terrain/geo_grid.hpp"

#include <geodesic.h>

#include <cmath>
#include <string>

#include "tidewright/common/error.hpp"
#include "gdal_support.hpp"

namespace tidewright::terrain {

double geodesic_cell_area_m2(double lon0_deg, double lon1_deg, double lat0_deg, double lat1_deg,
                             double semi_major_m, double inverse_flattening) {
  geod_geodesic g{};
  // PROJ takes the flattening f = 1 / (1/f); a sphere has 1/f = 0, i.e. f = 0.
  geod_init(&g, semi_major_m, inverse_flattening == 0.0 ? 0.0 : 1.0 / inverse_flattening);
  // Points along each parallel edge (see the header): the error falls as 1/points^2.
  const int per_edge = std::abs(lon1_deg - lon0_deg) > 0.1 ? 256 : 64;
  std::vector<double> lats;
  std::vector<double> lons;
  for (int i = 0; i <= per_edge; ++i) {  // lower parallel, west to east
    lats.push_back(lat0_deg);
    lons.push_back(lon0_deg + (lon1_deg - lon0_deg) * i / per_edge);
  }
  for (int i = 0; i <= per_edge; ++i) {  // upper parallel, east to west
    lats.push_back(lat1_deg);
    lons.push_back(lon1_deg + (lon0_deg - lon1_deg) * i / per_edge);
  }
  double area = 0.0;
  double perimeter = 0.0;
  geod_polygonarea(&g, lats.data(), lons.data(), static_cast<int>(lats.size()), &area, &perimeter);
  return std::abs(area);
}

CellAreas cell_areas(const GeoGrid& grid) {
  const OGRSpatialReference srs = gdal::grid_srs(grid);
  const auto& gt = grid.geotransform;
  CellAreas out;
  const char* name = srs.GetName();
  const std::string crs_name = name != nullptr ? name : "unnamed CRS";
  if (srs.IsGeographic()) {
    if (gt[2] != 0.0 || gt[4] != 0.0) {
      throw InputError("DEM", "a geographic DEM with a rotated geotransform",
                       "warp it to a north-up grid (gdalwarp) first");
    }
    const double to_deg = srs.GetAngularUnits(nullptr) * 180.0 / M_PI;  // unit -> degrees
    OGRErr err = OGRERR_NONE;
    const double a = srs.GetSemiMajor(&err);
    const double inv_f = srs.GetInvFlattening(&err);
    out.geodesic = true;
    out.method = "geodesic on the ellipsoid of " + crs_name + " (a = " + gdal::number_text(a) +
                 " m, 1/f = " + gdal::number_text(inv_f) + "), PROJ geod_polygonarea";
    const double lon0 = gt[0] * to_deg;
    const double lon1 = (gt[0] + gt[1]) * to_deg;
    for (std::size_t r = 0; r < grid.shape.rows; ++r) {
      const double lat_a = (gt[3] + gt[5] * static_cast<double>(r)) * to_deg;
      const double lat_b = (gt[3] + gt[5] * static_cast<double>(r + 1)) * to_deg;
      out.row_area_m2.push_back(geodesic_cell_area_m2(lon0, lon1, std::min(lat_a, lat_b),
                                                      std::max(lat_a, lat_b), a, inv_f));
    }
    return out;
  }
  const double unit_m = srs.GetLinearUnits(nullptr);  // metres per CRS unit
  // Planar area of the parallelogram spanned by the cell's two edge vectors.
  const double area = std::abs(gt[1] * gt[5] - gt[2] * gt[4]) * unit_m * unit_m;
  out.method = "planar in " + crs_name + " (" + gdal::number_text(area) + " m2 per cell)";
  out.row_area_m2.assign(grid.shape.rows, area);
  return out;
}

}  // namespace tidewright::terrain
