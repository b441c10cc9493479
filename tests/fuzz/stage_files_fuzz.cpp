// libFuzzer target: the files later stages read back (members CSV, fit JSON, quantile table)
// and the projection's scenario files (forcing, CO2, warming CSV) on arbitrary bytes.
// Anything but an InputError is a bug.
#include <cstddef>
#include <cstdint>
#include <filesystem>
#include <fstream>
#include <string>

#include "fuzz_input_file.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/local/quantile_table.hpp"
#include "tidewright/study/projection_stage.hpp"
#include "tidewright/study/stage_files.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  static const std::filesystem::path file = fuzz_input_file("stage-file");
  {
    std::ofstream out(file, std::ios::binary | std::ios::trunc);
    out.write(reinterpret_cast<const char*>(data), static_cast<std::streamsize>(size));
  }
  try {
    (void)tidewright::study::read_members_csv(file);
  } catch (const tidewright::InputError&) {
  }
  try {
    (void)tidewright::study::read_fit_json(file);
  } catch (const tidewright::InputError&) {
  }
  for (const auto source : {tidewright::study::ScenarioSource::forcing_csv, tidewright::study::ScenarioSource::co2_csv,
                            tidewright::study::ScenarioSource::temperature_csv}) {
    tidewright::study::ProjectionRequest request;
    request.source = source;
    request.path = file;
    try {
      (void)tidewright::study::load_scenario(request, "fuzz");
    } catch (const tidewright::InputError&) {
    }
  }
  try {
    (void)tidewright::local::parse_quantile_table(std::string(reinterpret_cast<const char*>(data), size), "fuzz.csv");
  } catch (const tidewright::InputError&) {
  }
  return 0;
}
