// Runs the built tidewright executable for command-line tests and captures what it prints.
#pragma once

#include <gmock/gmock.h>
#include <gtest/gtest.h>
#include <sys/wait.h>

#include <array>
#include <cstdio>
#include <filesystem>
#include <random>
#include <string>

namespace tidewright::testing {

struct CliResult {
  int exit_code = -1;
  std::string out;  // stdout
  std::string err;  // stderr
};

inline std::string shell_quote(const std::string& s) {
  std::string out = "'";
  for (char c : s) {
    if (c == '\'') out += "'\\''";
    else out += c;
  }
  return out + "'";
}

inline std::string read_all(const std::filesystem::path& p) {
  std::string s;
  if (FILE* f = std::fopen(p.c_str(), "rb")) {
    std::array<char, 4096> buf{};
    std::size_t n = 0;
    while ((n = std::fread(buf.data(), 1, buf.size(), f)) > 0) s.append(buf.data(), n);
    std::fclose(f);
  }
  return s;
}

// A fresh empty folder under the system temp folder, removed when the object goes.
class TempDir {
 public:
  TempDir() {
    std::random_device rd;
    path_ = std::filesystem::temp_directory_path() /
            ("tidewright-test-" + std::to_string(rd()) + std::to_string(rd()));
    std::filesystem::create_directories(path_);
  }
  ~TempDir() {
    std::error_code ec;
    std::filesystem::remove_all(path_, ec);
  }
  TempDir(const TempDir&) = delete;
  TempDir& operator=(const TempDir&) = delete;
  [[nodiscard]] const std::filesystem::path& path() const { return path_; }
  [[nodiscard]] std::filesystem::path operator/(const std::string& name) const { return path_ / name; }

 private:
  std::filesystem::path path_;
};

// `args` is appended to the executable's path as shell words (quote them yourself).
inline CliResult run_cli(const std::string& args) {
  TempDir tmp;
  const auto out = tmp / "stdout";
  const auto err = tmp / "stderr";
  const std::string cmd = shell_quote(TIDEWRIGHT_CLI) + " " + args + " >" +
                          shell_quote(out.string()) + " 2>" + shell_quote(err.string());
  const int status = std::system(cmd.c_str());
  CliResult r;
  r.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  r.out = read_all(out);
  r.err = read_all(err);
  return r;
}

// A shell command's exit code and standard output (add 2>&1 to catch its errors too); for the
// reference scripts.
inline CliResult run_shell(const std::string& cmd) {
  CliResult r;
  FILE* pipe = popen(cmd.c_str(), "r");
  if (pipe == nullptr) return r;
  std::array<char, 4096> buf{};
  std::size_t n = 0;
  while ((n = std::fread(buf.data(), 1, buf.size(), pipe)) > 0) r.out.append(buf.data(), n);
  const int status = pclose(pipe);
  r.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  return r;
}

inline std::size_t count_lines(const std::string& s) {
  std::size_t n = 0;
  for (char c : s) n += (c == '\n');
  return n;
}

// The command-line error convention: exit 2, one line "tidewright: error: ..." holding `part`.
inline void expect_one_line_error(const CliResult& r, const std::string& part) {
  EXPECT_EQ(r.exit_code, 2) << r.err;
  EXPECT_THAT(r.err, ::testing::StartsWith("tidewright: error: "));
  EXPECT_THAT(r.err, ::testing::HasSubstr(part));
  EXPECT_EQ(count_lines(r.err), 1U) << r.err;
}

}  // namespace tidewright::testing
