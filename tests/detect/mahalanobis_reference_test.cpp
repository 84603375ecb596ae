// Classical and robust Mahalanobis distances against R: stats::mahalanobis (Debian r-base-core)
// and robustbase::covMcd(use.correction = FALSE) (Debian r-cran-robustbase 0.95), on data sets
// that ship with them (stackloss and swiss from R's datasets; hbk and starsCYG from
// robustbase), and the deterministic MCD against covMcd(nsamp = "deterministic") (Hubert,
// Rousseeuw & Verdonck 2012). Fixtures and the script that made them: tests/reference/mahalanobis/.
// The set of flagged observations must match exactly; estimates and distances to 1e-7 relative.
#include <cmath>

#include <Eigen/LU>

#include <gtest/gtest.h>

#include "../support.hpp"
#include "envsift/detect/chi_square.hpp"
#include "envsift/detect/deterministic_mcd.hpp"
#include "envsift/detect/fast_mcd.hpp"
#include "envsift/detect/robust_mahalanobis.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

struct Estimates {
  Eigen::VectorXd center, raw_center;
  Eigen::MatrixXd cov, raw_cov;
};

struct Fixture {
  Eigen::MatrixXd x;
  std::vector<std::string> names;
  Eigen::VectorXd classical_d2, robust_d2, center, raw_center;
  Eigen::MatrixXd cov, raw_cov;
  Estimates deterministic;              // covMcd(nsamp = "deterministic")
  Eigen::VectorXd deterministic_d2;     // robust D² from it
  std::vector<bool> deterministic_flagged, deterministic_best;
};

// NAME-mcd.csv / NAME-detmcd.csv: "center", "raw_center", p covariance rows, p raw ones.
Estimates load_estimates(const std::string& path, Eigen::Index p) {
  const Table mcd = read_csv(path);
  auto vec = [&](std::size_t r) {
    Eigen::VectorXd v(p);
    for (Eigen::Index j = 0; j < p; ++j) v[j] = std::stod(mcd.rows[r][static_cast<std::size_t>(j + 1)]);
    return v;
  };
  Estimates e;
  e.center = vec(0);
  e.raw_center = vec(1);
  e.cov.resize(p, p);
  e.raw_cov.resize(p, p);
  for (Eigen::Index r = 0; r < p; ++r) {
    e.cov.row(r) = vec(static_cast<std::size_t>(2 + r)).transpose();
    e.raw_cov.row(r) = vec(static_cast<std::size_t>(2 + p + r)).transpose();
  }
  return e;
}

Fixture load(const std::string& name) {
  const std::string dir = source_path("tests/reference/mahalanobis/");
  const Table data = read_csv(dir + name + ".csv");
  Fixture f;
  const auto p = static_cast<Eigen::Index>(data.header.size() - 3);
  const auto n = static_cast<Eigen::Index>(data.rows.size());
  f.names.assign(data.header.begin(), data.header.begin() + p);
  f.x.resize(n, p);
  f.classical_d2.resize(n);
  f.robust_d2.resize(n);
  for (Eigen::Index i = 0; i < n; ++i) {
    const auto& row = data.rows[static_cast<std::size_t>(i)];
    for (Eigen::Index j = 0; j < p; ++j) f.x(i, j) = std::stod(row[static_cast<std::size_t>(j)]);
    f.classical_d2[i] = std::stod(row[static_cast<std::size_t>(p)]);
    f.robust_d2[i] = std::stod(row[static_cast<std::size_t>(p + 1)]);
  }
  const Estimates fast = load_estimates(dir + name + "-mcd.csv", p);
  f.center = fast.center, f.raw_center = fast.raw_center, f.cov = fast.cov, f.raw_cov = fast.raw_cov;
  f.deterministic = load_estimates(dir + name + "-detmcd.csv", p);
  const Table det = read_csv(dir + name + "-detmcd-d2.csv");
  f.deterministic_d2.resize(n);
  for (Eigen::Index i = 0; i < n; ++i) {
    const auto& row = det.rows[static_cast<std::size_t>(i)];
    f.deterministic_d2[i] = std::stod(row[0]);
    f.deterministic_flagged.push_back(row[2] == "1");
    f.deterministic_best.push_back(row[3] == "1");
  }
  return f;
}

void expect_close(const Eigen::MatrixXd& mine, const Eigen::MatrixXd& reference, double tolerance, const char* what) {
  ASSERT_EQ(mine.rows(), reference.rows());
  ASSERT_EQ(mine.cols(), reference.cols());
  for (Eigen::Index i = 0; i < mine.rows(); ++i)
    for (Eigen::Index j = 0; j < mine.cols(); ++j)
      EXPECT_NEAR(mine(i, j), reference(i, j), tolerance * std::max(1.0, std::fabs(reference(i, j))))
          << what << " (" << i << "," << j << ")";
}

// Every dimension kept, so the reduced space must reproduce the raw-space distances.
MahalanobisOptions keep_all_dimensions() {
  MahalanobisOptions o;
  o.min_records = 3;
  o.rows_per_dimension = 1;
  o.skew_adjusted = false;  // the classical statistic, as R computes it
  return o;
}

Eigen::VectorXd statistics(const std::vector<Finding>& findings) {
  Eigen::VectorXd v(static_cast<Eigen::Index>(findings.size()));
  for (std::size_t i = 0; i < findings.size(); ++i) v[static_cast<Eigen::Index>(i)] = findings[i].statistic;
  return v;
}

class MahalanobisReference : public ::testing::TestWithParam<std::string> {};

