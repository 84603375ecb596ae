#include "options.hpp"

#include <iostream>
#include <omp.h>
#include <cpl_conv.h>
#include <algorithm>

#include "envsift/errors.hpp"
#include "envsift/write/run_manifest.hpp"
#include <sstream>

namespace envsift::cli {

void add_sampling_options(po::options_description& d, SampleOptions& o, bool layers_required) {
  ColumnNames& c = o.reader.columns;
  auto* layers = po::value(&o.layers)->multitoken()->value_name("RASTER...");
  if (layers_required) layers->required();
  d.add_options()
    ("points", po::value(&o.points)->required()->value_name("FILE"),
     "occurrence records: CSV or TSV with a header line, or a GeoPackage, GeoJSON or Shapefile of points")
    ("layers", layers,
     "raster layers to sample (GeoTIFF or any GDAL raster). Each becomes a column named after its file; "
     "write NAME=PATH to choose the name. Layers may differ in CRS, resolution and extent.")
    ("out", po::value(&o.out)->required()->value_name("FILE.csv"), "where to write the result (CSV)")
    ("method", po::value<std::string>()->default_value("nearest")->value_name("nearest|bilinear"),
     "nearest: the value of the cell the point falls in (what gdallocationinfo reports); bilinear: "
     "weighted from the four nearest cell centres, falling back to nearest at edges and beside nodata")
    ("id-column", po::value(&c.id)->default_value(c.id)->value_name("NAME"), "record identifier column")
    ("taxon-column", po::value(&c.taxon)->default_value(c.taxon)->value_name("NAME"), "taxon name column")
    ("longitude-column", po::value(&c.longitude)->default_value(c.longitude)->value_name("NAME"),
     "longitude column, decimal degrees WGS 84")
    ("latitude-column", po::value(&c.latitude)->default_value(c.latitude)->value_name("NAME"),
     "latitude column, decimal degrees WGS 84")
    ("uncertainty-column", po::value(&c.uncertainty)->default_value(c.uncertainty)->value_name("NAME"),
     "coordinate uncertainty column, metres: each layer is also sampled over every cell within that radius "
     "(columns LAYER_min, LAYER_mean, LAYER_max)")
    ("delimiter", po::value<std::string>()->value_name("CHAR"),
     "field delimiter of a text points file: ',' ';' 'tab' (default: tab for .tsv, else guessed from the header)")
    ("points-layer", po::value(&o.reader.vector_layer)->value_name("NAME"),
     "layer of a multi-layer GeoPackage (default: the first)")
    ("default-uncertainty", po::value(&o.discs.default_radius_m)->default_value(o.discs.default_radius_m)->value_name("M"),
     "uncertainty radius in metres for records that give none (0: sample only their point)")
    ("max-uncertainty", po::value(&o.discs.max_radius_m)->default_value(o.discs.max_radius_m)->value_name("M"),
     "larger uncertainty discs are cut to M metres (cost grows with the disc's area); such records say so "
     "(uncertainty_capped)")
    ("assume-crs", po::value(&o.assume_crs)->value_name("CRS"),
     "CRS for layers that have none, e.g. EPSG:4326 (without it such layers are refused)")
    ("no-discs", po::bool_switch(), "ignore coordinate uncertainty: sample and judge each record at its point only")
    ("threads", po::value<int>()->value_name("N"), "threads to use (default: all cores); results do not depend on it")
    ("block-cache-mb", po::value(&o.cache_megabytes)->default_value(o.cache_megabytes)->value_name("MB"),
     "memory for decoded raster blocks (at most a quarter of --memory-limit)")
    ("memory-limit", po::value<std::size_t>()->default_value(4096)->value_name("MB"),
     "memory envsift aims to stay within: it bounds the block cache and samples records in chunks small "
     "enough to fit; results do not depend on it. A run whose records alone need more is warned about")
    ("gdal-config", po::value<std::vector<std::string>>()->multitoken()->value_name("KEY=VALUE..."),
     "GDAL configuration options, e.g. GDAL_HTTP_MAX_RETRY=3 for rasters read over HTTP "
     "(/vsicurl/https://...) or GDAL_NUM_THREADS=2 for decompression")
    ("manifest", po::value<std::string>()->value_name("FILE.json"),
     "also write a run manifest: envsift's version, the command line, every option value, each input's "
     "size and SHA-256, each layer's CRS, size and nodata, the seed, threads and timings")
    ("quiet,q", po::bool_switch(), "no progress display")
    ("timings", po::bool_switch(), "print the time each stage took (and each test's CPU time)")
    ("help,h", "show this help");
}

bool parse(int argc, char** argv, const std::string& command, const std::string& synopsis,
           const po::options_description& options, po::variables_map& vm,
           const po::positional_options_description* positional, const po::options_description* visible) {
  for (int i = 0; i < argc; ++i) {
    const std::string a = argv[i];
    if (a == "--help" || a == "-h") {
      std::cout << "usage: envsift " << command << " " << synopsis << "\n\n" << (visible ? *visible : options) << "\n";
      return false;
    }
  }
  try {
    po::command_line_parser parser(argc, argv);
    parser.options(options);
    if (positional) parser.positional(*positional);
    po::store(parser.run(), vm);
    po::notify(vm);
  } catch (const po::error& e) {
    throw UsageError(std::string(e.what()) + "; see 'envsift " + command + " --help'");
  }
  return true;
}

void finish_sampling_options(const po::variables_map& vm, SampleOptions& o) {
  const std::string method = vm["method"].as<std::string>();
  if (method == "nearest") o.method = Interpolation::nearest;
  else if (method == "bilinear") o.method = Interpolation::bilinear;
  else throw UsageError("--method must be nearest or bilinear, not '" + method + "'");
  if (vm.count("delimiter")) {
    const std::string d = vm["delimiter"].as<std::string>();
    if (d == "tab" || d == "\\t" || d == "\t") o.reader.delimiter = '\t';
    else if (d.size() == 1 && d != "\"" && d != "\n") o.reader.delimiter = d[0];
    else throw UsageError("--delimiter must be one character or 'tab', not '" + d + "'");
  }
  o.discs.enabled = !vm["no-discs"].as<bool>();
  if (!(o.discs.default_radius_m >= 0)) throw UsageError("--default-uncertainty must be 0 or more metres");
  if (!(o.discs.max_radius_m > 0)) throw UsageError("--max-uncertainty must be a positive number of metres");
  const std::size_t limit_mb = vm["memory-limit"].as<std::size_t>();
  if (limit_mb < 16) throw UsageError("--memory-limit must be at least 16 MB");
  o.memory_limit_mb = limit_mb;
  o.cache_megabytes = std::max<std::size_t>(1, std::min(o.cache_megabytes, limit_mb / 4));
  // sampling works on ~100 bytes per record and layer pass; a quarter of the limit for that
  o.chunk_records = std::max<std::size_t>(1024, (limit_mb << 20) / 4 / 100);
  if (vm.count("gdal-config"))
    for (const auto& kv : vm["gdal-config"].as<std::vector<std::string>>()) {
      const auto eq = kv.find('=');
      if (eq == std::string::npos || eq == 0) throw UsageError("--gdal-config takes KEY=VALUE, not '" + kv + "'");
      CPLSetConfigOption(kv.substr(0, eq).c_str(), kv.substr(eq + 1).c_str());
    }
  if (vm.count("threads")) {
    const int t = vm["threads"].as<int>();
    if (t < 1) throw UsageError("--threads must be at least 1");
    omp_set_num_threads(t);
  }
}

namespace {

// An option's value as text, whatever its type.
std::string text_of(const po::variable_value& v) {
  const boost::any& a = v.value();
  if (const auto* s = boost::any_cast<std::string>(&a)) return *s;
  if (const auto* b = boost::any_cast<bool>(&a)) return *b ? "true" : "false";
  if (const auto* i = boost::any_cast<int>(&a)) return std::to_string(*i);
  if (const auto* z = boost::any_cast<std::size_t>(&a)) return std::to_string(*z);
  if (const auto* u = boost::any_cast<std::uint64_t>(&a)) return std::to_string(*u);
  if (const auto* d = boost::any_cast<double>(&a)) {
    std::ostringstream out;
    out << *d;
    return out.str();
  }
  if (const auto* list = boost::any_cast<std::vector<std::string>>(&a)) {
    std::string joined;
    for (const auto& item : *list) joined += (joined.empty() ? "" : " ") + item;
    return joined;
  }
  return "?";
}

}  // namespace

RunManifest make_manifest(const po::variables_map& vm, const std::string& command, int argc, char** argv,
                          const SampleOptions& o, unsigned long long seed, const RunSummary& summary) {
  RunManifest m;
  m.command_line = "envsift " + command;
  for (int i = 1; i < argc; ++i) m.command_line += std::string(" ") + argv[i];
  for (const auto& [name, value] : vm) m.options.emplace_back(name, text_of(value));
  m.points = o.points;
  m.layers = o.layers;
  m.assume_crs = o.assume_crs;
  m.seed = seed;
  m.threads = omp_get_max_threads();
  m.seconds = summary.seconds;
  return m;
}

void write_manifest_if_asked(const po::variables_map& vm, const std::string& command, int argc, char** argv,
                             const SampleOptions& o, unsigned long long seed, const RunSummary& summary) {
  if (vm.count("manifest")) write_manifest(vm["manifest"].as<std::string>(), make_manifest(vm, command, argc, argv, o, seed, summary));
}

void report(const RunSummary& summary, const po::variables_map& vm, const std::string& wrote) {
  constexpr std::size_t kShown = 20;  // thousands of taxa can each warn; the rest are in the status codes
  for (std::size_t i = 0; i < summary.warnings.size() && i < kShown; ++i)
    std::cerr << "envsift: warning: " << summary.warnings[i] << "\n";
  if (summary.warnings.size() > kShown)
    std::cerr << "envsift: warning: " << summary.warnings.size() - kShown
              << " more warnings like these (every record concerned carries its reason code in `status`)\n";
  if (vm.count("timings") && vm["timings"].as<bool>())
    for (const auto& [stage, seconds] : summary.seconds) std::cerr << "envsift: time: " << stage << " " << seconds << " s\n";
  std::cerr << summary.codes_line() << "\n" << summary.line() << "\nenvsift: wrote " << wrote << "\n";
}

}  // namespace envsift::cli
