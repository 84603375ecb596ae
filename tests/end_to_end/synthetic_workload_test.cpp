// envsift's own contract, checked against envsift itself (the unlimited, two-thread run is the
// reference). The synthetic clustered workload of the benchmark tool (60 000 records in 40 taxa of skewed
// sizes over the demo island — large taxa take FAST-MCD's nested-subset path): a small
// --memory-limit (sampling in chunks, a 1 MB block cache that must evict and re-read) and the
// thread count change nothing in the output.
#include <gtest/gtest.h>

#include "../support.hpp"
#include "envsift/write/run_manifest.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

TEST(SyntheticWorkload, MemoryLimitAndThreadCountDoNotChangeTheOutput) {
  const auto dir = temp_dir("synthetic");
  const std::string bench = std::string(ENVSIFT_BENCH_BINARY);
  ASSERT_EQ(run(bench + " points " + dir + "/points.csv 60000 40 11 -0.95 -0.95 0.95 0.95").exit_code, 0);
  const std::string base = envsift_binary() + " screen --points " + dir + "/points.csv" + demo_layers() + " --quiet ";
  auto unlimited = run(base + "--threads 2 --out " + dir + "/unlimited.csv");
  ASSERT_EQ(unlimited.exit_code, 0) << unlimited.output;
  auto limited = run(base + "--threads 2 --memory-limit 16 --block-cache-mb 1 --out " + dir + "/limited.csv");
  ASSERT_EQ(limited.exit_code, 0) << limited.output;
  auto one_thread = run(base + "--threads 1 --out " + dir + "/one-thread.csv");
  ASSERT_EQ(one_thread.exit_code, 0) << one_thread.output;
  const std::string a = read_file(dir + "/unlimited.csv");
  EXPECT_GT(a.size(), 1000000u);
  EXPECT_EQ(a, read_file(dir + "/limited.csv"));
  EXPECT_EQ(a, read_file(dir + "/one-thread.csv"));
}

// Values are kept as 32-bit floats where a float holds the layer's cells exactly (Int16, Byte and
// Float32 here, at the nearest cell) and as doubles otherwise (bilinear). Either way the output is
// the one written when every value was a double: these are the SHA-256 of that output, recorded
// with envsift at commit b95f61e (values as doubles) on this workload.
TEST(SyntheticWorkload, FloatStorageWritesWhatDoubleStorageWrote) {
  const auto dir = temp_dir("synthetic-float");
  const std::string bench = std::string(ENVSIFT_BENCH_BINARY);
  ASSERT_EQ(run(bench + " points " + dir + "/points.csv 60000 40 11 -0.95 -0.95 0.95 0.95").exit_code, 0);
  const std::string base = envsift_binary() + " screen --points " + dir + "/points.csv" + demo_layers() + " --quiet ";
  ASSERT_EQ(run(base + "--out " + dir + "/nearest.csv").exit_code, 0);
  ASSERT_EQ(run(base + "--method bilinear --out " + dir + "/bilinear.csv").exit_code, 0);
  EXPECT_EQ(sha256_of_file(dir + "/nearest.csv"), "6611397b0fb56ca1ea7a2d820eebf11fabe26993e9578822b47892317bf907c3");
  EXPECT_EQ(sha256_of_file(dir + "/bilinear.csv"), "e3b3a4c2324e8e4fa8caa738190836f17bf5eb28e4fec69cc07d65f20e49093b");
}

}  // namespace
}  // namespace envsift
