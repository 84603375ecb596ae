// Two populations in one taxon (group/populations.hpp) — envsift's own rule, checked on samples
// whose shape is known: two well-separated normal clouds are split along the right line, one
// normal cloud and one flat (uniform) cloud are left whole (k-means cuts both, but neither has a
// density valley), and a second group smaller than the minimum share is not a population.
#include <random>

#include <gtest/gtest.h>

#include "envsift/group/populations.hpp"

namespace envsift {
namespace {

Eigen::MatrixXd cloud(std::size_t first, std::size_t second, double apart, unsigned seed, bool uniform = false) {
  std::mt19937_64 rng(seed);
  std::normal_distribution<double> normal(0, 1);
  std::uniform_real_distribution<double> flat(-3, 3);
  Eigen::MatrixXd x(static_cast<Eigen::Index>(first + second), 3);
  for (Eigen::Index r = 0; r < x.rows(); ++r)
    for (Eigen::Index c = 0; c < 3; ++c)
      x(r, c) = (uniform ? flat(rng) : normal(rng)) * (c + 1.0) + (r >= static_cast<Eigen::Index>(first) && c == 1 ? apart : 0);
  return x;
}

TEST(Populations, TwoSeparateCloudsAreSplit) {
  const Eigen::MatrixXd x = cloud(300, 200, 14, 1);  // 7 SDs apart on the second layer
  const Populations p = find_populations(x, {});
  ASSERT_TRUE(p.split);
  std::size_t wrong = 0;
  for (Eigen::Index r = 0; r < x.rows(); ++r)
    wrong += p.of_reference[static_cast<std::size_t>(r)] != p.of_reference[r < 300 ? 0 : 499];
  EXPECT_LE(wrong, 2u);
  EXPECT_NE(p.of_reference[0], p.of_reference[499]);
  // a record between them goes to the nearer; one missing a layer to the larger population
  Eigen::RowVectorXd record = x.row(0);
  EXPECT_EQ(p.population_of(record), p.of_reference[0]);
  record[2] = std::nan("");
  EXPECT_EQ(p.population_of(record), p.larger);
  EXPECT_EQ(p.larger, p.of_reference[0]);
}

TEST(Populations, OneCloudIsLeftWhole) {
  EXPECT_FALSE(find_populations(cloud(500, 0, 0, 2), {}).split);
  EXPECT_FALSE(find_populations(cloud(500, 0, 0, 3, true), {}).split);
  EXPECT_FALSE(find_populations(cloud(300, 200, 2, 4), {}).split);  // 1 SD apart: one bump
}

TEST(Populations, SmallGroupsAreNotPopulations) {
  EXPECT_FALSE(find_populations(cloud(460, 40, 14, 5), {}).split);  // 8 %, below the 20 % share
  EXPECT_FALSE(find_populations(cloud(12, 6, 14, 6), {}).split);    // too few rows
  PopulationOptions off;
  off.enabled = false;
  EXPECT_FALSE(find_populations(cloud(300, 200, 14, 1), off).split);
}

}  // namespace
}  // namespace envsift
