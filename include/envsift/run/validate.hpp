// A screen's settings as a whole: every option it takes (reading, sampling, the registered tests'
// and outputs'), their validation with the command line's messages, and their values as written.
#pragma once
#include <string>
#include <utility>
#include <vector>

#include "envsift/detect/test_registry.hpp"
#include "envsift/settings/settings.hpp"

namespace envsift {

std::vector<OptionSpec> all_screen_options();

// Throws UsageError with the command line's message for the first setting that is out of its
// bounds or choices, or that contradicts another.
void validate(const ScreenSettings& settings);

// What the tests need to know of the input to check their settings (--value-columns or layers).
TestContext test_context(const InputSettings& input);

// Every option's value as the command line writes it ("" = unset), for the run manifest.
std::vector<std::pair<std::string, std::string>> settings_as_written(const std::vector<OptionSpec>& options,
                                                                     const ScreenSettings& settings);

}  // namespace envsift
