// Medcouple and adjusted-boxplot fences against R's robustbase::mc and robustbase::adjboxStats
// (Debian r-cran-robustbase) on data sets that ship with R; fixtures and the script that made
// them in tests/reference/skewness/. The fast algorithm is also checked against the definition
// (Brys, Hubert & Struyf 2004) on random samples, and the side scales against their normal-data
// meaning (a fact of the trade: Q3 + 1.5 IQR lies 2.698 SD above the mean of a normal).
#include <cmath>
#include <random>

#include <gtest/gtest.h>

#include "envsift/detect/skew_scale.hpp"
#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

std::vector<double> values_of(const std::string& name) {
  std::vector<double> x;
  std::istringstream in(read_file(source_path("tests/reference/skewness/values_" + name + ".csv")));
  for (std::string line; std::getline(in, line);)
    if (!line.empty()) x.push_back(std::stod(line));
  return x;
}

TEST(Medcouple, EqualsRobustbaseOnRDataSets) {
  const Table t = read_csv(source_path("tests/reference/skewness/skewness.csv"));
  ASSERT_EQ(t.rows.size(), 7u);
  for (const auto& row : t.rows) {
    const auto x = values_of(row[t.column("dataset")]);
    ASSERT_EQ(std::to_string(x.size()), row[t.column("n")]);
    EXPECT_NEAR(medcouple(x), std::stod(row[t.column("mc")]), 1e-12) << row[0];
    const AdjustedFences f = adjusted_fences(x);
    EXPECT_NEAR(f.lower_hinge, std::stod(row[t.column("lower_hinge")]), 1e-9) << row[0];
    EXPECT_NEAR(f.upper_hinge, std::stod(row[t.column("upper_hinge")]), 1e-9) << row[0];
    EXPECT_NEAR(f.low, std::stod(row[t.column("fence_low")]), 1e-9) << row[0];
    EXPECT_NEAR(f.high, std::stod(row[t.column("fence_high")]), 1e-9) << row[0];
  }
}

TEST(Medcouple, FastAlgorithmEqualsDefinition) {
  std::mt19937_64 rng(5);
  std::lognormal_distribution<double> skewed(0, 1);
  for (int n : {3, 4, 5, 10, 11, 37, 64, 99, 100}) {
    std::vector<double> x;
    for (int i = 0; i < n; ++i) x.push_back(std::round(skewed(rng) * 10) / 10);  // rounded: ties too
    EXPECT_NEAR(medcouple(x), medcouple_by_definition(x), 1e-12) << n;
  }
}

TEST(Medcouple, SymmetricDataHaveZeroAndSignFollowsSkew) {
  EXPECT_NEAR(medcouple({1, 2, 3, 4, 5, 6, 7}), 0, 1e-15);
  EXPECT_GT(medcouple({1, 1.1, 1.2, 1.5, 2, 3, 5, 9, 20}), 0.3);
  EXPECT_LT(medcouple({-20, -9, -5, -3, -2, -1.5, -1.2, -1.1, -1}), -0.3);
}

TEST(SideScales, EqualTheSdForNormalDataAndStretchTheLongTail) {
  std::mt19937_64 rng(9);
  std::normal_distribution<double> normal(10, 2);
  std::vector<double> x;
  for (int i = 0; i < 20000; ++i) x.push_back(normal(rng));
  const SideScales s = side_scales(x, 1);
  EXPECT_NEAR(s.below, 2, 0.1);
  EXPECT_NEAR(s.above, 2, 0.1);
  std::lognormal_distribution<double> skewed(0, 0.8);
  std::vector<double> y;
  for (int i = 0; i < 20000; ++i) y.push_back(skewed(rng));
  const SideScales t = side_scales(y, 1);
  EXPECT_GT(t.above, 2.5 * t.below);
  // both hinges on the median (IQR = 0): the fences collapse and both sides get the fallback
  const SideScales tied = side_scales({0, 0, 0, 0, 0, 0, 0, 1, 2}, 0.7);
  EXPECT_EQ(tied.below, 0.7);
  EXPECT_EQ(tied.above, 0.7);
}

}  // namespace
}  // namespace envsift
