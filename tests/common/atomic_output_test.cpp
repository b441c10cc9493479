// Outputs are complete or absent, and existing outputs are refused without force.
#include "tidewright/common/atomic_output.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>

#include "support/run_cli.hpp"
#include "tidewright/common/error.hpp"

namespace fs = std::filesystem;
using tidewright::AtomicFile;
using tidewright::InputError;
using tidewright::testing::read_all;
using tidewright::testing::TempDir;
using ::testing::HasSubstr;

namespace {
std::size_t entries(const fs::path& dir) {
  return static_cast<std::size_t>(std::distance(fs::directory_iterator(dir), fs::directory_iterator()));
}
}  // namespace

TEST(AtomicOutput, WritesCompleteFileAndLeavesNoTemporary) {
  TempDir dir;
  tidewright::write_text_file(dir / "a.txt", "hello\n", false);
  EXPECT_EQ(read_all(dir / "a.txt"), "hello\n");
  EXPECT_EQ(entries(dir.path()), 1U);
}

TEST(AtomicOutput, ExceptionMidWriteLeavesNoFile) {
  TempDir dir;
  try {
    AtomicFile f(dir / "half.csv", false);
    f.stream() << "year,level\n1923,";
    throw std::runtime_error("simulated failure in the middle of writing");
  } catch (const std::runtime_error&) {
  }
  EXPECT_FALSE(fs::exists(dir / "half.csv"));
  EXPECT_EQ(entries(dir.path()), 0U);
}

TEST(AtomicOutput, FailedWriteKeepsThePreviousFile) {
  TempDir dir;
  tidewright::write_text_file(dir / "keep.txt", "old\n", false);
  try {
    AtomicFile f(dir / "keep.txt", true);
    f.stream() << "new";
    f.stream().setstate(std::ios::badbit);  // as a full disk would
    f.commit();
    FAIL() << "commit should have thrown";
  } catch (const InputError& e) {
    EXPECT_THAT(std::string(e.what()), HasSubstr("nothing was written"));
  }
  EXPECT_EQ(read_all(dir / "keep.txt"), "old\n");
  EXPECT_EQ(entries(dir.path()), 1U);
}

TEST(AtomicOutput, RefusesToOverwriteWithoutForce) {
  TempDir dir;
  tidewright::write_text_file(dir / "r.json", "{}\n", false);
  try {
    tidewright::write_text_file(dir / "r.json", "[]\n", false, "--json");
    FAIL() << "expected refusal";
  } catch (const InputError& e) {
    EXPECT_THAT(std::string(e.what()), HasSubstr("--json"));
    EXPECT_THAT(std::string(e.what()), HasSubstr("already exists; choose another name or pass --force"));
  }
  EXPECT_EQ(read_all(dir / "r.json"), "{}\n");
  tidewright::write_text_file(dir / "r.json", "[]\n", true);
  EXPECT_EQ(read_all(dir / "r.json"), "[]\n");
}

TEST(AtomicOutput, MissingFolderIsNamed) {
  TempDir dir;
  EXPECT_THROW(tidewright::write_text_file(dir / "no" / "x.txt", "x", false), InputError);
}

namespace {
// One run's folder output: `name` inside a new folder at `target`.
void write_folder_run(const fs::path& target, const std::string& name, bool force) {
  tidewright::AtomicPath p(target, force, "--out");
  p.make_temp_folder();
  fs::create_directory(p.temp_path() / "maps");
  tidewright::write_text_file(p.temp_path() / "maps" / name, "run", false);
  p.commit();
}
}  // namespace

TEST(AtomicOutput, FolderOfAPreviousRunIsReplacedWholeWithForce) {
  TempDir dir;
  write_folder_run(dir / "out", "old.txt", false);
  EXPECT_THROW(write_folder_run(dir / "out", "new.txt", false), tidewright::InputError);
  write_folder_run(dir / "out", "new.txt", true);
  EXPECT_TRUE(fs::exists(dir / "out" / "maps" / "new.txt"));
  EXPECT_FALSE(fs::exists(dir / "out" / "maps" / "old.txt"));
  EXPECT_EQ(entries(dir.path()), 1U);
}

// Issue 14: `map --out DIR --force` deleted every file in DIR. A folder holding anything a run
// did not write is refused with the names, and nothing in it changes.
TEST(AtomicOutput, ForceNeverReplacesAFolderHoldingAUsersFiles) {
  TempDir dir;
  write_folder_run(dir / "out", "old.txt", false);
  tidewright::write_text_file(dir / "out" / "notes.txt", "mine", false);
  tidewright::write_text_file(dir / "out" / "maps" / "sea.gpkg", "mine too", false);
  try {
    write_folder_run(dir / "out", "new.txt", true);
    FAIL() << "a folder with a user's files was replaced";
  } catch (const tidewright::InputError& e) {
    EXPECT_THAT(std::string(e.what()), HasSubstr("did not write (maps/sea.gpkg, notes.txt)"));
    EXPECT_THAT(std::string(e.what()), HasSubstr("--out"));
  }
  EXPECT_TRUE(fs::exists(dir / "out" / "notes.txt"));
  EXPECT_TRUE(fs::exists(dir / "out" / "maps" / "sea.gpkg"));
  EXPECT_TRUE(fs::exists(dir / "out" / "maps" / "old.txt"));
  EXPECT_EQ(entries(dir.path()), 1U);  // no temporary left beside it
}

// Issue 15: an empty folder made beforehand is accepted without --force.
TEST(AtomicOutput, EmptyExistingFolderIsAccepted) {
  TempDir dir;
  fs::create_directory(dir / "out");
  write_folder_run(dir / "out", "new.txt", false);
  EXPECT_TRUE(fs::exists(dir / "out" / "maps" / "new.txt"));
}

TEST(AtomicOutput, JsonIsIndentedWithNewline) {
  TempDir dir;
  nlohmann::ordered_json j;
  j["b"] = 1;
  j["a"] = 2.5;
  tidewright::write_json_file(dir / "j.json", j, false);
  EXPECT_EQ(read_all(dir / "j.json"), "{\n  \"b\": 1,\n  \"a\": 2.5\n}\n");
}

TEST(AtomicOutput, MessagesShowTheTargetNotTheTemporary) {
  EXPECT_EQ(tidewright::shown_path("/data/.maps.tmp-1234-0/depth.tif"), "/data/maps/depth.tif");
  EXPECT_EQ(tidewright::shown_path("out/.fit.tmp-77-3.json"), "out/fit.json");
  EXPECT_EQ(tidewright::shown_path("plain/.hidden/file.tmp-x"), "plain/.hidden/file.tmp-x");
  EXPECT_EQ(tidewright::shown_path("a/.b.tmp-1-2-3/c"), "a/.b.tmp-1-2-3/c");  // not a name this module makes
}
