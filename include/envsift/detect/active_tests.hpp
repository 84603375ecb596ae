// The tests a run uses, as built from the catalog (test_registry.hpp) for its settings.
#pragma once
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "envsift/detect/detector.hpp"
#include "envsift/detect/record_check.hpp"
#include "envsift/detect/test_settings.hpp"
#include "envsift/sample/landscape_sample.hpp"

namespace envsift {

struct TestEntry;  // test_registry.hpp

// The tests a run uses, built from the settings, in registry order: detectors judge taxa,
// checks judge records; `entries` and `names()` cover both, detectors first.
struct ActiveTests {
  std::vector<std::unique_ptr<Detector>> detectors;
  std::vector<std::unique_ptr<RecordCheck>> checks;
  std::vector<const TestEntry*> entries;
  std::vector<std::string> names() const;
  std::vector<std::vector<std::string>> extra_columns() const;  // per entry
  // What the active tests need from the run (the first entry that names one).
  std::optional<LandscapeOptions> landscape(const TestSettings& settings) const;
};

}  // namespace envsift
