// The flag rule on hand-computed cases. Cauchy combination: Liu & Xie (2020) eq. 1-2, worked by
// hand here; Benjamini & Hochberg (1995): the step-up rule p_(i) ≤ i q / m, worked by hand.
#include "envsift/score/flag_rule.hpp"

#include <gtest/gtest.h>

#include <cmath>

#include "envsift/score/scoring.hpp"

namespace envsift {
namespace {

Finding with_p(double p) {
  Finding f;
  f.tested = true;
  f.probability = p;
  f.severity = 1;
  f.statistic = 1, f.threshold = 1;
  return f;
}

// Two tests that each find a record a little unusual (p = 0.02 each) flag it together at 1 %?
// T = ½ (cot(0.02π) + cot(0.02π)) = cot(0.02π) = 15.894; p = arctan(1/T)/π = 0.02: identical
// evidence is not counted twice — not flagged at 0.01; with a third at 0.001 it is.
TEST(FlagRule, IdenticalEvidenceIsNotCountedTwiceAndStrongEvidenceCarries) {
  const FlagSettings share{FlagRule::share, 0.01};
  std::vector<std::vector<Finding>> two{{with_p(0.02)}, {with_p(0.02)}};
  auto flags = decide_flags(two, share);
  EXPECT_NEAR(flags[0].probability, 0.02, 1e-12);
  EXPECT_FALSE(flags[0].flagged);
  std::vector<std::vector<Finding>> three{{with_p(0.02)}, {with_p(0.02)}, {with_p(0.001)}};
  flags = decide_flags(three, share);
  // T = (2 cot(0.02π) + cot(0.001π)) / 3 = (31.789 + 318.31) / 3 = 116.70; p = 0.0027275
  EXPECT_NEAR(flags[0].probability, std::atan(1 / ((2 / std::tan(0.02 * M_PI) + 1 / std::tan(0.001 * M_PI)) / 3)) / M_PI,
              1e-12);
  EXPECT_NEAR(flags[0].probability, 0.0027275, 1e-6);
  EXPECT_TRUE(flags[0].flagged);
}

// Opposed evidence: p = 0.001 and p = 0.999 cancel to ½ (cot(0.001π) = −cot(0.999π)).
TEST(FlagRule, OpposedEvidenceCancels) {
  std::vector<std::vector<Finding>> two{{with_p(0.001)}, {with_p(0.999)}};
  EXPECT_NEAR(decide_flags(two, {FlagRule::share, 0.01})[0].probability, 0.5, 1e-9);
}

// A test the population guard withheld leaves the combination; a test without a probability
// (reverse jackknife, a record check) never enters it.
TEST(FlagRule, WithheldAndRankingOnlyTestsLeaveTheCombination) {
  Finding withheld = with_p(1e-6);
  withheld.withheld = true;
  Finding ranking_only = with_p(std::nan(""));
  std::vector<std::vector<Finding>> f{{with_p(0.3)}, {withheld}, {ranking_only}};
  EXPECT_NEAR(decide_flags(f, {FlagRule::share, 0.01})[0].probability, 0.3, 1e-12);
}

// Benjamini-Hochberg over a taxon's five records at q = 0.05: sorted p 0.001 0.008 0.039 0.041
// 0.20 against i q / 5 = 0.01 0.02 0.03 0.04 0.05: the largest i with p_(i) ≤ i q/m is 2, so two
// are flagged; the share rule at 0.05 would flag four.
TEST(FlagRule, FalseDiscoveryRateStepsUpOverTheTaxon) {
  std::vector<std::vector<Finding>> f{{with_p(0.039), with_p(0.001), with_p(0.20), with_p(0.008), with_p(0.041)}};
  const auto fdr = decide_flags(f, {FlagRule::fdr, 0.05});
  EXPECT_EQ((std::vector<bool>{fdr[0].flagged, fdr[1].flagged, fdr[2].flagged, fdr[3].flagged, fdr[4].flagged}),
            (std::vector<bool>{false, true, false, true, false}));
  const auto share = decide_flags(f, {FlagRule::share, 0.05});
  EXPECT_EQ(share[0].flagged + share[1].flagged + share[2].flagged + share[3].flagged + share[4].flagged, 4);
}

// The verdict names the tests within the knob, or `combined` when only their evidence together
// is; its first reason says how many clean records would look this unusual.
TEST(FlagRule, TheVerdictSaysWhichEvidenceFlaggedItInWords) {
  std::vector<std::vector<Finding>> f{{with_p(0.02)}, {with_p(0.015)}, {with_p(0.0005)}};
  flag_tests_at_knob(f, {FlagRule::share, 0.01});
  EXPECT_FALSE(f[0][0].flagged);
  EXPECT_TRUE(f[2][0].flagged);
  const auto flags = decide_flags(f, {FlagRule::share, 0.01});
  ASSERT_TRUE(flags[0].flagged);
  const Verdict v = combine({&f[0][0], &f[1][0], &f[2][0]}, {"a", "b", "c"}, CombineRule::mean, flags[0], FlagRule::share);
  EXPECT_EQ(v.flags, std::vector<std::string>{"c"});
  ASSERT_FALSE(v.reasons.empty());
  EXPECT_EQ(v.reasons[0].rfind("about 1 in ", 0), 0u) << v.reasons[0];

  std::vector<std::vector<Finding>> g{{with_p(0.012)}, {with_p(0.011)}};
  flag_tests_at_knob(g, {FlagRule::share, 0.02});
  const auto together = decide_flags(g, {FlagRule::share, 0.02});
  ASSERT_TRUE(together[0].flagged);
  g[0][0].flagged = g[1][0].flagged = false;  // neither alone at a stricter knob
  EXPECT_EQ(combine({&g[0][0], &g[1][0]}, {"a", "b"}, CombineRule::mean, together[0], FlagRule::share).flags,
            std::vector<std::string>{"combined"});
}

// Reasons under a probability rule: the tests by their evidence, then the record checks (no
// probability) by severity, whatever their severities — one order, the same on every run.
TEST(FlagRule, ReasonsListTestsByEvidenceThenChecks) {
  Finding weak = with_p(0.004), strong = with_p(0.0001), check = with_p(std::nan(""));
  weak.severity = 3, strong.severity = 1, check.severity = 2;
  weak.reasons = {"weak"}, strong.reasons = {"strong"}, check.reasons = {"check"};
  check.flagged = true;
  std::vector<std::vector<Finding>> f{{weak}, {check}, {strong}};
  flag_tests_at_knob(f, {FlagRule::share, 0.01});
  f[1][0].flagged = true;  // a check flags by its tolerance (flag_tests_at_knob leaves no probability unflagged)
  const auto flags = decide_flags(f, {FlagRule::share, 0.01});
  const Verdict v =
      combine({&f[0][0], &f[1][0], &f[2][0]}, {"weak", "check", "strong"}, CombineRule::mean, flags[0], FlagRule::share);
  ASSERT_EQ(v.reasons.size(), 4u);
  EXPECT_EQ((std::vector<std::string>{v.reasons[1], v.reasons[2], v.reasons[3]}),
            (std::vector<std::string>{"strong", "weak", "check"}));
}

TEST(FlagRule, OneInReadsAsAReviewerWouldSayIt) {
  EXPECT_EQ(one_in(0.00025), "about 1 in 4,000");
  EXPECT_EQ(one_in(1.0 / 37), "about 1 in 37");
  EXPECT_EQ(one_in(1.0 / 123456), "about 1 in 120,000");
  EXPECT_EQ(one_in(0.001002), "about 1 in 1,000");
  EXPECT_EQ(one_in(1e-9), "fewer than 1 in a million");
}

}  // namespace
}  // namespace envsift
