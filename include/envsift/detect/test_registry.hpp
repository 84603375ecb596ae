// The catalog of tests: one entry per statistical test or record check, listed in one place
// (test_registry.cpp, one line each) in the order their columns are written. Each entry lives in
// a file of its own beside its test's numerics (src/detect/NAME_entry.cpp) and declares its name,
// whether it is a default, its own settings struct and the options bound to its members, how it
// describes itself (report, manifest, --help), how it is built, and what it needs from the run.
// Settings shared by several tests (--min-records, --scale, ...) are declared once, in
// test_options().
#pragma once
#include <any>
#include <functional>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "envsift/detect/active_tests.hpp"
#include "envsift/detect/test_settings.hpp"
#include "envsift/option_spec.hpp"
#include "envsift/sample/landscape_sample.hpp"

namespace envsift {

using TestOption = Option<TestSettings>;

// Binds an option to a member of a test's own settings struct: own(&RobustZSettings::z_cutoff).
template <class Own, class Value>
Field<TestSettings, Value> own(Value Own::*member) {
  return [member](TestSettings& t) -> Value& { return t.own.get<Own>().*member; };
}

// How the report draws a one-layer test's cutoffs on a layer's histogram: a legend label, a
// slot of the report's cutoff styles (colour and dash; one slot per test), and the caption's
// words for what the lines mean.
struct CutoffStyle {
  std::string label;  // e.g. "robust z"
  int slot = 0;       // 0: blue dashed, 1: vermillion dotted, 2: reddish purple dash-dot, 3: black long dash
  std::string words;  // e.g. "where robust z starts flagging"
};

// What the run is, as far as a test's settings can be checked against it.
struct TestContext {
  bool values_from_columns = false;  // --value-columns: no rasters to sample
};

struct TestEntry {
  std::string name;          // written to `flags`; the prefix of its columns
  bool is_default = false;   // run unless --tests says otherwise (taxon tests)
  bool needs_layers = false; // judges nothing without rasters: left out of the defaults with --value-columns
  std::string help;          // one line for the --tests help
  std::any own_defaults;     // its own settings struct as default-constructed; empty when it has none
  std::vector<TestOption> options;  // its own options (the shared ones are in test_options())
  // One line for the report and the run's description: what it flags, with the cutoff in use.
  std::function<std::string(const TestSettings&)> describe;
  // A taxon test: builds its detector. Empty for a record check.
  std::function<std::unique_ptr<Detector>(const TestSettings&)> make_detector;
  // A record check: builds it, and says whether the settings ask for it (--tests chooses taxon
  // tests; a record check is asked for by its own options).
  std::function<std::unique_ptr<RecordCheck>(const TestSettings&)> make_check;
  std::function<bool(const TestSettings&)> wanted_check;
  std::optional<CutoffStyle> cutoffs;  // one-layer tests: drawn on the report's histograms
  // Cross-checks of its settings beyond their bounds; throws UsageError.
  std::function<void(const TestSettings&, const TestContext&)> validate;
  // Needs from the run. A landscape around each taxon (TaxonValues::landscape), drawn as these
  // options say; empty: none.
  std::function<LandscapeOptions(const TestSettings&)> landscape;
  // The layer it holds to be elevation in metres, "" when none is named (the report's relief and
  // the summary's elevation band use it).
  std::function<std::string(const TestSettings&)> elevation_layer;
};

const std::vector<TestEntry>& test_registry();
const TestEntry* find_test(const std::string& name);
// The tests a screen runs unless told otherwise (the registry's defaults).
std::vector<std::string> default_test_names();

// --tests and the options shared by several tests, then every entry's own options.
const std::vector<TestOption>& test_options();

ActiveTests activate_tests(const TestSettings& settings, const TestContext& context);

// The elevation layer some registered test is set to use ("" = none).
std::string elevation_layer(const TestSettings& settings);

// Throws UsageError for an unknown or missing test, or a test's own cross-check.
void validate_tests(const TestSettings& settings, const TestContext& context);

}  // namespace envsift
