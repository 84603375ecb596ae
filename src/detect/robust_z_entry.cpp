// robust_z in the catalog (test_registry.cpp): its option, words and construction.
#include <cstdio>

#include "envsift/detect/robust_z.hpp"
#include "envsift/detect/test_registry.hpp"

namespace envsift {

TestEntry robust_z_entry() {
  TestEntry e;
  e.name = RobustZ::kName;
  e.is_default = true;
  e.help = "one layer at a time, distance from the taxon's median in robust SDs;";
  e.own_defaults = RobustZSettings{};
  e.options.push_back(real_option("z-cutoff", "Z",
                                  "robust_z flags |z| > Z. 3 is 'very conservative' in Leys et al. (2013); envsift "
                                  "uses 4 because a record is judged on every layer and by the tests of all layers "
                                  "together (docs/evaluation.md); lower values flag more good records",
                                  own(&RobustZSettings::z_cutoff), above(0)));
  e.describe = [](const TestSettings& s) {
    char cutoff[32];
    std::snprintf(cutoff, sizeof cutoff, "%.2f", s.own.get<RobustZSettings>().z_cutoff);
    return std::string(RobustZ::kName) + ": flags a value more than " + cutoff +
           " robust SD (1.4826 × MAD) from the taxon's median on any layer, times (1 + 6/n + 30/n²) for n values";
  };
  e.make_detector = [](const TestSettings& s) -> std::unique_ptr<Detector> {
    RobustZOptions o;
    o.cutoff = s.own.get<RobustZSettings>().z_cutoff;
    o.min_records = s.min_records;
    o.skew_adjusted = s.scale == Scale::skew;
    o.common_share = s.common_share;
    return std::make_unique<RobustZ>(o);
  };
  e.cutoffs = CutoffStyle{"robust z", 0, "where robust z starts flagging"};
  return e;
}

}  // namespace envsift
