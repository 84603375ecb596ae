// Reverse jackknife per layer: finds a gap that cuts a tail off a taxon's values.
#pragma once
#include <cstddef>

#include "envsift/detect/per_layer_detector.hpp"

namespace envsift {

struct ReverseJackknifeOptions {
  std::size_t min_records = 10;  // fewer reference values on a layer: that layer is not judged
  double common_share = 0.05;    // a value held by this share of the reference is not flagged
};

class ReverseJackknife : public PerLayerDetector {
 public:
  explicit ReverseJackknife(ReverseJackknifeOptions options = {})
      : PerLayerDetector(options.min_records, options.common_share) {}
  static constexpr const char* kName = "reverse_jackknife";
  static constexpr std::size_t kMinimumValues = 20;  // reverse_jackknife.cpp says why
  std::string name() const override { return kName; }
  bool flags_its_bounds() const override { return true; }

 protected:
  std::unique_ptr<Layer> prepare(std::vector<double> reference, const std::string& layer) const override;
};

// One layer's test, exposed for tests: for each value of `values`, the largest standardised gap
// that separates it into a tail (0 when none does) and the threshold t.
struct JackknifeLayer {
  std::vector<double> sorted;   // reference values, ascending
  std::vector<double> gap;      // standardised y_i per sorted value
  std::vector<std::size_t> best_in_tail;  // index of the largest gap from i outwards to its tail's end
  double mean = 0, threshold = 0;
  bool usable = false;          // false when every value is equal (no gap is possible)
  // Largest standardised gap cutting off x's tail and the sorted index of that gap's value.
  std::pair<double, std::size_t> statistic(double x) const;
};
JackknifeLayer reverse_jackknife_layer(std::vector<double> reference);

}  // namespace envsift
