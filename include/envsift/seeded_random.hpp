// Random numbers (the evaluation, the landscape sample) that are the same on every machine and
// standard library (std::uniform_real_distribution and friends are not): SplitMix64 (Steele, Lea & Flood 2014,
// "Fast splittable pseudorandom number generators", OOPSLA), uniform doubles from its top 53
// bits, normals by Box-Muller.
#pragma once
#include <cmath>
#include <cstdint>

namespace envsift {

class SeededRandom {
 public:
  explicit SeededRandom(std::uint64_t seed) : state_(seed) {}
  std::uint64_t next() {
    std::uint64_t z = (state_ += 0x9e3779b97f4a7c15ull);
    z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ull;
    z = (z ^ (z >> 27)) * 0x94d049bb133111ebull;
    return z ^ (z >> 31);
  }
  double uniform() { return static_cast<double>(next() >> 11) * 0x1.0p-53; }  // [0, 1)
  double uniform(double low, double high) { return low + (high - low) * uniform(); }
  std::uint64_t below(std::uint64_t n) { return static_cast<std::uint64_t>(uniform() * static_cast<double>(n)); }
  double normal() {
    const double u = 1 - uniform(), v = uniform();  // u in (0, 1]
    return std::sqrt(-2 * std::log(u)) * std::cos(2 * M_PI * v);
  }

 private:
  std::uint64_t state_;
};

}  // namespace envsift
