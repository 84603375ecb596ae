// Where a run writes and how: the files asked for (each output's option names its file) and the
// settings the outputs share.
#pragma once
#include <cstddef>
#include <string>

namespace envsift {

// Row order of the main output.
enum class RowOrder { input, rank };

struct OutputSettings {
  std::string out;                 // the record table (CSV)
  std::string summary;             // per-taxon summary CSV
  std::string gis;                 // GeoPackage or GeoJSON
  std::string report;              // HTML report
  std::string manifest;            // run manifest (JSON)
  std::string decisions_template;  // the next review round's decisions file; empty: none
  std::size_t decisions_template_top = 200;  // open suspects listed in it
  std::size_t report_taxa = 100;   // taxon sections drawn in the report at most
  RowOrder order = RowOrder::input;
  std::string column_prefix;       // before every column envsift adds after the layers
  // Taxon shards: screen only the taxa whose stable hash modulo `shard_count` is `shard_index`.
  std::size_t shard_index = 0, shard_count = 1;
};

}  // namespace envsift
