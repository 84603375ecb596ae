// `envsift estimate`: the peak memory of a screen, from the record count and the layers, before
// anything is read — so that a cluster job (scripts/cluster/submit-slurm) can ask for what the run
// will need. The same estimate a screen prints with --timings (settings/memory_estimate.hpp).
#include <iostream>

#include <omp.h>

#include "commands.hpp"
#include "envsift/errors.hpp"
#include "envsift/run_summary.hpp"
#include "envsift/sample/raster_stack.hpp"
#include "envsift/detect/landscape.hpp"
#include "envsift/settings/memory_estimate.hpp"
#include "envsift/option_spec.hpp"
#include "options.hpp"

namespace envsift::cli {

int estimate_command(int argc, char** argv) {
  std::string records_text, taxa_text = "0", memory_limit_text = std::to_string(SamplingSettings{}.memory_limit_mb);
  std::vector<std::string> layers;
  bool discs = false, no_landscape = false, report = false, gis = false;
  std::string threads_text = std::to_string(omp_get_num_procs());
  po::options_description d(
      "Print the peak memory (MB, on stdout) that 'envsift screen' needs for RECORDS records on these layers:\n"
      "the estimate a screen prints with --timings, meant as an upper bound. A screen with --shard I/N reads\n"
      "every record, so each shard needs about this much too.\n\n"
      "Options",
      100, 50);
  d.add_options()
    ("records", po::value(&records_text)->required()->value_name("N"), "records in the points file")
    ("layers", po::value(&layers)->required()->multitoken()->value_name("FILE..."), "the layers the screen samples")
    ("taxa", po::value(&taxa_text)->value_name("K"), "taxa among them (default: one per 500 records)")
    ("discs", po::bool_switch(&discs), "the records have uncertainty discs (a coordinateUncertaintyInMeters column)")
    ("no-landscape", po::bool_switch(&no_landscape), "the screen does not run the landscape test")
    ("memory-limit", po::value(&memory_limit_text)->value_name("MB"), "the screen's --memory-limit")
    ("threads", po::value(&threads_text)->value_name("N"), "the screen's --threads (default: this machine's cores)")
    ("report", po::bool_switch(&report), "the screen writes an HTML report (--report)")
    ("gis", po::bool_switch(&gis), "the screen writes a GeoPackage or GeoJSON (--gis)")
    ("help,h", "show this help");
  po::variables_map vm;
  if (!parse(argc, argv, "estimate", "--records N --layers FILE... [options]", d, vm, nullptr, &d)) return 0;
  // a trillion records is far beyond any collection; beyond it the byte counts would overflow
  constexpr unsigned long long kMostRecords = 1'000'000'000'000ull;
  const std::size_t records = parse_whole("records", records_text), taxa = parse_whole("taxa", taxa_text),
                    memory_limit = parse_whole("memory-limit", memory_limit_text);
  if (records == 0 || records > kMostRecords)
    throw UsageError("--records must be between 1 and " + with_thousands(kMostRecords) + ", not " + records_text);
  if (memory_limit < 16) throw UsageError("--memory-limit must be at least 16, not " + memory_limit_text);
  RasterStack stack(expand_layer_arguments(layers));
  RunShape shape;
  shape.records = records;
  shape.taxa = taxa ? taxa : std::max<std::size_t>(1, records / 500);
  shape.layers = stack.layers().size();
  for (const auto& l : stack.layers()) {
    shape.float_layers += l.float_cells;
    shape.raster_bytes += static_cast<std::size_t>(l.width) * static_cast<std::size_t>(l.height) * (l.float_cells ? 4 : 8);
  }
  shape.discs = discs;
  shape.threads = parse_whole("threads", threads_text);
  if (shape.threads == 0 || shape.threads > kMaxThreads)
    throw UsageError("--threads must be between 1 and " + std::to_string(kMaxThreads) + ", not " + threads_text);
  shape.report = report, shape.gis = gis;
  shape.landscape_cells = no_landscape ? 0 : LandscapeSettings{}.cells;
  SamplingSettings sampling;
  sampling.memory_limit_mb = memory_limit;
  const MemoryEstimate e = estimate_memory(shape, sampling);
  std::cerr << "envsift: " << with_thousands(records) << " records on " << shape.layers << " layers: " << e.words() << "\n";
  std::cout << ((e.peak() + (std::size_t(1) << 19)) >> 20) << "\n";  // MB, as the words round it
  return 0;
}

}  // namespace envsift::cli
