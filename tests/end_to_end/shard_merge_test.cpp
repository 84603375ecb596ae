// envsift's own contract, checked against envsift itself (a single run is the reference).
// Taxon shards: screening shards 0..N-1 and merging them gives, byte for byte, what one run
// writes (N = 1, 3, 7), on the demo data with every test, discs and the elevation check.
#include <gtest/gtest.h>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

std::string screen(const std::string& out, const std::string& extra) {
  return envsift_binary() + " screen --points " + source_path("demo-points/occurrences.csv") + demo_layers() +
         " --dem dem --out " + out + " " + extra;
}

TEST(ShardMerge, MergedShardsEqualASingleRun) {
  const auto dir = temp_dir("shards");
  ASSERT_EQ(run(screen(dir + "/single.csv", "")).exit_code, 0);
  const std::string single = read_file(dir + "/single.csv");
  for (int n : {1, 3, 7}) {
    std::string shards;
    for (int i = n - 1; i >= 0; --i) {  // any order
      const std::string out = dir + "/shard" + std::to_string(i) + "of" + std::to_string(n) + ".csv";
      auto r = run(screen(out, "--shard " + std::to_string(i) + "/" + std::to_string(n)));
      ASSERT_EQ(r.exit_code, 0) << r.output;
      shards += " " + out;
    }
    auto m = run(envsift_binary() + " merge" + shards + " --out " + dir + "/merged.csv");
    ASSERT_EQ(m.exit_code, 0) << m.output;
    EXPECT_EQ(read_file(dir + "/merged.csv"), single) << n << " shards";
  }
}

TEST(ShardMerge, IncompleteOrMixedShardsAreRefused) {
  const auto dir = temp_dir("shards-bad");
  for (int i = 0; i < 3; ++i)
    ASSERT_EQ(run(screen(dir + "/s" + std::to_string(i) + ".csv", "--shard " + std::to_string(i) + "/3")).exit_code, 0);
  auto missing = run(envsift_binary() + " merge " + dir + "/s0.csv " + dir + "/s1.csv --out " + dir + "/m.csv");
  EXPECT_EQ(missing.exit_code, 3) << missing.output;
  EXPECT_NE(missing.output.find("0 shards claim this row"), std::string::npos) << missing.output;
  auto twice = run(envsift_binary() + " merge " + dir + "/s0.csv " + dir + "/s0.csv " + dir + "/s1.csv " + dir +
                   "/s2.csv --out " + dir + "/m.csv");
  EXPECT_EQ(twice.exit_code, 3) << twice.output;
  EXPECT_EQ(run(screen(dir + "/x.csv", "--shard 3/3")).exit_code, 2);
}

}  // namespace
}  // namespace envsift
