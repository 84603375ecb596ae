// Private to the MCD estimators (fast_mcd.cpp, deterministic_mcd.cpp): the pieces both share —
// a subset's fit, distances, the concentration step (C-step) of Rousseeuw & Van Driessen (1999,
// Theorem 1), and the consistency factor and reweighting that turn the best subset into the
// estimate. Both estimators differ only in where their C-steps start.
#pragma once
#include <cstddef>
#include <limits>
#include <vector>

#include <Eigen/Core>

#include "envsift/detect/fast_mcd.hpp"

namespace envsift::mcd {

using Rows = std::vector<std::size_t>;

struct Fit {
  Eigen::VectorXd mean;
  Eigen::MatrixXd cov;  // (m − 1)-divisor covariance of the rows
  double log_det = -std::numeric_limits<double>::infinity();
  bool singular = true;
};
Fit fit_rows(const Eigen::MatrixXd& x, const Rows& rows);

Eigen::VectorXd squared_distances(const Eigen::MatrixXd& x, const Eigen::VectorXd& center, const Eigen::MatrixXd& cov);

// The h rows with the smallest distance (ties: lower row first), ascending.
Rows smallest(const Eigen::VectorXd& d, std::size_t h);

struct Candidate {
  Rows rows;
  Fit fit;
};
// C-steps from `rows` until the subset stops changing (or `max_steps`), or the fit is singular.
Candidate concentrate(const Eigen::MatrixXd& x, Rows rows, std::size_t h, int max_steps);

// An exact fit (singular) is the minimum; otherwise the smaller log determinant.
bool better(const Candidate& a, const Candidate& b);

// p = 1: the exact MCD, the contiguous window of h sorted values with least variance.
Candidate univariate_mcd(const Eigen::MatrixXd& x, std::size_t h);

// c(α) = α / P(χ²_{p+2} ≤ χ²_{p,α}), R's robustbase .MCDcons.
double consistency_factor(double p, double alpha);

// The raw estimate from the best (non-singular) subset, then one reweighting step.
McdResult finish(const Eigen::MatrixXd& x, const Candidate& best, std::size_t h, double reweight_quantile);

}  // namespace envsift::mcd
