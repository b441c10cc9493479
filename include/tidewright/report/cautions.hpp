// The safety cautions that go with every design level and flood map the tool produces:
// shown in the --help epilogue, printed with results, and written into reports.
#pragma once

#include <string>
#include <string_view>
#include <vector>

namespace tidewright::report {

// One caution per entry, each a complete sentence.
[[nodiscard]] const std::vector<std::string_view>& safety_cautions();
// The cautions as a block of text, each caution prefixed by `prefix` (e.g. "  - ") and, when
// `width` > 0, wrapped to that many columns with continuation lines indented under the text.
[[nodiscard]] std::string cautions_text(std::string_view prefix = "  - ", std::size_t width = 0);

}  // namespace tidewright::report
