#include <iostream>

#include "commands.hpp"
#include "envsift/errors.hpp"
#include "options.hpp"

namespace envsift::cli {

int screen_command(int argc, char** argv) {
  ScreenOptions o;
  po::options_description d(
      "Sample the layers, then judge each record against the other records of its taxon and rank all\n"
      "records, most suspicious first. Output: the `sample` columns plus `rank` (1 = look at this first),\n"
      "`score` (above 1 = flagged by at least one test), `flags` (tests that fired) and `reasons`.\n"
      "Flags are reasons to look, not proof of error: review flagged records before removing any.\n\nOptions",
      100, 50);
  add_sampling_options(d, o);
  d.add_options()
    ("z-cutoff", po::value(&o.robust_z.cutoff)->default_value(o.robust_z.cutoff)->value_name("Z"),
     "flag a record whose value on a layer is more than Z scaled MADs from its taxon's median. 3 is "
     "'very conservative' in Leys et al. (2013); 2.5 flags more good records")
    ("min-records", po::value(&o.robust_z.min_records)->default_value(o.robust_z.min_records)->value_name("N"),
     "a taxon needs at least N values on a layer to be judged on it; smaller taxa get too_few_records")
    ("order", po::value<std::string>()->default_value("input")->value_name("input|rank"),
     "row order of the output: input order, or by rank (unscored records last)");
  po::variables_map vm;
  if (!parse(argc, argv, "screen", "--points FILE --layers RASTER... --out FILE.csv [options]", d, vm)) return 0;
  finish_sampling_options(vm, o);
  o.reader.require_taxon = true;
  const std::string order = vm["order"].as<std::string>();
  if (order == "rank") o.order = RowOrder::rank;
  else if (order != "input") throw UsageError("--order must be input or rank, not '" + order + "'");
  if (!(o.robust_z.cutoff > 0)) throw UsageError("--z-cutoff must be a positive number");
  if (o.robust_z.min_records < 3) throw UsageError("--min-records must be at least 3");
  const RunSummary summary = run_screen(o);
  std::cerr << summary.line() << "\nenvsift: wrote " << o.out
            << " (flags are for review, not automatic removal)\n";
  return 0;
}

}  // namespace envsift::cli
