// Where a fuzz target writes its input for readers that take a file name. The replay
// (tests/fuzz/replay.sh) sets TIDEWRIGHT_FUZZ_DIR to a fresh folder of fixed name, so the path,
// and with it every message that quotes it, is the same on every run: a fixed verdict needs
// the same code paths for the same input. Without it, a per-process name in the temp folder.
#pragma once

#include <unistd.h>

#include <cstdlib>
#include <filesystem>
#include <string>

inline std::filesystem::path fuzz_input_file(const std::string& name) {
  if (const char* dir = std::getenv("TIDEWRIGHT_FUZZ_DIR"); dir != nullptr && *dir != '\0') {
    std::filesystem::create_directories(dir);
    return std::filesystem::path(dir) / name;
  }
  return std::filesystem::temp_directory_path() /
         ("tidewright-fuzz-" + std::to_string(::getpid()) + "-" + name);
}
