// Private to the landscape test: the model's parts (landscape.cpp says what each is for) — a
// layer's map onto the landscape's scale, the quadratic features, and the unimodal response.
#pragma once
#include <algorithm>
#include <cstddef>
#include <vector>

#include <Eigen/Core>

namespace envsift::landscape_model {

// One layer's map onto a common scale: piecewise linear through (value, score) points, beyond
// them with `slope`.
struct LayerScale {
  std::vector<double> value, score;  // distinct landscape values, ascending, and their scores
  double slope = 0;                  // beyond the ends
  double operator()(double x) const {
    if (x <= value.front()) return score.front() + (x - value.front()) * slope;
    if (x >= value.back()) return score.back() + (x - value.back()) * slope;
    const auto k = static_cast<std::size_t>(std::upper_bound(value.begin(), value.end(), x) - value.begin());
    const double t = (x - value[k - 1]) / (value[k] - value[k - 1]);
    return score[k - 1] + t * (score[k] - score[k - 1]);
  }
};

// Standardised by the landscape's mean and standard deviation.
LayerScale linear_scale(const std::vector<double>& v);
// The normal scores of the landscape's values: Φ⁻¹ of the mid-rank ECDF.
LayerScale normal_scores(std::vector<double> v);

// The quadratic features of whitened scores: 1, s_j, s_j², and s_j s_k (j < k) when `products`.
Eigen::VectorXd features(const Eigen::VectorXd& s, bool products);
std::size_t feature_count(std::size_t d, bool products);

// A unimodal response: the quadratic part's matrix Q (η = β₀ + bᵀs + sᵀQs) made negative
// definite, every eigenvalue at most −curvature, and the intercept and linear terms refitted with
// the quadratic part fixed.
Eigen::VectorXd unimodal(const Eigen::MatrixXd& design, const Eigen::VectorXd& y, const Eigen::VectorXd& w,
                         Eigen::VectorXd beta, Eigen::Index d, bool products, double ridge, double curvature);

}  // namespace envsift::landscape_model
