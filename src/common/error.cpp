#include "tidewright/common/error.hpp"

namespace tidewright {
namespace {
std::string compose(const std::string& where, const std::string& what, const std::string& hint) {
  std::string out = where.empty() ? what : where + ": " + what;
  if (!hint.empty()) out += "; " + hint;
  return out;
}
}  // namespace

Error::Error(std::string where, std::string what, std::string hint)
    : std::runtime_error(compose(where, what, hint)),
      where_(std::move(where)),
      what_(std::move(what)),
      hint_(std::move(hint)) {}

std::string location(std::string_view file, std::size_t line) {
  std::string out(file);
  if (line > 0) out += ":" + std::to_string(line);
  return out;
}

std::string field_location(std::string_view file, std::string_view field) {
  std::string out(file);
  out += ": ";
  out += field;
  return out;
}

}  // namespace tidewright
