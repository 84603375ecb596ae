// The declared options of a run (settings/option_spec.hpp), grouped as the commands use them,
// and the library's validation of a whole settings struct.
#pragma once
#include <vector>

#include "envsift/sample/raster_stack.hpp"
#include "envsift/settings/option_spec.hpp"
#include "envsift/settings/settings.hpp"

namespace envsift {

const std::vector<OptionSpec>& input_options();     // --points, --layers, column names, ...
const std::vector<OptionSpec>& sampling_options();  // --method, discs, memory, threads, GDAL
const std::vector<OptionSpec>& screen_options();    // --value-columns, --single-taxon, --order, --shard
// Every option `screen` takes: the above, the tests' (detect/test_registry.hpp) and the
// outputs' (write/output_registry.hpp).
std::vector<OptionSpec> all_screen_options();

// Throws UsageError with the command line's message for the first setting that is out of its
// bounds or choices, or that contradicts another. `sample` checks only what it uses.
void validate(const ScreenSettings& settings);
void validate_for_sample(const ScreenSettings& settings);

// What the settings mean for sampling, derived once: the interpolation, the block cache in
// bytes (at most a quarter of the memory limit) and the records sampled at a time.
struct SamplingPlan {
  Interpolation method = Interpolation::nearest;
  std::size_t cache_bytes = 0;
  std::size_t chunk_records = 0;
};
SamplingPlan sampling_plan(const SamplingSettings& settings);

// Applies the process-wide settings (thread count, GDAL configuration) before a run.
void apply_process_settings(const SamplingSettings& settings);

}  // namespace envsift
