#include "landscape_model.hpp"

#include <cmath>

#include <Eigen/Eigenvalues>
#include <boost/math/distributions/normal.hpp>

#include "envsift/detect/numerics.hpp"

namespace envsift::landscape_model {

// Standardised by the landscape's mean and standard deviation.
LayerScale linear_scale(const std::vector<double>& v) {
  double mean = 0, sq = 0;
  for (double x : v) mean += x;
  mean /= static_cast<double>(v.size());
  for (double x : v) sq += (x - mean) * (x - mean);
  const double sd = std::sqrt(sq / static_cast<double>(v.size() - 1));
  const auto [lo, hi] = std::minmax_element(v.begin(), v.end());
  LayerScale s;
  s.value = {*lo, *hi};
  s.score = {(*lo - mean) / sd, (*hi - mean) / sd};
  s.slope = 1 / sd;
  return s;
}

// The normal scores of the landscape's values: Φ⁻¹ of the mid-rank ECDF.
LayerScale normal_scores(std::vector<double> v) {
  std::sort(v.begin(), v.end());
  const boost::math::normal normal;
  LayerScale s;
  const double m = static_cast<double>(v.size());
  for (std::size_t i = 0; i < v.size();) {
    std::size_t j = i;
    while (j < v.size() && v[j] == v[i]) ++j;
    const double mid_rank = (static_cast<double>(i) + static_cast<double>(j) + 1) / 2;  // 1-based
    s.value.push_back(v[i]);
    s.score.push_back(boost::math::quantile(normal, (mid_rank - 0.5) / m));
    i = j;
  }
  if (s.value.size() > 1) s.slope = (s.score.back() - s.score.front()) / (s.value.back() - s.value.front());
  return s;
}

// The quadratic features of whitened scores: 1, s_j, s_j², and s_j s_k (j < k) when `products`.
Eigen::VectorXd features(const Eigen::VectorXd& s, bool products) {
  const Eigen::Index d = s.size();
  Eigen::VectorXd f(1 + 2 * d + (products ? d * (d - 1) / 2 : 0));
  Eigen::Index k = 0;
  f[k++] = 1;
  for (Eigen::Index j = 0; j < d; ++j) f[k++] = s[j];
  for (Eigen::Index j = 0; j < d; ++j) f[k++] = s[j] * s[j];
  if (products)
    for (Eigen::Index j = 0; j < d; ++j)
      for (Eigen::Index l = j + 1; l < d; ++l) f[k++] = s[j] * s[l];
  return f;
}

std::size_t feature_count(std::size_t d, bool products) { return 1 + 2 * d + (products ? d * (d - 1) / 2 : 0); }

// A unimodal response: the quadratic part's matrix Q (η = β₀ + bᵀs + sᵀQs) made negative
// definite, every eigenvalue at most −curvature, and the intercept and linear terms refitted with
// the quadratic part fixed. Without it, a taxon at the edge of its landscape (the highest
// ground) gets a convex η that calls environments beyond the landscape ever more suitable.
Eigen::VectorXd unimodal(const Eigen::MatrixXd& design, const Eigen::VectorXd& y, const Eigen::VectorXd& w,
                         Eigen::VectorXd beta, Eigen::Index d, bool products, double ridge, double curvature) {
  Eigen::MatrixXd q(d, d);
  Eigen::Index k = 1 + 2 * d;
  for (Eigen::Index j = 0; j < d; ++j) {
    q(j, j) = beta[1 + d + j];
    for (Eigen::Index l = j + 1; l < d; ++l) q(j, l) = q(l, j) = products ? beta[k++] / 2 : 0;
  }
  Eigen::SelfAdjointEigenSolver<Eigen::MatrixXd> eig(q);
  if (eig.eigenvalues().maxCoeff() <= -curvature) return beta;
  const Eigen::VectorXd clamped = eig.eigenvalues().cwiseMin(-curvature);
  q = eig.eigenvectors() * clamped.asDiagonal() * eig.eigenvectors().transpose();
  k = 1 + 2 * d;
  for (Eigen::Index j = 0; j < d; ++j) {
    beta[1 + d + j] = q(j, j);
    for (Eigen::Index l = j + 1; l < d && products; ++l) beta[k++] = 2 * q(j, l);
  }
  const Eigen::Index fixed = design.cols() - 1 - d;
  const Eigen::VectorXd offset = design.rightCols(fixed) * beta.tail(fixed);
  const Eigen::VectorXd head = fit_logistic(design.leftCols(1 + d), y, w, ridge, beta[0], offset);
  beta.head(1 + d) = head;
  return beta;
}

}  // namespace envsift::landscape_model
