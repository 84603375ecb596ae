#include "envsift/detect/robust_mahalanobis.hpp"

namespace envsift {

Estimate RobustMahalanobis::estimate(const Eigen::MatrixXd& scores, std::uint64_t seed) const {
  McdOptions o = mcd_;
  o.seed = seed;
  McdResult r = fast_mcd(scores, o);
  return {std::move(r.center), std::move(r.scatter)};
}

}  // namespace envsift

// Registry entry (detect/test_registry.cpp). Its cutoff is --chi2-quantile, declared by the
// classical test's entry and shared.
#include "envsift/detect/test_registry.hpp"

namespace envsift {

TestEntry robust_mahalanobis_entry() {
  TestEntry e;
  e.name = RobustMahalanobis::kName;
  e.help = "all layers together, FAST-MCD estimates that outliers cannot distort (add it when errors come in "
           "batches that could mask each other; it costs most of the time).";
  e.describe = [](const ScreenSettings& s) {
    return std::string(RobustMahalanobis::kName) +
           ": the same with reweighted FAST-MCD centre and scatter (seed " + std::to_string(s.tests.seed) + ")";
  };
  e.make_detector = [](const ScreenSettings& s) -> std::unique_ptr<Detector> {
    return std::make_unique<RobustMahalanobis>(mahalanobis_options(s), McdOptions{});
  };
  return e;
}

}  // namespace envsift
