#include "plot_output.hpp"

#include <filesystem>

#include "tidewright/common/atomic_output.hpp"
#include "tidewright/common/error.hpp"

namespace tidewright::cli {
namespace {
std::string extension_of(const std::string& path) {
  std::string e = std::filesystem::path(path).extension().string();
  for (auto& c : e) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return e;
}
}  // namespace

void check_plot_path(const std::string& path, bool force) {
  const auto e = extension_of(path);
  if (e != ".svg" && e != ".png") {
    throw InputError("--plot " + path, "has neither a .svg nor a .png extension", "name the file plot.svg or plot.png");
  }
  check_output_path(path, force, "--plot");
}

void write_plot(const report::Canvas& canvas, const std::string& path, bool force) {
  check_plot_path(path, force);
  write_text_file(path, extension_of(path) == ".svg" ? canvas.to_svg() : canvas.to_png(), force, "--plot");
}

}  // namespace tidewright::cli
