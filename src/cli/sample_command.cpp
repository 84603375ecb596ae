#include <iostream>

#include "commands.hpp"
#include "options.hpp"
#include "progress_display.hpp"

namespace envsift::cli {

int sample_command(int argc, char** argv) {
  SampleOptions o;
  po::options_description d(
      "Sample every raster layer at every record's coordinates. Output: every input record once, in input\n"
      "order, with its original columns, one column per layer and a `status` column (`ok` or reason codes\n"
      "such as outside_layer:NAME, nodata:NAME, coord_missing).\n\nOptions",
      100, 50);
  add_sampling_options(d, o);
  po::variables_map vm;
  if (!parse(argc, argv, "sample", "--points FILE --layers RASTER... --out FILE.csv [options]", d, vm)) return 0;
  finish_sampling_options(vm, o);
  ProgressDisplay progress;
  if (!vm["quiet"].as<bool>()) o.progress = &progress;
  const RunSummary summary = run_sample(o);
  write_manifest_if_asked(vm, "sample", argc, argv, o, 0, summary);
  report(summary, vm, o.out);
  return 0;
}

}  // namespace envsift::cli
