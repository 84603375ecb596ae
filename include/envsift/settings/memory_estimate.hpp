// What a run will hold in memory at its peak, estimated before sampling from the record count,
// the layers and the settings, so that a run that would not fit is warned about at the start
// (with the way out: --shard) rather than killed by the system half way. Each part is what the
// code holds (sizes of its structures), measured against real runs in
// docs/big-runs.md's performance table; the estimate is meant as an upper bound.
#pragma once
#include <cstddef>
#include <string>

#include "envsift/settings/settings.hpp"

namespace envsift {

struct MemoryEstimate {
  std::size_t per_record = 0;  // bytes each record holds whatever the stage (parsed fields, indices, score)
  std::size_t values = 0;      // the sampled values (and disc values)
  std::size_t sampling = 0;    // held only while sampling: each record's sampling plan and cell status
  std::size_t budgets = 0;     // bounded by the limit: block cache, landscape batch, verdicts in memory
  std::size_t threads = 0;     // each thread's own: a handle on every layer, its stack and allocator arena
  std::size_t outputs = 0;     // what the outputs hold while written (the report's pictures, the GeoPackage's cache)
  std::size_t base = 0;        // the program and its libraries
  std::size_t peak() const;    // the largest stage's total
  std::string words() const;   // "about 3,210 MB at its peak (records 1,370, values 760, ...)"
};

struct RunShape {
  std::size_t records = 0, taxa = 0;
  std::size_t layers = 0, float_layers = 0;  // columns of values; those kept as 32-bit floats (value_table.hpp)
  bool discs = false;
  std::size_t landscape_cells = 0;  // cells drawn per taxon when a test draws landscapes, else 0
  std::size_t raster_bytes = 0;     // every layer's cells decoded (the most the block cache can hold); 0: unknown
  std::size_t threads = 1;          // threads the run uses
  bool report = false, gis = false; // --report, --gis
};
MemoryEstimate estimate_memory(const RunShape& run, const SamplingSettings& settings);

}  // namespace envsift
