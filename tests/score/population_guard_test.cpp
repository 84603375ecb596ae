// The population guard (population_guard.hpp) — envsift's own rule, checked on hand-made
// findings: withheld only above the share and the minimum count, statistics kept, severity capped
// at 1, the code added.
#include <gtest/gtest.h>

#include "envsift/score/population_guard.hpp"

namespace envsift {
namespace {

std::vector<Finding> findings(std::size_t judged, std::size_t flagged) {
  std::vector<Finding> f(judged + 1);  // one more, untested
  for (std::size_t i = 0; i < judged; ++i) {
    f[i].tested = true;
    f[i].statistic = i < flagged ? 5.0 : 1.0;
    f[i].threshold = 3.0;
    f[i].severity = f[i].statistic / 3.0;
    f[i].flagged = i < flagged;
    if (f[i].flagged) f[i].reasons = {"far"};
  }
  return f;
}

TEST(PopulationGuard, WithholdsOnlyAboveTheShareAndCount) {
  const PopulationGuard guard{0.15, 5};
  auto few = findings(100, 15);  // 15 % exactly: stands
  EXPECT_LT(withhold_population_flags(few, "robust_z", guard), 0);
  EXPECT_TRUE(few[0].flagged);
  auto small = findings(20, 4);  // 20 % but only 4 records: stands
  EXPECT_LT(withhold_population_flags(small, "robust_z", guard), 0);
  auto many = findings(100, 30);
  EXPECT_DOUBLE_EQ(withhold_population_flags(many, "mahalanobis", guard), 0.30);
  for (std::size_t i = 0; i < 30; ++i) {
    EXPECT_FALSE(many[i].flagged);
    EXPECT_DOUBLE_EQ(many[i].statistic, 5.0);  // the statistic stays
    EXPECT_DOUBLE_EQ(many[i].severity, 1.0);   // ranked at the cutoff
    EXPECT_TRUE(many[i].reasons.empty());
    EXPECT_EQ(many[i].codes, std::vector<std::string>{"looks_multimodal:mahalanobis"});
  }
  EXPECT_TRUE(many[50].codes.empty());  // records it never flagged carry no code
}

}  // namespace
}  // namespace envsift
