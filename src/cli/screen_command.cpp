#include "commands.hpp"
#include "envsift/run/run.hpp"
#include "envsift/run/validate.hpp"
#include "options.hpp"
#include "progress_display.hpp"

namespace envsift::cli {

int screen_command(int argc, char** argv) {
  const std::vector<OptionSpec> options = all_screen_options();
  po::options_description d(
      "Sample the layers, then judge each record against the other records of its taxon and rank all\n"
      "records, most suspicious first. Output: the `sample` columns plus `rank` (1 = look at this first),\n"
      "`score` (above 1 = flagged by at least one test), `flags` (tests that fired), `reasons`, and each\n"
      "test's statistic and cutoff. Flags are reasons to look, not proof of error: review flagged records\n"
      "before removing any.\n\nOptions",
      100, 50);
  add_declared(d, options, {"points", "out"});
  add_run_switches(d);
  po::variables_map vm;
  if (!parse(argc, argv, "screen",
             "--points FILE (--layers RASTER... | --value-columns A,B,...) --out FILE.csv [options]", d, vm))
    return 0;
  ScreenSettings s;
  apply_declared(vm, options, s);
  s.input.reader.require_taxon = !s.input.single_taxon;
  s.command_line = command_line("screen", argc, argv);
  ProgressDisplay progress;
  if (!vm["quiet"].as<bool>()) s.progress = &progress;
  report(run_screen(s), vm, s.outputs.out + " (flags are for review, not automatic removal)");
  return 0;
}

}  // namespace envsift::cli
