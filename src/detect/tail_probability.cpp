#include "envsift/detect/tail_probability.hpp"

#include <algorithm>
#include <cmath>
#include <numeric>

#include <boost/math/distributions/chi_squared.hpp>
#include <boost/math/distributions/normal.hpp>
#include <boost/math/special_functions/beta.hpp>

namespace envsift {

double normal_upper_tail(double z) {
  if (std::isnan(z)) return z;
  if (std::isinf(z)) return z > 0 ? 0.0 : 1.0;
  return boost::math::cdf(boost::math::complement(boost::math::normal(), z));
}

double normal_two_sided_tail(double z) { return std::min(1.0, 2 * normal_upper_tail(std::fabs(z))); }

double chi_square_upper_tail(double dof, double x) {
  if (std::isnan(x)) return x;
  if (!(x > 0)) return 1.0;
  if (std::isinf(x)) return 0.0;
  return boost::math::cdf(boost::math::complement(boost::math::chi_squared(dof), x));
}

double beta_upper_tail(double a, double b, double x) {
  if (std::isnan(x)) return x;
  if (!(x > 0)) return 1.0;
  if (x >= 1) return 0.0;
  return boost::math::ibetac(a, b, x);
}

double cauchy_combination(const std::vector<double>& p, const std::vector<double>& weights) {
  double t = 0;
  for (std::size_t i = 0; i < p.size(); ++i) {
    const double w = weights.empty() ? 1.0 / static_cast<double>(p.size()) : weights[i];
    if (p[i] <= 0) return 0.0;
    // tan((1/2 − p)π) = 1 / tan(pπ); for p below 1e-15, 1/(pπ) to the last digit (Liu & Xie, sec. 2)
    t += w * (p[i] < 1e-15 ? 1 / (p[i] * M_PI) : 1 / std::tan(p[i] * M_PI));
  }
  if (p.empty()) return 1.0;
  // 1/2 − arctan(T)/π, written as arctan(1/T)/π for T > 0 (the same number) so that a small
  // probability is not lost to cancellation
  return t > 0 ? std::atan(1 / t) / M_PI : 0.5 - std::atan(t) / M_PI;
}

double sidak_minimum(const std::vector<double>& p) {
  if (p.empty()) return 1.0;
  return sidak_minimum(*std::min_element(p.begin(), p.end()), p.size());
}

double sidak_minimum(double smallest, std::size_t k) {
  // 1 − (1 − p)^k = −expm1(k log1p(−p)): exact for small p
  return std::min(1.0, -std::expm1(static_cast<double>(k) * std::log1p(-std::min(smallest, 1.0))));
}

std::vector<bool> benjamini_hochberg(const std::vector<double>& p, double q) {
  const std::size_t m = p.size();
  std::vector<std::size_t> order(m);
  std::iota(order.begin(), order.end(), 0);
  std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) { return p[a] < p[b]; });
  std::size_t largest = 0;  // the number of discoveries
  for (std::size_t i = 0; i < m; ++i)
    if (p[order[i]] <= static_cast<double>(i + 1) * q / static_cast<double>(m)) largest = i + 1;
  std::vector<bool> found(m, false);
  for (std::size_t i = 0; i < largest; ++i) found[order[i]] = true;
  return found;
}

}  // namespace envsift
