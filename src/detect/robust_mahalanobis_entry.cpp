// mahalanobis_robust in the catalog (test_registry.cpp). Its cutoff is --chi2-quantile, declared
// by the classical test's entry and shared.
#include <string>

#include "envsift/detect/robust_mahalanobis.hpp"
#include "envsift/detect/test_registry.hpp"

namespace envsift {

TestEntry robust_mahalanobis_entry() {
  TestEntry e;
  e.name = RobustMahalanobis::kName;
  e.help = "all layers together, minimum covariance determinant (MCD) estimates that outliers cannot distort "
           "(errors in batches cannot mask each other);";
  e.own_defaults = RobustMahalanobisSettings{};
  e.options.push_back(choice_option(
      "mcd-start", "where mahalanobis_robust's MCD search starts. deterministic: from six robust estimates (DetMCD, "
                   "Hubert, Rousseeuw & Verdonck 2012), fast and the same every run; random: from 500 random subsets "
                   "(FAST-MCD, Rousseeuw & Van Driessen 1999, seeded by --seed), slower, sometimes a lower determinant. "
                   "When more than half of a taxon's places lie on a hyperplane, FAST-MCD's handling is used either way",
      own(&RobustMahalanobisSettings::mcd_start),
      Choices<McdEngine>{{"deterministic", McdEngine::deterministic}, {"random", McdEngine::fast}}));
  e.describe = [](const TestSettings& s) {
    const bool random = s.own.get<RobustMahalanobisSettings>().mcd_start == McdEngine::fast;
    return std::string(RobustMahalanobis::kName) + ": the same with reweighted MCD centre and scatter (" +
           (random ? "FAST-MCD, 500 random starts, seed " + std::to_string(s.seed)
                   : std::string("deterministic starts, DetMCD")) +
           ")";
  };
  e.make_detector = [](const TestSettings& s) -> std::unique_ptr<Detector> {
    McdOptions mcd;
    mcd.engine = s.own.get<RobustMahalanobisSettings>().mcd_start;
    return std::make_unique<RobustMahalanobis>(mahalanobis_options(s), mcd);
  };
  return e;
}

}  // namespace envsift
