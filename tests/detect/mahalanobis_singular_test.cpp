// Singular and near-singular covariance: a duplicated layer, fewer rows than layers, a layer
// without spread. Expected dimensions follow from linear algebra (a duplicated column adds no
// rank; n centred rows span at most n − 1 dimensions) — common practice, no outside table.
#include <cmath>
#include <random>

#include <gtest/gtest.h>

#include "envsift/detect/robust_mahalanobis.hpp"

namespace envsift {
namespace {

Eigen::MatrixXd random_rows(int n, int p, unsigned seed) {
  std::mt19937_64 rng(seed);
  std::normal_distribution<double> normal;
  Eigen::MatrixXd x(n, p);
  for (int i = 0; i < n; ++i)
    for (int j = 0; j < p; ++j) x(i, j) = normal(rng);
  return x;
}

void expect_finite_with_dimension(const std::vector<Finding>& findings, double dims) {
  for (const auto& f : findings) {
    ASSERT_TRUE(f.tested) << f.untested_code;
    EXPECT_TRUE(std::isfinite(f.statistic));
    EXPECT_EQ(f.extras[0], dims);
  }
}

TEST(MahalanobisSingular, DuplicatedLayerReducesTheDimension) {
  Eigen::MatrixXd x(60, 4);
  x.leftCols(3) = random_rows(60, 3, 3);
  x.col(3) = x.col(0) * 2.0 + Eigen::VectorXd::Constant(60, 5.0);  // a rescaled copy of layer 0
  const std::vector<std::string> names{"a", "b", "c", "a_again"};
  expect_finite_with_dimension(Mahalanobis().judge({x, x, names}), 3);
  expect_finite_with_dimension(RobustMahalanobis().judge({x, x, names, 7}), 3);
}

TEST(MahalanobisSingular, FewerRowsThanLayers) {
  const Eigen::MatrixXd x = random_rows(12, 19, 5);  // 12 rows, 19 layers
  std::vector<std::string> names;
  for (int j = 0; j < 19; ++j) names.push_back("bio" + std::to_string(j + 1));
  // at most one dimension per 3 rows: ⌊12 / 3⌋ = 4
  expect_finite_with_dimension(Mahalanobis().judge({x, x, names}), 4);
  expect_finite_with_dimension(RobustMahalanobis().judge({x, x, names, 7}), 4);
}

TEST(MahalanobisSingular, ConstantLayerIsLeftOutAndTooFewRowsIsAReason) {
  Eigen::MatrixXd x = random_rows(30, 3, 9);
  x.col(1).setConstant(4.0);
  const std::vector<std::string> names{"a", "flat", "c"};
  expect_finite_with_dimension(Mahalanobis().judge({x, x, names}), 2);
  const Eigen::MatrixXd few = random_rows(6, 3, 11);
  const auto f = RobustMahalanobis().judge({few, few, names, 1});
  EXPECT_FALSE(f[0].tested);
  EXPECT_EQ(f[0].untested_code, "too_few_records:mahalanobis_robust");
}

// More than half the rows share one value of a layer (a layer of few classes): the MCD scatter is
// flat there; that direction is left out instead of giving huge distances.
TEST(MahalanobisSingular, ExactFitOnADiscreteLayer) {
  Eigen::MatrixXd x = random_rows(40, 3, 13);
  for (int i = 0; i < 40; ++i) x(i, 2) = i < 30 ? 0.0 : static_cast<double>(i % 4 + 1);
  const std::vector<std::string> names{"a", "b", "dry_months"};
  const auto f = RobustMahalanobis().judge({x, x, names, 3});
  expect_finite_with_dimension(f, 2);
}

// The same on a large taxon, where the starts are screened on a subsample (a crash once: every
// start was an exact fit and none was carried to the full data).
TEST(MahalanobisSingular, ExactFitOnALargeTaxon) {
  Eigen::MatrixXd x = random_rows(4000, 3, 21);
  for (int i = 0; i < 4000; ++i) x(i, 2) = i % 10 < 7 ? 0.0 : static_cast<double>(i % 4 + 1);
  const std::vector<std::string> names{"a", "b", "dry_months"};
  expect_finite_with_dimension(RobustMahalanobis().judge({x, x, names, 5}), 2);
}

TEST(MahalanobisSingular, SameSeedSameResult) {
  const Eigen::MatrixXd x = random_rows(200, 5, 17);
  const std::vector<std::string> names{"a", "b", "c", "d", "e"};
  const auto a = RobustMahalanobis().judge({x, x, names, 42});
  const auto b = RobustMahalanobis().judge({x, x, names, 42});
  for (std::size_t i = 0; i < a.size(); ++i) EXPECT_EQ(a[i].statistic, b[i].statistic);
}

}  // namespace
}  // namespace envsift
