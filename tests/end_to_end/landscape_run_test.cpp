// envsift's own contract, checked against envsift itself: the landscape test as run on the demo.
// Its landscape is drawn per taxon with a seed from the taxon's name and sampled through the
// shared block cache, so neither the thread count nor a small --memory-limit with a 1 MB block
// cache (sampling in chunks, blocks evicted and read again, landscapes in several batches) may
// change a byte of the output;
// the extent area works too; and a taxon's landscape does not depend on the other taxa in the
// file (screening one taxon alone gives its records the same landscape statistics).
#include <gtest/gtest.h>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

TEST(LandscapeRun, ThreadsMemoryLimitAndOtherTaxaChangeNothing) {
  const auto dir = temp_dir("landscape-run");
  const std::string base = envsift_binary() + " screen -q --tests landscape --points " +
                           source_path("demo-points/occurrences.csv") + demo_layers();
  auto two = run(base + " --threads 2 --out " + dir + "/two.csv");
  ASSERT_EQ(two.exit_code, 0) << two.output;
  auto one = run(base + " --threads 1 --memory-limit 16 --block-cache-mb 1 --out " + dir + "/one.csv");
  ASSERT_EQ(one.exit_code, 0) << one.output;
  EXPECT_EQ(read_file(dir + "/two.csv"), read_file(dir + "/one.csv"));
  // Landscapes are drawn in batches sized by the memory limit, taxa ordered by where they live:
  // 20,000 cells a taxon (1.8 MB while drawn) and a 16 MB limit (2 MB for landscapes) leave room
  // for one taxon a batch, so the demo's four taxa are judged in four batches, in place order.
  auto whole = run(base + " --landscape-cells 20000 --out " + dir + "/whole.csv");
  ASSERT_EQ(whole.exit_code, 0) << whole.output;
  auto batched = run(base + " --landscape-cells 20000 --memory-limit 16 --out " + dir + "/batched.csv");
  ASSERT_EQ(batched.exit_code, 0) << batched.output;
  EXPECT_EQ(read_file(dir + "/whole.csv"), read_file(dir + "/batched.csv"));

  const Table all = read_csv(dir + "/two.csv");
  std::size_t flagged = 0, tested = 0;
  for (const auto& row : all.rows) {
    flagged += row[all.column("flags")] == "landscape";
    tested += !row[all.column("landscape_stat")].empty();
  }
  EXPECT_GT(tested, 850u);
  EXPECT_GT(flagged, 0u);
  EXPECT_LT(flagged, tested / 20);

  // one taxon alone: the same landscape statistics for its records
  std::string only = "occurrenceID,scientificName,decimalLongitude,decimalLatitude\n";
  const Table in = read_csv(source_path("demo-points/occurrences.csv"));
  for (const auto& row : in.rows)
    if (row[in.column("scientificName")] == "Oxmontia nivicola")
      only += row[in.column("occurrenceID")] + ",Oxmontia nivicola," + row[in.column("decimalLongitude")] + "," +
              row[in.column("decimalLatitude")] + "\n";
  write_file(dir + "/only.csv", only);
  auto alone = run(envsift_binary() + " screen -q --tests landscape --no-discs --points " + dir + "/only.csv" +
                   demo_layers() + " --out " + dir + "/alone.csv");
  ASSERT_EQ(alone.exit_code, 0) << alone.output;
  auto together = run(base + " --no-discs --out " + dir + "/together.csv");
  ASSERT_EQ(together.exit_code, 0) << together.output;
  const Table a = read_csv(dir + "/alone.csv"), t = read_csv(dir + "/together.csv");
  std::map<std::string, std::string> stat;
  for (const auto& row : t.rows) stat[row[t.column("occurrenceID")]] = row[t.column("landscape_stat")];
  std::size_t compared = 0;
  for (const auto& row : a.rows) {
    if (row[a.column("landscape_stat")].empty()) continue;
    EXPECT_EQ(row[a.column("landscape_stat")], stat[row[a.column("occurrenceID")]]) << row[0];
    ++compared;
  }
  EXPECT_GT(compared, 300u);
}

TEST(LandscapeRun, ExtentAreaAndTheReasonSayWhereTheLandscapeIs) {
  const auto dir = temp_dir("landscape-extent");
  auto r = run(envsift_binary() + " screen -q --tests landscape --landscape-area extent --landscape-ratio 3 --points " +
               source_path("demo-points/occurrences.csv") + demo_layers() + " --out " + dir + "/out.csv");
  ASSERT_EQ(r.exit_code, 0) << r.output;
  const Table out = read_csv(dir + "/out.csv");
  std::size_t flagged = 0;
  for (const auto& row : out.rows)
    if (row[out.column("flags")] == "landscape") {
      ++flagged;
      EXPECT_NE(row[out.column("reasons")].find("in the layers' extent"), std::string::npos) << row[0];
    }
  EXPECT_GT(flagged, 0u);
}

TEST(LandscapeRun, NamedWithValueColumnsIsRefusedInOneLine) {
  const auto dir = temp_dir("landscape-values");
  write_file(dir + "/v.csv", "occurrenceID,scientificName,x\n1,a,1\n");
  auto r = run(envsift_binary() + " screen --tests landscape --points " + dir + "/v.csv --value-columns x --out " + dir +
               "/o.csv");
  EXPECT_NE(r.exit_code, 0);
  EXPECT_NE(r.output.find("--tests landscape needs layers"), std::string::npos) << r.output;
  // the defaults with value columns simply leave it out
  auto d = run(envsift_binary() + " screen -q --points " + dir + "/v.csv --value-columns x --out " + dir + "/d.csv");
  EXPECT_EQ(d.exit_code, 0) << d.output;
  EXPECT_EQ(read_file(dir + "/d.csv").find("landscape"), std::string::npos);
}

}  // namespace
}  // namespace envsift
