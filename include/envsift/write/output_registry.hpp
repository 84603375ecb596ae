// The registry of outputs: one entry per file a run can write, listed in one place
// (output_registry.cpp). Each declares the option that names its file and builds its sink.
#pragma once
#include <functional>
#include <memory>
#include <string>
#include <vector>

#include "envsift/option_spec.hpp"
#include "envsift/write/output_settings.hpp"
#include "envsift/write/record_sink.hpp"

namespace envsift {

using OutputOption = Option<OutputSettings>;

struct OutputEntry {
  std::string name;     // "csv", "gis", ...
  OutputOption option;  // the option naming its file (its get() is the path, "" = not asked for)
  bool in_sample = false;  // `envsift sample` writes it too
  std::function<std::unique_ptr<RecordSink>(const std::string& path)> make;
};

const std::vector<OutputEntry>& output_registry();
// The outputs' options: each entry's path option, then their settings (--report-taxa).
const std::vector<OutputOption>& output_options();

// The sinks the settings ask for, in registry order (for `sample`: only those it writes).
std::vector<std::unique_ptr<RecordSink>> open_outputs(const OutputSettings& settings, bool sample);

}  // namespace envsift
