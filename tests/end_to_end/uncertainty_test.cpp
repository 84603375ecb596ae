// Uncertainty on the demo island (planted records listed in demo-points/truth.csv): the montane
// record placed in the dry valley east of the ridge is flagged when its uncertainty is small, and
// not when its uncertainty disc reaches the ridge (about 34 km west: 0.31° of longitude at
// latitude 0.33°, 111.2 km per degree on the 6 371 008.8 m sphere — hand-computed; disc values
// themselves are checked against gdallocationinfo and geod in tests/sample/disc_sampling_test.cpp).
#include <gtest/gtest.h>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

// The discs are judged by the one-layer and the Mahalanobis tests at their classic cutoffs (what
// these cases were built for); the landscape test judges discs the same way (landscape_test.cpp).
const std::string kLayers = demo_layers() + " --tests robust_z,reverse_jackknife,mahalanobis --z-cutoff 3 "
                            "--chi2-quantile 0.975 --combine max";

// The demo occurrences with QM-0003's uncertainty replaced.
std::string with_uncertainty(const std::string& dir, const std::string& metres) {
  std::string csv = read_file(source_path("demo-points/occurrences.csv"));
  const std::string row = "QM-0003,Oxmontia nivicola,0.81,0.33,";
  const auto at = csv.find(row);
  EXPECT_NE(at, std::string::npos);
  const auto end = csv.find(',', at + row.size());
  csv.replace(at + row.size(), end - at - row.size(), metres);
  const std::string path = dir + "/points-" + metres + ".csv";
  write_file(path, csv);
  return path;
}

std::vector<std::string> row_of(const Table& t, const std::string& id) {
  for (const auto& r : t.rows)
    if (r[0] == id) return r;
  ADD_FAILURE() << id;
  return {};
}

TEST(Uncertainty, AValleyRecordIsFlaggedUnlessItsDiscReachesTheRidge) {
  const auto dir = temp_dir("uncertainty");
  for (const std::string metres : {"100", "40000"}) {
    auto r = run(envsift_binary() + " screen --points " + with_uncertainty(dir, metres) + kLayers +
                 " --dem dem --max-uncertainty 50000 --out " + dir + "/out-" + metres + ".csv");
    ASSERT_EQ(r.exit_code, 0) << r.output;
  }
  const Table small = read_csv(dir + "/out-100.csv"), large = read_csv(dir + "/out-40000.csv");
  const auto a = row_of(small, "QM-0003"), b = row_of(large, "QM-0003");
  EXPECT_EQ(a[small.column("flags")], "robust_z;reverse_jackknife;mahalanobis;elevation_mismatch");
  EXPECT_EQ(a[small.column("rank")], "2");
  EXPECT_EQ(b[large.column("flags")], "") << b[large.column("reasons")];
  // the disc reaches the ridge: its DEM maximum is montane
  EXPECT_GT(std::stod(b[large.column("dem_max")]), 2000);
  EXPECT_LT(std::stod(b[large.column("dem_min")]), 200);
  EXPECT_EQ(b[large.column("dem")], a[small.column("dem")]);  // the point value is unchanged
}

TEST(Uncertainty, LargeDiscsAreCutAndSaySo) {
  const auto dir = temp_dir("uncertainty-cap");
  auto r = run(envsift_binary() + " screen --points " + with_uncertainty(dir, "90000") + kLayers +
               " --max-uncertainty 20000 --out " + dir + "/out.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const Table t = read_csv(dir + "/out.csv");
  const auto row = row_of(t, "QM-0003");
  EXPECT_NE(row[t.column("status")].find("uncertainty_capped"), std::string::npos);
  EXPECT_NE(row[t.column("reasons")].find("uncertainty 90000 m cut to 20000 m"), std::string::npos);
}

TEST(Uncertainty, SummaryShowsTheElevationBandAndRecordsOutsideIt) {
  const auto dir = temp_dir("uncertainty-summary");
  auto r = run(envsift_binary() + " screen --points " + source_path("demo-points/occurrences.csv") + kLayers +
               " --dem dem --summary " + dir + "/summary.csv --out " + dir + "/out.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const Table s = read_csv(dir + "/summary.csv");
  ASSERT_EQ(s.rows.size(), 4u);  // four taxa, sorted by name
  const auto montane = row_of(s, "Oxmontia nivicola");
  // the four montane records planted in the lowland lie below its band
  EXPECT_GE(std::stoi(montane[s.column("outside_elevation_band")]), 4);
  EXPECT_GT(std::stod(montane[s.column("elevation_band_low")]), 1000);
  EXPECT_EQ(montane[s.column("records")], "328");
}

}  // namespace
}  // namespace envsift
