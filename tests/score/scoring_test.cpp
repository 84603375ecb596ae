// The combined score and the ranking, as documented in docs/methods.md ("How suspicion is scored"):
// score = max over the tests that judged a record of its severity (1 at the test's cutoff);
// rank 1 = highest score, ties in input order, unscored records unranked.
#include "envsift/score/scoring.hpp"

#include <gtest/gtest.h>

namespace envsift {
namespace {

Finding judged(double statistic, double threshold, double severity, std::vector<std::string> reasons = {}) {
  Finding f;
  f.tested = true;
  f.statistic = statistic;
  f.threshold = threshold;
  f.severity = severity;
  f.flagged = statistic > threshold;
  f.reasons = std::move(reasons);
  return f;
}

TEST(Scoring, ScoreIsTheLargestSeverityAndFlagsNameTheTestsThatFired) {
  const Finding z = judged(4.5, 3.0, 1.5, {"dem far out"});
  const Finding j = judged(2.0, 4.4, 2.0 / 4.4);
  const Finding m = judged(40.0, 10.0, 2.0, {"D² large"});
  Finding untested;
  untested.untested_code = "too_few_records:x";
  const Verdict v = combine({&z, &j, &m, &untested}, {"robust_z", "reverse_jackknife", "mahalanobis", "x"});
  ASSERT_TRUE(v.score.has_value());
  EXPECT_DOUBLE_EQ(*v.score, 2.0);
  EXPECT_EQ(v.flags, (std::vector<std::string>{"robust_z", "mahalanobis"}));
  EXPECT_EQ(v.reasons, (std::vector<std::string>{"D² large", "dem far out"}));  // most severe test first
  EXPECT_EQ(v.codes, (std::vector<std::string>{"too_few_records:x"}));
}

TEST(Scoring, NothingJudgedMeansNoScore) {
  Finding a;
  a.untested_code = "too_few_records:robust_z";
  EXPECT_FALSE(combine({&a}, {"robust_z"}).score.has_value());
}

TEST(Scoring, RanksHighestFirstTiesInInputOrderUnscoredEmpty) {
  const auto rank = rank_by_score({0.5, std::nullopt, 2.0, 0.5, 3.0});
  EXPECT_EQ(rank, (std::vector<std::size_t>{3, 0, 2, 4, 1}));
}

}  // namespace
}  // namespace envsift
