// The landscape test on cases whose answer is known by hand.
//  1. A bimodal landscape: 80 % of its cells in a common mode, 20 % in a rare one; the taxon lives
//     in the rare mode only. A record in the common mode is flagged (its environment covers most
//     of the landscape and holds none of the taxon's places); a record in the rare-but-used mode
//     is not.
//  2. The density ratio itself, against its closed form: landscape N(0, 1), taxon N(1, 0.5²), so
//     a(x)/f(x) = φ(x) / (φ((x − 1)/0.5)/0.5) (normal densities; textbook algebra). The fitted
//     ratio must be within a factor e^0.35 of it across the taxon's range.
//  2b. Its probability against the closed form for the same case: the fitted log ratio is
//     quadratic, η(x) = c − 1.5 (x − 4/3)² (−2(x − 1)² + x²/2), so the environments at most as
//     suited as x are |X − 4/3| ≥ |x − 4/3|, and under the taxon X ~ N(1, 0.5²):
//     p(x) = Φ((1/3 − d)/0.5) + 1 − Φ((1/3 + d)/0.5), d = |x − 4/3| (textbook algebra).
//  3. Ties: on rounded layers (a DEM in whole metres, a raster rounded to 0.1), many cells share the
//     record's environment; "at most as suited" counts all of them, whatever the rounding of η (the
//     share is then a whole number of environments: arithmetic). It failed before ties were counted.
//  4. What the test cannot judge says why (no landscape, too few places, a missing value).
// Samples are deterministic normal quantiles Φ⁻¹((i − 0.5)/n), so nothing here is random.
#include <cmath>

#include <boost/math/distributions/normal.hpp>
#include <gtest/gtest.h>

#include "envsift/detect/landscape.hpp"

