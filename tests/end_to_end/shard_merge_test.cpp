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
  EXPECT_NE(missing.output.find("shard 2/3 of its run is missing"), std::string::npos) << missing.output;
  auto twice = run(envsift_binary() + " merge " + dir + "/s0.csv " + dir + "/s0.csv " + dir + "/s1.csv " + dir +
                   "/s2.csv --out " + dir + "/m.csv");
  EXPECT_EQ(twice.exit_code, 3) << twice.output;
  EXPECT_EQ(run(screen(dir + "/x.csv", "--shard 3/3")).exit_code, 2);
}

// Shards merge only when one run made them (envsift's own contract, checked through each shard's
// manifest): the cases seen mixed cutoffs and records silently. Each differing shard is named
// with what differs; threads and memory, which change no result, may differ.
TEST(ShardMerge, ShardsOfDifferentRunsAreRefusedWithWhatDiffers) {
  const auto dir = temp_dir("shards-mixed");
  const std::string points = source_path("demo-points/occurrences.csv");
  // the same number of rows, one coordinate changed: only the checksum tells them apart
  std::string other = read_file(points);
  other.replace(other.find("0.47831"), 7, "0.47832");
  write_file(dir + "/other.csv", other);
  auto shard = [&](int i, const std::string& out, const std::string& more, const std::string& from) {
    const auto r = run(envsift_binary() + " screen -q --points " + from + demo_layers() + " --shard " + std::to_string(i) +
                       "/3 --out " + dir + "/" + out + " " + more);
    ASSERT_EQ(r.exit_code, 0) << r.output;
  };
  for (int i = 0; i < 3; ++i) shard(i, "s" + std::to_string(i) + ".csv", "", points);
  shard(1, "threads.csv", "--threads 1 --memory-limit 512", points);
  const auto same = run(envsift_binary() + " merge " + dir + "/s0.csv " + dir + "/threads.csv " + dir + "/s2.csv --out " + dir + "/m.csv");
  EXPECT_EQ(same.exit_code, 0) << same.output;
  const std::vector<std::pair<std::string, std::string>> cases = {
      {"--z-cutoff 3", "it was made with --z-cutoff 3, " + dir + "/s0.csv with --z-cutoff 4"},
      {"--chi2-quantile 0.99", "--chi2-quantile 0.99"},
      {"--all-records", "--all-records true"},
      {"--tests robust_z", "--tests robust_z"},
      {"--seed 9", "--seed 9"},
  };
  for (const auto& [more, words] : cases) {
    SCOPED_TRACE(more);
    shard(1, "odd.csv", more, points);
    const auto r = run(envsift_binary() + " merge " + dir + "/s0.csv " + dir + "/odd.csv " + dir + "/s2.csv --out " + dir + "/m.csv");
    EXPECT_EQ(r.exit_code, 3) << r.output;
    EXPECT_NE(r.output.find(dir + "/odd.csv: is not a shard of the same run as " + dir + "/s0.csv"), std::string::npos) << r.output;
    EXPECT_NE(r.output.find(words), std::string::npos) << r.output;
  }
  shard(1, "odd.csv", "", dir + "/other.csv");
  auto r = run(envsift_binary() + " merge " + dir + "/s0.csv " + dir + "/odd.csv " + dir + "/s2.csv --out " + dir + "/m.csv");
  EXPECT_EQ(r.exit_code, 3) << r.output;
  EXPECT_NE(r.output.find("its points file differs (SHA-256"), std::string::npos) << r.output;
  // a layer with other contents under the same name
  run("cp " + demo_layer_paths()[1] + " " + dir + "/dem.tif");
  const auto odd_layer = run(envsift_binary() + " screen -q --points " + points + " --layers " + dir + "/dem.tif " +
                             demo_layer_paths()[1] + " " + demo_layer_paths()[2] + " " + demo_layer_paths()[3] +
                             " --shard 1/3 --out " + dir + "/odd.csv");
  ASSERT_EQ(odd_layer.exit_code, 0) << odd_layer.output;
  r = run(envsift_binary() + " merge " + dir + "/s0.csv " + dir + "/odd.csv " + dir + "/s2.csv --out " + dir + "/m.csv");
  EXPECT_EQ(r.exit_code, 3) << r.output;
  EXPECT_NE(r.output.find("its layer dem differs"), std::string::npos) << r.output;
  // a shard whose manifest is gone
  std::remove((dir + "/s2.csv.manifest.json").c_str());
  r = run(envsift_binary() + " merge " + dir + "/s0.csv " + dir + "/s1.csv " + dir + "/s2.csv --out " + dir + "/m.csv");
  EXPECT_EQ(r.exit_code, 3) << r.output;
  EXPECT_NE(r.output.find("s2.csv: has no run manifest beside it"), std::string::npos) << r.output;
}

}  // namespace
}  // namespace envsift
