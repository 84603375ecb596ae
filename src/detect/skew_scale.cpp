// Skew-aware spread.
// Sources: Brys, G., Hubert, M. & Struyf, A. (2004) A robust measure of skewness. Journal of
// Computational and Graphical Statistics 13:996-1017 (the medcouple and its fast algorithm);
// Hubert, M. & Vandervieren, E. (2008) An adjusted boxplot for skewed distributions.
// Computational Statistics & Data Analysis 52:5186-5201 (the fences).
//
// With median m, for x_i ≥ m ≥ x_j:
//   h(x_i, x_j) = ((x_i − m) − (m − x_j)) / (x_i − x_j),
//   h = sign(p − 1 − i − j) when x_i = x_j = m (i, j their places among the p values ≥ m and
//       the values ≤ m, both sorted decreasing),
//   MC = median of all h.                                              −1 ≤ MC ≤ 1
// Adjusted boxplot, Q1 and Q3 the lower and upper hinge, IQR = Q3 − Q1, c = 1.5:
//   MC ≥ 0:  [Q1 − c·e^(−4 MC)·IQR,  Q3 + c·e^(3 MC)·IQR]
//   MC < 0:  [Q1 − c·e^(−3 MC)·IQR,  Q3 + c·e^(4 MC)·IQR]
// The fast algorithm (Johnson & Mizoguchi's selection in a matrix with sorted rows and columns)
// follows the paper's outline; for an even number of kernel values it takes, as robustbase::mc
// does, the lower middle of the decreasing order, and for n ≤ 100 averages MC(x) and −MC(−x)
// (which is then the exact median of the kernel values).
#include "envsift/detect/skew_scale.hpp"
#include "envsift/median.hpp"

#include <algorithm>
#include <cmath>
#include <functional>
#include <numeric>

