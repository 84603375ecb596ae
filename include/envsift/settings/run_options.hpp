// The declared options of reading and sampling (settings/option_spec.hpp), grouped as the
// commands use them; the tests' are in detect/test_registry.hpp, the outputs' in
// write/output_registry.hpp, and run/validate.hpp gathers them all.
#pragma once
#include <vector>

#include "envsift/sample/raster_stack.hpp"
#include "envsift/settings/option_spec.hpp"
#include "envsift/settings/settings.hpp"

namespace envsift {

const std::vector<OptionSpec>& input_options();     // --points, --layers, column names, ...
const std::vector<OptionSpec>& sampling_options();  // --method, discs, memory, threads, GDAL
const std::vector<OptionSpec>& screen_options();    // --value-columns, --single-taxon, --order, --shard
// Throws UsageError with the command line's message for the first setting `sample` uses that is
// out of its bounds or choices (run/validate.hpp checks a screen's).
void validate_for_sample(const ScreenSettings& settings);

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
