// `--plot FILE`: one drawing to an .svg or .png file, written whole or not at all.
#pragma once

#include <string>

#include "tidewright/report/canvas.hpp"

namespace tidewright::cli {

// Throws InputError for another extension (checked before any work by check_plot_path).
void check_plot_path(const std::string& path, bool force);
void write_plot(const report::Canvas& canvas, const std::string& path, bool force);

}  // namespace tidewright::cli
