#include "tidewright/common/atomic_output.hpp"

#include <fcntl.h>
#include <sys/syscall.h>
#include <unistd.h>

#include <array>
#include <cctype>
#include <atomic>
#include <cerrno>
#include <csignal>
#include <cstring>
#include <algorithm>
#include <set>
#include <vector>

#include <nlohmann/json.hpp>

#include "tidewright/common/error.hpp"

namespace tidewright {
namespace {

// Paths of live temporaries, kept in fixed storage so the signal handler can read them
// without allocating (only async-signal-safe calls there: unlink, open, getdents64, _exit).
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

// Removes the entry `name` of the open folder `parent_fd`, and everything under it if it is a
// folder (a map's or a study's temporary output folder). Signal-safe: system calls and stack
// buffers only (opendir/readdir may allocate); deep trees past `depth_left` are left.
void remove_tree_at(int parent_fd, const char* name, int depth_left) noexcept {
  if (::unlinkat(parent_fd, name, 0) == 0 || errno != EISDIR || depth_left == 0) {
    ::unlinkat(parent_fd, name, AT_REMOVEDIR);  // harmless when it is gone or not a folder
    return;
  }
  const int fd = ::openat(parent_fd, name, O_RDONLY | O_DIRECTORY | O_NOFOLLOW | O_CLOEXEC);
  if (fd < 0) return;
  alignas(8) std::array<char, 4096> buf{};
  // Re-read until a pass finds nothing to remove: removing entries while reading is allowed,
  // but may make a pass skip some.
  for (bool removed = true; removed;) {
    removed = false;
    ::lseek(fd, 0, SEEK_SET);
    for (;;) {
      const long n = ::syscall(SYS_getdents64, fd, buf.data(), buf.size());
      if (n <= 0) break;
      for (long off = 0; off < n;) {
        // linux_dirent64: d_ino (8), d_off (8), d_reclen (2), d_type (1), d_name.
        unsigned short reclen = 0;
        std::memcpy(&reclen, buf.data() + off + 16, sizeof reclen);
        const char* entry = buf.data() + off + 19;
        if (std::strcmp(entry, ".") != 0 && std::strcmp(entry, "..") != 0) {
          remove_tree_at(fd, entry, depth_left - 1);
          removed = true;
        }
        off += reclen;
      }
    }
  }
  ::close(fd);
  ::unlinkat(parent_fd, name, AT_REMOVEDIR);
}

extern "C" void on_interrupt(int sig) {
  for (std::size_t i = 0; i < max_live_temps; ++i) {
    if (live_used[i].load()) remove_tree_at(AT_FDCWD, live_temps[i].data(), 16);
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

// Inverse of temp_name_for on one component: ".stem.tmp-PID-N.ext" -> "stem.ext".
std::string shown_component(const std::string& name) {
  const auto tmp = name.find(".tmp-");
  if (name.empty() || name[0] != '.' || tmp == std::string::npos || tmp == 0) return name;
  std::size_t end = tmp + 5;
  int dashes = 0;
  while (end < name.size() && (std::isdigit(static_cast<unsigned char>(name[end])) != 0 || name[end] == '-')) {
    dashes += name[end] == '-' ? 1 : 0;
    ++end;
  }
  if (dashes != 1) return name;
  return name.substr(1, tmp - 1) + name.substr(end);
}

std::string opt_prefix(std::string_view option) {
  return option.empty() ? std::string() : std::string(option) + " ";
}

// Every file and folder below `folder`, as paths relative to it ('/'-separated), sorted.
std::vector<std::string> entries_below(const std::filesystem::path& folder) {
  std::vector<std::string> names;
  std::error_code ec;
  for (auto it = std::filesystem::recursive_directory_iterator(folder, ec);
       !ec && it != std::filesystem::recursive_directory_iterator(); it.increment(ec)) {
    names.push_back(std::filesystem::relative(it->path(), folder, ec).generic_string());
  }
  std::sort(names.begin(), names.end());
  return names;
}

std::set<std::string> manifest_of(const std::filesystem::path& folder) {
  std::set<std::string> names;
  std::ifstream in(folder / output_manifest_name);
  for (std::string line; std::getline(in, line);) {
    if (!line.empty() && line[0] != '#') names.insert(line);
  }
  return names;
}

// An existing output folder may be replaced only when it is empty, or with force when all it
// holds was written by a tidewright run (listed in its manifest): never a user's own file.
void check_output_folder(const std::filesystem::path& target, bool force, const std::string& where) {
  const auto present = entries_below(target);
  if (present.empty()) return;
  if (!force) {
    throw InputError(where, "already exists and is not empty",
                     "choose another folder or pass --force to replace a previous run's output");
  }
  const auto written = manifest_of(target);
  std::vector<std::string> foreign;
  for (const auto& name : present) {
    if (name != output_manifest_name && written.count(name) == 0) foreign.push_back(name);
  }
  if (foreign.empty()) return;
  constexpr std::size_t shown = 5;
  std::string list;
  for (std::size_t i = 0; i < foreign.size() && i < shown; ++i) list += (i ? ", " : "") + foreign[i];
  if (foreign.size() > shown) list += " and " + std::to_string(foreign.size() - shown) + " more";
  throw InputError(where,
                   "holds files this command did not write (" + list + "); --force replaces only "
                   "a previous run's own output",
                   "move those files elsewhere or choose another folder");
}

}  // namespace

void check_output_path(const std::filesystem::path& target, bool force, std::string_view option) {
  std::error_code ec;
  const std::string where = opt_prefix(option) + target.string();
  if (target.empty()) throw InputError(std::string(option), "no output path given", "give a file name");
  if (std::filesystem::is_directory(target, ec)) {
    check_output_folder(target, force, where);
  } else if (std::filesystem::exists(target, ec) && !force) {
    throw InputError(where, "already exists", "choose another name or pass --force to replace it");
  }
  const auto parent = target.has_parent_path() ? target.parent_path() : std::filesystem::path(".");
  if (std::filesystem::exists(parent, ec) && !std::filesystem::is_directory(parent, ec)) {
    throw InputError(where, "'" + parent.string() + "' is a file, not a folder", "choose a path inside a folder");
  }
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

const std::filesystem::path& AtomicPath::make_temp_folder() {
  std::error_code ec;
  std::filesystem::create_directory(temp_, ec);
  if (ec) {
    throw InputError(target_.string(), "cannot be created: " + ec.message(), "choose a folder you can write to");
  }
  return temp_;
}

void AtomicPath::commit() {
  if (done_) return;
  std::error_code ec;
  if (std::filesystem::is_directory(temp_, ec)) {
    // The manifest lets a later --force tell this run's files from a user's.
    std::ofstream manifest(temp_ / output_manifest_name, std::ios::binary);
    manifest << "# Files written by one tidewright run; --force replaces this folder only while\n"
                "# it holds nothing else.\n";
    for (const auto& name : entries_below(temp_)) {
      if (name != output_manifest_name) manifest << name << '\n';
    }
    manifest.close();
    if (!manifest) {
      throw InputError(target_.string(), "cannot be written", "check the disk and permissions");
    }
  }
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

std::string shown_path(const std::filesystem::path& path) {
  std::filesystem::path out;
  for (const auto& part : path) out /= shown_component(part.string());
  return out.string();
}

void install_interrupt_cleanup() {
  struct sigaction action {};
  action.sa_handler = on_interrupt;
  sigemptyset(&action.sa_mask);
  ::sigaction(SIGINT, &action, nullptr);
  ::sigaction(SIGTERM, &action, nullptr);
  ::sigaction(SIGHUP, &action, nullptr);
  // A file-size limit (ulimit -f) then fails the write with EFBIG, which is reported and
  // cleaned up like a full disk, instead of killing the process with a temporary left behind.
  ::signal(SIGXFSZ, SIG_IGN);
}

}  // namespace tidewright
