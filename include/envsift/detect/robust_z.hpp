// Robust z per layer: how many robust standard deviations a record lies from its taxon's median.
#pragma once
#include <cstddef>
#include <vector>

#include "envsift/detect/per_layer_detector.hpp"

namespace envsift {

// Its own settings in a run (TestSettings::own; --z-cutoff).
struct RobustZSettings {
  double z_cutoff = 4.0;  // (docs/evaluation.md)
};

struct RobustZOptions {
  double cutoff = 3.0;          // |z| beyond this flags (Leys et al. 2013: 3 = very conservative)
  std::size_t min_records = 10;  // fewer reference values on a layer: that layer is not judged
  // Scale each side of the median by its adjusted-boxplot fence (skew_scale.hpp) instead of one
  // MAD for both: a long tail on one side is then not flagged, a short one is judged tightly.
  // Off by default: the evaluation (docs/evaluation.md) measured it worse on virtual taxa.
  bool skew_adjusted = false;
  double common_share = 0.05;    // a value held by this share of the reference is not flagged
};

class RobustZ : public PerLayerDetector {
 public:
  explicit RobustZ(RobustZOptions options = {})
      : PerLayerDetector(options.min_records, options.common_share), options_(options) {}
  static constexpr const char* kName = "robust_z";
  std::string name() const override { return kName; }

 protected:
  std::unique_ptr<Layer> prepare(std::vector<double> reference, const std::string& layer) const override;

 private:
  RobustZOptions options_;
};

// Centre and robust spread of the finite values: the median, and 1.4826 · MAD, or — when more
// than half the values are equal and MAD = 0 — 1.253314 · mean absolute deviation from the
// median. `spread` is 0 only when all values are equal; both are NaN for no values.
// The cutoff for a taxon of n values: `cutoff` · (1 + 6/n + 30/n²) (robust_z.cpp says why).
double small_sample_cutoff(double cutoff, std::size_t n);

struct RobustSpread {
  double median;
  double spread;
  bool from_mean_deviation;  // the MAD = 0 fallback was used
};
RobustSpread robust_spread(std::vector<double> values);

}  // namespace envsift
