// Tail probabilities and the rules that combine them, against outside references computed live by
// R (r-base-core, installed with r-cran-terra by scripts/install-deps): stats::pnorm and
// stats::pchisq for the tails, the Cauchy combination written in R straight from Liu & Xie (2020,
// eq. 1-2: T = Σ w tan((0.5 − p)π), p = 0.5 − arctan(T)/π), stats::p.adjust(method = "BH") for
// Benjamini & Hochberg; hand-computed cases for the edges (identical, opposed evidence).
#include "envsift/detect/tail_probability.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <sstream>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

// R's values of `expression` (a numeric vector), one per line, at 17 significant digits.
std::vector<double> r_values(const std::string& expression) {
  const auto r = run("Rscript -e \"cat(sprintf('%.17g', " + expression + "), sep = '\\n')\"");
  EXPECT_EQ(r.exit_code, 0) << r.output;
  std::vector<double> values;
  std::istringstream in(r.output);
  for (std::string line; std::getline(in, line);)
    if (!line.empty()) values.push_back(std::stod(line));
  return values;
}

// "c(a, b, ...)" with every digit, for R.
std::string r_vector(const std::vector<double>& values) {
  std::string list;
  char buf[40];
  for (double v : values) {
    std::snprintf(buf, sizeof buf, "%.17g", v);
    list += (list.empty() ? "" : ", ") + std::string(buf);
  }
  return "c(" + list + ")";
}

void expect_relative(double got, double expected, double tolerance) {
  EXPECT_NEAR(got, expected, tolerance * std::fabs(expected)) << "expected " << expected;
}

// The in-sample law of a classical D² (Gnanadesikan & Kettenring 1972): n D²/(n − 1)² ~
// Beta(k/2, (n − k − 1)/2); its tail against R's pbeta, and the tail Mahalanobis::tail gives.
TEST(TailProbability, BetaTailsMatchRPbeta) {
  const std::vector<double> x{1e-6, 0.01, 0.2, 0.5, 0.9, 0.999};
  const std::vector<std::pair<double, double>> shapes{{1, 8.5}, {1.5, 5}, {3, 40}};
  for (const auto& [a, b] : shapes) {
    char shape[128];
    std::snprintf(shape, sizeof shape, ", %.17g, %.17g, lower.tail = FALSE)", a, b);
    const auto expected = r_values("pbeta(" + r_vector(x) + shape);
    ASSERT_EQ(expected.size(), x.size());
    for (std::size_t i = 0; i < x.size(); ++i) expect_relative(beta_upper_tail(a, b, x[i]), expected[i], 1e-10);
  }
  EXPECT_EQ(beta_upper_tail(2, 3, 0), 1.0);
  EXPECT_EQ(beta_upper_tail(2, 3, 1), 0.0);
}

TEST(TailProbability, NormalTailsMatchRPnorm) {
  const std::vector<double> z{-3, -0.5, 0, 0.5, 1.959963984540054, 4, 6, 10, 30};
  const auto upper = r_values("pnorm(" + r_vector(z) + ", lower.tail = FALSE)");
  const auto both = r_values("2 * pnorm(abs(" + r_vector(z) + "), lower.tail = FALSE)");
  ASSERT_EQ(upper.size(), z.size());
  for (std::size_t i = 0; i < z.size(); ++i) {
    SCOPED_TRACE(z[i]);
    expect_relative(normal_upper_tail(z[i]), upper[i], 1e-10);  // far tails too: 1e-198 at z = 30
    expect_relative(normal_two_sided_tail(z[i]), std::min(1.0, both[i]), 1e-10);
  }
  EXPECT_EQ(normal_upper_tail(INFINITY), 0.0);
  EXPECT_EQ(normal_upper_tail(-INFINITY), 1.0);
}

TEST(TailProbability, ChiSquareTailsMatchRPchisq) {
  const std::vector<std::pair<double, double>> cases{{1, 3.841}, {2, 0.5}, {4, 14.86}, {4, 60}, {7, 12}, {19, 150}};
  for (const auto& [dof, x] : cases) {
    SCOPED_TRACE(std::to_string(dof) + " " + std::to_string(x));
    const auto r = r_values("pchisq(" + r_vector({x}) + ", " + r_vector({dof}) + ", lower.tail = FALSE)");
    ASSERT_EQ(r.size(), 1u);
    expect_relative(chi_square_upper_tail(dof, x), r[0], 1e-10);
  }
  // NIST/SEMATECH e-Handbook table 1.3.6.7.4: χ²(4) = 14.860 at upper-tail probability 0.005
  EXPECT_NEAR(chi_square_upper_tail(4, 14.860), 0.005, 1e-5);
  EXPECT_EQ(chi_square_upper_tail(3, 0), 1.0);
}

TEST(TailProbability, CauchyCombinationMatchesThePaperWrittenInR) {
  const std::vector<std::vector<double>> cases{{0.01, 0.2, 0.7}, {0.5, 0.5}, {1e-8, 0.99}, {0.03, 0.04, 0.05, 0.9}};
  for (const auto& p : cases) {
    const auto r = r_values("0.5 - atan(mean(tan((0.5 - " + r_vector(p) + ") * pi))) / pi");
    ASSERT_EQ(r.size(), 1u);
    SCOPED_TRACE(r_vector(p));
    expect_relative(cauchy_combination(p), r[0], 1e-9);
  }
  // identical evidence is that evidence, to the last digits, even far in the tail (by hand: T is
  // tan((0.5 − p)π) itself)
  for (double p : {0.2, 0.01, 1e-6, 1e-12, 1e-20}) expect_relative(cauchy_combination({p, p, p}), p, 1e-9);
  EXPECT_EQ(cauchy_combination({0.0, 0.4}), 0.0);
  // opposed evidence: p and 1 − p cancel (T = 0), the combination is 1/2
  EXPECT_NEAR(cauchy_combination({0.1, 0.9}), 0.5, 1e-12);
  // weights: all on the first
  expect_relative(cauchy_combination({0.003, 0.8}, {1.0, 0.0}), 0.003, 1e-9);
}

TEST(TailProbability, SidakMinimumByHand) {
  EXPECT_NEAR(sidak_minimum({0.01, 0.5, 0.9}), 1 - std::pow(0.99, 3), 1e-15);  // 0.029701
  expect_relative(sidak_minimum({1e-18, 0.3}), 2e-18, 1e-9);                    // no cancellation
  EXPECT_EQ(sidak_minimum({}), 1.0);
}

TEST(TailProbability, BenjaminiHochbergMatchesRPAdjust) {
  const std::vector<double> p{0.001, 0.008, 0.039, 0.041, 0.042, 0.06, 0.074, 0.205, 0.212, 0.216, 0.222, 0.251, 0.269,
                              0.275, 0.34, 0.341, 0.384, 0.569, 0.594, 0.696, 0.762, 0.94, 0.942, 0.975, 0.986};
  const auto adjusted = r_values("p.adjust(" + r_vector(p) + ", method = 'BH')");
  for (double q : {0.05, 0.25}) {
    SCOPED_TRACE(q);
    ASSERT_EQ(adjusted.size(), p.size());
    const auto found = benjamini_hochberg(p, q);
    for (std::size_t i = 0; i < p.size(); ++i) EXPECT_EQ(found[i], adjusted[i] <= q) << p[i];
  }
}

}  // namespace
}  // namespace envsift
