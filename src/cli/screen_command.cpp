#include <iostream>
#include <sstream>

#include "commands.hpp"
#include "envsift/errors.hpp"
#include "options.hpp"
#include "test_options.hpp"
#include "progress_display.hpp"

namespace envsift::cli {

int screen_command(int argc, char** argv) {
  ScreenOptions o;
  TestChoices choices;
  std::string value_columns;
  po::options_description d(
      "Sample the layers, then judge each record against the other records of its taxon and rank all\n"
      "records, most suspicious first. Output: the `sample` columns plus `rank` (1 = look at this first),\n"
      "`score` (above 1 = flagged by at least one test), `flags` (tests that fired), `reasons`, and each\n"
      "test's statistic and cutoff. Flags are reasons to look, not proof of error: review flagged records\n"
      "before removing any.\n\nOptions",
      100, 50);
  add_sampling_options(d, o, false);
  add_test_options(d, o, choices);
  d.add_options()
    ("value-columns", po::value(&value_columns)->value_name("A,B,..."),
     "screen values already in the points file (these columns) instead of sampling --layers")
    ("single-taxon", po::bool_switch(&o.single_taxon), "treat the whole file as one taxon (no taxon column needed)")
    ("dem", po::value(&o.elevation.dem_layer)->value_name("LAYER"),
     "the layer holding elevation in metres: compare each record's reported elevation with it "
     "(flag elevation_mismatch)")
    ("elevation-tolerance", po::value(&o.elevation.tolerance_m)->default_value(o.elevation.tolerance_m)->value_name("M"),
     "flag only when the reported elevation and the DEM's range within the record's uncertainty are more "
     "than M metres apart (DEM error, and label elevations rounded to 50-100 m)")
    ("min-elevation-column", po::value(&o.reader.columns.min_elevation)->default_value(o.reader.columns.min_elevation)->value_name("NAME"),
     "reported minimum elevation (metres, or with a unit: '1200 m', '3900 ft')")
    ("max-elevation-column", po::value(&o.reader.columns.max_elevation)->default_value(o.reader.columns.max_elevation)->value_name("NAME"),
     "reported maximum elevation")
    ("gis", po::value(&o.gis)->value_name("FILE.gpkg|FILE.geojson"),
     "also write every record as a point with all its attributes, for a desktop GIS; a GeoPackage also "
     "gets a layer of the uncertainty discs (polygons)")
    ("report", po::value(&o.report)->value_name("FILE.html"),
     "also write an HTML report for reviewers: one self-contained file (no network, no scripts) with the run "
     "overview, the top suspects, and per taxon its suspects, a map (shaded relief from --dem) and plots of "
     "its values with the cutoffs")
    ("report-taxa", po::value(&o.report_taxa)->default_value(o.report_taxa)->value_name("N"),
     "draw sections for at most N taxa in the report: all when there are no more, else the N whose worst "
     "suspect scores highest (the index lists every taxon); keeps the report quick to open")
    ("summary", po::value(&o.summary)->value_name("FILE.csv"),
     "also write one row per taxon: records, judged, flagged per test and, with --dem, the taxon's robust "
     "elevation band (median ± z-cutoff robust SD over distinct cells) and the records outside it")
    ("shard", po::value<std::string>()->value_name("I/N"),
     "screen only the taxa of shard I of N (0-based; taxa split by a stable hash of their name, the same on "
     "every machine); other records are written with status other_shard. Run I = 0..N-1, then "
     "'envsift merge' the outputs: the result equals one run's, byte for byte")
    ("order", po::value<std::string>()->default_value("input")->value_name("input|rank"),
     "row order of the output: input order, or by rank (unscored records last)");
  po::variables_map vm;
  if (!parse(argc, argv, "screen",
             "--points FILE (--layers RASTER... | --value-columns A,B,...) --out FILE.csv [options]", d, vm))
    return 0;
  finish_sampling_options(vm, o);
  ProgressDisplay progress;
  if (!vm["quiet"].as<bool>()) o.progress = &progress;
  o.value_columns = split_list(value_columns);
  if (o.value_columns.empty() && o.layers.empty()) throw UsageError("give --layers (rasters to sample) or --value-columns");
  if (!o.value_columns.empty() && !o.layers.empty()) throw UsageError("give either --layers or --value-columns, not both");
  o.reader.require_taxon = !o.single_taxon;
  finish_test_options(vm, o, choices);
  const std::string order = vm["order"].as<std::string>();
  if (order == "rank") o.order = RowOrder::rank;
  else if (order != "input") throw UsageError("--order must be input or rank, not '" + order + "'");
  if (vm.count("shard")) {
    const std::string text = vm["shard"].as<std::string>();
    const auto slash = text.find('/');
    try {
      if (slash == std::string::npos) throw std::invalid_argument(text);
      o.shard_index = std::stoul(text.substr(0, slash));
      o.shard_count = std::stoul(text.substr(slash + 1));
    } catch (const std::exception&) {
      throw UsageError("--shard must be I/N, e.g. 0/8, not '" + text + "'");
    }
    if (o.shard_count < 1 || o.shard_index >= o.shard_count)
      throw UsageError("--shard I/N needs 0 <= I < N, not '" + text + "'");
  }
  if (!(o.elevation.tolerance_m > 0)) throw UsageError("--elevation-tolerance must be a positive number of metres");
  o.manifest_json = [&](const RunSummary& s) {
    return manifest_json(make_manifest(vm, "screen", argc, argv, o, o.seed, s));
  };
  const RunSummary summary = run_screen(o);
  write_manifest_if_asked(vm, "screen", argc, argv, o, o.seed, summary);
  report(summary, vm, o.out + " (flags are for review, not automatic removal)");
  return 0;
}

}  // namespace envsift::cli
