// The one spelling of each option value, shared by the command line and the site file: a table
// of names per option, so that both parse straight into the same enums. The spellings are the
// command line's (words joined by '-'); the site file still reads its older '_' spellings, with
// a note (site_config.cpp).
#pragma once

#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "tidewright/climate/projection.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/record/mean_sea_level_trend.hpp"
#include "tidewright/study/fit_stage.hpp"
#include "tidewright/study/projection_stage.hpp"

namespace tidewright::study {

template <typename E>
using NameTable = std::vector<std::pair<std::string, E>>;

[[nodiscard]] const NameTable<RecordKind>& record_kind_names();                // detect, series, annual-maxima
[[nodiscard]] const NameTable<record::DetrendMethod>& detrend_names();         // none, annual-mean, linear
[[nodiscard]] const NameTable<climate::IceStoryline>& storyline_names();       // assessed, high-end-ice
[[nodiscard]] const NameTable<ScenarioSource>& scenario_source_names();        // pathway, forcing-csv, ...

template <typename E>
[[nodiscard]] std::vector<std::string> names_of(const NameTable<E>& table) {
  std::vector<std::string> out;
  for (const auto& [name, value] : table) out.push_back(name);
  return out;
}

template <typename E>
[[nodiscard]] const std::string& name_of(const NameTable<E>& table, E value) {
  for (const auto& entry : table) {
    if (entry.second == value) return entry.first;
  }
  throw ComputationError("option names", "a value has no name", "report this as a bug");
}

// The value a name stands for; InputError at `where` listing the names otherwise.
template <typename E>
[[nodiscard]] E value_named(const NameTable<E>& table, std::string_view name, const std::string& where) {
  std::string list;
  for (const auto& entry : table) {
    if (entry.first == name) return entry.second;
    list += (list.empty() ? "" : ", ") + entry.first;
  }
  throw InputError(where, "is '" + std::string(name) + "'", "use one of: " + list);
}

}  // namespace tidewright::study