namespace envsift {
namespace {

double normal_quantile(double p) { return boost::math::quantile(boost::math::normal(), p); }

// n values of N(mean, sd) at evenly spaced quantiles.
std::vector<double> quantiles(std::size_t n, double mean, double sd) {
  std::vector<double> v;
  for (std::size_t i = 0; i < n; ++i) v.push_back(mean + sd * normal_quantile((static_cast<double>(i) + 0.5) / static_cast<double>(n)));
  return v;
}

Eigen::MatrixXd column(const std::vector<double>& v) {
  Eigen::MatrixXd m(static_cast<Eigen::Index>(v.size()), 1);
  for (std::size_t i = 0; i < v.size(); ++i) m(static_cast<Eigen::Index>(i), 0) = v[i];
  return m;
}

const std::vector<std::string> kNames{"elevation"};

TEST(Landscape, FlagsTheCommonButUnusedModeNotTheRareButUsedOne) {
  std::vector<double> land = quantiles(800, 0, 1), rare = quantiles(200, 10, 1);
  land.insert(land.end(), rare.begin(), rare.end());
  const LandscapeValues landscape{column(land), "within 30 km of its records"};
  const Eigen::MatrixXd reference = column(quantiles(120, 10, 0.8));
  const Eigen::MatrixXd records = column({0.5, 10.0, 9.0});
  const auto findings = LandscapeTest().judge({reference, records, kNames, 1, nullptr, nullptr, &landscape});
  ASSERT_TRUE(findings[0].tested);
  EXPECT_TRUE(findings[0].flagged) << findings[0].statistic;
  EXPECT_GT(findings[0].statistic, 20);  // the common mode holds 80 % of the landscape, no place
  EXPECT_FALSE(findings[1].flagged) << findings[1].statistic;
  EXPECT_LT(findings[1].statistic, 1);     // the rare mode is where the taxon lives: used > available
  EXPECT_FALSE(findings[2].flagged) << findings[2].statistic;
  // The evidence in counts. The response is one hump at the rare mode, so the environments at least
  // as unsuited as 0.5 are those below it: 0.8 · Φ(0.5) = 0.553 of the landscape, and none of the
  // 120 places.
  EXPECT_NEAR(findings[0].extras[0], 0.8 * 0.6914625, 0.002);
  ASSERT_EQ(findings[0].reasons.size(), 1u);
  EXPECT_NE(findings[0].reasons[0].find("within 30 km of its records"), std::string::npos) << findings[0].reasons[0];
  EXPECT_NE(findings[0].reasons[0].find("hold 0 of its 120 places"), std::string::npos) << findings[0].reasons[0];
  EXPECT_NEAR(findings[0].severity, std::sqrt(std::log(findings[0].statistic) / std::log(LandscapeTestOptions{}.ratio_cutoff)), 1e-9);
}

TEST(Landscape, RatioMatchesTheClosedFormForNormalLandscapeAndTaxon) {
  const LandscapeValues landscape{column(quantiles(4000, 0, 1)), "in the layers' extent"};
  const Eigen::MatrixXd reference = column(quantiles(400, 1, 0.5));
  std::vector<double> at{-0.2, 0.2, 0.6, 1.0, 1.4, 1.8};
  const auto findings = LandscapeTest().judge({reference, column(at), kNames, 1, nullptr, nullptr, &landscape});
  const boost::math::normal normal;
  for (std::size_t i = 0; i < at.size(); ++i) {
    const double x = at[i];
    const double truth = boost::math::pdf(normal, x) / (boost::math::pdf(normal, (x - 1) / 0.5) / 0.5);
    EXPECT_NEAR(std::log(findings[i].statistic), std::log(truth), 0.35) << "x = " << x;
  }
}

TEST(Landscape, ProbabilityMatchesTheClosedFormForNormalLandscapeAndTaxon) {
  const LandscapeValues landscape{column(quantiles(4000, 0, 1)), "in the layers' extent"};
  const Eigen::MatrixXd reference = column(quantiles(400, 1, 0.5));
  const std::vector<double> at{-0.2, 0.2, 0.6, 1.0, 1.4, 1.8, 2.4};
  const auto findings = LandscapeTest().judge({reference, column(at), kNames, 1, nullptr, nullptr, &landscape});
  const boost::math::normal normal;
  for (std::size_t i = 0; i < at.size(); ++i) {
    const double d = std::fabs(at[i] - 4.0 / 3);
    const double truth = boost::math::cdf(normal, (1.0 / 3 - d) / 0.5) + 1 - boost::math::cdf(normal, (1.0 / 3 + d) / 0.5);
    SCOPED_TRACE("x = " + std::to_string(at[i]) + ", closed form " + std::to_string(truth));
    ASSERT_TRUE(findings[i].tested);
    if (truth > 0.05) EXPECT_NEAR(findings[i].probability, truth, 0.05);
    else EXPECT_NEAR(std::log(findings[i].probability), std::log(truth), 0.4);  // within a factor 1.5
  }
}

TEST(Landscape, CellsAndPlacesInTheRecordsOwnEnvironmentAreCountedAsAtMostAsSuited) {
  // three layers rounded to 0.1 (a rounded raster): a landscape of 6 environments, each on 150
  // cells; the taxon in two of them and, with 3 places, in a third; the record in that third one
  const double env[6][3] = {{1.2, 20.3, 0.7}, {1.9, 18.1, 0.4}, {2.6, 16.7, 0.9},
                            {3.1, 15.2, 0.3}, {3.4, 14.9, 0.8}, {0.3, 23.9, 0.1}};
  const auto rows = [&](std::vector<std::pair<int, int>> counts) {  // (environment, cells)
    Eigen::MatrixXd m(0, 3);
    for (const auto& [e, n] : counts)
      for (int k = 0; k < n; ++k) {
        m.conservativeResize(m.rows() + 1, 3);
        m.row(m.rows() - 1) << env[e][0], env[e][1], env[e][2];
      }
    return m;
  };
  const LandscapeValues landscape{rows({{0, 150}, {1, 150}, {2, 150}, {3, 150}, {4, 150}, {5, 150}}), "nearby"};
  const Eigen::MatrixXd places = rows({{3, 60}, {4, 60}, {1, 3}});
  const std::vector<std::string> names{"a", "b", "c"};
  for (int e = 0; e < 6; ++e) {
    SCOPED_TRACE("environment " + std::to_string(e));
    const auto f = LandscapeTest().judge({places, rows({{e, 1}}), names, 1, nullptr, nullptr, &landscape})[0];
    ASSERT_TRUE(f.tested);
    // the share is a whole number of environments: every cell of the record's own is counted
    const double environments = f.extras[0] * 6;
    EXPECT_NEAR(environments, std::round(environments), 1e-9);
    EXPECT_GE(environments, 1);
  }
}

TEST(Landscape, SaysWhyItCannotJudge) {
  const Eigen::MatrixXd reference = column(quantiles(40, 0, 1));
  const Eigen::MatrixXd records = column({0.0, std::nan("")});
  EXPECT_EQ(LandscapeTest().judge({reference, records, kNames, 1})[0].untested_code, "no_landscape:landscape");
  const LandscapeValues landscape{column(quantiles(500, 0, 2)), "x"};
  const auto judged = LandscapeTest().judge({reference, records, kNames, 1, nullptr, nullptr, &landscape});
  EXPECT_TRUE(judged[0].tested);
  EXPECT_EQ(judged[1].untested_code, "missing_value:landscape");
  const Eigen::MatrixXd few = column(quantiles(19, 0, 1));  // fewer than 20 places
  EXPECT_EQ(LandscapeTest().judge({few, records, kNames, 1, nullptr, nullptr, &landscape})[0].untested_code,
            "too_few_records:landscape");
  const LandscapeValues thin{column(quantiles(49, 0, 1)), "x"};  // fewer than 50 cells
  EXPECT_EQ(LandscapeTest().judge({reference, records, kNames, 1, nullptr, nullptr, &thin})[0].untested_code,
            "no_landscape:landscape");
}

// Collinear layers (the second a copy of the first, a third a constant) change nothing: the
// landscape's principal components leave the copy and the constant out.
TEST(Landscape, CollinearAndConstantLayersAreHarmless) {
  std::vector<double> land = quantiles(800, 0, 1), rare = quantiles(200, 10, 1);
  land.insert(land.end(), rare.begin(), rare.end());
  auto three = [](const std::vector<double>& v) {
    Eigen::MatrixXd m(static_cast<Eigen::Index>(v.size()), 3);
    for (std::size_t i = 0; i < v.size(); ++i) m.row(static_cast<Eigen::Index>(i)) << v[i], 2 * v[i] + 1, 7;
    return m;
  };
  const LandscapeValues one{column(land), "x"}, many{three(land), "x"};
  const std::vector<std::string> names{"a", "b", "c"};
  const std::vector<double> taxon = quantiles(120, 10, 0.8), at{0.5, 10.0, 9.0};
  const auto single = LandscapeTest().judge({column(taxon), column(at), kNames, 1, nullptr, nullptr, &one});
  const auto collinear = LandscapeTest().judge({three(taxon), three(at), names, 1, nullptr, nullptr, &many});
  for (std::size_t i = 0; i < at.size(); ++i) {
    EXPECT_EQ(single[i].flagged, collinear[i].flagged);
    EXPECT_NEAR(std::log(single[i].statistic), std::log(collinear[i].statistic), 1e-6 * std::fabs(std::log(single[i].statistic)) + 1e-6);
  }
}

}  // namespace
}  // namespace envsift
