#include "tidewright/record/read_options.hpp"

#include <array>
#include <cctype>
#include <utility>

#include "tidewright/common/error.hpp"

namespace tidewright::record {
namespace {

struct Unit {
  std::string_view name;
  double metres;
};

// The international foot is exactly 0.3048 m (international yard and pound agreement, 1959).
constexpr std::array<Unit, 4> units{{{"m", 1.0}, {"cm", 0.01}, {"mm", 0.001}, {"ft", 0.3048}}};

}  // namespace

std::string accepted_units() {
  std::string out;
  for (const auto& u : units) out += (out.empty() ? "" : ", ") + std::string(u.name);
  return out;
}

double metres_per_unit(std::string_view unit, std::string_view where) {
  std::string lower = trim(unit);
  for (char& c : lower) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  for (const auto& u : units) {
    if (lower == u.name) return u.metres;
  }
  throw InputError(std::string(where),
                   "unit '" + std::string(unit) + "' is not one tidewright reads",
                   "use one of " + accepted_units());
}

}  // namespace tidewright::record
