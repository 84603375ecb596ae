// Qn and the τ-scale against R's robustbase 0.95 (Debian r-cran-robustbase): Qn() and
// scaleTau2() with their defaults, on columns of R data sets (stackloss, swiss, quakes from
// datasets; hbk, starsCYG from robustbase), whole and cut to n = 2..14 so that every Qn
// small-sample factor is used. Fixture and script: tests/reference/robust_scale/.
// robustbase's Qn returns its order statistic rounded to single precision (checked in R 4.2:
// .C(Qn0) on hbk$X1[1:8] gives 0.40000000596 for the difference 0.4), so Qn agrees to float
// precision (2e-7 relative); envsift keeps the double. The τ-scale agrees to 1e-12.
#include <sstream>

#include <gtest/gtest.h>

#include "../support.hpp"
#include "envsift/detect/robust_scale.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

TEST(RobustScale, QnAndTauScaleMatchRobustbase) {
  const Table t = read_csv(source_path("tests/reference/robust_scale/scales.csv"));
  ASSERT_GT(t.rows.size(), 100u);
  for (const auto& row : t.rows) {
    std::vector<double> v;
    std::stringstream in(row[4]);
    for (std::string item; std::getline(in, item, ';');) v.push_back(std::stod(item));
    ASSERT_EQ(v.size(), std::stoul(row[1]));
    const double qn = std::stod(row[2]), tau = std::stod(row[3]);
    EXPECT_NEAR(qn_scale(v), qn, 2e-7 * std::max(1e-3, qn)) << row[0] << " n=" << row[1];
    EXPECT_NEAR(tau_scale(v), tau, 1e-12 * std::max(1.0, tau)) << row[0] << " n=" << row[1];
  }
}

// The selection inside Qn against sorting every pairwise difference (the definition,
// Rousseeuw & Croux 1993), on values with many ties and on distinct ones.
TEST(RobustScale, QnSelectionEqualsFullSort) {
  for (int n : {13, 40, 101, 400}) {
    for (int ties : {0, 1}) {
      std::vector<double> v;
      for (int i = 0; i < n; ++i) v.push_back(ties ? (i * 7919 % 13) : std::sin(i * 1.3) * 100 + i * 0.01);
      std::vector<double> diffs;
      for (int i = 0; i < n; ++i)
        for (int j = i + 1; j < n; ++j) diffs.push_back(std::fabs(v[static_cast<std::size_t>(i)] - v[static_cast<std::size_t>(j)]));
      std::sort(diffs.begin(), diffs.end());
      const std::size_t h = static_cast<std::size_t>(n) / 2 + 1, k = h * (h - 1) / 2;
      const double m = n;
      const double c = (n % 2 ? 1.60188 + (-2.1284 - 5.172 / m) / m : 3.67561 + (1.9654 + (6.987 - 77 / m) / m) / m) / m + 1;
      EXPECT_DOUBLE_EQ(qn_scale(v), 2.21914 * diffs[k - 1] / c) << "n=" << n << " ties=" << ties;
    }
  }
}

// Over half the values tied: the scale falls back to a quantile of |x − median| (R's doScale).
TEST(RobustScale, ZeroScaleFallsBackToAQuantile) {
  std::vector<double> v(20, 5.0);
  v[18] = 6, v[19] = 9;
  // |x − 5| sorted: eighteen 0, 1, 4. Type-7 quantiles at 0.5..0.95 are 0 up to 0.90
  // (position 17.1 → 0.1), so the first non-zero is at α = 0.90: 0.1 / Φ⁻¹(0.95).
  EXPECT_NEAR(mcd_scale(v), 0.1 / 1.6448536269514722, 1e-12);
  EXPECT_EQ(mcd_scale(std::vector<double>(10, 3.0)), 1.0);
}

}  // namespace
}  // namespace envsift
