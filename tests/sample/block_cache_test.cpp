// The block cache's contract (envsift's own design, no outside reference): a block is loaded once
// however many threads ask for it at once, a failed load is reported to the caller and not cached,
// and the memory budget evicts least recently used blocks.
#include "envsift/sample/block_cache.hpp"

#include <atomic>
#include <stdexcept>
#include <thread>

#include <gtest/gtest.h>

namespace envsift {
namespace {

Block block_of(int cells) {
  Block b;
  b.width = cells;
  b.height = 1;
  b.values.assign(static_cast<std::size_t>(cells), 1.0);  // a double block; float blocks count half
  return b;
}

TEST(BlockCache, ConcurrentRequestsLoadABlockOnce) {
  BlockCache cache(1 << 20);
  std::atomic<int> loads{0};
  std::vector<std::thread> threads;
  for (int t = 0; t < 8; ++t)
    threads.emplace_back([&] {
      for (std::uint32_t b = 0; b < 50; ++b)
        cache.get({0, b, 0}, [&] {
          ++loads;
          std::this_thread::yield();
          return block_of(16);
        });
    });
  for (auto& t : threads) t.join();
  EXPECT_EQ(loads.load(), 50);
  EXPECT_EQ(cache.loads(), 50u);
}

TEST(BlockCache, FailedLoadIsReportedAndRetried) {
  BlockCache cache(1 << 20);
  EXPECT_THROW(cache.get({0, 0, 0}, []() -> Block { throw std::runtime_error("truncated"); }), std::runtime_error);
  EXPECT_EQ(cache.get({0, 0, 0}, [] { return block_of(4); })->values.size(), 4u);
}

TEST(BlockCache, BudgetEvictsLeastRecentlyUsed) {
  BlockCache cache(3 * 8 * sizeof(double));  // room for three 8-cell blocks
  int loads = 0;
  auto load = [&] {
    ++loads;
    return block_of(8);
  };
  for (std::uint32_t b = 0; b < 3; ++b) cache.get({0, b, 0}, load);
  cache.get({0, 0, 0}, load);  // touch block 0: block 1 is now the oldest
  cache.get({0, 3, 0}, load);  // evicts block 1
  EXPECT_EQ(loads, 4);
  cache.get({0, 0, 0}, load);
  EXPECT_EQ(loads, 4);  // still cached
  cache.get({0, 1, 0}, load);
  EXPECT_EQ(loads, 5);  // was evicted
  EXPECT_GE(cache.evictions(), 1u);
}

}  // namespace
}  // namespace envsift
