// Outputs that are either complete or absent. A file is written under a temporary name in
// its destination folder and renamed over the target only when complete, so a failed write,
// an exception or an interrupt (SIGINT, SIGTERM) never leaves a half-written file behind.
// Existing outputs are refused unless the caller passes force (the CLI's --force).
#pragma once

#include <filesystem>
#include <fstream>
#include <string>
#include <string_view>

#include <nlohmann/json_fwd.hpp>

namespace tidewright {

// The list of files a run wrote into an output folder, written into the folder itself.
inline constexpr const char* output_manifest_name = ".tidewright-written";

// Throws InputError if `target` exists and !force, or if its folder does not exist or is
// not writable. `option` names the option that gave the path, for the message. An existing
// folder is accepted when empty; with force, only when everything in it is listed in its
// manifest (a previous run's own output): a folder holding other files is refused with their
// names, so --force never deletes a user's file.
void check_output_path(const std::filesystem::path& target, bool force,
                       std::string_view option = "");

// A temporary path next to `target`, registered for removal on interrupt until committed or
// discarded. Writers that need a file name (GDAL drivers) write here, then commit().
class AtomicPath {
 public:
  AtomicPath(std::filesystem::path target, bool force, std::string_view option = "");
  AtomicPath(const AtomicPath&) = delete;
  AtomicPath& operator=(const AtomicPath&) = delete;
  ~AtomicPath();

  [[nodiscard]] const std::filesystem::path& temp_path() const noexcept { return temp_; }
  [[nodiscard]] const std::filesystem::path& target() const noexcept { return target_; }
  // For a folder target: creates the temporary folder (InputError naming the target if the
  // system refuses, e.g. a read-only or special file system) and returns its path.
  const std::filesystem::path& make_temp_folder();
  // Renames the temporary over the target (replacing a folder target as a whole).
  void commit();
  void discard() noexcept;

 private:
  std::filesystem::path target_;
  std::filesystem::path temp_;
  bool done_ = false;
  int slot_ = -1;  // slot in the interrupt-cleanup registry
};

// A text file written through a stream; commit() checks the stream, flushes, syncs, renames.
class AtomicFile {
 public:
  AtomicFile(std::filesystem::path target, bool force, std::string_view option = "");
  [[nodiscard]] std::ostream& stream() noexcept { return out_; }
  void commit();

 private:
  AtomicPath path_;
  std::ofstream out_;
};

void write_text_file(const std::filesystem::path& target, std::string_view content, bool force,
                     std::string_view option = "");
// Pretty-printed (2 spaces), keys in insertion order of the caller's json, newline at end.
void write_json_file(const std::filesystem::path& target, const nlohmann::ordered_json& value,
                     bool force, std::string_view option = "");

// The path a user will see: each temporary component (".maps.tmp-123-0") shown as its target
// ("maps"), for messages about files written inside a temporary folder.
[[nodiscard]] std::string shown_path(const std::filesystem::path& path);

// Installs SIGINT/SIGTERM/SIGHUP handlers that remove every registered temporary (files, and
// temporary folders with what is in them) and exit with 128 + signal; ignores SIGXFSZ so a
// file-size limit is a write error. Called once by the command line.
void install_interrupt_cleanup();

}  // namespace tidewright
