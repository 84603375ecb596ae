// Robust z (median / MAD).
// Source: Leys, C., Ley, C., Klein, O., Bernard, P. & Licata, L. (2013) Detecting outliers: Do not
// use standard deviation around the mean, use absolute deviation around the median. Journal of
// Experimental Social Psychology 49:764-766.
//
//   MAD = median_i |x_i − median(x)|,   s = b · MAD,  b = 1.4826 = 1/Φ⁻¹(3/4)
//   z_i = (x_i − median(x)) / s,        flagged when |z_i| > cutoff
//
// Leys et al. call 3 very conservative, 2.5 moderately and 2 poorly conservative; envsift's
// default is 3 because a record is judged on several layers at once.
//
// MAD = 0 happens when more than half the values are equal (many records in one cell, a layer
// of few classes). Sn and Qn (Rousseeuw & Croux 1993) are then 0 as well, so they are no
// fallback; envsift uses s = 1.253314 · mean_i |x_i − median(x)| instead (1.253314 = √(π/2)
// makes the mean absolute deviation consistent with the normal SD; this MAD = 0 rule is the
// one IBM documents for its modified z-score — from memory). Only when every value is equal is
// the layer not judged (`no_spread:LAYER`). A layer with fewer than `min_records` reference values
// is not judged either (`too_few_records:robust_z`).
#include "envsift/detect/robust_z.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>

namespace envsift {
namespace {

constexpr double kMadToSd = 1.4826;
constexpr double kMeanAdToSd = 1.253314;

double median_in_place(std::vector<double>& v) {
  const std::size_t n = v.size(), mid = n / 2;
  std::nth_element(v.begin(), v.begin() + static_cast<std::ptrdiff_t>(mid), v.end());
  const double upper = v[mid];
  if (n % 2) return upper;
  const double lower = *std::max_element(v.begin(), v.begin() + static_cast<std::ptrdiff_t>(mid));
  return (lower + upper) / 2;
}

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

std::vector<Finding> RobustZ::judge(const TaxonValues& taxon) const {
  const auto rows = static_cast<std::size_t>(taxon.records.rows());
  const auto layers = static_cast<std::size_t>(taxon.records.cols());
  std::vector<Finding> findings(rows);
  std::vector<std::vector<std::pair<double, std::string>>> drivers(rows);  // (|z|, words) per record
  std::string untested;
  for (std::size_t l = 0; l < layers; ++l) {
    const auto column = taxon.reference.col(static_cast<Eigen::Index>(l));
    std::vector<double> ref;
    for (Eigen::Index r = 0; r < column.size(); ++r)
      if (std::isfinite(column[r])) ref.push_back(column[r]);
    const std::string& name = taxon.layer_names[l];
    if (ref.size() < options_.min_records) {
      untested = "too_few_records:" + this->name();
      continue;
    }
    const RobustSpread s = robust_spread(std::move(ref));
    if (!(s.spread > 0)) {
      untested = "no_spread:" + name;
      continue;
    }
    for (std::size_t i = 0; i < rows; ++i) {
      const double x = taxon.records(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(l));
      if (!std::isfinite(x)) continue;
      const double z = (x - s.median) / s.spread;
      Finding& f = findings[i];
      if (!f.tested || std::fabs(z) > f.statistic) f.statistic = std::fabs(z);
      f.tested = true;
      if (std::fabs(z) > options_.cutoff) drivers[i].emplace_back(std::fabs(z), describe(name, x, z, s.median));
    }
  }
  for (std::size_t i = 0; i < rows; ++i) {
    Finding& f = findings[i];
    if (!f.tested) {
      f.untested_reason = untested.empty() ? "no_values" : untested;
      continue;
    }
    f.threshold = options_.cutoff;
    f.severity = f.statistic / f.threshold;
    f.flagged = f.statistic > f.threshold;
    // the layer furthest out first; ties keep layer order
    std::stable_sort(drivers[i].begin(), drivers[i].end(),
                     [](const auto& a, const auto& b) { return a.first > b.first; });
    for (auto& d : drivers[i]) f.reasons.push_back(std::move(d.second));
  }
  return findings;
}

}  // namespace envsift
