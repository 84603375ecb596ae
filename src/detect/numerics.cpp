#include "envsift/detect/numerics.hpp"

#include <cmath>

#include <Eigen/Cholesky>
#include <Eigen/Eigenvalues>

namespace envsift {

Eigen::VectorXd fixed_sign(Eigen::VectorXd v) {
  Eigen::Index at;
  v.cwiseAbs().maxCoeff(&at);
  if (v[at] < 0) v = -v;
  return v;
}

Precision pseudo_inverse(const Eigen::MatrixXd& scatter, double floor) {
  Eigen::SelfAdjointEigenSolver<Eigen::MatrixXd> eig(scatter);
  const double largest = eig.eigenvalues().maxCoeff();
  Eigen::VectorXd inv = Eigen::VectorXd::Zero(eig.eigenvalues().size());
  Precision p;
  for (Eigen::Index i = 0; i < inv.size(); ++i)
    if (largest > 0 && eig.eigenvalues()[i] > floor * largest) {
      inv[i] = 1 / eig.eigenvalues()[i];
      ++p.rank;
    }
  p.matrix = eig.eigenvectors() * inv.asDiagonal() * eig.eigenvectors().transpose();
  return p;
}

namespace {

double log1p_exp(double x) { return x > 0 ? x + std::log1p(std::exp(-x)) : std::log1p(std::exp(x)); }

}  // namespace

Eigen::VectorXd fit_logistic(const Eigen::MatrixXd& x, const Eigen::VectorXd& y, const Eigen::VectorXd& w, double ridge,
                             double intercept, const Eigen::VectorXd& offset) {
  const Eigen::Index p = x.cols();
  Eigen::VectorXd beta = Eigen::VectorXd::Zero(p);
  beta[0] = intercept;
  Eigen::VectorXd penalty = Eigen::VectorXd::Constant(p, ridge);
  penalty[0] = 0;
  auto objective = [&](const Eigen::VectorXd& b) {
    const Eigen::VectorXd eta = x * b + offset;
    double sum = 0;
    for (Eigen::Index i = 0; i < eta.size(); ++i) sum += w[i] * (y[i] * eta[i] - log1p_exp(eta[i]));
    return sum - 0.5 * (penalty.array() * b.array().square()).sum();
  };
  double current = objective(beta);
  for (int iteration = 0; iteration < 100; ++iteration) {
    const Eigen::VectorXd eta = x * beta + offset;
    Eigen::VectorXd prob(eta.size()), weight(eta.size());
    for (Eigen::Index i = 0; i < eta.size(); ++i) {
      prob[i] = 1 / (1 + std::exp(-eta[i]));
      weight[i] = w[i] * prob[i] * (1 - prob[i]);
    }
    const Eigen::VectorXd gradient = x.transpose() * (w.array() * (y - prob).array()).matrix() - penalty.cwiseProduct(beta);
    Eigen::MatrixXd hessian = x.transpose() * weight.asDiagonal() * x;
    hessian.diagonal() += penalty;
    hessian.diagonal().array() += 1e-10;
    const Eigen::VectorXd step = hessian.ldlt().solve(gradient);
    double scale = 1, next = current;
    Eigen::VectorXd candidate = beta;
    for (int halving = 0; halving < 30; ++halving, scale /= 2) {
      candidate = beta + scale * step;
      next = objective(candidate);
      if (next >= current) break;
    }
    if (!(next >= current)) break;
    const double moved = (candidate - beta).cwiseAbs().maxCoeff();
    beta = candidate;
    current = next;
    if (moved < 1e-9) break;
  }
  return beta;
}

}  // namespace envsift
