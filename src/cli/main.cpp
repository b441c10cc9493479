// tidewright: the command-line entry point. Parsing and printing only; the work is done by
// the library. Exit codes: 0 success, 1 internal error, 2 bad input or usage, 3 a computation
// that could not give a trustworthy result.
#include <CLI/CLI.hpp>
#include <exception>
#include <iostream>
#include <string>

#include "command.hpp"
#include "tidewright/common/atomic_output.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/report/cautions.hpp"
#include "tidewright/version.hpp"

namespace {

int fail(int code, const std::string& message) {
  std::cerr << "tidewright: error: " << message << '\n';
  return code;
}

// CLI11's messages end without advice; add where to look.
std::string usage_message(const CLI::ParseError& e) {
  std::string what = e.what();
  while (!what.empty() && (what.back() == '\n' || what.back() == ' ')) what.pop_back();
  return "usage: " + what + "; run 'tidewright --help' (or 'tidewright COMMAND --help')";
}

}  // namespace

int main(int argc, char** argv) {
  using namespace tidewright;
  install_interrupt_cleanup();

  CLI::App app{
      "tidewright " + std::string(version_string) +
      " - coastal sea-level rise and flood-exceedance planning:\n"
      "extreme still-water fits, sea-level projections, allowances and flood maps."};
  app.name("tidewright");
  app.set_version_flag("--version", std::string("tidewright ") + version_string);
  app.footer("Cautions:\n" + report::cautions_text("  - ", 92) +
             "\nRun 'tidewright COMMAND --help' for the options of one command.");
  app.require_subcommand(0, 1);

  cli::CommonOptions common;
  for (const auto& command : cli::registered_commands()) {
    CLI::App* sub = app.add_subcommand(command.name, command.summary);
    // One line, not the whole block on every page: the cautions are on 'tidewright --help'.
    sub->footer("Results are planning estimates for review by a licensed coastal engineer against local codes; "
                "'tidewright --help' lists the cautions.");
    command.configure(*sub, common);
  }

  try {
    app.parse(argc, argv);
    if (app.get_subcommands().empty()) {
      std::cout << app.help();
    }
    return 0;
  } catch (const CLI::CallForHelp& e) {
    return app.exit(e);
  } catch (const CLI::CallForAllHelp& e) {
    return app.exit(e);
  } catch (const CLI::CallForVersion& e) {
    return app.exit(e);
  } catch (const CLI::ParseError& e) {
    return fail(2, usage_message(e));
  } catch (const InputError& e) {
    return fail(2, e.what());
  } catch (const ComputationError& e) {
    return fail(3, e.what());
  } catch (const std::bad_alloc&) {
    return fail(1, "out of memory; try a smaller input or a machine with more memory");
  } catch (const std::exception& e) {
    return fail(1, std::string("internal error: ") + e.what() +
                       "; please report this with the command line that caused it");
  }
}
