#include "tidewright/report/cautions.hpp"

namespace tidewright::report {

const std::vector<std::string_view>& safety_cautions() {
  static const std::vector<std::string_view> cautions{
      "Results are planning estimates, not design certificates: a licensed coastal engineer "
      "must review them against local codes, standards and datums before any use in design.",
      "Levels are still-water levels (tide plus surge) unless stated otherwise; waves, wave "
      "setup, run-up, overtopping, river flow and rainfall are not included.",
      "Check the vertical datum of every level and map against the local survey datum before "
      "comparing it with asset or ground levels.",
      "Sea-level projections and extreme-value fits are uncertain; quoted intervals cover only "
      "the uncertainties the tool models, and longer records or newer projections may change "
      "the answers.",
      "Not for navigation, emergency response or real-time warning.",
  };
  return cautions;
}

std::string cautions_text(std::string_view prefix, std::size_t width) {
  std::string out;
  const std::string indent(prefix.size(), ' ');
  for (const auto& c : safety_cautions()) {
    std::string line(prefix);
    std::size_t pos = 0;
    while (pos < c.size()) {
      const std::size_t next_space = c.find(' ', pos);
      const std::size_t end = next_space == std::string_view::npos ? c.size() : next_space;
      const std::string_view word = c.substr(pos, end - pos);
      const bool line_has_words = line.size() > prefix.size();
      if (width > 0 && line_has_words && line.size() + 1 + word.size() > width) {
        out += line + '\n';
        line = indent;
      } else if (line_has_words) {
        line += ' ';
      }
      line += word;
      pos = end + 1;
    }
    out += line + '\n';
  }
  return out;
}

}  // namespace tidewright::report
