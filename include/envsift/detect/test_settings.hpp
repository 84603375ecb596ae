// The tests' settings: those several tests share (--min-records, --scale, --seed, ...) as plain
// members, and each test's own settings in a struct declared beside the test (RobustZSettings in
// robust_z.hpp, ...), kept in `own` by its type, so that a test adds a setting without touching
// this file. `TestSettings{}` holds every registered test's defaults (test_registry.cpp).
#pragma once
#include <any>
#include <cstddef>
#include <map>
#include <string>
#include <typeindex>
#include <vector>

namespace envsift {

// How robust z and the Mahalanobis tests measure distance on a layer.
enum class Scale { mad, skew };
// Whether a taxon with two separate populations is judged as two.
enum class PopulationMode { split, one };
// How the tests' severities make a record's score.
enum class Combine { max, mean };
// How flags are decided (score/flag_rule.hpp): at a share of clean records, at a false discovery
// rate per taxon, or by each test's own cutoff.
enum class FlagRule { share, fdr, cutoffs };

// Each test's own settings struct, one value per type (a copyable struct with defaults).
class OwnSettings {
 public:
  void add(const std::any& defaults) { values_[defaults.type()] = defaults; }
  // The test's settings; its defaults if nobody set them.
  template <class T>
  T& get() {
    std::any& a = values_[typeid(T)];
    if (!a.has_value()) a = T{};
    return std::any_cast<T&>(a);
  }
  template <class T>
  const T& get() const {
    static const T defaults{};
    const auto it = values_.find(typeid(T));
    return it == values_.end() ? defaults : std::any_cast<const T&>(it->second);
  }

 private:
  std::map<std::type_index, std::any> values_;
};

struct TestSettings {
  TestSettings();                     // the registry's default tests, each test's own defaults
  std::vector<std::string> tests;     // the taxon tests to run (--tests)
  std::size_t min_records = 10;       // per layer (one-layer tests) or complete rows (Mahalanobis)
  double common_share = 0.05;         // a value this share of the reference holds is not flagged
  Scale scale = Scale::mad;
  bool all_records = false;           // estimate from every record, not one per distinct cell
  unsigned long long seed = 1;        // randomised tests
  PopulationMode populations = PopulationMode::split;
  Combine combine = Combine::mean;    // (docs/evaluation.md)
  double max_flagged_share = 0.15;    // population guard
  // cutoffs until the probabilities keep their promise on every terrain (docs/methods.md)
  FlagRule flag_rule = FlagRule::cutoffs;
  double flag_share = 0.01;           // the knob: share of clean records flagged, or the FDR
  OwnSettings own;                    // each test's own (RobustZSettings, LandscapeSettings, ...)
};

}  // namespace envsift
