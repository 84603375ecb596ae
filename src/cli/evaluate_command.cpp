#include <cstdio>
#include <iostream>

#include <omp.h>

#include "commands.hpp"
#include "envsift/errors.hpp"
#include "envsift/evaluate/evaluation.hpp"
#include "options.hpp"
#include "test_options.hpp"

namespace envsift::cli {

int evaluate_command(int argc, char** argv) {
  EvaluateOptions e;
  ScreenOptions& o = e.screen;
  TestChoices choices;
  po::options_description d(
      "Measure what the tests find on your own rasters: build virtual taxa with a known response to every\n"
      "layer (Gaussian, random optimum and width; records drawn in proportion to suitability), put known\n"
      "georeferencing errors into a share of each taxon's records (relocation, latitude/longitude swap, sign\n"
      "flips, decimal shift), screen them with the same options as `screen`, and write per test and for the\n"
      "combined verdict: recall on errors into unsuitable environment and on all errors, the false-flag rate\n"
      "on clean records, precision, and the average precision of the ranking. Seeded: the same options give\n"
      "the same table.\n\nOptions",
      100, 50);
  d.add_options()
    ("layers", po::value(&o.layers)->multitoken()->required()->value_name("RASTER..."),
     "raster layers (as for screen); the first one's cells are the study area")
    ("out", po::value(&o.out)->required()->value_name("FILE.csv"), "where to write the table (CSV)")
    ("taxa", po::value(&e.taxa.taxa)->default_value(e.taxa.taxa)->value_name("N"), "virtual taxa to build")
    ("taxon-records", po::value<std::string>()->default_value("12-3000")->value_name("MIN-MAX"),
     "records per taxon, log-uniform between MIN and MAX")
    ("response-width", po::value<std::string>()->default_value("0.1-0.4")->value_name("LOW-HIGH"),
     "width of each taxon's Gaussian response to a layer, in SDs of that layer over the study area, uniform "
     "between LOW and HIGH (broad responses give taxa the skew of the landscape)")
    ("two-population-share", po::value(&e.taxa.two_population_share)->default_value(e.taxa.two_population_share)->value_name("S"),
     "share of the taxa with two populations in different environments (30-50 % of records in the second)")
    ("error-share", po::value(&e.error_share)->default_value(e.error_share)->value_name("S"),
     "share of each taxon's records given an error (at least one)")
    ("unsuitable-below", po::value(&e.unsuitable_below)->default_value(e.unsuitable_below)->value_name("S"),
     "an error moved the record into unsuitable environment when the taxon's suitability there is below S "
     "(suitability is 1 at the optimum)")
    ("study-cells", po::value(&e.study_cells)->default_value(e.study_cells)->value_name("N"),
     "candidate cells, a seeded random choice when the first layer has more")
    ("keep-screened", po::value(&e.keep_screened)->value_name("FILE.csv"),
     "also keep the screen output of the virtual records (their column virtual_error names each error)")
    ("method", po::value<std::string>()->default_value("nearest")->value_name("nearest|bilinear"), "as for screen")
    ("assume-crs", po::value(&o.assume_crs)->value_name("CRS"), "as for screen")
    ("threads", po::value<int>()->value_name("N"), "threads to use; results do not depend on it");
  add_test_options(d, o, choices);
  po::variables_map vm;
  if (!parse(argc, argv, "evaluate", "--layers RASTER... --out FILE.csv [options]", d, vm)) return 0;
  finish_test_options(vm, o, choices);
  e.taxa.seed = o.seed;
  o.discs.enabled = false;
  o.method = vm["method"].as<std::string>() == "bilinear" ? Interpolation::bilinear : Interpolation::nearest;
  if (vm.count("threads")) {
    if (vm["threads"].as<int>() < 1) throw UsageError("--threads must be at least 1");
    omp_set_num_threads(vm["threads"].as<int>());
  }
  const std::string range = vm["taxon-records"].as<std::string>();
  unsigned long low = 0, high = 0;
  if (std::sscanf(range.c_str(), "%lu-%lu", &low, &high) != 2 || low < 3 || high < low)
    throw UsageError("--taxon-records must be MIN-MAX with 3 <= MIN <= MAX, e.g. 12-3000, not '" + range + "'");
  e.taxa.min_records = low, e.taxa.max_records = high;
  const std::string widths = vm["response-width"].as<std::string>();
  if (std::sscanf(widths.c_str(), "%lf-%lf", &e.taxa.width_low, &e.taxa.width_high) != 2 || !(e.taxa.width_low > 0) ||
      e.taxa.width_high < e.taxa.width_low)
    throw UsageError("--response-width must be LOW-HIGH with 0 < LOW <= HIGH, e.g. 0.1-0.4, not '" + widths + "'");
  if (e.taxa.taxa < 1) throw UsageError("--taxa must be at least 1");
  if (!(e.error_share > 0 && e.error_share < 0.5)) throw UsageError("--error-share must be above 0 and below 0.5");
  if (!(e.taxa.two_population_share >= 0 && e.taxa.two_population_share <= 1))
    throw UsageError("--two-population-share must be between 0 and 1");
  if (!(e.unsuitable_below > 0 && e.unsuitable_below < 1)) throw UsageError("--unsuitable-below must be between 0 and 1");
  if (e.study_cells < 100) throw UsageError("--study-cells must be at least 100");

  const Evaluation result = run_evaluation(e);
  write_evaluation(o.out, result);
  for (const auto& w : result.screen.warnings) std::cerr << "envsift: note: " << w << "\n";
  std::fprintf(stderr, "envsift: %zu virtual taxa, %zu records, %zu errors (%zu fell off the layers)\n", result.taxa,
               result.records, result.errors, result.errors_off_layers);
  std::fprintf(stderr, "%-20s %9s %9s %9s %9s %9s\n", "test", "rec.unsu", "rec.all", "false", "precis.", "avg.prec");
  for (const auto& r : result.rows)
    std::fprintf(stderr, "%-20s %9.4f %9.4f %9.4f %9.4f %9.4f\n", r.test.c_str(), r.metrics.recall_unsuitable,
                 r.metrics.recall_all, r.metrics.false_flag_rate, r.metrics.precision, r.metrics.average_precision);
  std::cerr << "envsift: wrote " << o.out << "\n";
  return 0;
}

}  // namespace envsift::cli
