// Robust scales.
// Sources: Rousseeuw, P.J. & Croux, C. (1993) Alternatives to the median absolute deviation.
// Journal of the American Statistical Association 88:1273-1283 (Qn); Maronna, R.A. & Zamar, R.H.
// (2002) Robust estimates of location and dispersion for high-dimensional datasets.
// Technometrics 44:307-317 (the τ-scale). Constants and finite-sample factors as in R's
// robustbase 0.95 (Qn, Qn.finite.c, scaleTau2, doScale), which the tests compare with.
#include "envsift/detect/robust_scale.hpp"

#include <algorithm>
#include <cmath>
#include <numeric>

#include <boost/math/distributions/normal.hpp>

#include "envsift/median.hpp"

namespace envsift {
namespace {


// The k-th smallest (1-based) of y[j] − y[i], i < j, for sorted y: the candidates of each row i
// are narrowed to [left_i, right_i] around a weighted median of the rows' middle candidates,
// which removes at least a quarter of them each round (the selection idea of Croux & Rousseeuw's
// Qn algorithm); counting the pairs below a trial value is one pass with two pointers.
double kth_pairwise_difference(const std::vector<double>& y, std::size_t k) {
  const std::size_t n = y.size();
  std::vector<std::size_t> left(n), right(n);
  for (std::size_t i = 0; i < n; ++i) left[i] = i + 1, right[i] = n;  // candidates j in [left, right)
  std::vector<std::pair<double, std::size_t>> middles;
  for (;;) {
    std::size_t candidates = 0, below = 0;  // `below`: pairs already known to rank under the answer
    for (std::size_t i = 0; i < n; ++i) candidates += right[i] - left[i], below += left[i] - (i + 1);
    if (candidates <= n) {
      std::vector<double> rest;
      for (std::size_t i = 0; i < n; ++i)
        for (std::size_t j = left[i]; j < right[i]; ++j) rest.push_back(y[j] - y[i]);
      std::nth_element(rest.begin(), rest.begin() + static_cast<std::ptrdiff_t>(k - 1 - below), rest.end());
      return rest[k - 1 - below];
    }
    // the weighted median of the rows' middle candidates (weights: the rows' candidate counts)
    middles.clear();
    for (std::size_t i = 0; i < n; ++i)
      if (right[i] > left[i]) middles.emplace_back(y[(left[i] + right[i] - 1) / 2] - y[i], right[i] - left[i]);
    double trial = 0;
    for (std::size_t lo = 0, hi = middles.size(), wanted = (candidates + 1) / 2;;) {  // selection on [lo, hi)
      const std::size_t mid = lo + (hi - lo) / 2;
      std::nth_element(middles.begin() + static_cast<std::ptrdiff_t>(lo), middles.begin() + static_cast<std::ptrdiff_t>(mid),
                       middles.begin() + static_cast<std::ptrdiff_t>(hi));
      std::size_t below_mid = 0;
      for (std::size_t k = lo; k < mid; ++k) below_mid += middles[k].second;
      if (below_mid >= wanted) {
        hi = mid;
      } else if (below_mid + middles[mid].second >= wanted) {
        trial = middles[mid].first;
        break;
      } else {
        wanted -= below_mid + middles[mid].second;
        lo = mid + 1;
      }
    }
    // Per row: pairs with difference < trial and ≤ trial (as end positions of j).
    std::vector<std::size_t> less(n), at_most(n);
    std::size_t count_less = 0, count_at_most = 0, jl = 0, ja = 0;
    for (std::size_t i = 0; i < n; ++i) {
      jl = std::max(jl, i + 1), ja = std::max(ja, i + 1);
      while (jl < n && y[jl] - y[i] < trial) ++jl;
      while (ja < n && y[ja] - y[i] <= trial) ++ja;
      less[i] = jl, at_most[i] = ja;
      count_less += jl - (i + 1), count_at_most += ja - (i + 1);
    }
    if (k <= count_less) {
      for (std::size_t i = 0; i < n; ++i) right[i] = std::min(right[i], less[i]);
    } else if (k <= count_at_most) {
      return trial;
    } else {
      for (std::size_t i = 0; i < n; ++i) left[i] = std::max(left[i], at_most[i]);
    }
  }
}

}  // namespace

double qn_scale(std::vector<double> x) {
  const std::size_t n = x.size();
  if (n < 2) return 0;
  std::sort(x.begin(), x.end());
  const std::size_t h = n / 2 + 1, k = h * (h - 1) / 2;
  const double r = 2.21914 * kth_pairwise_difference(x, k);
  if (n <= 12) {
    static const double factor[] = {0.399356, 0.99365, 0.51321, 0.84401, 0.6122, 0.85877,
                                    0.66993,  0.87344, 0.72014, 0.88906, 0.75743};
    return r * factor[n - 2];
  }
  const double m = static_cast<double>(n);
  const double c = (n % 2 ? 1.60188 + (-2.1284 - 5.172 / m) / m : 3.67561 + (1.9654 + (6.987 - 77 / m) / m) / m) / m + 1;
  return r / c;
}

double tau_scale(const std::vector<double>& x) {
  const double c1 = 4.5, c2 = 3;
  const double mu0 = median_of(x);
  std::vector<double> dev(x.size());
  for (std::size_t i = 0; i < x.size(); ++i) dev[i] = std::fabs(x[i] - mu0);
  const double sigma0 = median_of(dev);
  if (!(sigma0 > 0)) return 0;
  double sw = 0, sxw = 0;
  for (std::size_t i = 0; i < x.size(); ++i) {
    const double u = dev[i] / (sigma0 * c1), w = u < 1 ? (1 - u * u) * (1 - u * u) : 0;
    sw += w, sxw += x[i] * w;
  }
  const double mu = sxw / sw;
  double rho = 0;
  for (double v : x) rho += std::min(((v - mu) / sigma0) * ((v - mu) / sigma0), c2 * c2);
  const boost::math::normal normal;
  const double b = c2 * boost::math::quantile(normal, 0.75);
  const double e_rho = 2 * ((1 - b * b) * boost::math::cdf(normal, b) - b * boost::math::pdf(normal, b) + b * b) - 1;
  return sigma0 * std::sqrt(rho / (static_cast<double>(x.size()) * e_rho));
}

double mcd_scale(const std::vector<double>& x) {
  const double s = x.size() < 1000 ? qn_scale(x) : tau_scale(x);
  if (s > 0) return s;
  // R's quantile type 7 of |x − median| at 50 %, 55 %, …, 95 %, 98.75 %.
  const double mid = median_of(x);
  std::vector<double> dev(x.size());
  for (std::size_t i = 0; i < x.size(); ++i) dev[i] = std::fabs(x[i] - mid);
  std::sort(dev.begin(), dev.end());
  const boost::math::normal normal;
  for (int step = 10; step <= 20; ++step) {
    const double alpha = step < 20 ? step / 20.0 : 19.75 / 20;
    const double at = alpha * static_cast<double>(dev.size() - 1);
    const auto lo = static_cast<std::size_t>(std::floor(at));
    const double q = dev[lo] + (at - static_cast<double>(lo)) * (dev[std::min(lo + 1, dev.size() - 1)] - dev[lo]);
    if (q != 0) return q / boost::math::quantile(normal, (alpha + 1) / 2);
  }
  return 1;
}

}  // namespace envsift
