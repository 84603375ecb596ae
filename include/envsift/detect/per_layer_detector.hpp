// The shared frame of the one-layer tests (robust z, reverse jackknife): each layer is judged on
// its own from the taxon's reference values; a record's finding is its most severe layer, and
// its reasons list every layer beyond the cutoff, most severe first.
//
// Its probability: a layer's tail probability p_l (NaN when the test only ranks), and for the
// record the smallest over the L layers it was judged on, made a probability for all L by
// Šidák's rule, 1 − (1 − min p_l)^L. Šidák, Z. (1967) Rectangular confidence regions for the
// means of multivariate normal distributions. J. Am. Stat. Assoc. 62:626-633: for two-sided
// tests of jointly normal values the rule holds whatever their correlation (conservative when
// layers are correlated, as climate layers are), so no layer count inflates the flags.
#pragma once
#include <cmath>
#include <cstddef>
#include <memory>
#include <optional>
#include <utility>
#include <string>
#include <vector>

#include "envsift/detect/detector.hpp"

namespace envsift {

struct LayerVerdict {
  double statistic;
  double threshold;  // flagged when statistic > threshold
  std::string reason;  // plain words, filled when flagged or its probability is worth words
  double probability = std::nan("");  // the layer's tail probability; NaN: the test only ranks
};

class PerLayerDetector : public Detector {
 public:
  std::vector<Finding> judge(const TaxonValues& taxon) const final;

  // One layer's statistics, ready to judge values.
  class Layer {
   public:
    virtual ~Layer() = default;
    virtual LayerVerdict judge(double x) const = 0;
    // The value that fits best; within a disc, the value closest to it is judged (the test's
    // statistic grows with the distance from it on either side).
    virtual double centre() const = 0;
    // Where flagging starts on each side, for plots: values between low and high are not flagged
    // (NaN: no bound on that side; reverse jackknife flags the bounds themselves).
    virtual std::pair<double, double> accepted() const = 0;
  };

  // The accepted range on one layer from its reference values (as judge() prepares it); nothing
  // when the layer could not be judged (too few values, no spread).
  std::optional<std::pair<double, double>> accepted_range(std::vector<double> reference,
                                                         const std::string& layer) const override;

 protected:
  // common_share: a value that at least this share of the reference values (and two of them)
  // hold exactly is not an outlier on that layer — a layer of few classes (months, soil types)
  // has a second-commonest class, not outliers; its statistic is capped at the cutoff.
  PerLayerDetector(std::size_t min_records, double common_share) : min_records_(min_records), common_share_(common_share) {}

  // From the layer's finite reference values (at least min_records of them); nullptr when the
  // values have no spread to judge by.
  virtual std::unique_ptr<Layer> prepare(std::vector<double> reference, const std::string& layer) const = 0;

 private:
  std::size_t min_records_;
  double common_share_;
};

}  // namespace envsift
