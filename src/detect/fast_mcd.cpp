// FAST-MCD.
// Source: Rousseeuw, P.J. & Van Driessen, K. (1999) A fast algorithm for the minimum covariance
// determinant estimator. Technometrics 41:212-223.
//
// The MCD of n rows in p dimensions is the subset H of h = ⌊(n + p + 1)/2⌋ rows whose covariance
// has the smallest determinant. FAST-MCD finds it by "concentration steps" (C-steps, the paper's
// Theorem 1): from any H with mean T and covariance S, the h rows with the smallest
// d²(i) = (x_i − T)ᵀ S⁻¹ (x_i − T) form an H' with det S' ≤ det S. The algorithm:
//   1. many random (p+1)-subsets (rows added at random while their covariance is singular),
//      each grown to h rows by its distances, then two C-steps;
//   2. the `finalists` starts with the lowest determinant iterated to convergence;
//   3. for n > 1500, the paper's nested subsets: 1500 random rows in 5 groups of 300; the starts
//      run in the groups, the best of each group get two C-steps on the pooled rows, and only the
//      finalists see all rows — the cost of the search does not grow with n. (The paper nests
//      from n > 600; envsift searches all rows up to 1500, which matched covMcd more closely on
//      R's quakes data, n = 1000, in the reference tests);
//   4. p = 1: the exact MCD, the contiguous window of h sorted values with least variance;
//   5. an exact fit (the best h rows on a hyperplane, determinant 0) sets the flat directions
//      aside and repeats the search on the others (see exact_fit below).
// Consistency factor (as in R's robustbase::covMcd without small-sample correction, which the
// tests compare with): raw scatter = c(h/n) · cov(H), with
//   c(α) = α / P(χ²_{p+2} ≤ χ²_{p,α})
// and cov(·) the usual (m − 1)-divisor covariance. Reweighting: rows with raw d² < χ²_{p,0.975}
// get weight 1, others 0; the final location/scatter are the mean and c(m/n) · covariance of the
// m weighted rows.
#include "envsift/detect/fast_mcd.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numeric>
#include <random>

#include <Eigen/Cholesky>
#include <Eigen/Eigenvalues>

#include "envsift/detect/chi_square.hpp"
#include "mcd_steps.hpp"

