// Every setting of a run, as plain structs: what the command line fills in and what a program
// embedding envsift sets directly. `validate` (settings/validate.hpp) checks them against the
// declared options (bounds, choices), with the command line's messages.
#pragma once
#include <cstddef>
#include <string>
#include <vector>

#include "envsift/progress.hpp"
#include "envsift/read/point_reader.hpp"

namespace envsift {

// The tests a screen runs unless told otherwise (the registry's defaults, detect/test_registry.hpp).
std::vector<std::string> default_test_names();

struct InputSettings {
  std::string points;                      // CSV/TSV or an OGR vector source
  ReaderOptions reader;                    // column names, delimiter, vector layer
  std::vector<std::string> layers;         // raster paths or NAME=PATH
  std::vector<std::string> value_columns;  // screen these input columns instead of sampling layers
  bool single_taxon = false;               // one group for the whole file
  std::string assume_crs;                  // CRS for layers that have none (else they are refused)
  std::vector<std::string> circular;       // layers holding directions in degrees (besides those named so)
};

// The most threads a run may use (--threads): each keeps a handle on every layer.
inline constexpr std::size_t kMaxThreads = 256;

struct SamplingSettings {
  std::string method = "nearest";          // nearest | bilinear
  bool discs = true;                       // sample uncertainty discs
  double default_radius_m = 0;             // disc for records without an uncertainty; 0 = none
  double max_radius_m = 25000;             // larger discs are cut to this
  std::size_t block_cache_mb = 256;        // decoded raster blocks (at most a quarter of the limit)
  std::size_t memory_limit_mb = 4096;      // bounds the cache and the sampling chunks
  std::vector<std::string> gdal_config;    // KEY=VALUE
  std::size_t threads = 0;                 // 0: all cores; results do not depend on it; at most kMaxThreads
};

// Settings shared by several tests exist once here; a test's own are beside them, named after it.
struct TestSettings {
  std::vector<std::string> tests = default_test_names();
  std::size_t min_records = 10;       // per layer (one-layer tests) or complete rows (Mahalanobis)
  double common_share = 0.05;         // a value this share of the reference holds is not flagged
  std::string scale = "mad";          // mad | skew
  bool all_records = false;           // estimate from every record, not one per distinct cell
  unsigned long long seed = 1;        // randomised tests
  std::string populations = "split";  // split | one
  std::string combine = "mean";       // how severities make the score: max | mean (docs/evaluation.md)
  double max_flagged_share = 0.15;    // population guard
  double z_cutoff = 4.0;              // robust_z (docs/evaluation.md)
  double chi2_quantile = 0.995;       // mahalanobis, mahalanobis_robust (docs/evaluation.md)
  std::string mcd_start = "deterministic";  // mahalanobis_robust: deterministic | random
  // landscape: flag when the record's environment is this many times more common in the taxon's
  // landscape than among its records; where the landscape is drawn (landscape_sample.hpp)
  double landscape_ratio = 5;
  std::string landscape_area = "buffer";  // buffer | extent
  double landscape_spread = 1;            // buffer radius = this × the taxon's spread …
  double landscape_min_km = 20;           // … at least this
  std::size_t landscape_cells = 300;      // cells drawn per taxon
};

// The reported elevation against a DEM layer.
struct ElevationSettings {
  std::string dem_layer;    // empty: no check
  double tolerance_m = 100;
};

// Taxa's published ranges (read/range_layer.hpp, detect/range_check.hpp).
struct RangeSettings {
  std::string path;                           // the range layer; empty: no check
  std::string taxon_field = "scientificName";
  std::string filter;                         // OGR SQL WHERE clause on its features
  double tolerance_km = 100;                  // flag records farther than this outside the range
};

struct OutputSettings {
  std::string out;                // the record table (CSV)
  std::string summary;            // per-taxon summary CSV
  std::string gis;                // GeoPackage or GeoJSON
  std::string report;             // HTML report
  std::string manifest;           // run manifest (JSON)
  std::size_t report_taxa = 100;  // taxon sections drawn in the report at most
  std::string order = "input";    // input | rank
  std::string column_prefix;      // before every column envsift adds after the layers
  // Taxon shards: screen only the taxa whose stable hash modulo `shard_count` is `shard_index`.
  std::size_t shard_index = 0, shard_count = 1;
};

// Screening in rounds: a reviewer's decisions from earlier rounds (review/decisions.hpp).
struct ReviewSettings {
  std::string decisions;  // the decisions file; empty: none
  std::string template_path;      // the next round's decisions file to write; empty: none
  std::size_t template_top = 200;  // open suspects listed in it
};

struct ScreenSettings {
  InputSettings input;
  SamplingSettings sampling;
  TestSettings tests;
  ElevationSettings elevation;
  RangeSettings ranges;
  OutputSettings outputs;
  ReviewSettings review;
  std::string command_line;     // how the run was invoked, for the manifest
  Progress* progress = nullptr;  // optional
};

}  // namespace envsift
