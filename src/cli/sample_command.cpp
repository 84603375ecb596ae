#include "commands.hpp"
#include "envsift/run/run.hpp"
#include "envsift/run/validate.hpp"
#include "envsift/settings/run_options.hpp"
#include "options.hpp"
#include "progress_display.hpp"

namespace envsift::cli {

int sample_command(int argc, char** argv) {
  const std::vector<OptionSpec> options = sample_options();
  po::options_description d(
      "Sample every raster layer at every record's coordinates. Output: every input record once, in input\n"
      "order, with its original columns, one column per layer and a `status` column (`ok` or reason codes\n"
      "such as outside_layer:NAME, nodata:NAME, position_empty).\n\nOptions",
      100, 50);
  add_declared(d, options, {"points", "layers", "out"});
  add_run_switches(d);
  po::variables_map vm;
  if (!parse(argc, argv, "sample", "--points FILE --layers RASTER... --out FILE.csv [options]", d, vm)) return 0;
  ScreenSettings s;
  apply_declared(vm, options, s);
  s.command_line = command_line("sample", argc, argv);
  ProgressDisplay progress;
  if (!vm["quiet"].as<bool>()) s.progress = &progress;
  report(run_sample(s), vm, s.outputs.out);
  return 0;
}

}  // namespace envsift::cli
