// Invented demo data (scripts/make-demo-data.py), so no outside reference beyond the samples, which
// tests/sample/nearest_vs_gdal_test.cpp checks against gdallocationinfo. End to end on the demo data: the planted errors listed in demo-points/truth.csv (written by
// scripts/make-demo-data.py when it planted them) are the top-ranked records, and every input
// record appears exactly once in the output.
#include <algorithm>
#include <map>
#include <set>

#include <gtest/gtest.h>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

std::string screen_command(const std::string& out, const std::string& extra = "") {
  return envsift_binary() + " screen --points " + source_path("demo-points/occurrences.csv") + demo_layers() +
         " --out " + out + " " + extra;
}

TEST(DemoScreen, PlantedErrorsRankFirstAndNoRecordIsLost) {
  const auto dir = temp_dir("demo-screen");
  auto r = run(screen_command(dir + "/out.csv"));
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const Table in = read_csv(source_path("demo-points/occurrences.csv"));
  const Table out = read_csv(dir + "/out.csv");
  const Table truth = read_csv(source_path("demo-points/truth.csv"));

  // every record once, in input order, with its original fields untouched
  ASSERT_EQ(out.rows.size(), in.rows.size());
  for (std::size_t i = 0; i < in.rows.size(); ++i)
    ASSERT_TRUE(std::equal(in.rows[i].begin(), in.rows[i].end(), out.rows[i].begin())) << "row " << i;
  // each layer with its uncertainty disc (the demo has coordinateUncertaintyInMeters), then ours
  const std::vector<std::string> tail = {"dem", "dem_min", "dem_mean", "dem_max", "temperature", "temperature_min",
                                         "temperature_mean", "temperature_max", "rainfall", "rainfall_min",
                                         "rainfall_mean", "rainfall_max", "dry_months", "dry_months_min",
                                         "dry_months_mean", "dry_months_max", "status", "rank", "score",
                                         "flags", "reasons", "probability", "robust_z_stat", "robust_z_cutoff",
                                         "robust_z_p", "mahalanobis_stat", "mahalanobis_cutoff", "mahalanobis_p",
                                         "mahalanobis_dims", "landscape_stat", "landscape_cutoff", "landscape_p",
                                         "landscape_area_share"};
  ASSERT_TRUE(std::equal(tail.begin(), tail.end(), out.header.begin() + static_cast<long>(in.header.size())));

  std::map<std::string, const std::vector<std::string>*> by_id;
  for (const auto& row : out.rows) by_id[row[0]] = &row;
  const std::size_t rank = out.column("rank"), status = out.column("status"), flags = out.column("flags");
  std::size_t planted = 0;
  for (const auto& t : truth.rows) {
    const auto& row = *by_id.at(t[0]);
    if (t[2] == "yes") {  // an environmental outlier: must be among the first ranks, flagged
      ++planted;
      ASSERT_FALSE(row[rank].empty()) << t[0];
      EXPECT_LE(std::stoul(row[rank]), 5u) << t[0] << " (" << t[1] << ")";
      EXPECT_EQ(row[flags].substr(0, 30), "robust_z;mahalanobis;landscape") << t[0];  // every default test
    } else {  // an input problem: kept, unranked, its reason code first in the status
      EXPECT_TRUE(row[rank].empty()) << t[0];
      EXPECT_EQ(row[status].substr(0, t[1].size()), t[1]) << t[0];
    }
  }
  EXPECT_EQ(planted, 5u);
  EXPECT_NE(r.output.find(std::to_string(in.rows.size()) + " records read"), std::string::npos) << r.output;
}

// Determinism: byte-identical outputs (main and summary) for 1 and 2 threads and across two runs,
// with every test, discs, the elevation check and bilinear sampling switched on.
TEST(DemoScreen, OutputIsByteIdenticalForAnyThreadCountAndRun) {
  const auto dir = temp_dir("demo-threads");
  for (const std::string run_name : {"1", "2", "2-again"}) {
    const std::string threads = run_name.substr(0, 1);
    auto r = run(screen_command(dir + "/out" + run_name + ".csv", "--threads " + threads +
                                " --method bilinear --dem dem --summary " + dir + "/taxa" + run_name + ".csv"));
    ASSERT_EQ(r.exit_code, 0) << r.output;
  }
  const std::string one = read_file(dir + "/out1.csv");
  EXPECT_GT(one.size(), 10000u);
  EXPECT_EQ(one, read_file(dir + "/out2.csv"));
  EXPECT_EQ(one, read_file(dir + "/out2-again.csv"));
  EXPECT_EQ(read_file(dir + "/taxa1.csv"), read_file(dir + "/taxa2.csv"));
  EXPECT_EQ(read_file(dir + "/taxa1.csv"), read_file(dir + "/taxa2-again.csv"));
}

TEST(DemoScreen, SmallTaxonIsNotJudged) {
  const auto dir = temp_dir("demo-small");
  ASSERT_EQ(run(screen_command(dir + "/out.csv")).exit_code, 0);
  const Table out = read_csv(dir + "/out.csv");
  for (const auto& row : out.rows)
    if (row[1] == "Pexaltra rara") {
      EXPECT_EQ(row[out.column("status")],
                "too_few_records:robust_z;too_few_records:mahalanobis;too_few_records:landscape");
      EXPECT_TRUE(row[out.column("rank")].empty());
    }
}

}  // namespace
}  // namespace envsift
