#include "tidewright/terrain/gdal_messages.hpp"

#include <cpl_error.h>
#include <gdal.h>

namespace tidewright::terrain {

QuietGdalMessages::QuietGdalMessages() { CPLPushErrorHandler(CPLQuietErrorHandler); }
QuietGdalMessages::~QuietGdalMessages() { CPLPopErrorHandler(); }

std::function<void(double)> terminal_progress() {
  return [](double fraction) { GDALTermProgress(fraction, nullptr, nullptr); };
}

}  // namespace tidewright::terrain
