// The one hash envsift keys things by (shards, seeds, cells, record IDs): 64-bit FNV-1a
// (Fowler, Noll & Vo; the IETF draft "The FNV Non-Cryptographic Hash Algorithm"), stable across
// machines, compilers and runs.
#pragma once
#include <cstdint>
#include <string>

namespace envsift {

constexpr std::uint64_t kFnvBasis = 0xcbf29ce484222325ull;
constexpr std::uint64_t kFnvPrime = 0x100000001b3ull;

// One FNV-1a step with a whole 64-bit word (values' bits, not their bytes).
constexpr std::uint64_t fnv_mix(std::uint64_t hash, std::uint64_t word) { return (hash ^ word) * kFnvPrime; }

inline std::uint64_t stable_hash(const std::string& text, std::uint64_t basis = kFnvBasis) {
  std::uint64_t h = basis;
  for (unsigned char c : text) h = fnv_mix(h, c);
  return h;
}

}  // namespace envsift
