// What a caller outside terrain needs of GDAL's console, without GDAL's headers: its own
// messages silenced while terrain works (terrain reports GDAL's failures itself, in one
// InputError line with GDAL's last message), and its terminal progress bar.
#pragma once

#include <functional>

namespace tidewright::terrain {

// GDAL's own console messages are off for this object's lifetime.
class QuietGdalMessages {
 public:
  QuietGdalMessages();
  ~QuietGdalMessages();
  QuietGdalMessages(const QuietGdalMessages&) = delete;
  QuietGdalMessages& operator=(const QuietGdalMessages&) = delete;
};

// A progress callback (fraction 0..1) that draws GDAL's terminal progress bar on stdout.
[[nodiscard]] std::function<void(double)> terminal_progress();

}  // namespace tidewright::terrain
