#include "tidewright/common/csv.hpp"

#include <algorithm>
#include <cctype>
#include <charconv>
#include <cmath>
#include <fstream>
#include <sstream>

#include "tidewright/common/error.hpp"

namespace tidewright {
namespace {

// Returns the 1-based line of the first byte that breaks UTF-8, or 0 if the text is valid.
std::size_t first_invalid_utf8_line(std::string_view s) {
  std::size_t line = 1;
  for (std::size_t i = 0; i < s.size();) {
    const auto c = static_cast<unsigned char>(s[i]);
    if (c == '\n') ++line;
    std::size_t extra = 0;
    if (c < 0x80) {
      extra = 0;
    } else if ((c & 0xE0) == 0xC0 && c >= 0xC2) {
      extra = 1;
    } else if ((c & 0xF0) == 0xE0) {
      extra = 2;
    } else if ((c & 0xF8) == 0xF0 && c <= 0xF4) {
      extra = 3;
    } else {
      return line;
    }
    for (std::size_t k = 1; k <= extra; ++k) {
      if (i + k >= s.size() || (static_cast<unsigned char>(s[i + k]) & 0xC0) != 0x80) return line;
    }
    i += extra + 1;
  }
  return 0;
}

}  // namespace

bool iequals(std::string_view a, std::string_view b) {
  return a.size() == b.size() && std::equal(a.begin(), a.end(), b.begin(), [](char x, char y) {
           return std::tolower(static_cast<unsigned char>(x)) ==
                  std::tolower(static_cast<unsigned char>(y));
         });
}

std::string trim(std::string_view text) {
  const auto* begin = text.begin();
  const auto* end = text.end();
  while (begin != end && std::isspace(static_cast<unsigned char>(*begin))) ++begin;
  while (end != begin && std::isspace(static_cast<unsigned char>(*(end - 1)))) --end;
  return {begin, end};
}

std::optional<double> parse_finite_double(std::string_view text) {
  const std::string t = trim(text);
  if (t.empty()) return std::nullopt;
  const char* first = t.data();
  const char* last = t.data() + t.size();
  if (*first == '+') ++first;  // from_chars refuses a leading '+'
  double value = 0.0;
  const auto [ptr, ec] = std::from_chars(first, last, value);
  if (ec != std::errc() || ptr != last || !std::isfinite(value)) return std::nullopt;
  return value;
}

std::string csv_field(std::string_view text) {
  if (text.find_first_of(",\"\n\r") == std::string_view::npos) return std::string(text);
  std::string out = "\"";
  for (char c : text) {
    if (c == '"') out += '"';
    out += c;
  }
  return out + "\"";
}

std::optional<int> whole_year(std::optional<double> value) {
  constexpr double kYearLimit = 1e6;  // far beyond any record or projection; keeps the int cast defined
  if (!value || *value != std::floor(*value) || std::abs(*value) > kYearLimit) return std::nullopt;
  return static_cast<int>(*value);
}

bool MissingValues::is_marker(std::string_view cell) const {
  const std::string t = trim(cell);
  return std::any_of(markers.begin(), markers.end(),
                     [&](const std::string& m) { return iequals(t, m); });
}

bool MissingValues::is_sentinel(double value) const {
  return std::any_of(sentinels.begin(), sentinels.end(),
                     [&](double s) { return value == s; });
}

CsvTable CsvTable::read(const std::filesystem::path& path, const CsvOptions& options) {
  std::error_code ec;
  if (std::filesystem::is_directory(path, ec)) {
    throw InputError(path.string(), "is a folder, not a CSV file", "give the path of a file");
  }
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    throw InputError(path.string(), "cannot be opened for reading",
                     "check that the file exists and is readable");
  }
  std::ostringstream buffer;
  buffer << in.rdbuf();
  if (in.bad()) {
    throw InputError(path.string(), "could not be read to the end", "check the file and the disk");
  }
  return parse(buffer.str(), path.string(), options);
}

