// The module order of DEVELOPERS.md ("Layout"), checked on the source text: a module's headers
// and sources include only modules before it, and the public headers include no GDAL, toml++ or
// cairo header (those stay private to the modules that use them). The build enforces the same
// order by linking (one library per module); this test names the offending line.
#include <gtest/gtest.h>

#include <algorithm>
#include <array>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

namespace {

namespace fs = std::filesystem;

// DEVELOPERS.md, "Layout": common → record → extremes → climate → local → planning → terrain →
// report → study → cli.
constexpr std::array<const char*, 10> module_order = {
    "common", "record", "extremes", "climate", "local", "planning",
    "terrain", "report", "study", "cli"};

int rank_of(const std::string& module) {
  const auto* at = std::find(module_order.begin(), module_order.end(), module);
  return at == module_order.end() ? -1 : static_cast<int>(at - module_order.begin());
}

struct Include {
  std::string file;
  int line = 0;
  std::string text;
  std::string target;  // the included path
};

// The path of an #include line ("a/b.hpp" or <a/b.hpp>), or empty. Plain string scanning:
// <regex> trips GCC 12's -Wmaybe-uninitialized under the sanitizer build.
std::string included_path(const std::string& text) {
  std::size_t i = text.find_first_not_of(" \t");
  if (i == std::string::npos || text[i] != '#') return "";
  i = text.find_first_not_of(" \t", i + 1);
  if (i == std::string::npos || text.compare(i, 7, "include") != 0) return "";
  i = text.find_first_of("<\"", i + 7);
  if (i == std::string::npos) return "";
  const std::size_t end = text.find_first_of(">\"", i + 1);
  return end == std::string::npos ? "" : text.substr(i + 1, end - i - 1);
}

// The module a "tidewright/<module>/..." path names, or empty.
std::string module_of(const std::string& path) {
  const std::string prefix = "tidewright/";
  if (path.compare(0, prefix.size(), prefix) != 0) return "";
  const std::size_t slash = path.find('/', prefix.size());
  return slash == std::string::npos ? "" : path.substr(prefix.size(), slash - prefix.size());
}

std::vector<Include> includes_of(const fs::path& file) {
  std::vector<Include> found;
  std::ifstream in(file);
  std::string text;
  int line = 0;
  while (std::getline(in, text)) {
    ++line;
    if (auto path = included_path(text); !path.empty()) {
      found.push_back({file.string(), line, text, path});
    }
  }
  return found;
}

// Every header and source of a module with the module's name: include/tidewright/<m>/ and src/<m>/.
std::vector<std::pair<std::string, fs::path>> module_files() {
  const fs::path root = TIDEWRIGHT_SOURCE_DIR;
  std::vector<std::pair<std::string, fs::path>> files;
  for (const auto* top : {"include/tidewright", "src"}) {
    for (const auto& dir : fs::directory_iterator(root / top)) {
      if (!dir.is_directory()) continue;
      for (const auto& entry : fs::directory_iterator(dir.path())) {
        const auto ext = entry.path().extension();
        if (ext == ".hpp" || ext == ".cpp") {
          files.emplace_back(dir.path().filename().string(), entry.path());
        }
      }
    }
  }
  return files;
}

std::vector<std::string> order_violations() {
  std::vector<std::string> problems;
  for (const auto& [module, file] : module_files()) {
    const int rank = rank_of(module);
    if (rank < 0) {
      problems.push_back(file.string() + ": module '" + module + "' is not in the order");
      continue;
    }
    for (const auto& inc : includes_of(file)) {
      const std::string used_module = module_of(inc.target);
      if (used_module.empty()) continue;
      if (rank_of(used_module) > rank) {
        problems.push_back(inc.file + ":" + std::to_string(inc.line) + ": " + module +
                           " includes " + used_module + ", which comes after it: " + inc.text);
      }
    }
  }
  return problems;
}

TEST(ModuleOrder, NoModuleIncludesALaterOne) {
  const auto problems = order_violations();
  std::string all;
  for (const auto& p : problems) all += p + "\n";
  EXPECT_TRUE(problems.empty()) << all;
}

TEST(ModuleOrder, PublicHeadersKeepGdalTomlAndCairoPrivate) {
  const std::vector<std::string> private_prefixes = {"gdal", "ogr", "cpl_", "toml++/", "toml.h",
                                                     "cairo", "proj.h", "proj/"};
  const fs::path root = TIDEWRIGHT_SOURCE_DIR;
  std::vector<std::string> problems;
  std::size_t headers = 0;
  for (const auto& entry : fs::recursive_directory_iterator(root / "include/tidewright")) {
    if (entry.path().extension() != ".hpp") continue;
    ++headers;
    for (const auto& inc : includes_of(entry.path())) {
      const bool is_private =
          std::any_of(private_prefixes.begin(), private_prefixes.end(),
                      [&](const std::string& p) { return inc.target.compare(0, p.size(), p) == 0; });
      if (is_private) {
        problems.push_back(inc.file + ":" + std::to_string(inc.line) + ": " + inc.text);
      }
    }
  }
  EXPECT_GT(headers, 40U) << "the scan found too few public headers; is the path right?";
  std::string all;
  for (const auto& p : problems) all += p + "\n";
  EXPECT_TRUE(problems.empty()) << all;
}

// Each outside library's headers appear only in the sources of the module that owns it: GDAL,
// OGR and PROJ in terrain, toml++ in study, cairo in report. So no other module (the command
// line and the study included) can call GDAL around terrain's checked wrappers.
TEST(ModuleOrder, OutsideLibrariesStayInTheirOwnModule) {
  const std::vector<std::pair<std::string, std::string>> owner_of_prefix = {
      {"gdal", "terrain"}, {"ogr", "terrain"}, {"cpl_", "terrain"}, {"proj.h", "terrain"}, {"proj/", "terrain"},
      {"toml++/", "study"}, {"toml.h", "study"}, {"cairo", "report"}};
  const fs::path root = TIDEWRIGHT_SOURCE_DIR;
  std::vector<std::string> problems;
  std::size_t sources = 0;
  for (const auto& entry : fs::recursive_directory_iterator(root / "src")) {
    const auto ext = entry.path().extension();
    if (ext != ".cpp" && ext != ".hpp") continue;
    ++sources;
    const std::string module = entry.path().parent_path().filename().string();
    for (const auto& inc : includes_of(entry.path())) {
      for (const auto& [prefix, owner] : owner_of_prefix) {
        if (inc.target.compare(0, prefix.size(), prefix) == 0 && module != owner) {
          problems.push_back(inc.file + ":" + std::to_string(inc.line) + ": " + module + " includes " + inc.text +
                             ", which belongs to " + owner);
        }
      }
    }
  }
  EXPECT_GT(sources, 60U) << "the scan found too few sources; is the path right?";
  std::string all;
  for (const auto& p : problems) all += p + "\n";
  EXPECT_TRUE(problems.empty()) << all;
}

// The check itself can fail: an upward include in a scratch file is caught by the same rule.
TEST(ModuleOrder, TheRuleCatchesAnUpwardInclude) {
  const fs::path dir = fs::temp_directory_path() / "tidewright_module_order_probe";
  fs::create_directories(dir);
  const fs::path probe = dir / "probe.hpp";
  std::ofstream(probe) << "#pragma once\n#include \"tidewright/study/site_config.hpp\"\n";
  const auto found = includes_of(probe);
  fs::remove_all(dir);
  ASSERT_EQ(found.size(), 1U);
  EXPECT_EQ(module_of(found[0].target), "study");
  EXPECT_GT(rank_of(module_of(found[0].target)), rank_of("record"));
  EXPECT_EQ(included_path("#  include <gdal_priv.h>"), "gdal_priv.h");
  EXPECT_EQ(included_path("// #include \"x.hpp\""), "");
}

}  // namespace
