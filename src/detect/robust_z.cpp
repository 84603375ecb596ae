// Robust z (median / MAD).
// Source: Leys, C., Ley, C., Klein, O., Bernard, P. & Licata, L. (2013) Detecting outliers: Do not
// use standard deviation around the mean, use absolute deviation around the median. Journal of
// Experimental Social Psychology 49:764-766.
//
//   MAD = median_i |x_i − median(x)|,   s = b · MAD,  b = 1.4826 = 1/Φ⁻¹(3/4)
//   z_i = (x_i − median(x)) / s,        flagged when |z_i| > cutoff
//
// Leys et al. call 3 very conservative, 2.5 moderately and 2 poorly conservative; envsift's
// default is 4 because a record is judged on several layers at once and beside two tests of all
// layers together: 4 measured best with them (docs/evaluation.md, envsift evaluate).
//
// MAD = 0 happens when more than half the values are equal (many records in one cell, a layer
// of few classes). Sn and Qn (Rousseeuw & Croux 1993) are then 0 as well, so they are no
// fallback; envsift uses s = 1.253314 · mean_i |x_i − median(x)| instead (1.253314 = √(π/2)
// makes the mean absolute deviation consistent with the normal SD; this MAD = 0 rule is the
// one IBM documents for its modified z-score — from memory). Only when every value is equal is
// the layer not judged (`no_spread:LAYER`). A layer with fewer than `min_records` reference values
// is not judged either (`too_few_records:robust_z`).
//
// Small taxa: median and MAD from n values are themselves noisy, so a cutoff that flags a share
// p of normal values when n is large flags several times p when n is small (at n = 12, |z| > 3
// flags 2.7 % of normal values instead of 0.27 %). The cutoff used is therefore
//   cutoff_n = cutoff · (1 + 6/n + 30/n²)
// envsift's fit (scripts/small-sample-cutoff, a simulation of normal samples with NumPy) to the
// quantile of |z| that flags the same share as `cutoff` does for large n: 1.90 × at n = 10,
// 1.37 × at 20, 1.06 × at 100, 1.01 × at 500 (fitted at cutoff 3; close for 2.5 to 3.5).
//
// Its probability: the normal two-sided tail of |z| / (1 + 6/n + 30/n²), the same small-sample
// widening, so that a layer's probability means the share of a clean taxon's values (normal on
// the layer, or on each side with --scale skew) at least this far out: P(|Z| > |z| / c_n).
//
// Skewed layers (rainfall, slope, distances): with `skew_adjusted` (--scale skew) each side of
// the median has its own spread, the distance to that side's adjusted-boxplot fence over 2.698
// (Hubert & Vandervieren 2008; skew_scale.cpp), which equals the SD on both sides for normal
// data, so z keeps its meaning there while a long tail stops producing flags. Both ways, no
// spread is taken below the values' resolution (skew_scale.hpp): on a layer of whole months, one
// month from the median is never many robust SDs.
#include "envsift/detect/robust_z.hpp"
#include "envsift/detect/skew_scale.hpp"
#include "envsift/detect/tail_probability.hpp"
#include "envsift/median.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>

namespace envsift {
namespace {

constexpr double kMadToSd = 1.4826;
constexpr double kMeanAdToSd = 1.253314;

std::string describe(const std::string& layer, double value, double z, double median) {
  char buf[256];
  std::snprintf(buf, sizeof buf, "%s %.6g is %.1f robust SD %s the taxon median %.6g", layer.c_str(), value,
                std::fabs(z), z > 0 ? "above" : "below", median);
  return buf;
}

}  // namespace

RobustSpread robust_spread(std::vector<double> values) {
  values.erase(std::remove_if(values.begin(), values.end(), [](double v) { return !std::isfinite(v); }),
               values.end());
  if (values.empty()) return {std::nan(""), std::nan(""), false};
  const double median = median_in_place(values);
  double mean_deviation = 0;
  for (double& v : values) {
    v = std::fabs(v - median);
    mean_deviation += v;
  }
  mean_deviation /= static_cast<double>(values.size());
  const double mad = median_in_place(values);
  if (mad > 0) return {median, kMadToSd * mad, false};
  return {median, kMeanAdToSd * mean_deviation, true};
}

namespace {

// `scale` holds one spread per side of the median: both the MAD-based spread, or with
// skew adjustment each side's own (skew_scale.hpp, the MAD-based spread where a side collapses).
class RobustZLayer : public PerLayerDetector::Layer {
 public:
  RobustZLayer(SideScales scale, double cutoff, double widening, std::string name)
      : scale_(scale), cutoff_(cutoff), widening_(widening), name_(std::move(name)) {}
  LayerVerdict judge(double x) const override {
    const double z = scale_.z(x);
    LayerVerdict v{std::fabs(z), cutoff_, "", normal_two_sided_tail(z / widening_)};
    if (v.statistic > cutoff_ || v.probability <= kWorthWords) v.reason = describe(name_, x, z, scale_.median);
    return v;
  }
  double centre() const override { return scale_.median; }
  std::pair<double, double> accepted() const override {
    return {scale_.median - cutoff_ * scale_.below, scale_.median + cutoff_ * scale_.above};
  }

 private:
  SideScales scale_;
  double cutoff_;
  double widening_;  // 1 + 6/n + 30/n²
  std::string name_;
};

}  // namespace

std::unique_ptr<PerLayerDetector::Layer> RobustZ::prepare(std::vector<double> reference, const std::string& layer) const {
  const RobustSpread s = robust_spread(reference);
  if (!(s.spread > 0)) return nullptr;
  const std::size_t n = reference.size();
  const double floor = resolution(reference);
  SideScales scale = options_.skew_adjusted ? side_scales(std::move(reference), s.spread)
                                            : SideScales{s.median, s.spread, s.spread};
  scale.below = std::max(scale.below, floor), scale.above = std::max(scale.above, floor);
  return std::make_unique<RobustZLayer>(scale, small_sample_cutoff(options_.cutoff, n), small_sample_cutoff(1, n),
                                        layer);
}

double small_sample_cutoff(double cutoff, std::size_t n) {
  const double m = static_cast<double>(n);
  return cutoff * (1 + 6 / m + 30 / (m * m));
}

}  // namespace envsift
