// A small --memory-limit (sampling in chunks of records, a 1 MB block cache that must evict and
// re-read) changes nothing in the output. The input is a synthetic clustered workload of 60 000
// records in 40 taxa over the demo island, made by the benchmark tool.
#include <gtest/gtest.h>

#include "../support.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

TEST(MemoryLimit, ASmallLimitGivesTheSameOutput) {
  const auto dir = temp_dir("memory-limit");
  const std::string bench = std::string(ENVSIFT_BENCH_BINARY);
  ASSERT_EQ(run(bench + " points " + dir + "/points.csv 60000 40 11 -0.95 -0.95 0.95 0.95").exit_code, 0);
  const std::string base = envsift_binary() + " screen --points " + dir + "/points.csv" + demo_layers() + " --quiet ";
  auto unlimited = run(base + "--out " + dir + "/unlimited.csv");
  ASSERT_EQ(unlimited.exit_code, 0) << unlimited.output;
  auto limited = run(base + "--memory-limit 16 --block-cache-mb 1 --out " + dir + "/limited.csv");
  ASSERT_EQ(limited.exit_code, 0) << limited.output;
  const std::string a = read_file(dir + "/unlimited.csv");
  EXPECT_GT(a.size(), 1000000u);
  EXPECT_EQ(a, read_file(dir + "/limited.csv"));
}

}  // namespace
}  // namespace envsift
