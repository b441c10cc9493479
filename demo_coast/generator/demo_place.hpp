// Quillhaven: the INVENTED harbour town of tidewright's demo study. Invented data — not a real
// place, not for any real decision. This header holds the names, the datum label and the
// coordinate reference system that every generated file shares, so they are decided once.
//
// The place is set at projected coordinates in the open Bay of Biscay (about 45.15 N, 3.00 W,
// some 140 km from any real coast), so that it cannot be mistaken for, or overlaid on, a real
// town. The EPSG code is real (WGS 84 / UTM zone 30N); the land on it is not.
#pragma once

#include <string_view>

namespace tidewright::demo {

inline constexpr std::string_view place_name = "Quillhaven (invented)";
inline constexpr std::string_view coast_name = "the Sorrel Coast (invented)";
inline constexpr std::string_view river_name = "River Tamsel (invented)";
inline constexpr std::string_view low_district_name = "Orrin Levels (invented)";
inline constexpr std::string_view ridge_name = "Orrin Bank (invented)";

// The one vertical datum of every demo file: the tide record's levels and the DEM's
// elevations are both metres above it (DEM datum = gauge datum + 0.0 m).
inline constexpr std::string_view datum_label = "QCD (Quillhaven chart datum, invented)";
inline constexpr double dem_datum_offset_m = 0.0;  // DEM level = gauge level + this

// WGS 84 / UTM zone 30N (a real EPSG code; the place on it is invented).
inline constexpr int crs_epsg = 32630;

inline constexpr std::string_view invented_notice =
    "INVENTED DATA: Quillhaven is not a real place; not for any real decision.";

}  // namespace tidewright::demo
