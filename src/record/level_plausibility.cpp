#include "tidewright/record/level_plausibility.hpp"

#include <algorithm>
#include <cctype>
#include <vector>

#include "prepared_record.hpp"
#include "tidewright/common/error.hpp"

namespace tidewright::record {

std::optional<std::string> unit_in_column_name(std::string_view column) {
  std::vector<std::string> words;
  std::string word;
  for (const char c : column) {
    if (std::isalnum(static_cast<unsigned char>(c)) != 0) {
      word += static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
    } else if (!word.empty()) {
      words.push_back(word);
      word.clear();
    }
  }
  if (!word.empty()) words.push_back(word);
  if (words.size() < 2) return std::nullopt;  // a bare "m" or "level" states no unit
  const std::string& last = words.back();
  if (last == "m" || last == "metres" || last == "meters") return "m";
  if (last == "cm" || last == "mm" || last == "ft") return last;
  if (last == "feet") return "ft";
  return std::nullopt;
}

void check_level_plausibility(std::span<const double> level_m, std::span<const std::size_t> line,
                              const std::string& source, const ReadOptions& options) {
  if (options.accept_implausible_levels || level_m.empty()) return;
  const auto named = unit_in_column_name(options.level_column);
  if (named && metres_per_unit(*named) != metres_per_unit(options.unit)) {
    throw InputError(source + ": column '" + options.level_column + "'",
                     "is named in " + *named + " but the levels are read in " + options.unit,
                     "give the unit (--units " + *named + ", or record.units in a site file), or "
                     "--accept-implausible-levels if the name is wrong");
  }
  std::vector<double> sorted(level_m.begin(), level_m.end());
  const auto mid = sorted.begin() + static_cast<std::ptrdiff_t>(sorted.size() / 2);
  std::nth_element(sorted.begin(), mid, sorted.end());
  const double median = *mid;
  std::size_t count = 0;
  std::size_t first = 0;
  for (std::size_t i = 0; i < level_m.size(); ++i) {
    if (std::abs(level_m[i] - median) > max_departure_from_median_m) {
      if (count == 0) first = i;
      ++count;
    }
  }
  if (count == 0) return;
  const std::string where = source + (first < line.size() ? ":" + std::to_string(line[first]) : std::string());
  throw InputError(where,
                   "level " + detail::format_number(level_m[first], "%.6g") + " m lies more than " +
                       detail::format_number(max_departure_from_median_m, "%.0f") +
                       " m from the record's median " + detail::format_number(median, "%.4g") + " m (" +
                       std::to_string(count) + " such value" + (count == 1 ? "" : "s") +
                       "): a no-data value or another unit",
                   "declare no-data values (--sentinel " +
                       (count == 1 ? detail::format_number(level_m[first] / metres_per_unit(options.unit), "%.6g")
                                   : std::string("VALUE")) +
                       "), check the unit (--units) and that it is one unit throughout, or accept the record on "
                       "purpose (--accept-implausible-levels)");
}

}  // namespace tidewright::record
