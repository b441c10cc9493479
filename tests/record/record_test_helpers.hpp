// Helpers for the record module's tests: the message of an expected InputError, synthetic
// series, and running the outside references (Rscript, Debian's Python) live.
#pragma once

#include <gtest/gtest.h>

#include <chrono>
#include <cstdint>
#include <cstdlib>
#include <functional>
#include <string>

#include "support/run_cli.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/record/water_level_series.hpp"

namespace tidewright::record::testing {

// The what() of the InputError `f` throws, or "" (with a test failure) when it throws none.
inline std::string input_error_of(const std::function<void()>& f) {
  try {
    f();
  } catch (const InputError& e) {
    return e.what();
  }
  ADD_FAILURE() << "expected an InputError";
  return "";
}

inline constexpr std::int64_t hour_s = 3600;

// Seconds of UTC at hour `h` of a civil date, by std::chrono (independent of the parser).
inline std::int64_t utc(std::chrono::year_month_day ymd, int h = 0) {
  using namespace std::chrono;
  return duration_cast<seconds>((sys_days(ymd) + hours(h)).time_since_epoch()).count();
}

// A series built in memory (no file), times in seconds.
inline WaterLevelSeries make_series(std::vector<std::int64_t> t, std::vector<double> h,
                                    std::string source = "synthetic") {
  WaterLevelSeries s;
  s.time_utc_s = std::move(t);
  s.level_m = std::move(h);
  s.line.assign(s.level_m.size(), 0);
  s.source = std::move(source);
  s.cleaning.rows_read = s.level_m.size();
  s.cleaning.values_kept = s.level_m.size();
  return s;
}

// Runs a shell command line; returns its exit code and stdout. Used for Rscript and
// /usr/bin/python3, which the reference checks need (never skipped: a failure names them).
struct CommandResult {
  int exit_code = -1;
  std::string out;
  std::string err;
};
inline CommandResult run_command(const std::string& command) {
  tidewright::testing::TempDir tmp;
  const auto out = tmp / "stdout";
  const auto err = tmp / "stderr";
  const std::string cmd = command + " >" + tidewright::testing::shell_quote(out.string()) + " 2>" +
                          tidewright::testing::shell_quote(err.string());
  const int status = std::system(cmd.c_str());
  CommandResult r;
  r.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  r.out = tidewright::testing::read_all(out);
  r.err = tidewright::testing::read_all(err);
  return r;
}

// Runs an R expression with Rscript (package evd from Debian r-cran-evd); a failure is a test
// failure naming the package, never a skip.
inline CommandResult run_rscript(const std::string& expression) {
  auto r = run_command("Rscript -e " + tidewright::testing::shell_quote(expression));
  EXPECT_EQ(r.exit_code, 0) << "Rscript with package evd (Debian r-cran-evd) is needed: " << r.err;
  return r;
}

}  // namespace tidewright::record::testing
