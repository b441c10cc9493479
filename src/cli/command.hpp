// The subcommand registry and the conventions every subcommand shares. A subcommand lives in
// one file src/cli/<name>_command.cpp that calls register_command() from a static initialiser;
// main.cpp adds every registered command to the application, in `order`.
#pragma once

#include <CLI/CLI.hpp>
#include <functional>
#include <nlohmann/json.hpp>
#include <ostream>
#include <string>
#include <vector>

namespace tidewright::cli {

// Options that mean the same in every subcommand.
struct CommonOptions {
  bool quiet = false;  // --quiet: only errors and the requested outputs
  bool force = false;  // --force: replace existing output files or folders
};

struct Command {
  std::string name;
  std::string summary;  // one line for `tidewright --help`
  int order = 100;      // position in the help listing
  // Adds the command's options to `app` and sets its callback. The callback throws
  // InputError / ComputationError for the caller to turn into an exit code.
  std::function<void(CLI::App& app, CommonOptions& common)> configure;
};

bool register_command(Command command);
[[nodiscard]] std::vector<Command> registered_commands();  // sorted by order, then name

// The seed used when --seed is not given, so that two runs agree by default.
inline constexpr unsigned long long default_seed = 20261201ULL;

// Shared options, so their names and help texts are decided once.
void add_force_flag(CLI::App& app, CommonOptions& common);
void add_quiet_flag(CLI::App& app, CommonOptions& common);
CLI::Option* add_seed_option(CLI::App& app, unsigned long long& seed,
                             unsigned long long default_value = default_seed);
CLI::Option* add_json_option(CLI::App& app, std::string& path);
CLI::Option* add_csv_option(CLI::App& app, std::string& path);
CLI::Option* add_out_dir_option(CLI::App& app, std::string& path);

// Data outputs (--json, --csv) given as "-" go to standard output, so they can be piped; the
// printed summary then goes to standard error (unless --quiet). At most one output can be "-".
inline constexpr const char* stdout_name = "-";
struct DataOutput {
  std::string path;
  const char* option;
};
// check_output_path for each given output, "-" accepted; InputError when two are "-".
void check_data_outputs(const std::vector<DataOutput>& outputs, bool force);
// Writes to the file (atomically) or, for "-", to standard output.
void write_data_output(const DataOutput& output, const std::string& text, bool force);
void write_data_output(const DataOutput& output, const nlohmann::ordered_json& value, bool force);
// Where the human summary goes: standard error when one of the outputs is "-".
[[nodiscard]] std::ostream& summary_stream(const std::vector<DataOutput>& outputs);

// A word as a POSIX shell reads it back: unchanged when it holds only characters no shell treats
// specially, else in single quotes (a quote inside written '\''). For recorded command lines
// that can be pasted back.
[[nodiscard]] std::string shell_word(const std::string& word);

}  // namespace tidewright::cli
