// Robust Mahalanobis distance: the same test as mahalanobis.hpp with the taxon's centre and
// scatter estimated by the reweighted MCD (deterministic_mcd.hpp by default, FAST-MCD on
// request), so that the outliers themselves cannot pull the centre towards them or inflate the
// scatter (masking).
#pragma once
#include "envsift/detect/fast_mcd.hpp"
#include "envsift/detect/mahalanobis.hpp"

namespace envsift {

// Its own settings in a run (TestSettings::own; --mcd-start).
struct RobustMahalanobisSettings {
  McdEngine mcd_start = McdEngine::deterministic;
};

class RobustMahalanobis : public Mahalanobis {
 public:
  RobustMahalanobis(MahalanobisOptions options = {}, McdOptions mcd = {}) : Mahalanobis(options), mcd_(mcd) {}
  static constexpr const char* kName = "mahalanobis_robust";
  std::string name() const override { return kName; }

 protected:
  Estimate estimate(const Eigen::MatrixXd& scores, const Eigen::MatrixXd& standardised, const Eigen::MatrixXd& basis,
                    std::uint64_t seed) const override;
  double tail(double d2, std::size_t dims, std::size_t rows) const override;

 private:
  McdOptions mcd_;
};

// How much larger robust D² runs than χ²_k in its upper tail for a clean taxon of n rows in k
// dimensions (robust_mahalanobis.cpp); 1 for large n.
double robust_distance_inflation(std::size_t dims, std::size_t rows);

}  // namespace envsift
