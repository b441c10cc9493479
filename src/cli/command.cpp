#include "command.hpp"

#include <algorithm>

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

CLI::Option* add_seed_option(CLI::App& app, unsigned long long& seed) {
  seed = default_seed;
  return app.add_option("--seed", seed, "Seed for every random draw; same seed, same numbers")
      ->default_val(default_seed);
}

CLI::Option* add_json_option(CLI::App& app, std::string& path) {
  return app.add_option("--json", path, "Write the full result as JSON to FILE")
      ->type_name("FILE");
}

CLI::Option* add_csv_option(CLI::App& app, std::string& path) {
  return app.add_option("--csv", path, "Write the result table as CSV to FILE")->type_name("FILE");
}

CLI::Option* add_out_dir_option(CLI::App& app, std::string& path) {
  return app.add_option("--out", path, "Write all outputs into folder DIR")->type_name("DIR");
}

}  // namespace tidewright::cli
