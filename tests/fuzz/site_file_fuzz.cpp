// libFuzzer target: the site-file reader on arbitrary bytes. Anything but an InputError is a bug.
#include <cstddef>
#include <cstdint>
#include <filesystem>
#include <fstream>
#include <string>

#include "fuzz_input_file.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/study/site_config.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  static const std::filesystem::path file = fuzz_input_file("site.toml");
  {
    std::ofstream out(file, std::ios::binary | std::ios::trunc);
    out.write(reinterpret_cast<const char*>(data), static_cast<std::streamsize>(size));
  }
  try {
    (void)tidewright::study::load_site_file(file);
  } catch (const tidewright::InputError&) {
  }
  return 0;
}
