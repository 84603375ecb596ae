// The deterministic MCD.
// Source: Hubert, M., Rousseeuw, P.J. & Verdonck, T. (2012) A deterministic algorithm for robust
// location and scatter. Journal of Computational and Graphical Statistics 21:618-637. Details
// (scales, ranks, ties) follow R's robustbase 0.95 (covMcd(nsamp = "deterministic"), r6pack,
// .detmcd), which the tests compare with.
//
// Each column is standardised by its median and a robust scale (mcd_scale: Qn, or τ for n ≥ 1000),
// z = (x − med) / s. Six scatter estimates of z give six sets of axes P:
//   1. the correlation of tanh(z);            2. Spearman's rank correlation;
//   3. the correlation of normal scores Φ⁻¹((rank − 1/3) / (n + 1/3));
//   4. the spatial sign covariance Σ z_i z_iᵀ / ‖z_i‖²;
//   5. the covariance of the ⌈n/2⌉ rows with the smallest ‖z_i‖;
//   6. the OGK pairwise scatter U_jk = (s(z_j + z_k)² − s(z_j − z_k)²) / 4 (Maronna & Zamar 2002).
// On the axes of P the scales λ_j = s(z P_j) and a centre (the coordinatewise median in the
// sphered coordinates, mapped back) give distances; the h closest rows are fitted, their
// distances choose h rows again, and C-steps run from there to convergence. The subset with the
// smallest determinant wins (the first of equals); consistency factor and reweighting as FAST-MCD.
// Not affine equivariant (the standardisation is per column), as the paper says.
#include "envsift/detect/deterministic_mcd.hpp"

#include <algorithm>
#include <cmath>
#include <numeric>

#include <Eigen/Eigenvalues>
#include <boost/math/distributions/normal.hpp>

#include "envsift/detect/robust_scale.hpp"
#include "envsift/median.hpp"
#include "mcd_steps.hpp"

