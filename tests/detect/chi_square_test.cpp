// Chi-square quantiles (Boost.Math) against the NIST/SEMATECH e-Handbook of Statistical
// Methods, table 1.3.6.7.4 "Critical values of the chi-square distribution", upper-tail
// probability 0.025 (i.e. the 0.975 quantile), values printed to three decimals.
#include "envsift/detect/chi_square.hpp"

#include <gtest/gtest.h>

namespace envsift {
namespace {

TEST(ChiSquare, QuantilesMatchTheNistTable) {
  EXPECT_NEAR(chi_square_quantile(1, 0.975), 5.024, 5e-4);
  EXPECT_NEAR(chi_square_quantile(2, 0.975), 7.378, 5e-4);
  EXPECT_NEAR(chi_square_quantile(3, 0.975), 9.348, 5e-4);
  EXPECT_NEAR(chi_square_quantile(4, 0.975), 11.143, 5e-4);
  EXPECT_NEAR(chi_square_quantile(19, 0.975), 32.852, 5e-4);
  // same table, upper-tail probability 0.05: p = 10 → 18.307
  EXPECT_NEAR(chi_square_quantile(10, 0.95), 18.307, 5e-4);
}

TEST(ChiSquare, CdfInvertsTheQuantile) {
  EXPECT_NEAR(chi_square_cdf(3, chi_square_quantile(3, 0.975)), 0.975, 1e-12);
}

}  // namespace
}  // namespace envsift
