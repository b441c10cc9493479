// Plausibility of the levels of a record, so that an undeclared no-data value (9999 in a record
// of 2 m levels gave a 100-year level of 25 km), a column whose name states another unit than
// the one given (`level_cm` read as metres) or a record that changes unit part-way (m to mm) is
// refused with one line instead of fitted. ReadOptions::accept_implausible_levels accepts such
// a record on purpose.
#pragma once

#include <cstddef>
#include <optional>
#include <span>
#include <string>
#include <string_view>

#include "tidewright/record/read_options.hpp"

namespace tidewright::record {

// No still-water level lies this far from a record's median: half the largest tidal range on
// Earth (about 16 m, Bay of Fundy) plus the largest storm surges (about 8 m) is under 20 m
// (our bound; both figures from memory). Values beyond it are no-data values or another unit.
inline constexpr double max_departure_from_median_m = 20.0;

// The unit a column name states ("level_cm", "height (mm)", "wl_ft"), or nothing: the name's
// last word among m, metres, meters, cm, mm, ft, feet.
[[nodiscard]] std::optional<std::string> unit_in_column_name(std::string_view column);

// Throws InputError unless options.accept_implausible_levels: at `where` (the file) when the
// level column's name states a unit other than options.unit; at the first offending line
// when levels (metres, with their file lines) lie more than max_departure_from_median_m from
// their median, with the count and the hints (declare the no-data value, check the unit).
void check_level_plausibility(std::span<const double> level_m, std::span<const std::size_t> line,
                              const std::string& source, const ReadOptions& options);

}  // namespace tidewright::record
