#include "tidewright/report/text_table.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <stdexcept>

namespace tidewright::report {
namespace {
bool looks_numeric(const std::string& s) {
  return !s.empty() && (std::isdigit(static_cast<unsigned char>(s[0])) || s[0] == '-' || s[0] == '+' || s[0] == '.');
}
// Display width in characters, counting UTF-8 continuation bytes as zero width.
std::size_t width(const std::string& s) {
  return static_cast<std::size_t>(std::count_if(s.begin(), s.end(), [](char c) {
    return (static_cast<unsigned char>(c) & 0xC0) != 0x80;
  }));
}
}  // namespace

TextTable::TextTable(std::vector<std::string> header) : header_(std::move(header)) {}

void TextTable::add_row(std::vector<std::string> cells) {
  if (cells.size() != header_.size()) throw std::logic_error("TextTable row width differs from header");
  rows_.push_back(std::move(cells));
}

std::string TextTable::render(const std::string& indent) const {
  std::vector<std::size_t> w(header_.size());
  for (std::size_t c = 0; c < header_.size(); ++c) {
    w[c] = width(header_[c]);
    for (const auto& r : rows_) w[c] = std::max(w[c], width(r[c]));
  }
  auto line = [&](const std::vector<std::string>& cells, bool is_header) {
    std::string out = indent;
    for (std::size_t c = 0; c < cells.size(); ++c) {
      const std::size_t pad = w[c] - width(cells[c]);
      const bool right = !is_header && looks_numeric(cells[c]);
      if (c > 0) out += "  ";
      if (right) out += std::string(pad, ' ') + cells[c];
      else out += cells[c] + (c + 1 < cells.size() ? std::string(pad, ' ') : "");
    }
    return out + "\n";
  };
  std::string out = line(header_, true);
  std::string rule = indent;
  for (std::size_t c = 0; c < w.size(); ++c) rule += (c ? "  " : "") + std::string(w[c], '-');
  out += rule + "\n";
  for (const auto& r : rows_) out += line(r, false);
  return out;
}

std::string probability_text(double p, bool rounds_to_one) {
  if (rounds_to_one || p > 0.9999995) return "> 0.999999";
  if (p >= 0.99995) return fixed(p, 6);  // four decimals would show 1.0000
  if (p > 0.0 && p < 1e-4) {
    char buf[32];
    std::snprintf(buf, sizeof buf, "%.1e", p);
    return buf;
  }
  return fixed(p, 4);
}

std::string fixed(double value, int decimals) {
  if (std::isnan(value)) return "—";
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.*f", decimals, value);
  return buf;
}

std::string significant(double value, int digits) {
  if (std::isnan(value)) return "—";
  if (std::isinf(value)) return value > 0 ? "∞" : "−∞";
  if (value == 0) return "0";
  digits = std::max(1, digits);
  const std::string sign = value < 0 ? "−" : "";
  const double a = std::abs(value);
  int exponent = static_cast<int>(std::floor(std::log10(a)));
  // Rounding to `digits` can carry into the next power of ten (9.996 -> 10.0).
  const double scale = std::pow(10.0, digits - 1 - exponent);
  if (std::round(a * scale) >= std::pow(10.0, digits)) ++exponent;
  if (exponent < 6) {
    const double step = std::pow(10.0, exponent + 1 - digits);  // value of the last digit kept
    return sign + fixed(std::round(a / step) * step, std::max(0, digits - 1 - exponent));
  }
  static const char* const superscripts[] = {"⁰", "¹", "²", "³", "⁴", "⁵", "⁶", "⁷", "⁸", "⁹"};
  std::string power;
  for (char c : std::to_string(exponent)) power += superscripts[c - '0'];
  return sign + fixed(a / std::pow(10.0, exponent), digits - 1) + " × 10" + power;
}

}  // namespace tidewright::report
