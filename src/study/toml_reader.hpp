// Strict reading of a TOML table: every key read is marked, and finish() refuses keys that
// nobody read, so a misspelt key is an error with its path and line instead of being ignored.
#pragma once

#include <filesystem>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include <toml++/toml.h>

namespace tidewright::study {

class TomlReader {
 public:
  // `file` is the site file (for messages and relative paths); `prefix` the table's dotted path.
  TomlReader(const toml::table& table, std::filesystem::path file, std::string prefix);

  [[nodiscard]] bool has(std::string_view key) const;
  [[nodiscard]] std::string string(std::string_view key);
  [[nodiscard]] std::optional<std::string> optional_string(std::string_view key);
  [[nodiscard]] double number(std::string_view key);
  [[nodiscard]] std::optional<double> optional_number(std::string_view key);
  [[nodiscard]] long long integer(std::string_view key);
  [[nodiscard]] std::optional<long long> optional_integer(std::string_view key);
  [[nodiscard]] std::optional<bool> optional_boolean(std::string_view key);
  [[nodiscard]] std::vector<double> numbers(std::string_view key);  // empty if absent
  [[nodiscard]] std::vector<long long> integers(std::string_view key);
  [[nodiscard]] std::vector<std::string> strings(std::string_view key);
  // A path relative to the site file's folder (absolute paths are kept).
  [[nodiscard]] std::filesystem::path path(std::string_view key);
  [[nodiscard]] std::optional<std::filesystem::path> optional_path(std::string_view key);
  // A string that must be one of `choices`.
  [[nodiscard]] std::string choice(std::string_view key, const std::vector<std::string>& choices,
                                   std::optional<std::string> default_value = std::nullopt);

  [[nodiscard]] std::optional<TomlReader> table(std::string_view key);
  [[nodiscard]] std::vector<TomlReader> array_of_tables(std::string_view key);
  // All keys of this table (for maps such as fingerprint factors); marks them read.
  [[nodiscard]] std::vector<std::string> keys();

  // Throws InputError for the first key that was not read.
  void finish() const;

  [[nodiscard]] std::string where(std::string_view key) const;  // "file:line: prefix.key"
  [[nodiscard]] const std::filesystem::path& file() const noexcept { return file_; }

 private:
  const toml::node* get(std::string_view key);
  [[noreturn]] void wrong_type(std::string_view key, std::string_view wanted) const;
  [[noreturn]] void missing(std::string_view key) const;

  const toml::table* table_;
  std::filesystem::path file_;
  std::string prefix_;
  std::vector<std::string> read_;
};

// Parses the file; syntax errors become InputError at file:line.
[[nodiscard]] toml::table parse_toml_file(const std::filesystem::path& file);

}  // namespace tidewright::study
