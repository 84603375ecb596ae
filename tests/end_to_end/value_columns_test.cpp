// Pre-sampled values mode: screening values already in the file must give the same verdicts as
// sampling the rasters that produced them (the values come from `envsift sample`, which is itself
// checked against gdallocationinfo), without uncertainty discs. Both runs use --all-records: distinct cells and distinct
// value tuples are not the same grouping (two cells can hold equal values). Values read back from
// text differ from the rasters' float32 cells in the ninth digit, so scores agree to 1e-3.
#include <gtest/gtest.h>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

const std::string kLayers = demo_layers();

TEST(ValueColumns, SameVerdictsAsSamplingTheRasters) {
  const auto dir = temp_dir("values");
  const std::string points = source_path("demo-points/occurrences.csv");
  ASSERT_EQ(run(envsift_binary() + " sample --no-discs --points " + points + kLayers + " --out " + dir + "/sampled.csv").exit_code, 0);
  // the sampled file has a status column of its own: rename it so the screen can add one
  std::string sampled = read_file(dir + "/sampled.csv");
  sampled.replace(sampled.find(",status\n"), 8, ",sample_status\n");
  write_file(dir + "/sampled.csv", sampled);
  // the tests that can judge value columns (landscape needs the rasters themselves)
  const std::string tests = " --tests robust_z,reverse_jackknife,mahalanobis,mahalanobis_robust";
  auto a = run(envsift_binary() + " screen --no-discs --all-records" + tests + " --points " + points + kLayers + " --out " +
               dir + "/rasters.csv");
  auto b = run(envsift_binary() + " screen --all-records" + tests + " --points " + dir +
               "/sampled.csv --value-columns dem,temperature,rainfall,dry_months --out " + dir + "/values.csv");
  ASSERT_EQ(a.exit_code, 0) << a.output;
  ASSERT_EQ(b.exit_code, 0) << b.output;
  const Table ra = read_csv(dir + "/rasters.csv"), vb = read_csv(dir + "/values.csv");
  ASSERT_EQ(ra.rows.size(), vb.rows.size());
  for (std::size_t i = 0; i < ra.rows.size(); ++i) {
    EXPECT_EQ(ra.rows[i][ra.column("flags")], vb.rows[i][vb.column("flags")]) << "row " << i;
    const std::string sa = ra.rows[i][ra.column("score")], sb = vb.rows[i][vb.column("score")];
    ASSERT_EQ(sa.empty(), sb.empty()) << "row " << i;
    if (!sa.empty()) {
      // scores are written with 3 decimals: values printed from 9 significant digits may round to
      // neighbouring thousandths
      EXPECT_NEAR(std::stod(sa), std::stod(sb), 1.5e-3 * std::max(1.0, std::stod(sa))) << "row " << i;
    }
  }
  // values mode adds no layer columns: the sampled file's columns (which hold the values and
  // one more, sample_status), then the same envsift columns
  EXPECT_EQ(vb.header.size(), ra.header.size() + 1);
  EXPECT_EQ(vb.header[vb.column("sample_status") + 1], "status");
}

TEST(ValueColumns, SingleTaxonNeedsNoTaxonColumn) {
  const auto dir = temp_dir("values-single");
  std::string csv = "id,x,y\n";
  for (int i = 0; i < 30; ++i) csv += std::to_string(i) + "," + std::to_string(i % 7) + "," + std::to_string((i * 3) % 11) + "\n";
  csv += "30,500,5\n31,,2\n32,abc,1\n";
  write_file(dir + "/v.csv", csv);
  auto r = run(envsift_binary() + " screen --points " + dir + "/v.csv --value-columns x,y --single-taxon --out " + dir + "/o.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const Table t = read_csv(dir + "/o.csv");
  ASSERT_EQ(t.rows.size(), 33u);
  EXPECT_EQ(t.rows[30][t.column("rank")], "1");
  EXPECT_NE(t.rows[30][t.column("flags")].find("robust_z"), std::string::npos);
  // a value missing on one layer: judged on the others, not by the all-layer tests
  EXPECT_EQ(t.rows[31][t.column("status")], "value_missing:x;missing_value:mahalanobis");
  EXPECT_EQ(t.rows[32][t.column("status")], "value_not_numeric:x;missing_value:mahalanobis");
  EXPECT_FALSE(t.rows[32][t.column("rank")].empty());  // still judged on y by the one-layer tests
  auto missing = run(envsift_binary() + " screen --points " + dir + "/v.csv --value-columns x,y --out " + dir + "/o2.csv");
  EXPECT_EQ(missing.exit_code, 3) << missing.output;  // no taxon column and no --single-taxon
  EXPECT_NE(missing.output.find("no taxon column 'scientificName'"), std::string::npos) << missing.output;
}

}  // namespace
}  // namespace envsift