// One pass of the RFC 4180 state machine over the text: its states share the cell, row and
// line being built, so split it would pass them all around.
CsvTable CsvTable::parse(std::string_view text, std::string source,  // NOLINT(readability-function-size)
                         const CsvOptions& options) {
  CsvTable table;
  table.source_ = std::move(source);
  if (text.size() >= 3 && text.substr(0, 3) == "\xEF\xBB\xBF") text.remove_prefix(3);
  if (const auto nul = text.find('\0'); nul != std::string_view::npos) {
    const auto line = static_cast<std::size_t>(std::count(text.begin(), text.begin() + nul, '\n')) + 1;
    throw InputError(location(table.source_, line), "holds a NUL byte: this is not a text file",
                     "give a CSV text file");
  }
  if (const auto bad = first_invalid_utf8_line(text); bad != 0) {
    throw InputError(location(table.source_, bad), "is not valid UTF-8 text",
                     "save the file as UTF-8 (or plain ASCII)");
  }

  std::size_t line = 1;
  std::size_t i = 0;
  bool have_header = false;
  while (i < text.size()) {
    const std::size_t start_line = line;
    std::vector<std::string> cells;
    std::string cell;
    bool in_quotes = false;
    bool was_quoted = false;
    bool line_done = false;
    // Skip comment lines and blank lines before parsing cells.
    {
      std::size_t j = i;
      while (j < text.size() && (text[j] == ' ' || text[j] == '\t')) ++j;
      if (j >= text.size() || text[j] == '\n' || text[j] == '\r' || text[j] == options.comment) {
        const auto eol = text.find('\n', i);
        if (!have_header && j < text.size() && text[j] == options.comment) {
          // "# key: value" before the header: metadata the file states about itself.
          const std::string body =
              trim(text.substr(j + 1, (eol == std::string_view::npos ? text.size() : eol) - j - 1));
          const auto colon = body.find(": ");
          if (colon != std::string::npos && colon > 0 && body.find(' ') >= colon) {
            table.metadata_.emplace(body.substr(0, colon),
                                    CsvMetadata{trim(body.substr(colon + 2)), line});
          }
        }
        i = (eol == std::string_view::npos) ? text.size() : eol + 1;
        ++line;
        continue;
      }
    }
    while (i < text.size() && !line_done) {
      const char c = text[i];
      if (in_quotes) {
        if (c == '"') {
          if (i + 1 < text.size() && text[i + 1] == '"') {
            cell += '"';
            i += 2;
            continue;
          }
          in_quotes = false;
          ++i;
          continue;
        }
        if (c == '\n') ++line;
        cell += c;
        ++i;
        continue;
      }
      if (c == '"' && trim(cell).empty()) {
        in_quotes = true;
        was_quoted = true;
        cell.clear();
        ++i;
      } else if (c == options.delimiter) {
        cells.push_back(was_quoted ? cell : trim(cell));
        cell.clear();
        was_quoted = false;
        ++i;
      } else if (c == '\r' && i + 1 < text.size() && text[i + 1] == '\n') {
        ++i;
      } else if (c == '\n') {
        line_done = true;
        ++i;
        ++line;
      } else {
        cell += c;
        ++i;
      }
    }
    if (in_quotes) {
      throw InputError(location(table.source_, start_line), "a quoted cell is never closed",
                       "add the closing double quote");
    }
    cells.push_back(was_quoted ? cell : trim(cell));
    if (!have_header) {
      table.header_ = std::move(cells);
      table.header_line_ = start_line;
      have_header = true;
      for (std::size_t a = 0; a < table.header_.size(); ++a) {
        for (std::size_t b = a + 1; b < table.header_.size(); ++b) {
          if (!table.header_[a].empty() && iequals(table.header_[a], table.header_[b])) {
            throw InputError(location(table.source_, start_line),
                             "column '" + table.header_[a] + "' appears twice in the header",
                             "give every column a distinct name");
          }
        }
      }
      continue;
    }
    if (cells.size() != table.header_.size()) {
      throw InputError(location(table.source_, start_line),
                       "has " + std::to_string(cells.size()) + " cells but the header has " +
                           std::to_string(table.header_.size()),
                       "give every row as many cells as the header (check for a stray delimiter)");
    }
    table.rows_.push_back(CsvRow{start_line, std::move(cells)});
  }
  if (!have_header) {
    throw InputError(table.source_, "is empty (no header line)",
                     "give a CSV file with a header line and data rows");
  }
  return table;
}

std::optional<std::size_t> CsvTable::find_column(std::string_view name) const {
  const std::string wanted = trim(name);
  for (std::size_t c = 0; c < header_.size(); ++c) {
    if (iequals(header_[c], wanted)) return c;
  }
  return std::nullopt;
}

std::size_t CsvTable::column(std::string_view name) const {
  if (auto c = find_column(name)) return *c;
  std::string have;
  for (const auto& h : header_) have += (have.empty() ? "" : ", ") + h;
  throw InputError(location(source_, header_line_),
                   "has no column '" + std::string(name) + "' (columns: " + have + ")",
                   "name one of these columns in the options");
}

std::optional<double> CsvTable::number(const CsvRow& row, std::size_t column,
                                       const MissingValues& missing) const {
  const std::string& cell = row.cells.at(column);
  if (missing.is_marker(cell)) return std::nullopt;
  const auto value = parse_finite_double(cell);
  if (!value) {
    throw InputError(where(row),
                     "column '" + header_.at(column) + "' holds '" + cell + "', which is not a finite number",
                     "correct the value, or declare it a missing-value marker");
  }
  if (missing.is_sentinel(*value)) return std::nullopt;
  return value;
}

std::string CsvTable::where(const CsvRow& row) const { return location(source_, row.line); }

}  // namespace tidewright
