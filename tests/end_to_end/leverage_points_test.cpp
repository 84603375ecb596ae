// The ranking a reviewer reads, on a published data set with known outliers: Hawkins, Bradu &
// Kass (1984), "Location of several outliers in multiple-regression data using elemental sets",
// Technometrics 26:197-208 — 75 rows, the first 14 leverage points (10 bad, 4 good), a group that
// masks itself in the classical distance. The data and the reference robust distances come from
// R (robustbase::hbk, robustbase::covMcd; tests/reference/mahalanobis/make_fixtures.R, Debian
// r-cran-robustbase). Screened as values (--value-columns) with the robust Mahalanobis test, the
// 14 are ranks 1-14, with distinct scores, in the order of covMcd's robust distances. They are
// 14 of 75 distinct places (19 %), a spread-out group the population guard withholds by default
// (looks_multimodal): ranked all the same; with the guard off they are flagged, exactly the rows
// covMcd's distances put beyond chi-square(3, 0.975).
#include <algorithm>
#include <numeric>

#include <gtest/gtest.h>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

TEST(LeveragePoints, HawkinsBraduKassRankInTheOrderOfTheirRobustDistances) {
  const Table hbk = read_csv(source_path("tests/reference/mahalanobis/hbk.csv"));
  ASSERT_EQ(hbk.rows.size(), 75u);
  const auto dir = temp_dir("leverage-points");
  std::string csv = "id,X1,X2,X3\n";
  for (std::size_t i = 0; i < hbk.rows.size(); ++i)
    csv += "row" + std::to_string(i + 1) + "," + hbk.rows[i][0] + "," + hbk.rows[i][1] + "," + hbk.rows[i][2] + "\n";
  write_file(dir + "/hbk.csv", csv);
  const auto r = run(envsift_binary() + " screen --points " + dir + "/hbk.csv --value-columns X1,X2,X3 --single-taxon" +
                     " --tests mahalanobis_robust --report " + dir + "/report.html --out " + dir + "/out.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const Table out = read_csv(dir + "/out.csv");
  ASSERT_EQ(out.rows.size(), 75u);
  // R's order of the rows by robust distance, largest first
  std::vector<std::size_t> by_r(75);
  std::iota(by_r.begin(), by_r.end(), 0);
  const auto robust = hbk.column("robust_d2");
  std::stable_sort(by_r.begin(), by_r.end(), [&](std::size_t a, std::size_t b) {
    return std::stod(hbk.rows[a][robust]) > std::stod(hbk.rows[b][robust]);
  });
  std::vector<std::size_t> top(by_r.begin(), by_r.begin() + 14);
  std::sort(top.begin(), top.end());
  for (std::size_t k = 0; k < 14; ++k) ASSERT_EQ(top[k], k);  // the leverage points are R's 14 farthest
  std::string previous_score;
  for (std::size_t k = 0; k < 14; ++k) {
    const auto& row = out.rows[by_r[k]];
    EXPECT_EQ(row[out.column("rank")], std::to_string(k + 1)) << "row " << by_r[k] + 1;
    EXPECT_EQ(row[out.column("status")], "looks_multimodal:mahalanobis_robust");  // 14 of 75 places: withheld
    EXPECT_NE(row[out.column("score")], previous_score);  // distinct severities
    previous_score = row[out.column("score")];
  }
  // the report shows the withheld group together, each marked as withheld
  const std::string report = read_file(dir + "/report.html");
  EXPECT_NE(report.find("Review them as a group"), std::string::npos);
  std::size_t marked = 0;
  for (auto at = report.find("withheld mahalanobis_robust"); at != std::string::npos; at = report.find("withheld mahalanobis_robust", at + 1)) ++marked;
  EXPECT_EQ(marked, 14u);  // the top-suspects table lists the 14, and no other record
  const auto off = run(envsift_binary() + " screen --points " + dir + "/hbk.csv --value-columns X1,X2,X3 --single-taxon" +
                       " --tests mahalanobis_robust --max-flagged-share 1 --out " + dir + "/off.csv");
  ASSERT_EQ(off.exit_code, 0) << off.output;
  const Table flagged = read_csv(dir + "/off.csv");
  for (std::size_t i = 0; i < 75; ++i) {
    EXPECT_EQ(flagged.rows[i][flagged.column("flags")].empty(), !(std::stod(hbk.rows[i][robust]) > 9.348))  // chi-square(3) 0.975: NIST/SEMATECH e-Handbook, table 1.3.6.7.4
        << "row " << i + 1;
    EXPECT_EQ(flagged.rows[i][flagged.column("rank")], out.rows[i][out.column("rank")]);  // the same ranking
  }
}

}  // namespace
}  // namespace envsift
