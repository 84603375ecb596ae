// What the landscape sampler (landscape_sample.hpp) draws for one taxon and the landscape test
// (detect/landscape.hpp) compares the taxon with: plain numbers, no rasters.
#pragma once
#include <string>

#include <Eigen/Core>

namespace envsift {

// The environments available around a taxon (its landscape test's background): cells drawn from
// its accessible area, cells × layers (the same layers as the taxon's values), NaN = missing;
// `area` says in words where they were drawn (e.g. "within 35 km of its records").
struct LandscapeValues {
  Eigen::MatrixXd values;
  std::string area;
};

}  // namespace envsift
