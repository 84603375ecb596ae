// How often a test's probability is at most a level on clean data: taxa of n records drawn from a
// k-variate normal with correlated layers (a fixed seed), each judged by the test as a screen
// would (reference = records). The share is what the test's probability promises to be the
// level; it is what a calibration is measured and checked by (calibration/ and tests/detect/).
#pragma once
#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

#include <Eigen/Core>

#include "envsift/detect/detector.hpp"
#include "envsift/seeded_random.hpp"

namespace envsift::calibration {

// n rows of k layers: x = L z with z standard normal and L mixing neighbouring layers (correlation
// about 0.5 between neighbours), so that the tests see collinear layers as climate layers are.
inline Eigen::MatrixXd correlated_normal(std::size_t n, std::size_t k, SeededRandom& random) {
  Eigen::MatrixXd x(static_cast<Eigen::Index>(n), static_cast<Eigen::Index>(k));
  for (Eigen::Index r = 0; r < x.rows(); ++r) {
    double previous = random.normal();
    for (Eigen::Index c = 0; c < x.cols(); ++c) {
      const double z = random.normal();
      x(r, c) = 0.7 * z + 0.7 * previous + 10 * static_cast<double>(c);
      previous = z;
    }
  }
  return x;
}

struct NullShare {
  std::size_t records = 0, at_or_below = 0;
  std::vector<double> probabilities, statistics;  // every clean record's, for quantiles
  double share() const { return records ? static_cast<double>(at_or_below) / static_cast<double>(records) : 0; }
};

// `taxa` clean taxa of n records in k layers judged by `test`; the share with probability ≤ level.
inline NullShare null_share(const Detector& test, std::size_t n, std::size_t k, std::size_t taxa, double level,
                            std::uint64_t seed) {
  SeededRandom random(seed);
  NullShare s;
  std::vector<std::string> names;
  for (std::size_t c = 0; c < k; ++c) names.push_back("layer" + std::to_string(c));
  for (std::size_t t = 0; t < taxa; ++t) {
    const Eigen::MatrixXd x = correlated_normal(n, k, random);
    const TaxonValues values{x, x, names, seed + t};
    for (const Finding& f : test.judge(values)) {
      if (!f.tested) continue;
      ++s.records;
      s.at_or_below += f.probability <= level;
      s.probabilities.push_back(f.probability);
      s.statistics.push_back(f.statistic);
    }
  }
  return s;
}

}  // namespace envsift::calibration
