#include "envsift/settings/run_options.hpp"

#include <algorithm>
#include <omp.h>
#include <sys/resource.h>
#include <cpl_conv.h>

#include "envsift/errors.hpp"

namespace envsift {
namespace {

OptionSpec column_option(const std::string& name, const std::string& help, std::string ColumnNames::*member) {
  return text_option(name, "NAME", help, [member](ScreenSettings& s) -> std::string& { return s.input.reader.columns.*member; });
}

OptionSpec delimiter_option() {
  OptionSpec o{"delimiter", "CHAR",
               "field delimiter of a text points file: ',' ';' 'tab' (default: tab for .tsv, else guessed from the header)"};
  o.set = [](ScreenSettings& s, const std::string& d) {
    if (d == "tab" || d == "\\t" || d == "\t") s.input.reader.delimiter = '\t';
    else if (d.size() == 1 && d != "\"" && d != "\n" && d != "\r") s.input.reader.delimiter = d[0];
    else throw UsageError("--delimiter must be one character or 'tab', not '" + d + "'");
  };
  o.get = [](const ScreenSettings& s) {
    const char d = s.input.reader.delimiter;
    return d == 0 ? std::string() : d == '\t' ? std::string("tab") : std::string(1, d);
  };
  return o;
}

OptionSpec shard_option() {
  OptionSpec o{"shard", "I/N",
               "screen only the taxa of shard I of N (0-based; taxa split by a stable hash of their name, the same on "
               "every machine); other records are written with status other_shard. Run I = 0..N-1, then "
               "'envsift merge' the outputs: the result equals one run's, byte for byte"};
  o.set = [](ScreenSettings& s, const std::string& text) {
    const auto slash = text.find('/');
    try {
      std::size_t used = 0;
      if (slash == std::string::npos || text[0] == '-' || text[slash + 1] == '-') throw std::invalid_argument(text);
      s.outputs.shard_index = std::stoul(text.substr(0, slash), &used);
      if (used != slash) throw std::invalid_argument(text);
      s.outputs.shard_count = std::stoul(text.substr(slash + 1), &used);
      if (used != text.size() - slash - 1) throw std::invalid_argument(text);
    } catch (const std::exception&) {
      throw UsageError("--shard must be I/N, e.g. 0/8, not '" + text + "'");
    }
  };
  o.get = [](const ScreenSettings& s) {
    return s.outputs.shard_count <= 1 ? std::string()
                                      : std::to_string(s.outputs.shard_index) + "/" + std::to_string(s.outputs.shard_count);
  };
  o.check = [](const ScreenSettings& s) {
    const auto& out = s.outputs;
    return out.shard_count >= 1 && out.shard_index < out.shard_count
               ? std::string()
               : "needs 0 <= I < N, not " + std::to_string(out.shard_index) + "/" + std::to_string(out.shard_count);
  };
  return o;
}

OptionSpec value_columns_option() {
  OptionSpec o{"value-columns", "A,B,...", "screen values already in the points file (these columns) instead of sampling --layers"};
  o.set = [](ScreenSettings& s, const std::string& text) { s.input.value_columns = split_list(text); };
  o.get = [](const ScreenSettings& s) {
    std::string joined;
    for (const auto& c : s.input.value_columns) joined += (joined.empty() ? "" : ",") + c;
    return joined;
  };
  return o;
}

}  // namespace

const std::vector<OptionSpec>& input_options() {
  static const std::vector<OptionSpec> options = [] {
    std::vector<OptionSpec> v;
    v.push_back(text_option("points", "FILE",
                            "occurrence records: CSV or TSV with a header line, or a GeoPackage, GeoJSON or Shapefile of points",
                            [](ScreenSettings& s) -> std::string& { return s.input.points; }));
    v.back().required = true;
    v.push_back(list_option("layers", "RASTER...",
                            "raster layers to sample (GeoTIFF or any GDAL raster). Each becomes a column named after its "
                            "file; write NAME=PATH to choose the name. Layers may differ in CRS, resolution and extent.",
                            [](ScreenSettings& s) -> std::vector<std::string>& { return s.input.layers; }));
    v.push_back(column_option("id-column", "record identifier column", &ColumnNames::id));
    v.push_back(column_option("taxon-column", "taxon name column", &ColumnNames::taxon));
    v.push_back(column_option("longitude-column", "longitude column, decimal degrees WGS 84", &ColumnNames::longitude));
    v.push_back(column_option("latitude-column", "latitude column, decimal degrees WGS 84", &ColumnNames::latitude));
    v.push_back(column_option("uncertainty-column",
                              "coordinate uncertainty column, metres: each layer is also sampled over every cell within "
                              "that radius (columns LAYER_min, LAYER_mean, LAYER_max)",
                              &ColumnNames::uncertainty));
    v.push_back(delimiter_option());
    v.push_back(choice_option("quoting",
                              "how quotes in a text points file are read. auto: tab-separated text literally (a quote "
                              "is a character, as in data-portal exports and Darwin Core Archives), other delimiters "
                              "as RFC 4180 (a quoted field may hold the delimiter and line breaks); or rfc4180 | literal",
                              [](ScreenSettings& s) -> std::string& { return s.input.reader.quoting; },
                              {"auto", "rfc4180", "literal"}));
    v.push_back(text_option("points-crs", "CRS",
                            "the CRS of a text file's coordinate columns when they are not WGS 84 degrees, e.g. "
                            "EPSG:32631 (UTM metres: x in the longitude column, y in the latitude column); any CRS "
                            "GDAL/PROJ knows, as EPSG:N, WKT or a .prj file. The points are transformed to WGS 84",
                            [](ScreenSettings& s) -> std::string& { return s.input.reader.points_crs; }));
    v.push_back(text_option("points-layer", "NAME", "layer of a multi-layer GeoPackage (default: the first)",
                            [](ScreenSettings& s) -> std::string& { return s.input.reader.vector_layer; }));
    {
      OptionSpec circular{"circular", "LAYER,...",
                          "layers (or value columns) holding directions in degrees, such as aspect: the tests judge their "
                          "sine and cosine (columns LAYER_sin, LAYER_cos), so 359° and 1° are neighbours. Layers named "
                          "aspect, azimuth, bearing, direction or orientation are taken as circular without it"};
      circular.set = [](ScreenSettings& s, const std::string& text) { s.input.circular = split_list(text); };
      circular.get = [](const ScreenSettings& s) {
        std::string joined;
        for (const auto& c : s.input.circular) joined += (joined.empty() ? "" : ",") + c;
        return joined;
      };
      v.push_back(circular);
    }
    v.push_back(text_option("assume-crs", "CRS",
                            "CRS for layers that have none, e.g. EPSG:4326 (without it such layers are refused)",
                            [](ScreenSettings& s) -> std::string& { return s.input.assume_crs; }));
    return v;
  }();
  return options;
}

const std::vector<OptionSpec>& sampling_options() {
  static const std::vector<OptionSpec> options = [] {
    std::vector<OptionSpec> v;
    v.push_back(choice_option("method",
                              "nearest: the value of the cell the point falls in (what gdallocationinfo reports); "
                              "bilinear: weighted from the four nearest cell centres, falling back to nearest at edges "
                              "and beside nodata",
                              [](ScreenSettings& s) -> std::string& { return s.sampling.method; }, {"nearest", "bilinear"}));
    v.push_back(real_option("default-uncertainty", "M",
                            "uncertainty radius in metres for records that give none (0: sample only their point)",
                            [](ScreenSettings& s) -> double& { return s.sampling.default_radius_m; }, at_least(0)));
    v.push_back(real_option("max-uncertainty", "M",
                            "larger uncertainty discs are cut to M metres (cost grows with the disc's area); such "
                            "records say so (uncertainty_capped)",
                            [](ScreenSettings& s) -> double& { return s.sampling.max_radius_m; }, above(0)));
    OptionSpec no_discs = switch_option("no-discs", "ignore coordinate uncertainty: sample and judge each record at its point only",
                                        [](ScreenSettings& s) -> bool& { return s.sampling.discs; });
    no_discs.set = [](ScreenSettings& s, const std::string& text) { s.sampling.discs = text == "false"; };
    no_discs.get = [](const ScreenSettings& s) { return std::string(s.sampling.discs ? "false" : "true"); };
    v.push_back(no_discs);
    // 0 (unset) is every core; each thread keeps its own handle on every layer, so the count is
    // bounded to keep open files and thread stacks within what a machine gives a process
    v.push_back(count_option("threads", "N",
                             "threads to use, at most " + std::to_string(kMaxThreads) +
                                 " (0, the default: all cores); results do not depend on it",
                             [](ScreenSettings& s) -> std::size_t& { return s.sampling.threads; }, between(0, kMaxThreads)));
    v.back().get = [](const ScreenSettings& s) { return s.sampling.threads ? std::to_string(s.sampling.threads) : std::string(); };
    v.push_back(count_option("block-cache-mb", "MB", "memory for decoded raster blocks (at most a quarter of --memory-limit)",
                             [](ScreenSettings& s) -> std::size_t& { return s.sampling.block_cache_mb; }, at_least(1)));
    v.push_back(count_option("memory-limit", "MB",
                             "memory envsift aims to stay within: it bounds the block cache and samples records in "
                             "chunks small enough to fit; results do not depend on it. A run whose records alone need "
                             "more is warned about",
                             [](ScreenSettings& s) -> std::size_t& { return s.sampling.memory_limit_mb; }, at_least(16)));
    v.push_back(list_option("gdal-config", "KEY=VALUE...",
                            "GDAL configuration options, e.g. GDAL_HTTP_MAX_RETRY=3 for rasters read over HTTP "
                            "(/vsicurl/https://...) or GDAL_NUM_THREADS=2 for decompression",
                            [](ScreenSettings& s) -> std::vector<std::string>& { return s.sampling.gdal_config; }));
    v.back().check = [](const ScreenSettings& s) {
      for (const auto& kv : s.sampling.gdal_config)
        if (kv.find('=') == std::string::npos || kv[0] == '=') return "takes KEY=VALUE, not '" + kv + "'";
      return std::string();
    };
    return v;
  }();
  return options;
}

const std::vector<OptionSpec>& screen_options() {
  static const std::vector<OptionSpec> options = [] {
    std::vector<OptionSpec> v;
    v.push_back(value_columns_option());
    v.push_back(switch_option("single-taxon", "treat the whole file as one taxon (no taxon column needed)",
                              [](ScreenSettings& s) -> bool& { return s.input.single_taxon; }));
    v.push_back(shard_option());
    v.push_back(text_option("column-prefix", "P",
                            "put P before every column envsift adds after the layers (status, rank, score, flags, "
                            "reasons, each test's columns), for points that have a status or rank column of their own; "
                            "layer columns are named with NAME=PATH",
                            [](ScreenSettings& s) -> std::string& { return s.outputs.column_prefix; }));
    v.push_back(choice_option("order", "row order of the output: input order, or by rank (unscored records last)",
                              [](ScreenSettings& s) -> std::string& { return s.outputs.order; }, {"input", "rank"}));
    v.push_back(text_option("decisions", "FILE.csv",
                            "a reviewer's decisions from earlier rounds, one row per record: its ID (the points' ID "
                            "column), decision (error: confirmed wrong, left out of its taxon's statistics and "
                            "ranked last; valid: confirmed right, never flagged again, ranked after the open suspects; "
                            "unsure), and optionally note, reviewer, date",
                            [](ScreenSettings& s) -> std::string& { return s.review.decisions; }));
    return v;
  }();
  return options;
}

void validate_for_sample(const ScreenSettings& s) {
  check_options(input_options(), s);
  check_options(sampling_options(), s);
  if (s.input.layers.empty()) throw UsageError("--layers is required: give the rasters to sample");
  if (s.outputs.out.empty()) throw UsageError("--out is required: give the CSV file to write");
}

SamplingPlan sampling_plan(const SamplingSettings& s) {
  SamplingPlan plan;
  plan.method = s.method == "bilinear" ? Interpolation::bilinear : Interpolation::nearest;
  plan.cache_bytes = std::max<std::size_t>(1, std::min(s.block_cache_mb, s.memory_limit_mb / 4)) << 20;
  // sampling works on ~100 bytes per record and layer pass; a quarter of the limit for that
  plan.chunk_records = std::max<std::size_t>(1024, (s.memory_limit_mb << 20) / 4 / 100);
  plan.landscape_bytes = (s.memory_limit_mb << 20) / 8;
  plan.verdict_bytes = (s.memory_limit_mb << 20) / 16;
  return plan;
}

void apply_process_settings(const SamplingSettings& s) {
  for (const auto& kv : s.gdal_config) {
    const auto eq = kv.find('=');
    CPLSetConfigOption(kv.substr(0, eq).c_str(), kv.substr(eq + 1).c_str());
  }
  if (s.threads > 0) omp_set_num_threads(static_cast<int>(s.threads));
  // every thread opens every layer once: let the process use the open files its hard limit
  // allows (the soft limit is often 1,024), as most runtimes do at start
  rlimit files{};
  if (getrlimit(RLIMIT_NOFILE, &files) == 0 && files.rlim_cur < files.rlim_max) {
    files.rlim_cur = files.rlim_max;
    setrlimit(RLIMIT_NOFILE, &files);
  }
}

}  // namespace envsift
