// mahalanobis in the catalog (test_registry.cpp). Its --chi2-quantile is shared with
// mahalanobis_robust (MahalanobisSettings).
#include <cstdio>

#include "envsift/detect/mahalanobis.hpp"
#include "envsift/detect/test_registry.hpp"

namespace envsift {

MahalanobisOptions mahalanobis_options(const TestSettings& s) {
  MahalanobisOptions o;
  o.quantile = s.own.get<MahalanobisSettings>().chi2_quantile;
  o.min_records = s.min_records;
  o.skew_adjusted = s.scale == Scale::skew;
  return o;
}

TestEntry mahalanobis_entry() {
  TestEntry e;
  e.name = Mahalanobis::kName;
  e.is_default = true;
  e.help = "all layers together, classical mean/covariance;";
  e.own_defaults = MahalanobisSettings{};
  e.options.push_back(real_option("chi2-quantile", "Q",
                                  "the Mahalanobis tests flag D² above the Q quantile of chi-square (Rousseeuw & van "
                                  "Zomeren 1990 use 0.975)",
                                  own(&MahalanobisSettings::chi2_quantile), inside(0, 1)));
  e.describe = [](const TestSettings& s) {
    char q[32];
    std::snprintf(q, sizeof q, "%.3f", s.own.get<MahalanobisSettings>().chi2_quantile);
    return std::string(Mahalanobis::kName) + ": flags D² above the " + q +
           " quantile of χ² (classical mean and covariance, all layers together)";
  };
  e.make_detector = [](const TestSettings& s) -> std::unique_ptr<Detector> {
    return std::make_unique<Mahalanobis>(mahalanobis_options(s));
  };
  return e;
}

}  // namespace envsift
