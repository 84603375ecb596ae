// Measures how much larger the reweighted MCD's robust D² runs than χ²_k at small n — the
// inflation c(k, n) robust_mahalanobis.cpp divides D² by — by simulation: clean normal taxa
// (calibration/null_shares.hpp, seed 20261205), for each k and n the ratio of the 99th
// percentile of robust D² to χ²_{k, 0.99}. Prints one line per (k, n) and the least-squares fit
// of c − 1 = a·(k − 1)/n + b·(k − 1)/n² (in one dimension the reweighted MCD's D² is close to
// χ²_1 already; the inflation grows with each further dimension); envsift uses the fitted a and b. Run:
//   build/envsift_calibrate_robust_distance
// (A few minutes on two cores; the check that keeps the fit honest is
// tests/detect/calibrated_probability_test.cpp.)
#include <algorithm>
#include <cstdio>

#include <Eigen/Dense>

#include "calibration/null_shares.hpp"
#include "envsift/detect/chi_square.hpp"
#include "envsift/detect/robust_mahalanobis.hpp"

int main() {
  using namespace envsift;
  MahalanobisOptions o;
  o.min_records = 5;
  const RobustMahalanobis test(o);
  std::vector<double> x1, x2, y;
  std::printf("k\tn\tshare_p_le_0.01_now\tinflation_99\n");
  for (std::size_t k : {1, 2, 3, 4, 6})
    for (std::size_t n : {15, 20, 30, 50, 100, 200}) {
      if (n < 3 * k) continue;
      const std::size_t taxa = std::max<std::size_t>(40, 40000 / n);
      auto s = calibration::null_share(test, n, k, taxa, 0.01, 20261205 + 7 * k + n);
      std::vector<double> d2 = s.statistics;  // robust D²
      std::sort(d2.begin(), d2.end());
      const double q99 = d2[static_cast<std::size_t>(0.99 * static_cast<double>(d2.size() - 1))];
      const double c = q99 / chi_square_quantile(static_cast<double>(k), 0.99);
      std::printf("%zu\t%zu\t%.4f\t%.3f\n", k, n, s.share(), c);
      const double m = static_cast<double>(n), extra = static_cast<double>(k) - 1;
      x1.push_back(extra / m), x2.push_back(extra / (m * m)), y.push_back(c - 1);
    }
  Eigen::MatrixXd a(static_cast<Eigen::Index>(y.size()), 2);
  Eigen::VectorXd b(static_cast<Eigen::Index>(y.size()));
  for (std::size_t i = 0; i < y.size(); ++i)
    a(static_cast<Eigen::Index>(i), 0) = x1[i], a(static_cast<Eigen::Index>(i), 1) = x2[i], b[static_cast<Eigen::Index>(i)] = y[i];
  const Eigen::VectorXd coef = a.colPivHouseholderQr().solve(b);
  std::printf("fit: c(k, n) = 1 + %.3f (k - 1)/n + %.1f (k - 1)/n^2\n", coef[0], coef[1]);
}