namespace envsift {
namespace {

using namespace mcd;

std::vector<double> column(const Eigen::MatrixXd& x, Eigen::Index j) {
  return {x.col(j).data(), x.col(j).data() + x.rows()};
}

// The scale of a column after centring on its median (R's doScale(center = median)).
double centred_scale(std::vector<double> v) {
  const double m = median_of(v);
  for (double& e : v) e -= m;
  return mcd_scale(v);
}

Eigen::MatrixXd correlation(const Eigen::MatrixXd& y) {
  const Eigen::MatrixXd c = y.rowwise() - y.colwise().mean();
  Eigen::MatrixXd cov = c.transpose() * c;
  const Eigen::VectorXd sd = cov.diagonal().cwiseSqrt();
  for (Eigen::Index i = 0; i < cov.rows(); ++i)
    for (Eigen::Index j = 0; j < cov.cols(); ++j) cov(i, j) = sd[i] > 0 && sd[j] > 0 ? cov(i, j) / (sd[i] * sd[j]) : (i == j);
  return cov;
}

// Ranks 1..n per column, ties given their average rank.
Eigen::MatrixXd ranks(const Eigen::MatrixXd& x) {
  const Eigen::Index n = x.rows();
  Eigen::MatrixXd r(n, x.cols());
  std::vector<Eigen::Index> order(static_cast<std::size_t>(n));
  for (Eigen::Index j = 0; j < x.cols(); ++j) {
    std::iota(order.begin(), order.end(), 0);
    std::stable_sort(order.begin(), order.end(), [&](Eigen::Index a, Eigen::Index b) { return x(a, j) < x(b, j); });
    for (std::size_t i = 0; i < order.size();) {
      std::size_t k = i;
      while (k + 1 < order.size() && x(order[k + 1], j) == x(order[i], j)) ++k;
      const double average = (static_cast<double>(i) + static_cast<double>(k)) / 2 + 1;
      for (std::size_t m = i; m <= k; ++m) r(order[m], j) = average;
      i = k + 1;
    }
  }
  return r;
}

Eigen::MatrixXd axes(const Eigen::MatrixXd& scatter) {
  return Eigen::SelfAdjointEigenSolver<Eigen::MatrixXd>(scatter).eigenvectors();
}

// The six sets of axes of the paper's initial estimates.
std::vector<Eigen::MatrixXd> initial_axes(const Eigen::MatrixXd& z) {
  const Eigen::Index n = z.rows(), p = z.cols();
  std::vector<Eigen::MatrixXd> all;
  all.push_back(axes(correlation(z.array().tanh().matrix())));
  const Eigen::MatrixXd r = ranks(z);
  all.push_back(axes(correlation(r)));
  const boost::math::normal normal;
  Eigen::MatrixXd scores(n, p);
  for (Eigen::Index i = 0; i < n; ++i)
    for (Eigen::Index j = 0; j < p; ++j)
      scores(i, j) = boost::math::quantile(normal, (r(i, j) - 1.0 / 3) / (static_cast<double>(n) + 1.0 / 3));
  all.push_back(axes(correlation(scores)));
  const Eigen::VectorXd norm = z.rowwise().norm();
  Eigen::MatrixXd signs = z;
  for (Eigen::Index i = 0; i < n; ++i)
    if (norm[i] > std::numeric_limits<double>::epsilon()) signs.row(i) /= norm[i];
  all.push_back(axes(signs.transpose() * signs));
  Rows closest(static_cast<std::size_t>(n));
  std::iota(closest.begin(), closest.end(), 0);
  std::stable_sort(closest.begin(), closest.end(), [&](std::size_t a, std::size_t b) {
    return norm[static_cast<Eigen::Index>(a)] < norm[static_cast<Eigen::Index>(b)];
  });
  closest.resize(static_cast<std::size_t>((n + 1) / 2));
  all.push_back(axes(fit_rows(z, closest).cov));
  Eigen::MatrixXd u = Eigen::MatrixXd::Identity(p, p);
  for (Eigen::Index i = 1; i < p; ++i)
    for (Eigen::Index j = 0; j < i; ++j) {
      const double plus = mcd_scale(column(z.col(i) + z.col(j), 0)), minus = mcd_scale(column(z.col(i) - z.col(j), 0));
      u(i, j) = u(j, i) = (plus * plus - minus * minus) / 4;
    }
  all.push_back(axes(u));
  return all;
}

// The h rows closest to the centre the axes P give (r6pack's initset).
Rows initial_subset(const Eigen::MatrixXd& z, const Eigen::MatrixXd& P, std::size_t h) {
  const Eigen::MatrixXd y = z * P;
  Eigen::VectorXd lambda(P.cols());
  for (Eigen::Index j = 0; j < P.cols(); ++j) lambda[j] = centred_scale(column(y, j));
  const Eigen::MatrixXd sqrt_cov = P * lambda.asDiagonal() * P.transpose();
  const Eigen::MatrixXd sqrt_inv = P * lambda.cwiseInverse().asDiagonal() * P.transpose();
  const Eigen::MatrixXd sphered = z * sqrt_inv;
  Eigen::RowVectorXd medians(P.cols());
  for (Eigen::Index j = 0; j < P.cols(); ++j) medians[j] = median_of(column(sphered, j));
  const Eigen::RowVectorXd location = medians * sqrt_cov;
  const Eigen::MatrixXd centred = (z.rowwise() - location) * P;
  const Eigen::VectorXd d = (centred.array().rowwise() / lambda.transpose().array()).square().rowwise().sum();
  return smallest(d, h);
}

}  // namespace

McdResult deterministic_mcd(const Eigen::MatrixXd& x, const McdOptions& o) {
  const Eigen::Index n = x.rows(), p = x.cols();
  const std::size_t h = static_cast<std::size_t>(n + p + 1) / 2;
  if (p == 1) return finish(x, univariate_mcd(x, h), h, o.reweight_quantile);  // the exact MCD
  Eigen::RowVectorXd centre(p), scale(p);
  for (Eigen::Index j = 0; j < p; ++j) {
    centre[j] = median_of(column(x, j));
    scale[j] = centred_scale(column(x, j));
  }
  const Eigen::MatrixXd z = (x.rowwise() - centre).array().rowwise() / scale.array();
  Candidate best;
  bool have = false;
  for (const Eigen::MatrixXd& P : initial_axes(z)) {
    const Fit start = fit_rows(z, initial_subset(z, P, h));
    if (start.singular) return fast_mcd(x, o);  // an exact fit: FAST-MCD's handling
    Candidate c = concentrate(z, smallest(squared_distances(z, start.mean, start.cov), h), h, 200);
    if (c.fit.singular) return fast_mcd(x, o);
    if (!have || c.fit.log_det < best.fit.log_det) best = std::move(c), have = true;
  }
  return finish(x, {best.rows, fit_rows(x, best.rows)}, h, o.reweight_quantile);
}

McdResult minimum_covariance_determinant(const Eigen::MatrixXd& x, const McdOptions& o) {
  return o.engine == McdEngine::deterministic ? deterministic_mcd(x, o) : fast_mcd(x, o);
}

}  // namespace envsift
