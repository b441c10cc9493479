// libFuzzer target: the water-level series and annual-maxima readers on arbitrary bytes, and
// the annual maxima and declustered peaks taken from a series that reads. Anything but an
// InputError is a bug.
#include <cstddef>
#include <cstdint>
#include <string>

#include "tidewright/common/error.hpp"
#include "tidewright/record/annual_maxima.hpp"
#include "tidewright/record/block_maxima.hpp"
#include "tidewright/record/peaks_over_threshold.hpp"
#include "tidewright/record/water_level_series.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string text(reinterpret_cast<const char*>(data), size);
  tidewright::record::ReadOptions options;
  options.missing.sentinels = {-99.0};
  try {
    (void)tidewright::record::parse_annual_maxima(text, "fuzz.csv", options);
  } catch (const tidewright::InputError&) {
  }
  try {
    const auto series = tidewright::record::parse_water_level_series(text, "fuzz.csv", options);
    try {
      (void)tidewright::record::annual_maxima_from_series(series);
    } catch (const tidewright::InputError&) {
    }
    try {
      (void)tidewright::record::peaks_over_threshold(series);
    } catch (const tidewright::InputError&) {
    }
  } catch (const tidewright::InputError&) {
  }
  return 0;
}
