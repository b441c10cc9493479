// Plain-text tables for terminal output: a header row, aligned columns, numbers right-aligned.
#pragma once

#include <string>
#include <vector>

namespace tidewright::report {

class TextTable {
 public:
  explicit TextTable(std::vector<std::string> header);
  void add_row(std::vector<std::string> cells);
  [[nodiscard]] std::string render(const std::string& indent = "  ") const;

 private:
  std::vector<std::string> header_;
  std::vector<std::vector<std::string>> rows_;
};

// Fixed-point text of a number with `decimals` digits ("—" for NaN).
[[nodiscard]] std::string fixed(double value, int decimals);

// A probability as a table shows it, never a rounded 0 or 1 that is not one: four decimals;
// six from 0.99995; "> 0.999999" above that or when the caller knows 1 - p is lost to
// rounding; two significant digits (e.g. "3.2e-06") below 0.0001.
[[nodiscard]] std::string probability_text(double p, bool rounds_to_one = false);
// A number with `digits` significant digits for tables of widely ranging values (amplification
// factors, return periods): plain below one million ("0.0123", "4250"), else "3.64 × 10⁶";
// "—" for NaN, "∞" / "−∞" for infinities.
[[nodiscard]] std::string significant(double value, int digits);

}  // namespace tidewright::report
