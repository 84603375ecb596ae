// A screen's settings as a whole: every option it takes (reading, sampling, the registered tests'
// and outputs'), their validation with the command line's messages, and their values as written.
#pragma once
#include <string>
#include <utility>
#include <vector>

#include "envsift/settings/option_spec.hpp"
#include "envsift/settings/settings.hpp"

namespace envsift {

std::vector<OptionSpec> all_screen_options();
// The options `sample` takes: reading, sampling and the outputs it writes.
std::vector<OptionSpec> sample_options();

// Throws UsageError with the command line's message for the first setting that is out of its
// bounds or choices, or that contradicts another.
void validate(const ScreenSettings& settings);

// Every option's value as the command line writes it ("" = unset), for the run manifest.
std::vector<std::pair<std::string, std::string>> settings_as_written(const std::vector<OptionSpec>& options,
                                                                     const ScreenSettings& settings);

}  // namespace envsift
