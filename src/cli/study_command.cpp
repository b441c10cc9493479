// tidewright study SITE.toml --out DIR: the whole job from one site file; and
// tidewright demo: the same on the invented demo harbour.
#include <chrono>
#include <ctime>
#include <iostream>

#include "command.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/study/site_config.hpp"
#include "tidewright/study/study_pipeline.hpp"
#ifdef TIDEWRIGHT_HAVE_DEMO
#include "demo_inputs.hpp"
#endif

namespace tidewright::cli {
namespace {

// The report's date: SOURCE_DATE_EPOCH when set (reproducible builds convention), else today (UTC).
std::string report_date() {
  std::time_t t = std::time(nullptr);
  if (const char* e = std::getenv("SOURCE_DATE_EPOCH")) t = static_cast<std::time_t>(std::strtoll(e, nullptr, 10));
  char buf[16];
  std::tm tm{};
  gmtime_r(&t, &tm);
  std::strftime(buf, sizeof buf, "%Y-%m-%d", &tm);
  return buf;
}

void print_outcome(const study::StudyOutcome& out) {
  std::cout << "tidewright: study written to " << out.out_dir.string() << "\n";
  for (const auto& [stage, s] : out.stage_seconds) {
    std::printf("  %-36s %6.2f s\n", stage.c_str(), s);
  }
  for (const auto& h : out.headline) std::cout << "  " << h << "\n";
  std::cout << "  report: " << out.report.string() << "\n"
            << "Planning estimates of still water only; a licensed coastal engineer must review them against local "
               "codes and datums.\n";
}

study::StudyOutcome run(const study::SiteConfig& site, const std::string& out_dir, const CommonOptions& common,
                        const std::string& command) {
  study::StudyOptions o;
  o.out_dir = out_dir;
  o.force = common.force;
  o.date = report_date();
  o.command = command;
  // How the site file was read (an older spelling of a value): on standard error, like warnings.
  for (const auto& n : site.notes) std::cerr << "tidewright: note: " << n << "\n";
  if (!common.quiet) o.progress = [](const std::string& stage) { std::cout << "tidewright: " << stage << " ..." << std::endl; };
  return study::run_study(site, o);
}

void configure_study(CLI::App& app, CommonOptions& common) {
  auto site = std::make_shared<std::string>();
  auto out = std::make_shared<std::string>();
  app.add_option("SITE", *site, "The site file (TOML, docs/site-file.md)")->required();
  add_out_dir_option(app, *out)->required();
  add_force_flag(app, common);
  add_quiet_flag(app, common);
  app.callback([site, out, &common] {
    const auto config = study::load_site_file(*site);
    const auto outcome =
        run(config, *out, common, "tidewright study " + shell_word(*site) + " --out " + shell_word(*out));
    if (!common.quiet) print_outcome(outcome);
  });
}

const bool study_registered = register_command(
    {"study", "Run the whole chain from one site file into a report folder", 60, configure_study});

#ifdef TIDEWRIGHT_HAVE_DEMO
void configure_demo(CLI::App& app, CommonOptions& common) {
  auto out = std::make_shared<std::string>("tidewright-demo");
  auto small = std::make_shared<bool>(false);
  auto seed = std::make_shared<unsigned long long>(demo::demo_default_seed);
  add_out_dir_option(app, *out)->default_str("tidewright-demo");
  app.add_flag("--small", *small, "A smaller demo (coarser DEM, shorter record): for tests");
  add_seed_option(app, *seed, demo::demo_default_seed);
  add_force_flag(app, common);
  add_quiet_flag(app, common);
  app.callback([out, small, seed, &common] {
    const std::filesystem::path dir(*out);
    if (std::filesystem::exists(dir) && !common.force) {
      throw InputError("--out " + dir.string(), "already exists", "choose another folder or pass --force to replace it");
    }
    std::error_code ec;
    std::filesystem::create_directories(dir, ec);
    if (ec) throw InputError("--out " + dir.string(), "cannot be created: " + ec.message(), "choose a folder you can write to");
    if (!common.quiet) std::cout << "tidewright demo: writing invented inputs to " << (dir / "inputs").string() << std::endl;
    demo::DemoOptions options;
    options.small = *small;
    options.force = true;
    // 2.5 m cells: 2,400 x 1,800 = 4.3 million cells, the "few million" of the demo's design
    // (demo_coast/README.md); the small variant keeps its 20 m cells.
    options.dem_cell_size_m = *small ? 0.0 : 2.5;
    const auto inputs = demo::write_demo_inputs(dir / "inputs", *seed, options);
    if (!common.quiet) std::cout << inputs.summary_text() << std::endl;
    const auto config = study::load_site_file(inputs.site_toml);
    CommonOptions study_common = common;
    study_common.force = true;
    const auto outcome =
        run(config, (dir / "study").string(), study_common, "tidewright demo --out " + shell_word(dir.string()));
    if (!common.quiet) print_outcome(outcome);
  });
}

const bool demo_registered = register_command(
    {"demo", "Generate the invented demo harbour's inputs and run the study on them", 70, configure_demo});
#endif

}  // namespace
}  // namespace tidewright::cli
