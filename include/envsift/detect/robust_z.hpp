// Robust z per layer: how many scaled MADs a record lies from its taxon's median.
#pragma once
#include <cstddef>

#include "envsift/detect/detector.hpp"

namespace envsift {

struct RobustZOptions {
  double cutoff = 3.0;            // |z| beyond this flags (Leys et al. 2013: 3 = very conservative)
  std::size_t min_records = 8;    // fewer reference values on a layer: that layer is not tested
};

class RobustZ : public Detector {
 public:
  explicit RobustZ(RobustZOptions options = {}) : options_(options) {}
  std::string name() const override { return "robust_z"; }
  std::vector<Finding> judge(const TaxonValues& taxon) const override;

 private:
  RobustZOptions options_;
};

// Median and scaled MAD (1.4826 · MAD) of the finite values; NaN for an empty input.
struct Spread {
  double median;
  double scaled_mad;
};
Spread median_and_scaled_mad(std::vector<double> values);

}  // namespace envsift