TEST_P(MahalanobisReference, ClassicalDistancesMatchStatsMahalanobis) {
  const Fixture f = load(GetParam());
  const auto findings = Mahalanobis(keep_all_dimensions()).judge({f.x, f.x, f.names});
  expect_close(statistics(findings), f.classical_d2, 1e-9, "D²");
  EXPECT_EQ(findings[0].extras[0], static_cast<double>(f.x.cols()));
}

// The MCD objective (log det of the raw scatter) is at least as good as covMcd's; where the
// optimum subset is unique, the raw estimates are the same. quakes (n = 1000, with many tied
// values) has near-equivalent subsets whose log det differ by ~1e-5: there the raw estimates may
// differ, but the reweighted ones — what envsift uses — agree.
McdOptions fast_engine() {
  McdOptions o;
  o.engine = McdEngine::fast;
  return o;
}

TEST_P(MahalanobisReference, FastMcdMatchesCovMcd) {
  const Fixture f = load(GetParam());
  McdOptions o = fast_engine();
  o.seed = 1;
  const McdResult r = fast_mcd(f.x, o);
  EXPECT_EQ(r.h, static_cast<std::size_t>((f.x.rows() + f.x.cols() + 1) / 2));
  EXPECT_LE(std::log(r.raw_scatter.determinant()), std::log(f.raw_cov.determinant()) + 1e-4);
  if (GetParam() != "quakes") {
    expect_close(r.raw_center, f.raw_center, 1e-9, "raw centre");
    expect_close(r.raw_scatter, f.raw_cov, 1e-9, "raw scatter");
  }
  expect_close(r.center, f.center, 1e-9, "centre");
  expect_close(r.scatter, f.cov, 1e-9, "scatter");
}

// Large data: with the starts screened on a 300-row subsample (the path taken above `subsample`
// rows), the MCD objective is within 0.1 % of covMcd's, and all but a handful of the 1000 rows
// get the same verdict.
TEST(MahalanobisReferenceLarge, SubsampledStartsReachANearlyEqualOptimum) {
  const Fixture f = load("quakes");
  McdOptions o = fast_engine();
  o.subsample = 300;
  const McdResult r = fast_mcd(f.x, o);
  const double mine = std::log(r.raw_scatter.determinant()), theirs = std::log(f.raw_cov.determinant());
  EXPECT_LE(mine, theirs + 1e-3 * std::fabs(theirs));
  const auto findings = RobustMahalanobis(keep_all_dimensions(), o).judge({f.x, f.x, f.names, 1});
  const double cutoff = chi_square_quantile(5, 0.975);
  int disagree = 0;
  for (std::size_t i = 0; i < findings.size(); ++i)
    disagree += findings[i].flagged != (f.robust_d2[static_cast<Eigen::Index>(i)] > cutoff);
  EXPECT_LE(disagree, 5);
  RecordProperty("disagreements", disagree);
}

TEST_P(MahalanobisReference, RobustDistancesAndFlagsMatchCovMcd) {
  const Fixture f = load(GetParam());
  const auto findings = RobustMahalanobis(keep_all_dimensions(), fast_engine()).judge({f.x, f.x, f.names, 1});
  expect_close(statistics(findings), f.robust_d2, 1e-7, "robust D²");
  const double cutoff = chi_square_quantile(static_cast<double>(f.x.cols()), 0.975);
  for (std::size_t i = 0; i < findings.size(); ++i)
    EXPECT_EQ(findings[i].flagged, f.robust_d2[static_cast<Eigen::Index>(i)] > cutoff) << "row " << i + 1;
}

// DetMCD: the same best h-subset as covMcd(nsamp = "deterministic"), hence the same raw and
// reweighted estimates (to rounding: R standardises with a Qn rounded to single precision, see
// robust_scale_test.cpp, which moves nothing but the last bits).
TEST_P(MahalanobisReference, DeterministicMcdMatchesCovMcdDeterministic) {
  const Fixture f = load(GetParam());
  const McdResult r = deterministic_mcd(f.x, McdOptions{});
  std::vector<bool> best(static_cast<std::size_t>(f.x.rows()));
  for (std::size_t i : r.subset) best[i] = true;
  EXPECT_EQ(best, f.deterministic_best);
  EXPECT_FALSE(r.exact_fit);
  expect_close(r.raw_center, f.deterministic.raw_center, 1e-9, "raw centre");
  expect_close(r.raw_scatter, f.deterministic.raw_cov, 1e-9, "raw scatter");
  expect_close(r.center, f.deterministic.center, 1e-9, "centre");
  expect_close(r.scatter, f.deterministic.cov, 1e-9, "scatter");
}

// The test as run (deterministic engine, the default): distances and the flagged set.
TEST_P(MahalanobisReference, DefaultRobustTestMatchesCovMcdDeterministic) {
  const Fixture f = load(GetParam());
  const auto findings = RobustMahalanobis(keep_all_dimensions()).judge({f.x, f.x, f.names, 1});
  expect_close(statistics(findings), f.deterministic_d2, 1e-7, "robust D²");
  for (std::size_t i = 0; i < findings.size(); ++i)
    EXPECT_EQ(findings[i].flagged, f.deterministic_flagged[i]) << "row " << i + 1;
}

INSTANTIATE_TEST_SUITE_P(RDataSets, MahalanobisReference,
                         ::testing::Values("stackloss", "hbk", "starsCYG", "swiss", "quakes"));

}  // namespace
}  // namespace envsift
