// A shared, thread-safe cache of decoded raster blocks with a memory budget. Each block is loaded
// at most once while it stays in the cache, even when several threads ask for it at the same time:
// the first asks the loader, the others wait for that result.
#pragma once
#include <cstddef>
#include <cstdint>
#include <functional>
#include <future>
#include <list>
#include <memory>
#include <mutex>
#include <unordered_map>
#include <vector>

namespace envsift {

// One block's raw cell values (before scale/offset), row-major with stride `width`. Types that
// a float holds exactly (8- and 16-bit integers, Float32) are kept as floats: half the memory.
struct Block {
  int width = 0;
  int height = 0;
  std::vector<double> values;  // other types
  std::vector<float> floats;   // float-exact types
  double at(int col, int row) const {
    const std::size_t i = static_cast<std::size_t>(row) * static_cast<std::size_t>(width) + static_cast<std::size_t>(col);
    return floats.empty() ? values[i] : floats[i];
  }
  std::size_t bytes() const { return values.size() * sizeof(double) + floats.size() * sizeof(float); }
};

struct BlockKey {
  std::uint32_t layer;
  std::uint32_t x;
  std::uint32_t y;
  bool operator==(const BlockKey& o) const { return layer == o.layer && x == o.x && y == o.y; }
};

class BlockCache {
 public:
  using BlockPtr = std::shared_ptr<const Block>;
  explicit BlockCache(std::size_t budget_bytes);

  // Returns the block, calling `load` only when it is not cached. Exceptions from `load` reach
  // every caller waiting for that block and leave nothing cached.
  BlockPtr get(const BlockKey& key, const std::function<Block()>& load);

  std::size_t loads() const;      // blocks loaded so far (a block re-loaded after eviction counts again)
  std::size_t evictions() const;

 private:
  struct KeyHash {
    std::size_t operator()(const BlockKey& k) const {
      return (static_cast<std::size_t>(k.layer) * 0x9E3779B97F4A7C15ull) ^ (static_cast<std::size_t>(k.x) << 32) ^ k.y;
    }
  };
  struct Entry {
    std::shared_future<BlockPtr> block;
    std::list<BlockKey>::iterator recency;
    std::size_t bytes = 0;
  };
  void evict_locked();

  mutable std::mutex mutex_;
  std::unordered_map<BlockKey, Entry, KeyHash> entries_;
  std::list<BlockKey> recency_;  // front = most recently used
  std::size_t budget_;
  std::size_t bytes_ = 0;
  std::size_t loads_ = 0;
  std::size_t evictions_ = 0;
};

}  // namespace envsift
