// libFuzzer target: the CSV reader on arbitrary bytes. Anything but an InputError is a bug.
#include <cstddef>
#include <cstdint>
#include <string_view>

#include "tidewright/common/csv.hpp"
#include "tidewright/common/error.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view text(reinterpret_cast<const char*>(data), size);
  try {
    const auto table = tidewright::CsvTable::parse(text, "fuzz.csv");
    tidewright::MissingValues missing;
    missing.sentinels = {-99.0};
    for (const auto& row : table.rows()) {
      for (std::size_t c = 0; c < row.cells.size(); ++c) {
        try {
          (void)table.number(row, c, missing);
        } catch (const tidewright::InputError&) {
        }
      }
    }
    if (!table.header().empty()) (void)table.find_column(table.header().front());
  } catch (const tidewright::InputError&) {
  }
  return 0;
}
