// Mahalanobis distance of each record from its taxon's centre, with a chi-square cutoff.
// `Mahalanobis` uses the classical mean and covariance; `RobustMahalanobis` (robust_mahalanobis.hpp)
// the reweighted FAST-MCD estimates. Both work in the same reduced space (see the .cpp).
#pragma once
#include "envsift/detect/test_settings.hpp"
#include <cstddef>
#include <cstdint>

#include <Eigen/Core>

#include "envsift/detect/detector.hpp"

namespace envsift {

struct MahalanobisOptions {
  double quantile = 0.975;             // cutoff χ²_{k, quantile}, k = dimensions used
  std::size_t min_records = 10;        // fewer complete reference rows: not judged
  std::size_t rows_per_dimension = 3;  // at most ⌊rows / 3⌋ dimensions are used
  double eigen_floor = 1e-6;           // components with eigenvalue < floor · largest are dropped
  // Measure each layer on the taxon's skew-adjusted scale first (skew_scale.hpp): distance from
  // the median in units of the side's adjusted-boxplot scale, so a long tail is not an outlier.
  bool skew_adjusted = false;  // off by default, as for robust z (docs/evaluation.md)
};

struct Estimate {
  Eigen::VectorXd center;
  Eigen::MatrixXd scatter;
};

class Mahalanobis : public Detector {
 public:
  explicit Mahalanobis(MahalanobisOptions options = {}) : options_(options) {}
  static constexpr const char* kName = "mahalanobis";
  std::string name() const override { return kName; }
  std::vector<std::string> extra_columns() const override { return {"dims"}; }
  std::vector<Finding> judge(const TaxonValues& taxon) const final;

 protected:
  // Location and scatter of the reference scores (rows × dimensions). `standardised` holds the
  // same rows on the standardised layers and `basis` maps them to scores (scores = standardised ·
  // basis); an estimator that is not rotation-equivariant may work on those instead.
  virtual Estimate estimate(const Eigen::MatrixXd& scores, const Eigen::MatrixXd& standardised,
                            const Eigen::MatrixXd& basis, std::uint64_t seed) const;
  const MahalanobisOptions& options() const { return options_; }
  // How often a clean record has D² at least `d2` in `dims` dimensions when the estimate came
  // from `rows` reference rows that include the record (one per distinct cell).
  virtual double tail(double d2, std::size_t dims, std::size_t rows) const;

 private:
  struct FittedSpace;
  std::vector<Finding> judge_values(const TaxonValues& taxon) const;
  Finding judge_record(const TaxonValues& taxon, Eigen::Index row, const FittedSpace& fitted) const;
  MahalanobisOptions options_;
};

// The space the distances are measured in: layers with spread, standardised, projected on the
// leading principal components of their correlation matrix.
struct ReducedSpace {
  std::vector<std::size_t> layers;  // layers used (those with non-zero spread)
  Eigen::VectorXd mean, scale;      // per used layer
  Eigen::MatrixXd basis;            // used layers × k, orthonormal columns
  std::size_t dimensions() const { return static_cast<std::size_t>(basis.cols()); }
};
// `complete`: reference rows with every layer finite. Returns a space with 0 dimensions when
// nothing is left.
ReducedSpace reduce(const Eigen::MatrixXd& complete, const MahalanobisOptions& options);

// Both Mahalanobis tests' own settings in a run (TestSettings::own; --chi2-quantile), and the
// options they take from a run's settings (mahalanobis_entry.cpp).
struct MahalanobisSettings {
  double chi2_quantile = 0.995;  // (docs/evaluation.md)
};
MahalanobisOptions mahalanobis_options(const TestSettings& settings);

}  // namespace envsift
