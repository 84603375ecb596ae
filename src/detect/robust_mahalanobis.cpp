#include "envsift/detect/robust_mahalanobis.hpp"

#include "envsift/detect/deterministic_mcd.hpp"

namespace envsift {

// DetMCD standardises each column and starts from coordinatewise medians and rank correlations:
// it is not rotation-equivariant, and its starts are meant for the variables themselves. When
// every component is kept (the basis is square) it therefore runs on the standardised layers and
// its estimate is rotated into the scores (exact, the basis being orthonormal); the result is
// then the MCD of the layers as given. With fewer components it runs on the scores.
Estimate RobustMahalanobis::estimate(const Eigen::MatrixXd& scores, const Eigen::MatrixXd& standardised,
                                     const Eigen::MatrixXd& basis, std::uint64_t seed) const {
  McdOptions o = mcd_;
  o.seed = seed;
  if (o.engine == McdEngine::deterministic && basis.rows() == basis.cols()) {
    const McdResult r = minimum_covariance_determinant(standardised, o);
    return {basis.transpose() * r.center, basis.transpose() * r.scatter * basis};
  }
  McdResult r = minimum_covariance_determinant(scores, o);
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
  e.help = "all layers together, minimum covariance determinant (MCD) estimates that outliers cannot distort "
           "(errors in batches cannot mask each other);";
  e.options.push_back(choice_option(
      "mcd-start", "where mahalanobis_robust's MCD search starts. deterministic: from six robust estimates (DetMCD, "
                   "Hubert, Rousseeuw & Verdonck 2012), fast and the same every run; random: from 500 random subsets "
                   "(FAST-MCD, Rousseeuw & Van Driessen 1999, seeded by --seed), slower, sometimes a lower determinant. "
                   "When more than half of a taxon's places lie on a hyperplane, FAST-MCD's handling is used either way",
      [](ScreenSettings& s) -> std::string& { return s.tests.mcd_start; }, {"deterministic", "random"}));
  e.describe = [](const ScreenSettings& s) {
    return std::string(RobustMahalanobis::kName) + ": the same with reweighted MCD centre and scatter (" +
           (s.tests.mcd_start == "random" ? "FAST-MCD, 500 random starts, seed " + std::to_string(s.tests.seed)
                                          : std::string("deterministic starts, DetMCD")) +
           ")";
  };
  e.make_detector = [](const ScreenSettings& s) -> std::unique_ptr<Detector> {
    McdOptions mcd;
    mcd.engine = s.tests.mcd_start == "random" ? McdEngine::fast : McdEngine::deterministic;
    return std::make_unique<RobustMahalanobis>(mahalanobis_options(s), mcd);
  };
  return e;
}

}  // namespace envsift
