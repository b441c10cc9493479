#include "tidewright/common/atomic_output.hpp"

#include <fcntl.h>
#include <unistd.h>

#include <array>
#include <atomic>
#include <csignal>
#include <cstring>
#include <nlohmann/json.hpp>

#include "tidewright/common/error.hpp"

namespace tidewright {
namespace {

// Paths of live temporaries, kept in fixed storage so the signal handler can read them
// without allocating (only async-signal-safe calls there: unlink, rmdir-free, _exit).
constexpr std::size_t max_live_temps = 256;
constexpr std::size_t max_path_bytes = 4096;
std::array<std::array<char, max_path_bytes>, max_live_temps> live_temps{};
std::array<std::atomic<bool>, max_live_temps> live_used{};

int register_temp(const std::filesystem::path& p) {
  const std::string s = p.string();
  if (s.size() >= max_path_bytes) return -1;
  for (std::size_t i = 0; i < max_live_temps; ++i) {
    bool expected = false;
    if (live_used[i].compare_exchange_strong(expected, true)) {
      std::memcpy(live_temps[i].data(), s.c_str(), s.size() + 1);
      return static_cast<int>(i);
    }
  }
  return -1;
}

void unregister_temp(int slot) {
  if (slot >= 0) live_used[static_cast<std::size_t>(slot)].store(false);
}

extern "C" void on_interrupt(int sig) {
  for (std::size_t i = 0; i < max_live_temps; ++i) {
    if (live_used[i].load()) ::unlink(live_temps[i].data());
  }
  ::_exit(128 + sig);
}

std::atomic<unsigned> temp_counter{0};

std::filesystem::path temp_name_for(const std::filesystem::path& target) {
  const auto parent = target.has_parent_path() ? target.parent_path() : std::filesystem::path(".");
  // Keep the extension last: some GDAL drivers look at it.
  std::string name = ".";
  name += target.stem().string();
  name += ".tmp-";
  name += std::to_string(::getpid());
  name += '-';
  name += std::to_string(temp_counter.fetch_add(1));
  name += target.extension().string();
  return parent / name;
}

std::string opt_prefix(std::string_view option) {
  return option.empty() ? std::string() : std::string(option) + " ";
}

}  // namespace

void check_output_path(const std::filesystem::path& target, bool force, std::string_view option) {
  std::error_code ec;
  const std::string where = opt_prefix(option) + target.string();
  if (target.empty()) throw InputError(std::string(option), "no output path given", "give a file name");
  if (std::filesystem::exists(target, ec) && !force) {
    throw InputError(where, "already exists", "choose another name or pass --force to replace it");
  }
  const auto parent = target.has_parent_path() ? target.parent_path() : std::filesystem::path(".");
  if (!std::filesystem::is_directory(parent, ec)) {
    throw InputError(where, "its folder '" + parent.string() + "' does not exist",
                     "create the folder first");
  }
  if (::access(parent.c_str(), W_OK) != 0) {
    throw InputError(where, "its folder '" + parent.string() + "' is not writable",
                     "choose a folder you can write to");
  }
}

AtomicPath::AtomicPath(std::filesystem::path target, bool force, std::string_view option)
    : target_(std::move(target)) {
  check_output_path(target_, force, option);
  temp_ = temp_name_for(target_);
  slot_ = register_temp(temp_);
}

AtomicPath::~AtomicPath() { discard(); }

void AtomicPath::discard() noexcept {
  if (done_) return;
  done_ = true;
  std::error_code ec;
  std::filesystem::remove_all(temp_, ec);
  unregister_temp(slot_);
}

void AtomicPath::commit() {
  if (done_) return;
  std::error_code ec;
  if (std::filesystem::is_directory(target_, ec) && std::filesystem::is_directory(temp_, ec)) {
    // A folder cannot be renamed over a non-empty folder: move the old one aside first.
    const auto old = temp_name_for(target_.string() + "-previous");
    std::filesystem::rename(target_, old, ec);
    if (ec) throw InputError(target_.string(), "cannot replace the existing folder: " + ec.message(), "remove it by hand");
    std::filesystem::rename(temp_, target_, ec);
    if (ec) {
      std::filesystem::rename(old, target_);
      throw InputError(target_.string(), "cannot be written: " + ec.message(), "check the disk and permissions");
    }
    std::filesystem::remove_all(old, ec);
  } else {
    std::filesystem::rename(temp_, target_, ec);
    if (ec) {
      discard();
      throw InputError(target_.string(), "cannot be written: " + ec.message(),
                       "check the disk and permissions");
    }
  }
  done_ = true;
  unregister_temp(slot_);
}

AtomicFile::AtomicFile(std::filesystem::path target, bool force, std::string_view option)
    : path_(std::move(target), force, option), out_(path_.temp_path(), std::ios::binary) {
  if (!out_) {
    throw InputError(path_.target().string(), "cannot be created", "check the folder's permissions");
  }
}

void AtomicFile::commit() {
  out_.flush();
  const bool ok = static_cast<bool>(out_);
  out_.close();
  if (!ok || out_.fail()) {
    path_.discard();
    throw InputError(path_.target().string(), "writing failed (disk full or write error); nothing was written",
                     "free space or choose another folder");
  }
  // Sync so that a crash after rename cannot expose an empty file.
  const int fd = ::open(path_.temp_path().c_str(), O_RDONLY);
  if (fd >= 0) {
    const int rc = ::fsync(fd);
    ::close(fd);
    if (rc != 0) {
      path_.discard();
      throw InputError(path_.target().string(), "writing failed at sync; nothing was written",
                       "free space or choose another folder");
    }
  }
  path_.commit();
}

void write_text_file(const std::filesystem::path& target, std::string_view content, bool force,
                     std::string_view option) {
  AtomicFile file(target, force, option);
  file.stream().write(content.data(), static_cast<std::streamsize>(content.size()));
  file.commit();
}

void write_json_file(const std::filesystem::path& target, const nlohmann::ordered_json& value,
                     bool force, std::string_view option) {
  write_text_file(target, value.dump(2) + "\n", force, option);
}

void install_interrupt_cleanup() {
  struct sigaction action {};
  action.sa_handler = on_interrupt;
  sigemptyset(&action.sa_mask);
  ::sigaction(SIGINT, &action, nullptr);
  ::sigaction(SIGTERM, &action, nullptr);
}

}  // namespace tidewright
