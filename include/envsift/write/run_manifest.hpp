// The run manifest (`--manifest FILE.json`): what a reviewer or a later reader needs to know and
// repeat a run — envsift's version, the command line and every option value, each input file's
// path, size and SHA-256, each layer's CRS, size and nodata, the seed, the threads and the time
// each stage took.
#pragma once
#include <map>
#include <string>
#include <utility>
#include <vector>

#include "envsift/sample/raster_stack.hpp"

namespace envsift {

struct RunContext;
struct RunSummary;

struct RunManifest {
  std::string command_line;
  std::vector<std::pair<std::string, std::string>> options;  // name → value, as given or defaulted
  std::string points;                                        // the points file
  std::vector<LayerInfo> layers;                             // as read when sampling (none for value columns)
  unsigned long long seed = 0;
  int threads = 1;
  std::vector<std::pair<std::string, double>> seconds;       // time per stage
  std::string decisions;                                     // --decisions file, "" for none
  std::string ranges;                                        // --ranges file, "" for none
  std::map<std::string, std::size_t> decided;                // records per decision applied
};

// The manifest of a run: its settings as the declared options write them, its inputs, layers
// and timings so far.
RunManifest make_manifest(const RunContext& run, const RunSummary& summary);

// The manifest as JSON text (also embedded in the HTML report).
std::string manifest_json(const RunManifest& manifest);

// Where a shard run (--shard I/N) writes its manifest when --manifest is not given: beside its
// output, so that `merge` can check that the shards come from one run.
std::string shard_manifest_path(const std::string& out);

// Lower-case hex SHA-256 of a file's bytes (FIPS 180-4, computed by OpenSSL).
std::string sha256_of_file(const std::string& path);

}  // namespace envsift
