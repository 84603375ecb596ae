// The numerical kernels several tests share, in one home: the sign rule that makes a principal
// axis independent of the eigen-solver, the pseudo-inverse of a scatter matrix, and a ridge
// logistic regression (common practice; the papers each test cites say where it uses them).
#pragma once
#include <cstddef>

#include <Eigen/Core>

namespace envsift {

// An eigenvector with a fixed sign: its largest-magnitude element positive, so that results
// never depend on which of ±v the solver returns.
Eigen::VectorXd fixed_sign(Eigen::VectorXd v);

// The pseudo-inverse of a symmetric positive semi-definite scatter over its directions with
// eigenvalue above floor · largest, and how many there are (its rank).
struct Precision {
  Eigen::MatrixXd matrix;
  std::size_t rank = 0;
};
Precision pseudo_inverse(const Eigen::MatrixXd& scatter, double floor);

// Ridge logistic regression by Newton's method with step halving: the β that maximises
//   Σ w_i [y_i η_i − log(1 + e^η_i)] − ridge/2 · Σ_{j≥1} β_j²,   η = xβ + offset,
// starting from β = (intercept, 0, ..., 0); column 0 of x is the intercept (not penalised).
Eigen::VectorXd fit_logistic(const Eigen::MatrixXd& x, const Eigen::VectorXd& y, const Eigen::VectorXd& w, double ridge,
                             double intercept, const Eigen::VectorXd& offset);

}  // namespace envsift
