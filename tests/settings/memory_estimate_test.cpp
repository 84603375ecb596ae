// The memory estimate (settings/memory_estimate.hpp) is what warns a run that will not fit. Not
// timed: these check that the estimate of a 10-million-record run stays under the limit the run
// reports, that it grows linearly with the records, and that a real run's peak resident memory
// (getrusage, reported by --timings) stays under its estimate. The measured 10 M figures are in
// docs/big-runs.md's performance table (scripts/bench 10000000 20000).
#include <gtest/gtest.h>

#include <algorithm>
#include <regex>

#include "../support.hpp"
#include "envsift/settings/memory_estimate.hpp"

namespace envsift {
namespace {

using namespace envsift::testing;

// scripts/bench's workload: 19 Float32 layers of 4320 × 2160 cells, 300 landscape cells per taxon
RunShape bench_run(std::size_t records, std::size_t taxa) {
  return {records, taxa, 19, 19, false, 300, std::size_t(19) * 4320 * 2160 * 4};
}

TEST(MemoryEstimate, TenMillionRecordsStayUnderTheDefaultLimit) {
  const SamplingSettings defaults;
  const MemoryEstimate e = estimate_memory(bench_run(10'000'000, 20'000), defaults);
  EXPECT_LT(e.peak(), defaults.memory_limit_mb << 20) << e.words();
  // values as 32-bit floats: 10 M × 19 × 4 bytes
  EXPECT_EQ(e.values, std::size_t(10'000'000) * 19 * 4);
}

TEST(MemoryEstimate, GrowsLinearlyWithTheRecordsBesidesTheBoundedParts) {
  const SamplingSettings defaults;
  const MemoryEstimate one = estimate_memory(bench_run(1'000'000, 2'000), defaults);
  const MemoryEstimate ten = estimate_memory(bench_run(10'000'000, 20'000), defaults);
  EXPECT_EQ(ten.per_record, 10 * one.per_record);
  EXPECT_EQ(ten.values, 10 * one.values);
  EXPECT_LE(ten.budgets, (defaults.memory_limit_mb << 20) / 2);  // cache, landscapes, verdicts: bounded by the limit
}

TEST(MemoryEstimate, ASmallerLimitShrinksTheBoundedParts) {
  SamplingSettings small;
  small.memory_limit_mb = 512;
  const MemoryEstimate e = estimate_memory(bench_run(1'000'000, 2'000), small);
  EXPECT_LE(e.budgets, std::size_t(512) << 19);  // at most half the limit
}

// A real run: its peak resident memory is under the estimate it prints, with the default limit
// and with a limit so small that the run is warned (and still writes every record).
TEST(MemoryEstimate, ARealRunStaysUnderItsEstimate) {
#if defined(__SANITIZE_ADDRESS__)
  GTEST_SKIP() << "under AddressSanitizer the process holds shadow memory and a quarantine of freed blocks: its "
                  "resident memory says nothing of envsift's own";
#endif
  const auto dir = temp_dir("memory-estimate");
  ASSERT_EQ(run(std::string(ENVSIFT_BENCH_BINARY) + " points " + dir + "/points.csv 60000 40 11 -0.95 -0.95 0.95 0.95").exit_code, 0);
  for (const std::string limit : {"", " --memory-limit 64"}) {
    const auto r = run(envsift_binary() + " screen --timings --points " + dir + "/points.csv" + demo_layers() + limit +
                       " --out " + dir + "/out.csv");
    ASSERT_EQ(r.exit_code, 0) << r.output;
    std::smatch m;
    const std::regex line("memory: peak resident ([0-9,]+) MB; estimated about ([0-9,]+) MB");
    ASSERT_TRUE(std::regex_search(r.output, m, line)) << r.output;
    auto number = [](std::string s) {
      s.erase(std::remove(s.begin(), s.end(), ','), s.end());
      return std::stoul(s);
    };
    EXPECT_LE(number(m[1]), number(m[2])) << r.output;
    if (!limit.empty()) {
      EXPECT_NE(r.output.find("more than --memory-limit 64 MB; split the run with --shard"), std::string::npos);
    }
  }
}

// `envsift estimate` (what a cluster job asks for) gives the estimate the screen itself prints:
// envsift's own contract, checked against envsift (no outside reference: the two must agree).
TEST(MemoryEstimate, TheEstimateCommandGivesWhatTheScreenEstimates) {
  const auto dir = temp_dir("memory-estimate-command");
  ASSERT_EQ(run(std::string(ENVSIFT_BENCH_BINARY) + " points " + dir + "/points.csv 60000 40 11 -0.95 -0.95 0.95 0.95").exit_code, 0);
  for (const std::string limit : {"", " --memory-limit 64"}) {
    const auto screen = run(envsift_binary() + " screen --timings --points " + dir + "/points.csv" + demo_layers() + limit +
                            " --out " + dir + "/out.csv");
    ASSERT_EQ(screen.exit_code, 0) << screen.output;
    std::smatch m;
    ASSERT_TRUE(std::regex_search(screen.output, m, std::regex("estimated about ([0-9,]+) MB"))) << screen.output;
    // the workload: 60,000 records of 40 taxa, each with an uncertainty (discs)
    const auto estimate = run(envsift_binary() + " estimate --records 60000 --taxa 40 --discs" + demo_layers() + limit);
    ASSERT_EQ(estimate.exit_code, 0) << estimate.output;
    // stderr says it in words, stdout gives the number alone: the last line
    const std::string out = estimate.output.substr(0, estimate.output.size() - 1);
    EXPECT_EQ(out.substr(out.rfind('\n') + 1), std::string(m[1])) << estimate.output;
  }
}

}  // namespace
}  // namespace envsift