namespace envsift {

using namespace mcd;

namespace {

// Uniform integer in [0, n) from a 64-bit generator, the same on every platform.
std::size_t uniform_index(std::mt19937_64& rng, std::size_t n) {
  return static_cast<std::size_t>(static_cast<double>(rng() >> 11) * 0x1.0p-53 * static_cast<double>(n));
}

Candidate random_start(const Eigen::MatrixXd& x, std::size_t h, std::mt19937_64& rng) {
  const auto n = static_cast<std::size_t>(x.rows()), p = static_cast<std::size_t>(x.cols());
  Rows start;
  auto add_random_row = [&] {
    for (;;) {
      const std::size_t r = uniform_index(rng, n);
      if (std::find(start.begin(), start.end(), r) == start.end()) {
        start.push_back(r);
        return;
      }
    }
  };
  while (start.size() < p + 1) add_random_row();
  std::sort(start.begin(), start.end());
  Fit fit = fit_rows(x, start);
  while (fit.singular && start.size() < h) {
    add_random_row();
    std::sort(start.begin(), start.end());
    fit = fit_rows(x, start);
  }
  if (fit.singular) return {start, fit};
  return concentrate(x, smallest(squared_distances(x, fit.mean, fit.cov), h), h, 2);
}

}  // namespace

// Exact fit: the best h rows lie on a hyperplane (e.g. more than half share one value of a layer
// of few classes). Every such subset has determinant 0, so which one the search lands on is
// arbitrary; instead the flat directions are set aside (no robust scale exists along them) and
// the MCD is computed again on the data projected onto the remaining directions. The result has
// zero scatter along the flat directions, which the distance then leaves out.
static McdResult exact_fit(const Eigen::MatrixXd& x, const Candidate& flat, const McdOptions& o) {
  const Eigen::Index p = x.cols();
  Eigen::SelfAdjointEigenSolver<Eigen::MatrixXd> eig(flat.fit.cov);
  const double largest = std::max(eig.eigenvalues().maxCoeff(), 0.0);
  Eigen::Index flat_count = 0;
  while (flat_count < p && eig.eigenvalues()[flat_count] <= 1e-10 * largest) ++flat_count;
  // The subset was found singular by its Cholesky factor; its smallest direction is flat at least
  // (and setting it aside guarantees the recursion ends).
  flat_count = std::max<Eigen::Index>(flat_count, 1);
  const Eigen::MatrixXd normal = eig.eigenvectors().leftCols(flat_count);  // flat directions
  const Eigen::MatrixXd plane = eig.eigenvectors().rightCols(p - flat_count);
  McdResult r;
  r.exact_fit = true;
  r.h = flat.rows.size();
  r.subset = flat.rows;
  const Eigen::VectorXd offset = normal * (normal.transpose() * flat.fit.mean);  // where the plane lies
  if (plane.cols() == 0) {  // all of the subset is one point
    r.raw_center = r.center = flat.fit.mean;
    r.raw_scatter = r.scatter = Eigen::MatrixXd::Zero(p, p);
    r.weights.assign(static_cast<std::size_t>(x.rows()), true);
    return r;
  }
  const McdResult inner = fast_mcd(x * plane, o);
  r.raw_center = plane * inner.raw_center + offset;
  r.center = plane * inner.center + offset;
  r.raw_scatter = plane * inner.raw_scatter * plane.transpose();
  r.scatter = plane * inner.scatter * plane.transpose();
  r.weights = inner.weights;
  return r;
}

McdResult fast_mcd(const Eigen::MatrixXd& x, const McdOptions& o) {
  const auto n = static_cast<std::size_t>(x.rows()), p = static_cast<std::size_t>(x.cols());
  McdResult r;
  r.h = (n + p + 1) / 2;
  std::mt19937_64 rng(o.seed);

  Candidate best;
  if (p == 1) {
    best = univariate_mcd(x, r.h);
  } else {
    // Step 1. Up to `subsample` rows: every start on all rows. Larger: the paper's nested subsets
    // — a random subsample of `subsample` rows, split into k ≤ 5 groups of about `group` rows;
    // starts/k starts in each group, the best `finalists` of every group carried to the pooled
    // subsample with two more C-steps, and the best `finalists` of those kept.
    Rows sample(n);
    std::iota(sample.begin(), sample.end(), 0);
    std::size_t groups = 1;
    if (n > o.subsample) {
      for (std::size_t i = 0; i < o.subsample; ++i) std::swap(sample[i], sample[i + uniform_index(rng, n - i)]);
      sample.resize(o.subsample);
      groups = std::min<std::size_t>(5, std::max<std::size_t>(1, o.subsample / o.group));
    }
    auto rows_of = [&](const Rows& rows) {
      Eigen::MatrixXd m(static_cast<Eigen::Index>(rows.size()), x.cols());
      for (std::size_t i = 0; i < rows.size(); ++i) m.row(static_cast<Eigen::Index>(i)) = x.row(static_cast<Eigen::Index>(rows[i]));
      return m;
    };
    auto scaled_h = [&](std::size_t rows) { return rows == n ? r.h : (rows * r.h + n - 1) / n; };
    std::vector<Candidate> starts;  // in the row numbers of `sample`
    for (std::size_t g = 0; g < groups; ++g) {
      // group g: positions [g·pooled/groups, (g+1)·pooled/groups) of the shuffled sample
      const std::size_t from = g * sample.size() / groups, to = (g + 1) * sample.size() / groups;
      const Rows members(sample.begin() + static_cast<std::ptrdiff_t>(from), sample.begin() + static_cast<std::ptrdiff_t>(to));
      const Eigen::MatrixXd xg = rows_of(members);
      std::vector<Candidate> local;
      for (std::size_t s = 0; s < o.starts / groups; ++s) local.push_back(random_start(xg, scaled_h(members.size()), rng));
      if (groups > 1) {
        std::stable_sort(local.begin(), local.end(), better);
        local.resize(std::min(local.size(), o.finalists));
      }
      for (auto& c : local) {
        for (auto& row : c.rows) row += from;  // into positions of `sample`
        starts.push_back(std::move(c));
      }
    }
    if (groups > 1) {  // carry every group's best to the pooled subsample
      const Eigen::MatrixXd xs = rows_of(sample);
      const std::size_t hs = scaled_h(sample.size());
      for (auto& c : starts)
        if (!c.fit.singular) c = concentrate(xs, smallest(squared_distances(xs, c.fit.mean, c.fit.cov), hs), hs, 2);
    }
    std::stable_sort(starts.begin(), starts.end(), better);
    starts.resize(std::min(starts.size(), o.finalists));
    // Step 2: the finalists to convergence on all rows.
    bool have = false;
    for (const Candidate& c : starts) {
      Candidate full;
      if (c.fit.singular) {  // an exact fit already: keep it, in the full data's row numbers
        Rows rows;
        for (std::size_t k : c.rows) rows.push_back(sample[k]);
        std::sort(rows.begin(), rows.end());
        Fit fit = fit_rows(x, rows);
        full = {std::move(rows), std::move(fit)};
      } else {
        Rows rows = sample.size() == n ? c.rows : smallest(squared_distances(x, c.fit.mean, c.fit.cov), r.h);
        full = concentrate(x, rows, r.h, 100);
      }
      if (!have || better(full, best)) {
        best = std::move(full);
        have = true;
      }
    }
  }

  if (best.fit.singular && best.fit.cov.size() > 0) {
    return exact_fit(x, best, o);
  }
  return finish(x, best, r.h, o.reweight_quantile);
}

}  // namespace envsift
