// Faults a catalogue row cannot set up (docs/bad-inputs.md): a map run killed half-way, a full
// disk, a file-size limit, and the same run twice. Outputs must be whole or absent, never partial.
#include <gmock/gmock.h>
#include <gtest/gtest.h>
#include <signal.h>
#include <spawn.h>
#include <sys/mount.h>
#include <sys/wait.h>
#include <fcntl.h>
#include <unistd.h>

#include <cerrno>
#include <chrono>
#include <cmath>
#include <cstring>
#include <filesystem>
#include <map>
#include <thread>

#include "support/run_cli.hpp"
#include "terrain/terrain_fixtures.hpp"

extern char** environ;

namespace fs = std::filesystem;
using ::testing::HasSubstr;
using tidewright::testing::expect_one_line_error;
using tidewright::testing::read_all;
using tidewright::testing::run_cli;
using tidewright::testing::shell_quote;
using tidewright::testing::TempDir;

namespace {

// A rolling coast: sea at the left edge, land rising to the right with ripples, so every level
// from 0.25 m to 5 m floods a different share (a map run of seconds, not milliseconds).
std::string rolling_dem(const TempDir& tmp, int n) {
  const auto path = (tmp / "dem.tif").string();
  std::vector<double> z(static_cast<std::size_t>(n) * static_cast<std::size_t>(n));
  for (int r = 0; r < n; ++r) {
    for (int c = 0; c < n; ++c) {
      z[static_cast<std::size_t>(r) * static_cast<std::size_t>(n) + static_cast<std::size_t>(c)] =
          6.0 * c / n - 0.5 + 0.8 * std::sin(r / 23.0) * std::cos(c / 31.0) + 0.05 * ((r * 7 + c * 13) % 11);
    }
  }
  tidewright::testing::write_raster(path, n, n, tidewright::testing::utm_10m, 32633, z);
  return path;
}

std::vector<std::string> twenty_level_map(const std::string& dem, const fs::path& out) {
  std::vector<std::string> args{TIDEWRIGHT_CLI, "map", "--dem", dem, "--same-datum", "--sea-edge-below", "0"};
  for (int i = 1; i <= 20; ++i) {
    args.emplace_back("--level");
    args.push_back(std::to_string(0.25 * i));
  }
  args.insert(args.end(), {"--quiet", "--force", "--out", out.string()});
  return args;
}

pid_t spawn(const std::vector<std::string>& args) {
  std::vector<char*> argv;
  for (const auto& a : args) argv.push_back(const_cast<char*>(a.c_str()));
  argv.push_back(nullptr);
  posix_spawn_file_actions_t actions;
  posix_spawn_file_actions_init(&actions);
  posix_spawn_file_actions_addopen(&actions, 1, "/dev/null", O_WRONLY, 0);
  posix_spawn_file_actions_addopen(&actions, 2, "/dev/null", O_WRONLY, 0);
  pid_t pid = -1;
  const int rc = posix_spawn(&pid, argv[0], &actions, nullptr, argv.data(), environ);
  posix_spawn_file_actions_destroy(&actions);
  return rc == 0 ? pid : -1;
}

// Every entry under `dir` (relative name -> bytes), so "nothing changed" is one comparison.
std::map<std::string, std::string> snapshot(const fs::path& dir) {
  std::map<std::string, std::string> files;
  for (const auto& e : fs::recursive_directory_iterator(dir)) {
    files[fs::relative(e.path(), dir).string()] = e.is_regular_file() ? read_all(e.path()) : "(folder)";
  }
  return files;
}

// Starts the run, waits until its temporary output folder exists (and holds `file`, if given),
// sends `sig`. Returns the exit status; fails the test if the run ended before the signal.
int interrupt_run(const std::vector<std::string>& args, const fs::path& parent, int sig, const std::string& file) {
  const pid_t pid = spawn(args);
  EXPECT_GT(pid, 0);
  if (pid <= 0) return -1;
  const auto ready = [&] {
    for (const auto& e : fs::directory_iterator(parent)) {
      if (e.path().filename().string().find(".tmp-") == std::string::npos) continue;
      std::error_code ec;
      if (file.empty() || fs::exists(e.path() / file, ec)) return true;
    }
    return false;
  };
  int status = 0;
  for (int i = 0; i < 20000 && !ready(); ++i) {
    if (waitpid(pid, &status, WNOHANG) == pid) {
      ADD_FAILURE() << "the run ended before it could be interrupted";
      return status;
    }
    std::this_thread::sleep_for(std::chrono::milliseconds(1));
  }
  EXPECT_EQ(waitpid(pid, &status, WNOHANG), 0) << "the run ended before the signal";
  kill(pid, sig);
  waitpid(pid, &status, 0);
  return status;
}

}  // namespace

