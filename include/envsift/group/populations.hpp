// Step 3b: a taxon found in two separate environments is split into two populations, each
// screened on its own, so that neither is judged an outlier of the other (and an error between
// them is judged against the nearer one). See the .cpp for the rule.
#pragma once
#include <cstddef>
#include <cstdint>
#include <vector>

#include <Eigen/Core>

namespace envsift {

struct PopulationOptions {
  bool enabled = true;
  std::size_t min_rows = 10;   // each population needs this many reference rows…
  double min_share = 0.2;      // …and this share of them
  double max_valley = 0.5;     // density in the valley between them / the lower of the two peaks
};

struct Populations {
  bool split = false;
  std::vector<std::uint8_t> of_reference;  // 0 or 1 per reference row (empty when not split)
  // Which population a row of values (one per layer, NaN allowed) belongs to.
  std::uint8_t population_of(const Eigen::RowVectorXd& values) const;

  // the split's frame: standardised layers, projection direction, populations along it
  std::vector<Eigen::Index> layers;
  Eigen::VectorXd centre, scale, direction;
  double mean[2] = {0, 0}, sd[2] = {1, 1};
  std::uint8_t larger = 0;
};

Populations find_populations(const Eigen::MatrixXd& reference, const PopulationOptions& options);

}  // namespace envsift
