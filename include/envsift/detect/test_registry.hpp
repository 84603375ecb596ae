// The registry of tests: one entry per statistical test or record check, listed in one place
// (test_registry.cpp) in the order their columns are written. Each entry lives in its test's
// own file and declares its name, whether it is a default, its own options, how it describes
// itself (report, manifest, --help) and how it is built. Settings shared by several tests
// (min-records, common-share, scale, ...) are declared once, in test_options().
#pragma once
#include <functional>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "envsift/detect/detector.hpp"
#include "envsift/detect/record_check.hpp"
#include "envsift/settings/option_spec.hpp"
#include "envsift/settings/settings.hpp"

namespace envsift {

// How the report draws a one-layer test's cutoffs on a layer's histogram: a legend label, a
// slot of the report's cutoff styles (colour and dash; one slot per test), and the caption's
// words for what the lines mean.
struct CutoffStyle {
  std::string label;  // e.g. "robust z"
  int slot = 0;       // 0: blue dashed, 1: vermillion dotted, 2: reddish purple dash-dot, 3: black long dash
  std::string words;  // e.g. "where robust z starts flagging"
};

struct TestEntry {
  std::string name;          // written to `flags`; the prefix of its columns
  bool is_default = false;   // run unless --tests says otherwise (taxon tests)
  bool needs_layers = false; // judges nothing without rasters: left out of the defaults with --value-columns
  std::string help;          // one line for the --tests help
  std::vector<OptionSpec> options;  // its own options (the shared ones are in test_options())
  // One line for the report and the run's description: what it flags, with the cutoff in use.
  std::function<std::string(const ScreenSettings&)> describe;
  // A taxon test: builds its detector. Empty for a record check.
  std::function<std::unique_ptr<Detector>(const ScreenSettings&)> make_detector;
  // A record check: builds it, and says whether the settings ask for it (--tests chooses taxon
  // tests; a record check is asked for by its own options).
  std::function<std::unique_ptr<RecordCheck>(const ScreenSettings&)> make_check;
  std::function<bool(const ScreenSettings&)> wanted_check;
  std::optional<CutoffStyle> cutoffs;  // one-layer tests: drawn on the report's histograms
  // Cross-checks of its settings beyond their bounds; throws UsageError.
  std::function<void(const ScreenSettings&)> validate;
};

const std::vector<TestEntry>& test_registry();
const TestEntry* find_test(const std::string& name);

// --tests and the options shared by several tests, then every entry's own options.
const std::vector<OptionSpec>& test_options();

// The tests a run uses, built from the settings, in registry order: detectors judge taxa,
// checks judge records; `entries` and `names()` cover both, detectors first.
struct ActiveTests {
  std::vector<std::unique_ptr<Detector>> detectors;
  std::vector<std::unique_ptr<RecordCheck>> checks;
  std::vector<const TestEntry*> entries;
  std::vector<std::string> names() const;
  std::vector<std::vector<std::string>> extra_columns() const;  // per entry
};
ActiveTests activate_tests(const ScreenSettings& settings);

// Throws UsageError for an unknown or missing test, or a test's own cross-check.
void validate_tests(const ScreenSettings& settings);

}  // namespace envsift
