#include "envsift/detect/per_layer_detector.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>

#include "envsift/detect/tail_probability.hpp"

namespace envsift {

std::optional<std::pair<double, double>> PerLayerDetector::accepted_range(std::vector<double> reference,
                                                                     const std::string& layer) const {
  reference.erase(std::remove_if(reference.begin(), reference.end(), [](double v) { return !std::isfinite(v); }),
                  reference.end());
  if (reference.size() < min_records_) return std::nullopt;
  const auto prepared = prepare(std::move(reference), layer);
  if (!prepared) return std::nullopt;
  return prepared->accepted();
}

std::vector<Finding> PerLayerDetector::judge(const TaxonValues& taxon) const {
  const auto rows = static_cast<std::size_t>(taxon.records.rows());
  std::vector<Finding> findings(rows);
  std::vector<std::vector<std::pair<double, std::string>>> drivers(rows);  // (severity, words) per record
  std::string untested;
  std::vector<double> smallest(rows, 1.0);        // the smallest layer probability per record
  std::vector<std::size_t> layers_judged(rows, 0);  // layers with a probability per record
  for (Eigen::Index l = 0; l < taxon.records.cols(); ++l) {
    const std::string& name = taxon.layer_names[static_cast<std::size_t>(l)];
    std::vector<double> reference;
    for (Eigen::Index r = 0; r < taxon.reference.rows(); ++r)
      if (std::isfinite(taxon.reference(r, l))) reference.push_back(taxon.reference(r, l));
    if (reference.size() < min_records_) {
      untested = "too_few_records:" + this->name();
      continue;
    }
    std::sort(reference.begin(), reference.end());
    const std::vector<double> sorted = reference;
    const double common = std::max(2.0, common_share_ * static_cast<double>(sorted.size()));
    const auto layer = prepare(std::move(reference), name);
    if (!layer) {
      untested = "no_spread:" + name;
      continue;
    }
    for (std::size_t i = 0; i < rows; ++i) {
      const auto [lo, hi] = taxon.range(static_cast<Eigen::Index>(i), l);
      if (!std::isfinite(lo)) continue;
      const double x = std::clamp(layer->centre(), lo, hi);  // the best-fitting value in the disc
      LayerVerdict v = layer->judge(x);
      const bool unusual = v.statistic > v.threshold || v.probability <= kWorthWords;
      if (unusual) {
        const auto [first, last] = std::equal_range(sorted.begin(), sorted.end(), x);
        if (static_cast<double>(last - first) >= common) {
          v.statistic = std::min(v.statistic, v.threshold), v.reason.clear();
          if (std::isfinite(v.probability)) v.probability = 1;  // a common value is no evidence
        }
      }
      if (lo < hi && !v.reason.empty()) {
        char buf[160];
        std::snprintf(buf, sizeof buf, ", the closest value within its uncertainty disc (%.6g to %.6g)", lo, hi);
        v.reason += buf;
      }
      const double severity = v.statistic / v.threshold;
      Finding& f = findings[i];
      if (!f.tested || severity > f.severity) {
        f.statistic = v.statistic;
        f.threshold = v.threshold;
        f.severity = severity;
      }
      f.tested = true;
      if (std::isfinite(v.probability)) {
        smallest[i] = std::min(smallest[i], v.probability);
        ++layers_judged[i];
      }
      if (v.statistic > v.threshold) f.flagged = true;
      if (!v.reason.empty()) drivers[i].emplace_back(severity, std::move(v.reason));
    }
  }
  for (std::size_t i = 0; i < rows; ++i) {
    Finding& f = findings[i];
    if (!f.tested) f.untested_code = untested.empty() ? "no_values" : untested;
    if (layers_judged[i] > 0) f.probability = sidak_minimum(smallest[i], layers_judged[i]);
    std::stable_sort(drivers[i].begin(), drivers[i].end(),
                     [](const auto& a, const auto& b) { return a.first > b.first; });  // ties: layer order
    for (auto& d : drivers[i]) f.reasons.push_back(std::move(d.second));
  }
  return findings;
}

}  // namespace envsift
