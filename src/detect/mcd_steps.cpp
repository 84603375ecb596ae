// The C-step machinery shared by FAST-MCD and the deterministic MCD (see mcd_steps.hpp).
// Source: Rousseeuw, P.J. & Van Driessen, K. (1999) A fast algorithm for the minimum covariance
// determinant estimator. Technometrics 41:212-223 (C-steps, Theorem 1; consistency factor and
// reweighting as in R's robustbase::covMcd without small-sample correction).
#include "mcd_steps.hpp"

#include <algorithm>
#include <cmath>
#include <numeric>

#include <Eigen/Cholesky>

#include "envsift/detect/chi_square.hpp"

namespace envsift::mcd {


Fit fit_rows(const Eigen::MatrixXd& x, const Rows& rows) {
  Fit f;
  const auto m = static_cast<Eigen::Index>(rows.size());
  Eigen::MatrixXd sub(m, x.cols());
  for (Eigen::Index i = 0; i < m; ++i) sub.row(i) = x.row(static_cast<Eigen::Index>(rows[static_cast<std::size_t>(i)]));
  f.mean = sub.colwise().mean().transpose();
  sub.rowwise() -= f.mean.transpose();
  f.cov = (sub.transpose() * sub) / static_cast<double>(std::max<Eigen::Index>(m - 1, 1));
  Eigen::LLT<Eigen::MatrixXd> llt(f.cov);
  if (llt.info() != Eigen::Success) return f;
  const Eigen::VectorXd diag = Eigen::MatrixXd(llt.matrixL()).diagonal();
  const double tiny = 1e-12 * std::max(1.0, f.cov.diagonal().maxCoeff());
  if ((diag.array() <= std::sqrt(tiny)).any()) return f;
  f.log_det = 2 * diag.array().log().sum();
  f.singular = false;
  return f;
}

Eigen::VectorXd squared_distances(const Eigen::MatrixXd& x, const Eigen::VectorXd& center, const Eigen::MatrixXd& cov) {
  Eigen::LLT<Eigen::MatrixXd> llt(cov);
  Eigen::MatrixXd centred = (x.rowwise() - center.transpose()).transpose();
  llt.matrixL().solveInPlace(centred);
  return centred.colwise().squaredNorm().transpose();
}

Rows smallest(const Eigen::VectorXd& d, std::size_t h) {
  Rows idx(static_cast<std::size_t>(d.size()));
  std::iota(idx.begin(), idx.end(), 0);
  auto less = [&](std::size_t a, std::size_t b) {
    return d[static_cast<Eigen::Index>(a)] < d[static_cast<Eigen::Index>(b)] ||
           (d[static_cast<Eigen::Index>(a)] == d[static_cast<Eigen::Index>(b)] && a < b);
  };
  std::nth_element(idx.begin(), idx.begin() + static_cast<std::ptrdiff_t>(h), idx.end(), less);
  idx.resize(h);
  std::sort(idx.begin(), idx.end());
  return idx;
}

Candidate concentrate(const Eigen::MatrixXd& x, Rows rows, std::size_t h, int max_steps) {
  Fit fit = fit_rows(x, rows);
  for (int step = 0; step < max_steps && !fit.singular; ++step) {
    Rows next = smallest(squared_distances(x, fit.mean, fit.cov), h);
    if (next == rows) break;
    rows = std::move(next);
    fit = fit_rows(x, rows);
  }
  return {std::move(rows), std::move(fit)};
}



bool better(const Candidate& a, const Candidate& b) {
  if (a.fit.singular != b.fit.singular) return a.fit.singular;  // an exact fit is the minimum
  return a.fit.log_det < b.fit.log_det;
}

Candidate univariate_mcd(const Eigen::MatrixXd& x, std::size_t h) {
  const auto n = static_cast<std::size_t>(x.rows());
  Rows order(n);
  std::iota(order.begin(), order.end(), 0);
  std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
    return x(static_cast<Eigen::Index>(a), 0) < x(static_cast<Eigen::Index>(b), 0);
  });
  double sum = 0, sum_sq = 0, best_var = std::numeric_limits<double>::infinity();
  std::size_t best = 0;
  for (std::size_t i = 0; i < n; ++i) {
    const double v = x(static_cast<Eigen::Index>(order[i]), 0);
    sum += v;
    sum_sq += v * v;
    if (i >= h) {
      const double out = x(static_cast<Eigen::Index>(order[i - h]), 0);
      sum -= out;
      sum_sq -= out * out;
    }
    if (i + 1 >= h) {
      const double var = sum_sq - sum * sum / static_cast<double>(h);
      if (var < best_var - 1e-12 * std::fabs(best_var)) {
        best_var = var;
        best = i + 1 - h;
      }
    }
  }
  Rows rows(order.begin() + static_cast<std::ptrdiff_t>(best), order.begin() + static_cast<std::ptrdiff_t>(best + h));
  std::sort(rows.begin(), rows.end());
  Fit fit = fit_rows(x, rows);
  return {std::move(rows), std::move(fit)};
}

double consistency_factor(double p, double alpha) {
  if (alpha >= 1) return 1.0;
  return alpha / chi_square_cdf(p + 2, chi_square_quantile(p, alpha));
}

McdResult finish(const Eigen::MatrixXd& x, const Candidate& best, std::size_t h, double reweight_quantile) {
  const auto n = static_cast<std::size_t>(x.rows());
  const auto p = static_cast<double>(x.cols());
  McdResult r;
  r.h = h;
  r.subset = best.rows;
  r.raw_center = best.fit.mean;
  r.raw_scatter = best.fit.cov * consistency_factor(p, static_cast<double>(h) / static_cast<double>(n));
  r.weights.assign(n, true);
  const Eigen::VectorXd d2 = squared_distances(x, r.raw_center, r.raw_scatter);
  const double cutoff = chi_square_quantile(p, reweight_quantile);
  Rows kept;
  for (std::size_t i = 0; i < n; ++i) {
    r.weights[i] = d2[static_cast<Eigen::Index>(i)] < cutoff;
    if (r.weights[i]) kept.push_back(i);
  }
  const Fit reweighted = fit_rows(x, kept);
  r.center = reweighted.mean;
  r.scatter = reweighted.cov * consistency_factor(p, static_cast<double>(kept.size()) / static_cast<double>(n));
  return r;
}

}  // namespace envsift::mcd
