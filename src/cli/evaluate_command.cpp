#include <cmath>
#include <cstdio>
#include <type_traits>
#include <iostream>

#include "commands.hpp"
#include "envsift/detect/test_registry.hpp"
#include "envsift/errors.hpp"
#include "envsift/evaluate/evaluation.hpp"
#include "envsift/run/validate.hpp"
#include "envsift/settings/run_options.hpp"
#include "options.hpp"

namespace envsift::cli {
namespace {

// The screen's options an evaluation takes: its layers and how they are sampled, and every test option.
std::vector<OptionSpec> screen_options_for_evaluation() {
  std::vector<OptionSpec> options;
  for (const auto& group : {input_run_options(), sampling_run_options()})
    for (const auto& o : group)
      if (o.name == "layers" || o.name == "method" || o.name == "assume-crs" || o.name == "threads") options.push_back(o);
  for (const auto& o : test_run_options()) options.push_back(o);
  return options;
}

// A LOW-HIGH option into two numbers (whole ones for a count); its bounds are validate()'s.
template <class Number>
void read_range(const po::variables_map& vm, const std::string& name, const std::string& rule, Number& low, Number& high) {
  const std::string text = vm[name].as<std::string>();
  double a = 0, b = 0;
  char rest = 0;
  if (std::sscanf(text.c_str(), "%lf-%lf%c", &a, &b, &rest) != 2 || !(a >= 0) || !(b >= 0) ||
      (std::is_integral<Number>::value && (a != std::floor(a) || b != std::floor(b) || b > 1e12)))
    throw UsageError("--" + name + " must be " + rule + ", not '" + text + "'");
  low = static_cast<Number>(a), high = static_cast<Number>(b);
}

}  // namespace

int evaluate_command(int argc, char** argv) {
  EvaluateOptions e;
  std::string out;
  ScreenSettings& o = e.screen;
  const std::vector<OptionSpec> screen_options = screen_options_for_evaluation();
  po::options_description d(
      "Measure what the tests find on your own rasters: build virtual taxa with a known response to every\n"
      "layer (Gaussian, random optimum and width; records drawn in proportion to suitability), put known\n"
      "georeferencing errors into a share of each taxon's records (relocation, latitude/longitude swap, sign\n"
      "flips, decimal shift) and batches of errors at a few wrong places into a share of the taxa, screen them with the same options as `screen`, and write per test and for the\n"
      "combined verdict: recall on errors into unsuitable environment and on all errors, the false-flag rate\n"
      "on clean records, precision, and the average precision of the ranking. Seeded: the same options give\n"
      "the same table. Each measure is given for slices of the records: all, single errors, relocations,\n"
      "batches, second populations, and taxa by their number of distinct places.\n\nOptions",
      100, 50);
  d.add_options()
    ("out", po::value(&out)->required()->value_name("FILE.csv"), "where to write the table (CSV)")
    ("taxa", po::value(&e.taxa.taxa)->default_value(e.taxa.taxa)->value_name("N"), "virtual taxa to build")
    ("taxon-records", po::value<std::string>()->default_value("12-3000")->value_name("MIN-MAX"),
     "records per taxon, log-uniform between MIN and MAX")
    ("response-width", po::value<std::string>()->default_value("0.1-0.4")->value_name("LOW-HIGH"),
     "width of each taxon's Gaussian response to a layer, in SDs of that layer over the study area, uniform "
     "between LOW and HIGH (broad responses give taxa the skew of the landscape)")
    ("two-population-share", po::value(&e.taxa.two_population_share)->default_value(e.taxa.two_population_share, number_text(e.taxa.two_population_share))->value_name("S"),
     "share of the taxa with two populations in different environments (30-50 % of records in the second)")
    ("error-share", po::value(&e.error_share)->default_value(e.error_share, number_text(e.error_share))->value_name("S"),
     "share of each taxon's records given a single error (at least one)")
    ("batch-taxa-share", po::value(&e.batch_taxa_share)->default_value(e.batch_taxa_share, number_text(e.batch_taxa_share))->value_name("S"),
     "share of the taxa that also get a batch of errors: records moved together to one to a few wrong places")
    ("batch-share", po::value<std::string>()->default_value("0.12-0.25")->value_name("LOW-HIGH"),
     "a batch holds this share of its taxon's records, uniform between LOW and HIGH")
    ("batch-places", po::value<std::string>()->default_value("1-3")->value_name("MIN-MAX"),
     "a batch's records are spread over this many wrong places (random cells)")
    ("unsuitable-below", po::value(&e.unsuitable_below)->default_value(e.unsuitable_below, number_text(e.unsuitable_below))->value_name("S"),
     "an error moved the record into unsuitable environment when the taxon's suitability there is below S "
     "(suitability is 1 at the optimum)")
    ("study-cells", po::value(&e.study_cells)->default_value(e.study_cells)->value_name("N"),
     "candidate cells, a seeded random choice when the first layer has more")
    ("keep-screened", po::value(&e.keep_screened)->value_name("FILE.csv"),
     "also keep the screen output of the virtual records (their column virtual_error names each error)");
  add_declared(d, screen_options, {"layers"});
  po::variables_map vm;
  if (!parse(argc, argv, "evaluate", "--layers RASTER... --out FILE.csv [options]", d, vm)) return 0;
  apply_declared(vm, screen_options, o);
  o.sampling.discs = false;
  o.command_line = command_line("evaluate", argc, argv);
  // before the virtual taxa are built, which takes a while (run_screen checks the rest)
  validate_tests(o.tests, test_context(o.input));
  check_options(sampling_options(), o.sampling);
  apply_process_settings(o.sampling);
  e.taxa.seed = o.tests.seed;
  read_range(vm, "taxon-records", "MIN-MAX with 3 <= MIN <= MAX, e.g. 12-3000", e.taxa.min_records, e.taxa.max_records);
  read_range(vm, "response-width", "LOW-HIGH with 0 < LOW <= HIGH, e.g. 0.1-0.4", e.taxa.width_low, e.taxa.width_high);
  read_range(vm, "batch-share", "LOW-HIGH with 0 < LOW <= HIGH <= 0.5, e.g. 0.12-0.25", e.batch_share_low, e.batch_share_high);
  read_range(vm, "batch-places", "MIN-MAX with 1 <= MIN <= MAX, e.g. 1-3", e.batch_places_low, e.batch_places_high);
  validate(e);

  const Evaluation result = run_evaluation(e);
  write_evaluation(out, result);
  for (const auto& w : result.screen.warnings) std::cerr << "envsift: note: " << w << "\n";
  std::fprintf(stderr, "envsift: %zu virtual taxa, %zu records, %zu errors (%zu in batches; %zu fell off the layers)\n",
               result.taxa, result.records, result.errors, result.batch_errors, result.errors_off_layers);
  std::fprintf(stderr, "%-20s %-18s %9s %9s %9s %9s %9s\n", "test", "slice", "rec.unsu", "rec.all", "false", "precis.", "avg.prec");
  for (const auto& r : result.rows)
    if (r.slice == "all" || r.test == "combined")
      std::fprintf(stderr, "%-20s %-18s %9.4f %9.4f %9.4f %9.4f %9.4f\n", r.test.c_str(), r.slice.c_str(),
                   r.metrics.recall_unsuitable, r.metrics.recall_all, r.metrics.false_flag_rate, r.metrics.precision,
                   r.metrics.average_precision);
  std::cerr << "envsift: wrote " << out << "\n";
  return 0;
}

}  // namespace envsift::cli
