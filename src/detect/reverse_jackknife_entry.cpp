// reverse_jackknife in the catalog (test_registry.cpp): no option of its own.
#include <algorithm>
#include <string>

#include "envsift/detect/reverse_jackknife.hpp"
#include "envsift/detect/test_registry.hpp"

namespace envsift {

TestEntry reverse_jackknife_entry() {
  TestEntry e;
  e.name = ReverseJackknife::kName;
  e.help = "one layer at a time, a gap cutting off a tail;";
  e.describe = [](const TestSettings& s) {
    return std::string(ReverseJackknife::kName) +
           ": flags a value beyond a gap that cuts a tail off the taxon's values on any layer (gap statistic > 0.95 √n + 0.2; "
           "at least " + std::to_string(std::max(s.min_records, ReverseJackknife::kMinimumValues)) + " values)";
  };
  e.make_detector = [](const TestSettings& s) -> std::unique_ptr<Detector> {
    return std::make_unique<ReverseJackknife>(
        ReverseJackknifeOptions{std::max(s.min_records, ReverseJackknife::kMinimumValues), s.common_share});
  };
  e.cutoffs = CutoffStyle{"jackknife", 1, "the reverse jackknife's cut"};
  return e;
}

}  // namespace envsift
