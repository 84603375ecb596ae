// Every setting of a run, gathered: each part's own struct (declared in the layer that uses it)
// in one ScreenSettings, which the command line fills in and a program embedding envsift sets
// directly. The parts: input (read/input_settings.hpp), sampling (sample/sampling_settings.hpp),
// tests (detect/test_settings.hpp; each test's own settings in `tests.own`), outputs
// (write/output_settings.hpp). Each stage is handed only its part. `validate`
// (run/validate.hpp) checks them against the declared options (bounds, choices), with the
// command line's messages.
#pragma once
#include <string>

#include "envsift/detect/test_settings.hpp"
#include "envsift/option_spec.hpp"
#include "envsift/progress.hpp"
#include "envsift/read/input_settings.hpp"
#include "envsift/sample/sampling_settings.hpp"
#include "envsift/write/output_settings.hpp"

namespace envsift {

// Screening in rounds: a reviewer's decisions from earlier rounds (review/decisions.hpp).
struct ReviewSettings {
  std::string decisions;  // the decisions file; empty: none
};

struct ScreenSettings {
  InputSettings input;
  SamplingSettings sampling;
  TestSettings tests;
  OutputSettings outputs;
  ReviewSettings review;
  std::string command_line;     // how the run was invoked, for the manifest
  Progress* progress = nullptr;  // optional
};

// An option of the whole run, as the command line and the manifest see it.
using OptionSpec = Option<ScreenSettings>;

}  // namespace envsift
