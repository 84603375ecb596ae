// Reverse jackknife on hand-computed examples of the formulas in src/detect/reverse_jackknife.cpp
// (Chapman 2005, as recalled in envsift's methods notes, from memory). For each set: sorted x,
// mean x̄, y_i, sd(y) with n − 1, z_i = y_i / sd(y), t = 0.95·√20 + 0.2 = 4.44853.
#include "envsift/detect/reverse_jackknife.hpp"

#include <numeric>

#include <gtest/gtest.h>

#include "../support.hpp"

namespace envsift {
namespace {

using envsift::testing::column;

std::vector<double> range(double from, double to) {
  std::vector<double> v;
  for (double x = from; x <= to; ++x) v.push_back(x);
  return v;
}

std::vector<bool> flagged(const std::vector<double>& values) {
  const auto x = column(values);
  const std::vector<std::string> names{"x"};
  std::vector<bool> out;
  for (const auto& f : ReverseJackknife().judge({x, x, names})) out.push_back(f.flagged);
  return out;
}

// 1, 2, …, 19, 100: x̄ = 14.5. Lower values: y_i = 1 · (14.5 − x_i) = 13.5, 12.5, …, 0.5;
// x = 15…19: y = 1 · (x − 14.5) = 0.5 … 4.5; x = 100: y = (100 − 19)(100 − 14.5) = 6925.5.
// sd(y) = 1547.294, z(100) = 6925.5 / 1547.294 = 4.4759 > 4.4485: only 100 is an outlier.
TEST(ReverseJackknife, OneFarValueBeyondATightCluster) {
  auto v = range(1, 19);
  v.push_back(100);
  const JackknifeLayer j = reverse_jackknife_layer(v);
  EXPECT_DOUBLE_EQ(j.mean, 14.5);
  EXPECT_NEAR(j.threshold, 4.44853, 1e-5);
  EXPECT_NEAR(j.statistic(100).first, 4.4759, 1e-4);
  const auto f = flagged(v);
  EXPECT_EQ(std::count(f.begin(), f.end(), true), 1);
  EXPECT_TRUE(f.back());
}

// 1, …, 17, 100, 101, 102: x̄ = 22.8; the gap below 100 gives y = (100 − 17)(100 − 22.8) = 6407.6,
// sd(y) = 1426.417, z = 4.4921 > t: 100 and every value above it are outliers.
TEST(ReverseJackknife, AGapCutsOffTheWholeTailBeyondIt) {
  auto v = range(1, 17);
  for (double x : {100.0, 101.0, 102.0}) v.push_back(x);
  const auto f = flagged(v);
  EXPECT_EQ(std::count(f.begin(), f.end(), true), 3);
  EXPECT_TRUE(f[17] && f[18] && f[19]);
  EXPECT_NEAR(reverse_jackknife_layer(v).statistic(102).first, 4.4921, 1e-4);
}

// Two separated tails, −100, 40, …, 57, 1000: x̄ = 88.65, so 40 … 57 are below the mean too.
// Lower tail: y(−100) = (40 + 100)(88.65 + 100) = 26411, y(57) = (1000 − 57)(88.65 − 57) =
// 29845.95; upper: y(1000) = (1000 − 57)(1000 − 88.65) = 859403.05; sd(y) = 191692.87. The
// statistic of −100 is the largest z from it up to the mean, 29845.95 / 191692.87 = 0.1557; of
// 1000, 4.4832 > t: the far upper tail is flagged, the lower one is not. With tails of similar size
// (−100 … 200) the two gaps share sd(y) and neither reaches t (z 3.19 and 3.31): the statistic
// can reach at most √n, so this test finds one dominant gap, not several (documented).
TEST(ReverseJackknife, TwoSeparatedTails) {
  auto v = range(40, 57);
  v.insert(v.begin(), -100);
  v.push_back(1000);
  const auto f = flagged(v);
  EXPECT_FALSE(f.front());
  EXPECT_TRUE(f.back());
  EXPECT_NEAR(reverse_jackknife_layer(v).statistic(-100).first, 0.1557, 1e-4);
  EXPECT_NEAR(reverse_jackknife_layer(v).statistic(1000).first, 4.4832, 1e-4);
  v.back() = 200;
  const auto g = flagged(v);
  EXPECT_EQ(std::count(g.begin(), g.end(), true), 0);
}

// 1, …, 20: evenly spaced, y = 9.5 … 0.5 … 9.5, largest z = 9.5 / 2.9469 = 3.2237 < t.
TEST(ReverseJackknife, NoGapNothingFlagged) {
  const auto f = flagged(range(1, 20));
  EXPECT_EQ(std::count(f.begin(), f.end(), true), 0);
  EXPECT_NEAR(reverse_jackknife_layer(range(1, 20)).statistic(1).first, 3.2237, 1e-4);
}

TEST(ReverseJackknife, BelowTheMinimumIsNotJudged) {
  const auto x = column(range(1, 9));  // 9 < 10
  const std::vector<std::string> names{"x"};
  const auto f = ReverseJackknife().judge({x, x, names});
  EXPECT_FALSE(f[0].tested);
  EXPECT_EQ(f[0].untested_code, "too_few_records:reverse_jackknife");
}

}  // namespace
}  // namespace envsift

#include "envsift/detect/test_registry.hpp"
#include "envsift/settings/settings.hpp"

namespace envsift {
namespace {

// As run (the registry's detector): at least 20 values, whatever --min-records below that
// (reverse_jackknife.cpp says why); 19 evenly spread values are not judged, 20 are.
TEST(ReverseJackknife, AsRunItNeedsTwentyValues) {
  TestSettings s;
  s.min_records = 10;
  const auto detector = find_test("reverse_jackknife")->make_detector(s);
  const std::vector<std::string> names{"x"};
  const auto nineteen = column(range(1, 19)), twenty = column(range(1, 20));
  EXPECT_FALSE(detector->judge({nineteen, nineteen, names})[0].tested);
  EXPECT_TRUE(detector->judge({twenty, twenty, names})[0].tested);
  s.min_records = 30;  // a higher minimum is kept
  EXPECT_FALSE(find_test("reverse_jackknife")->make_detector(s)->judge({twenty, twenty, names})[0].tested);
}

}  // namespace
}  // namespace envsift
