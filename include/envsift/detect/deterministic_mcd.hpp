// The deterministic MCD (DetMCD): the same estimator as FAST-MCD (fast_mcd.hpp), its C-steps
// started from six robust deterministic estimates instead of hundreds of random subsets.
#pragma once
#include "envsift/detect/fast_mcd.hpp"

namespace envsift {

// `x`: n rows × p columns, all finite, n > p. When a start's h rows lie on a hyperplane (an exact
// fit) the result is FAST-MCD's, which handles that case (see fast_mcd.cpp).
McdResult deterministic_mcd(const Eigen::MatrixXd& x, const McdOptions& options);

// The MCD by the engine `options.engine` chooses.
McdResult minimum_covariance_determinant(const Eigen::MatrixXd& x, const McdOptions& options);

}  // namespace envsift
