// The whole job from one site file: record -> fit -> projection -> local -> planning -> maps
// -> report, written into one folder that appears whole or not at all.
#pragma once

#include <filesystem>
#include <functional>
#include <string>
#include <vector>

#include "tidewright/study/site_config.hpp"

namespace tidewright::study {

struct StudyOptions {
  std::filesystem::path out_dir;
  bool force = false;
  std::string date;     // ISO 8601 date printed in the report (the caller picks it)
  std::string command;  // the command line, for the outputs' records
  std::function<void(const std::string& stage)> progress;  // may be empty
};

struct StudyOutcome {
  std::filesystem::path out_dir;
  std::filesystem::path report;
  std::vector<std::string> files;  // relative to out_dir
  std::vector<std::pair<std::string, double>> stage_seconds;
  std::vector<std::string> headline;  // a few lines of answers for the terminal
};

[[nodiscard]] StudyOutcome run_study(const SiteConfig& site, const StudyOptions& options);

}  // namespace tidewright::study
