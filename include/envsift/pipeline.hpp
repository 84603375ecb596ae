// The whole pipeline, as the CLI runs it:
//   read points → sample raster stack → group by taxon → tests → score and rank → write.
#pragma once
#include <cstddef>
#include <cstdint>
#include <functional>
#include <map>
#include <string>
#include <vector>

#include "envsift/detect/fast_mcd.hpp"
#include "envsift/detect/mahalanobis.hpp"
#include "envsift/detect/reverse_jackknife.hpp"
#include "envsift/detect/reported_elevation.hpp"
#include "envsift/detect/robust_z.hpp"
#include "envsift/read/point_reader.hpp"
#include "envsift/group/populations.hpp"
#include "envsift/score/population_guard.hpp"
#include "envsift/progress.hpp"
#include "envsift/sample/raster_stack.hpp"

namespace envsift {

// Uncertainty discs: a record with coordinateUncertaintyInMeters (or the default) is also
// sampled over every cell within that radius.
struct DiscOptions {
  bool enabled = true;
  double default_radius_m = 0;     // for records without an uncertainty; 0 = none
  double max_radius_m = 25000;     // larger discs are cut to this (cost grows with the area)
};

struct SampleOptions {
  std::string points;
  ReaderOptions reader;
  std::vector<std::string> layers;  // paths or NAME=PATH
  Interpolation method = Interpolation::nearest;
  std::string out;
  std::size_t cache_megabytes = 256;
  DiscOptions discs;
  std::string assume_crs;  // CRS for layers that have none (else they are refused)
  std::size_t chunk_records = static_cast<std::size_t>(-1);  // sample this many records at a time
  Progress* progress = nullptr;                               // optional
  std::size_t memory_limit_mb = 4096;                         // a warning when the records need more
};

// The label's elevation against the DEM.
struct ElevationOptions {
  std::string dem_layer;        // empty: no check
  double tolerance_m = 100;
};

enum class RowOrder { input, rank };

// Every test envsift knows, in the order their columns are written.
const std::vector<std::string>& all_test_names();
// The tests a screen runs unless told otherwise: the ones the evaluation supports (README).
const std::vector<std::string>& default_test_names();

struct RunSummary;

struct ScreenOptions : SampleOptions {
  std::vector<std::string> tests = default_test_names();
  RobustZOptions robust_z;
  ReverseJackknifeOptions jackknife;
  MahalanobisOptions mahalanobis;
  McdOptions mcd;
  PopulationOptions populations;  // split a taxon with two separate populations and judge each
  PopulationGuard population;  // withholds a test's flags from a taxon it flags wholesale
  bool distinct_cells = true;  // estimate each taxon's statistics on distinct cells
  std::uint64_t seed = 1;
  std::vector<std::string> value_columns;  // screen these input columns instead of sampling layers
  bool single_taxon = false;               // one group for the whole file
  RowOrder order = RowOrder::input;
  ElevationOptions elevation;
  std::string summary;                     // per-taxon summary CSV; empty = none
  std::string gis;                         // GeoPackage or GeoJSON of all records; empty = none
  std::string report;                      // HTML report; empty = none
  std::size_t report_taxa = 100;           // taxon sections drawn in it at most (the worst taxa)
  // The run manifest as JSON, for the report (called once, at the end, with the run's summary).
  std::function<std::string(const RunSummary&)> manifest_json;
  // Taxon shards for clusters: screen only the taxa whose stable hash modulo `shard_count` is
  // `shard_index`; every other record is written with status `other_shard`. `envsift merge`
  // combines the shards' outputs into exactly what one run writes.
  std::size_t shard_index = 0, shard_count = 1;
};

// The shard that owns a taxon (records without a taxon: the shard of the empty name).
std::size_t shard_of(const std::string& taxon, std::size_t shard_count);


// Where the records went: every record read is counted once as scored or as not scorable.
struct RunSummary {
  std::size_t read = 0;
  std::size_t scored = 0;
  std::size_t flagged = 0;
  std::map<std::string, std::size_t> not_scored;  // by first reason code
  std::map<std::string, std::size_t> codes;       // every reason code, over all records
  std::vector<std::string> warnings;              // e.g. a layer no record falls on
  std::vector<std::pair<std::string, double>> seconds;  // time per stage (and per test, CPU time)
  std::string line() const;                       // one line for stderr
  std::string codes_line() const;                 // one line: every code and its count
};

RunSummary run_sample(const SampleOptions& options);

// Combines the outputs of shards 0..N-1 of one screen (any order) into `out`, re-ranking.
// Throws InputError when the files are not shards of the same run.
RunSummary merge_shards(const std::vector<std::string>& shard_outputs, const std::string& out);
RunSummary run_screen(const ScreenOptions& options);

}  // namespace envsift
