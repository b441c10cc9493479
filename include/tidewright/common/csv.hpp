// A small CSV reader for outside input (tide-gauge records, projection tables, forcing).
// Every problem it finds is an InputError naming the file and line. It accepts a UTF-8 byte
// order mark, CRLF line ends, quoted cells (RFC 4180) and '#' comment lines; it refuses
// NUL bytes and text that is not UTF-8.
#pragma once

#include <cstddef>
#include <filesystem>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace tidewright {

struct CsvOptions {
  char delimiter = ',';
  char comment = '#';  // a line whose first non-blank character is this is skipped
};

// Cells that mean "no value": the markers (compared after trimming, case-insensitive) and
// numeric sentinels such as -99 or 9999 that some gauge archives use.
struct MissingValues {
  std::vector<std::string> markers{"", "NA", "NaN", "N/A", "null", "-"};
  std::vector<double> sentinels;
  [[nodiscard]] bool is_marker(std::string_view cell) const;
  [[nodiscard]] bool is_sentinel(double value) const;
};

struct CsvRow {
  std::size_t line = 0;  // line in the file, from 1
  std::vector<std::string> cells;
};

// A "# key: value" comment line before the header (a key is one word).
struct CsvMetadata {
  std::string value;
  std::size_t line = 0;
};

class CsvTable {
 public:
  static CsvTable read(const std::filesystem::path& path, const CsvOptions& options = {});
  // `source` names the text in messages (usually the file name).
  static CsvTable parse(std::string_view text, std::string source, const CsvOptions& options = {});

  [[nodiscard]] const std::string& source() const noexcept { return source_; }
  [[nodiscard]] const std::vector<std::string>& header() const noexcept { return header_; }
  [[nodiscard]] const std::vector<CsvRow>& rows() const noexcept { return rows_; }
  [[nodiscard]] std::size_t header_line() const noexcept { return header_line_; }
  // The first "# key: value" line before the header with this key; nullptr when none.
  [[nodiscard]] const CsvMetadata* metadata(const std::string& key) const {
    const auto it = metadata_.find(key);
    return it == metadata_.end() ? nullptr : &it->second;
  }

  // Column by name (trimmed, case-insensitive). `column` throws an InputError that lists the
  // columns the file has.
  [[nodiscard]] std::optional<std::size_t> find_column(std::string_view name) const;
  [[nodiscard]] std::size_t column(std::string_view name) const;

  // The cell as a number, or nullopt when it is a missing-value marker or sentinel.
  // Throws an InputError at file:line for anything else that is not a finite number.
  [[nodiscard]] std::optional<double> number(const CsvRow& row, std::size_t column,
                                             const MissingValues& missing = {}) const;
  // "file:line" of a row, for messages.
  [[nodiscard]] std::string where(const CsvRow& row) const;

 private:
  std::string source_;
  std::vector<std::string> header_;
  std::size_t header_line_ = 0;
  std::vector<CsvRow> rows_;
  std::map<std::string, CsvMetadata> metadata_;
};

// Parses a whole cell as a finite double (leading/trailing blanks allowed); nullopt otherwise.
[[nodiscard]] std::optional<double> parse_finite_double(std::string_view text);
[[nodiscard]] std::string trim(std::string_view text);
/// Equal letter for letter without regard to ASCII case.
[[nodiscard]] bool iequals(std::string_view a, std::string_view b);
/// One CSV cell as written: quoted (RFC 4180) when it holds a comma, quote or line break.
[[nodiscard]] std::string csv_field(std::string_view text);
/// A calendar year written as a number ("2100", "2100.0"); nullopt unless whole and within
/// +-1,000,000, so the cast to int can never overflow (a fuzzed "2E20" did).
[[nodiscard]] std::optional<int> whole_year(std::optional<double> value);

}  // namespace tidewright
