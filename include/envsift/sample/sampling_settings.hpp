// The sampler's settings (--method, discs, memory, threads, GDAL configuration), their declared
// options, and what they mean for a run once derived (the sampling plan).
#pragma once
#include <cstddef>
#include <string>
#include <vector>

#include "envsift/option_spec.hpp"

namespace envsift {

enum class Interpolation { nearest, bilinear };

// The most threads a run may use (--threads): each keeps a handle on every layer.
inline constexpr std::size_t kMaxThreads = 256;

struct SamplingSettings {
  Interpolation method = Interpolation::nearest;
  bool discs = true;                       // sample uncertainty discs
  double default_radius_m = 0;             // disc for records without an uncertainty; 0 = none
  double max_radius_m = 25000;             // larger discs are cut to this
  std::size_t block_cache_mb = 256;        // decoded raster blocks (at most a quarter of the limit)
  std::size_t memory_limit_mb = 4096;      // bounds the cache and the sampling chunks
  std::vector<std::string> gdal_config;    // KEY=VALUE
  std::size_t threads = 0;                 // 0: all cores; results do not depend on it; at most kMaxThreads
};

// --method, --default-uncertainty, --max-uncertainty, --no-discs, --threads, --block-cache-mb,
// --memory-limit, --gdal-config
const std::vector<Option<SamplingSettings>>& sampling_options();

// What the settings mean for sampling, derived once: the interpolation, the block cache in
// bytes (at most a quarter of the memory limit), the records sampled at a time, the memory for
// the landscapes drawn at a time (an eighth of the limit) and for verdicts waiting to be written
// before they go to disk (a sixteenth).
struct SamplingPlan {
  Interpolation method = Interpolation::nearest;
  std::size_t cache_bytes = 0;
  std::size_t chunk_records = 0;
  std::size_t landscape_bytes = 0;
  std::size_t verdict_bytes = 0;
};
SamplingPlan sampling_plan(const SamplingSettings& settings);

// Applies the process-wide settings (thread count, GDAL configuration) before a run.
void apply_process_settings(const SamplingSettings& settings);

}  // namespace envsift
