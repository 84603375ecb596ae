#include "envsift/sample/block_cache.hpp"

namespace envsift {

BlockCache::BlockCache(std::size_t budget_bytes) : budget_(budget_bytes) {}

BlockCache::BlockPtr BlockCache::get(const BlockKey& key, const std::function<Block()>& load) {
  std::promise<BlockPtr> promise;
  std::shared_future<BlockPtr> pending;
  {
    std::lock_guard<std::mutex> lock(mutex_);
    auto it = entries_.find(key);
    if (it != entries_.end()) {
      recency_.splice(recency_.begin(), recency_, it->second.recency);
      pending = it->second.block;
    } else {
      recency_.push_front(key);
      entries_.emplace(key, Entry{promise.get_future().share(), recency_.begin(), 0});
      ++loads_;
    }
  }
  if (pending.valid()) return pending.get();  // cached, or being loaded by another thread

  try {
    auto block = std::make_shared<const Block>(load());
    promise.set_value(block);
    std::lock_guard<std::mutex> lock(mutex_);
    auto it = entries_.find(key);
    if (it != entries_.end()) {
      it->second.bytes = block->bytes();
      bytes_ += it->second.bytes;
      evict_locked();
    }
    return block;
  } catch (...) {
    promise.set_exception(std::current_exception());
    std::lock_guard<std::mutex> lock(mutex_);
    auto it = entries_.find(key);
    if (it != entries_.end()) {
      recency_.erase(it->second.recency);
      entries_.erase(it);
    }
    throw;
  }
}

// Drops least recently used, fully loaded blocks until the budget holds. Blocks still in use by a
// caller stay alive through their shared_ptr; only the cache forgets them.
void BlockCache::evict_locked() {
  auto it = recency_.end();
  while (bytes_ > budget_ && it != recency_.begin()) {
    --it;
    auto entry = entries_.find(*it);
    if (entry->second.bytes == 0) continue;  // still loading
    bytes_ -= entry->second.bytes;
    entries_.erase(entry);
    it = recency_.erase(it);
    ++evictions_;
  }
}

std::size_t BlockCache::loads() const {
  std::lock_guard<std::mutex> lock(mutex_);
  return loads_;
}

std::size_t BlockCache::evictions() const {
  std::lock_guard<std::mutex> lock(mutex_);
  return evictions_;
}

}  // namespace envsift
