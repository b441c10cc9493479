// The project's error types. Every message reads "<where>: <what was wrong>; <what to do>",
// where <where> is a file and line ("tide.csv:12"), a file and field ("site.toml: record.path")
// or an option ("--years"). The command line prints it as one line and picks the exit code:
// InputError → 2 (bad input or usage), ComputationError → 3 (no trustworthy result).
#pragma once

#include <cstddef>
#include <stdexcept>
#include <string>
#include <string_view>

namespace tidewright {

class Error : public std::runtime_error {
 public:
  Error(std::string where, std::string what, std::string hint);

  [[nodiscard]] const std::string& where() const noexcept { return where_; }
  [[nodiscard]] const std::string& problem() const noexcept { return what_; }
  [[nodiscard]] const std::string& hint() const noexcept { return hint_; }

 private:
  std::string where_;
  std::string what_;
  std::string hint_;
};

// Bad input: a file, a field, an option or a combination of them. Exit code 2.
class InputError : public Error {
 public:
  using Error::Error;
};

// A computation that could not give a trustworthy result (a fit that does not converge,
// a root that cannot be bracketed). Exit code 3.
class ComputationError : public Error {
 public:
  using Error::Error;
};

// "file:line" (line counted from 1) or just "file" when line is 0.
[[nodiscard]] std::string location(std::string_view file, std::size_t line = 0);
// "file: field"
[[nodiscard]] std::string field_location(std::string_view file, std::string_view field);

}  // namespace tidewright
