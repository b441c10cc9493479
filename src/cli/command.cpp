#include "command.hpp"

#include <algorithm>
#include <cctype>
#include <string_view>
#include <iostream>

#include "tidewright/common/atomic_output.hpp"
#include "tidewright/common/error.hpp"

namespace tidewright::cli {
namespace {
std::vector<Command>& registry() {
  static std::vector<Command> commands;
  return commands;
}
}  // namespace

bool register_command(Command command) {
  registry().push_back(std::move(command));
  return true;
}

std::vector<Command> registered_commands() {
  auto out = registry();
  std::sort(out.begin(), out.end(), [](const Command& a, const Command& b) {
    return a.order != b.order ? a.order < b.order : a.name < b.name;
  });
  return out;
}

void add_force_flag(CLI::App& app, CommonOptions& common) {
  app.add_flag("--force", common.force, "Replace output files or folders that already exist");
}

void add_quiet_flag(CLI::App& app, CommonOptions& common) {
  app.add_flag("-q,--quiet", common.quiet, "Print only errors and the requested outputs");
}

CLI::Option* add_seed_option(CLI::App& app, unsigned long long& seed, unsigned long long default_value) {
  seed = default_value;
  return app.add_option("--seed", seed, "Seed for every random draw; same seed, same numbers")
      ->default_val(default_value);
}

CLI::Option* add_json_option(CLI::App& app, std::string& path) {
  return app.add_option("--json", path, "Write the full result as JSON to FILE ('-': standard output)")
      ->type_name("FILE");
}

CLI::Option* add_csv_option(CLI::App& app, std::string& path) {
  return app.add_option("--csv", path, "Write the result table as CSV to FILE ('-': standard output)")
      ->type_name("FILE");
}

std::string shell_word(const std::string& word) {
  const bool safe = !word.empty() && std::all_of(word.begin(), word.end(), [](char c) {
    return (std::isalnum(static_cast<unsigned char>(c)) != 0) || std::string_view("_@%+=:,./-").find(c) != std::string_view::npos;
  });
  if (safe) return word;
  std::string out = "'";
  for (const char c : word) out += c == '\'' ? std::string("'\\''") : std::string(1, c);
  return out + "'";
}

void check_data_outputs(const std::vector<DataOutput>& outputs, bool force) {
  const char* to_stdout = nullptr;
  for (const auto& o : outputs) {
    if (o.path.empty()) continue;
    if (o.path == stdout_name) {
      if (to_stdout != nullptr) {
        throw InputError(o.option, "sends a second output to standard output after " + std::string(to_stdout),
                         "give one of them a file name");
      }
      to_stdout = o.option;
      continue;
    }
    check_output_path(o.path, force, o.option);
  }
}

void write_data_output(const DataOutput& output, const std::string& text, bool force) {
  if (output.path.empty()) return;
  if (output.path == stdout_name) {
    std::cout << text << std::flush;
    return;
  }
  write_text_file(output.path, text, force, output.option);
}

void write_data_output(const DataOutput& output, const nlohmann::ordered_json& value, bool force) {
  if (output.path == stdout_name) {
    write_data_output(output, value.dump(2) + "\n", force);
    return;
  }
  if (!output.path.empty()) write_json_file(output.path, value, force, output.option);
}

std::ostream& summary_stream(const std::vector<DataOutput>& outputs) {
  const bool piped = std::any_of(outputs.begin(), outputs.end(), [](const DataOutput& o) { return o.path == stdout_name; });
  return piped ? std::cerr : std::cout;
}

CLI::Option* add_out_dir_option(CLI::App& app, std::string& path) {
  return app.add_option("--out", path, "Write all outputs into folder DIR")->type_name("DIR");
}

}  // namespace tidewright::cli