TEST(Faults, InterruptedMapRunLeavesThePreviousOutputWholeOrNone) {
  TempDir tmp;
  const auto dem = rolling_dem(tmp, 2000);
  const auto work = tmp / "work";
  fs::create_directory(work);
  // A complete previous output, made by a quick one-level run.
  const auto out = work / "maps";
  ASSERT_EQ(run_cli("map --dem " + shell_quote(dem) + " --same-datum --sea-edge-below 0 --level 1 --quiet --out " +
                    shell_quote(out.string()))
                .exit_code,
            0);
  const auto before = snapshot(work);
  ASSERT_TRUE(before.count("maps/summary.json"));

  // SIGTERM during the threshold pass (the folder is made first), and SIGINT once the level
  // rasters are being written.
  for (const auto& [sig, file] : {std::pair<int, std::string>{SIGTERM, ""}, std::pair<int, std::string>{SIGINT, "depth.tif"}}) {
    const int status = interrupt_run(twenty_level_map(dem, out), work, sig, file);
    ASSERT_TRUE(WIFEXITED(status)) << "signal " << sig << ": the run did not exit through its handler";
    EXPECT_EQ(WEXITSTATUS(status), 128 + sig);
    EXPECT_EQ(snapshot(work), before) << "signal " << sig << ": the previous output changed or a temporary was left";
  }
  // No previous output: nothing at all is left.
  const auto fresh = work / "fresh";
  const int status = interrupt_run(twenty_level_map(dem, fresh), work, SIGTERM, "extent.tif");
  ASSERT_TRUE(WIFEXITED(status));
  EXPECT_EQ(WEXITSTATUS(status), 128 + SIGTERM);
  EXPECT_EQ(snapshot(work), before);
}

TEST(Faults, SameMapRunTwiceGivesByteIdenticalFiles) {
  // The GeoPackage's gpkg_contents.last_change is the writing time unless SOURCE_DATE_EPOCH
  // pins it (docs/map.md); the rasters and summaries carry no time.
  ::setenv("SOURCE_DATE_EPOCH", "1700000000", 1);
  TempDir tmp;
  const auto dem = rolling_dem(tmp, 300);
  const std::string cmd = "map --dem " + shell_quote(dem) +
                          " --same-datum --sea-edge-below 0 --level 1 --level 2.5 --gev 1.0,0.4,-0.1 --rise 2050=0.3"
                          " --rise 2100=0.8 --aep-pass 0.01 --polygons --quiet --force --out " +
                          shell_quote((tmp / "maps").string());
  ASSERT_EQ(run_cli(cmd).exit_code, 0);
  const auto first = snapshot(tmp / "maps");
  ASSERT_EQ(run_cli(cmd).exit_code, 0);
  const auto second = snapshot(tmp / "maps");
  ASSERT_EQ(first.size(), second.size());
  for (const auto& [name, bytes] : first) {
    ASSERT_TRUE(second.count(name)) << name;
    EXPECT_TRUE(second.at(name) == bytes) << name << " differs between two runs of the same command";
  }
  EXPECT_TRUE(first.count("extent.gpkg"));
  EXPECT_TRUE(first.count("aep.tif"));
  ::unsetenv("SOURCE_DATE_EPOCH");
  ASSERT_EQ(run_cli(cmd).exit_code, 0);
  const auto unpinned = snapshot(tmp / "maps");
  for (const auto& [name, bytes] : first) {
    if (name != "extent.gpkg") {
      EXPECT_TRUE(unpinned.at(name) == bytes) << name << " carries a time or varies";
    }
  }
  ::setenv("SOURCE_DATE_EPOCH", "yesterday", 1);
  expect_one_line_error(run_cli(cmd), "SOURCE_DATE_EPOCH: is 'yesterday'");
  ::unsetenv("SOURCE_DATE_EPOCH");
}

TEST(Faults, FileSizeLimitIsAWriteErrorWithNothingLeft) {
  // ulimit -f (512-byte blocks in POSIX sh): a write error on any machine, no privileges needed.
  TempDir tmp;
  const auto dem = rolling_dem(tmp, 400);
  const auto work = tmp / "work";
  fs::create_directory(work);
  const std::string cmd = "sh -c " + shell_quote("ulimit -f 64; exec " + shell_quote(TIDEWRIGHT_CLI) + " map --dem " +
                                                 shell_quote(dem) +
                                                 " --same-datum --sea-edge-below 0 --level 1 --level 2 --out " +
                                                 shell_quote((work / "maps").string()));
  TempDir capture;
  const int status = std::system((cmd + " 2>" + shell_quote((capture / "err").string()) + " >/dev/null").c_str());
  tidewright::testing::CliResult r;
  r.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  r.err = read_all(capture / "err");
  expect_one_line_error(r, "work/maps/threshold.tif: writing failed");
  EXPECT_TRUE(fs::is_empty(work)) << "a temporary or partial output was left";
}

TEST(Faults, FullDiskIsOneLineWithNothingLeft) {
  TempDir tmp;
  const auto disk = tmp / "disk";
  fs::create_directory(disk);
  if (::mount("tidewright-test", disk.c_str(), "tmpfs", 0, "size=256k") != 0) {
    GTEST_SKIP() << "cannot mount a small tmpfs here (needs root and mount rights): " << std::strerror(errno);
  }
  const auto dem = rolling_dem(tmp, 400);
  const auto fit_json = disk / "fit.json";
  const std::string pp = std::string(TIDEWRIGHT_SOURCE_DIR) + "/tests/reference/data/portpirie.csv";
  // A small output fits; the map's rasters (about 1 MB) do not.
  const auto small = run_cli("fit " + shell_quote(pp) + " --level-column level_m --quiet --json " +
                             shell_quote(fit_json.string()));
  const auto full = run_cli("map --dem " + shell_quote(dem) + " --same-datum --sea-edge-below 0 --level 1 --level 2 " +
                            "--out " + shell_quote((disk / "maps").string()));
  const auto left = snapshot(disk);
  ::umount(disk.c_str());
  EXPECT_EQ(small.exit_code, 0) << small.err;
  expect_one_line_error(full, "disk/maps/threshold.tif: writing failed");
  ASSERT_EQ(left.size(), 1U) << "a temporary or partial output was left";
  EXPECT_TRUE(left.count("fit.json"));
}