namespace envsift {
namespace {

// The kernel matrix of x (sorted decreasing): rows = values ≥ m, columns = values ≤ m.
struct Kernel {
  std::vector<double> plus, minus;  // both decreasing, centred on m and scaled
  double operator()(std::size_t i, std::size_t j) const {
    const double a = plus[i], b = minus[j];
    if (a == b) {
      const auto s = static_cast<long>(plus.size()) - 1 - static_cast<long>(i) - static_cast<long>(j);
      return static_cast<double>((s > 0) - (s < 0));
    }
    return (a + b) / (a - b);
  }
};

Kernel kernel_of(std::vector<double> x) {
  std::sort(x.begin(), x.end(), std::greater<>());
  std::vector<double> ascending(x.rbegin(), x.rend());
  const double m = median_of_sorted(ascending);
  double scale = 0;
  for (double v : x) scale = std::max(scale, std::fabs(v - m));
  if (!(scale > 0)) scale = 1;
  Kernel k;
  for (double v : x) {
    if (v >= m) k.plus.push_back((v - m) / scale);
    if (v <= m) k.minus.push_back((v - m) / scale);
  }
  return k;
}

// The kernel value at place ⌊p·q/2⌋ of the decreasing order.
double fast_medcouple_one_side(const std::vector<double>& x) {
  const Kernel h = kernel_of(x);
  const std::size_t p = h.plus.size(), q = h.minus.size();
  std::vector<long> left(p, 0), right(p, static_cast<long>(q) - 1);
  long left_total = 0, right_total = static_cast<long>(p * q);
  const long target = static_cast<long>(p * q / 2);
  std::vector<long> P(p), Q(p);
  while (right_total - left_total > static_cast<long>(p)) {
    // weighted median of the middles of the rows' remaining ranges
    std::vector<std::pair<double, long>> middles;
    long weight_total = 0;
    for (std::size_t i = 0; i < p; ++i)
      if (left[i] <= right[i]) {
        const long w = right[i] - left[i] + 1;
        middles.emplace_back(h(i, static_cast<std::size_t>((left[i] + right[i]) / 2)), w);
        weight_total += w;
      }
    std::sort(middles.begin(), middles.end());
    double trial = middles.back().first;
    long seen = 0;
    for (const auto& [value, w] : middles)
      if ((seen += w) * 2 >= weight_total) {
        trial = value;
        break;
      }
    // P[i]: last column with h > trial; Q[i]: first column with h < trial
    for (long i = static_cast<long>(p) - 1, j = 0; i >= 0; --i) {
      while (j < static_cast<long>(q) && h(static_cast<std::size_t>(i), static_cast<std::size_t>(j)) > trial) ++j;
      P[static_cast<std::size_t>(i)] = j - 1;
    }
    for (long i = 0, j = static_cast<long>(q) - 1; i < static_cast<long>(p); ++i) {
      while (j >= 0 && h(static_cast<std::size_t>(i), static_cast<std::size_t>(j)) < trial) --j;
      Q[static_cast<std::size_t>(i)] = j + 1;
    }
    const long above = std::accumulate(P.begin(), P.end(), 0L) + static_cast<long>(p);  // h > trial
    const long at_or_above = std::accumulate(Q.begin(), Q.end(), 0L);                   // h ≥ trial
    if (target <= above - 1) {
      right = P;
      right_total = above;
    } else if (target > at_or_above - 1) {
      left = Q;
      left_total = at_or_above;
    } else {
      return trial;
    }
  }
  std::vector<double> rest;
  for (std::size_t i = 0; i < p; ++i)
    for (long j = left[i]; j <= right[i]; ++j) rest.push_back(h(i, static_cast<std::size_t>(j)));
  const auto k = static_cast<std::size_t>(target - left_total);
  std::nth_element(rest.begin(), rest.begin() + static_cast<std::ptrdiff_t>(k), rest.end(), std::greater<>());
  return rest[k];
}

std::vector<double> finite(std::vector<double> x) {
  x.erase(std::remove_if(x.begin(), x.end(), [](double v) { return !std::isfinite(v); }), x.end());
  return x;
}

}  // namespace

double medcouple(std::vector<double> x) {
  x = finite(std::move(x));
  if (x.size() < 3) return 0;
  const double mc = fast_medcouple_one_side(x);
  if (x.size() > 100) return mc;
  for (double& v : x) v = -v;
  return (mc - fast_medcouple_one_side(x)) / 2;
}

double medcouple_by_definition(std::vector<double> x) {
  x = finite(std::move(x));
  if (x.size() < 3) return 0;
  const Kernel h = kernel_of(x);
  std::vector<double> all;
  for (std::size_t i = 0; i < h.plus.size(); ++i)
    for (std::size_t j = 0; j < h.minus.size(); ++j) all.push_back(h(i, j));
  std::sort(all.begin(), all.end());
  return median_of_sorted(all);
}

AdjustedFences adjusted_fences(std::vector<double> x, double c) {
  x = finite(std::move(x));
  std::sort(x.begin(), x.end());
  AdjustedFences f{};
  const std::size_t n = x.size();
  if (n == 0) return {NAN, NAN, NAN, NAN, NAN, NAN};
  // Tukey's hinges, as R's fivenum: the medians of the lower and upper halves (middle included)
  const double depth = std::floor((static_cast<double>(n) + 3) / 2) / 2;
  auto at_depth = [&](double d) {
    const auto lo = static_cast<std::size_t>(std::floor(d)) - 1, hi = static_cast<std::size_t>(std::ceil(d)) - 1;
    return (x[lo] + x[hi]) / 2;
  };
  f.lower_hinge = at_depth(depth);
  f.upper_hinge = at_depth(static_cast<double>(n) + 1 - depth);
  f.median = median_of_sorted(x);
  f.medcouple = medcouple(x);
  const double iqr = f.upper_hinge - f.lower_hinge, mc = f.medcouple;
  f.low = f.lower_hinge - c * std::exp(mc >= 0 ? -4 * mc : -3 * mc) * iqr;
  f.high = f.upper_hinge + c * std::exp(mc >= 0 ? 3 * mc : 4 * mc) * iqr;
  return f;
}

SideScales side_scales(std::vector<double> x, double fallback) {
  constexpr double kNormalFence = 0.6744897501960817 * 4;  // Φ⁻¹(¾) + 1.5 · 2Φ⁻¹(¾) = 4 Φ⁻¹(¾) = 2.698
  const AdjustedFences f = adjusted_fences(std::move(x));
  SideScales s{f.median, (f.median - f.low) / kNormalFence, (f.high - f.median) / kNormalFence};
  if (!(s.below > 0)) s.below = fallback;
  if (!(s.above > 0)) s.above = fallback;
  return s;
}

}  // namespace envsift

namespace envsift {

double resolution(std::vector<double> x) {
  x = finite(std::move(x));
  std::sort(x.begin(), x.end());
  // gaps of rounding noise (a scaled integer read as 15.100000000000001) are not gaps
  double gap = 0;
  for (std::size_t i = 1; i < x.size(); ++i) {
    const double d = x[i] - x[i - 1];
    if (d > 1e-9 * std::max(1.0, std::fabs(x[i])) && (gap == 0 || d < gap)) gap = d;
  }
  return gap;
}

}  // namespace envsift
