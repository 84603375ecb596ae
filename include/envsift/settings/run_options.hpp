// Every option of a run over the whole settings: each part's declared options (reading,
// sampling, the registered tests' and outputs') lifted to ScreenSettings, grouped as the
// commands use them; run/validate.hpp gathers a screen's.
#pragma once
#include <vector>

#include "envsift/settings/settings.hpp"

namespace envsift {

std::vector<OptionSpec> input_run_options();     // --points, --layers, column names, ...
std::vector<OptionSpec> sampling_run_options();  // --method, discs, memory, threads, GDAL
const std::vector<OptionSpec>& screen_options(); // --value-columns, --single-taxon, --shard, --order, --decisions
std::vector<OptionSpec> test_run_options();      // --tests, the shared tests' options, each test's own
std::vector<OptionSpec> output_run_options();    // each output's file and settings
// The options `sample` takes: reading, sampling and the outputs it writes.
std::vector<OptionSpec> sample_options();

// Throws UsageError with the command line's message for the first setting `sample` uses that is
// out of its bounds or choices (run/validate.hpp checks a screen's).
void validate_for_sample(const ScreenSettings& settings);

}  // namespace envsift
