// Stage timings: each lap records the time since the previous one under a stage's name.
#pragma once
#include <chrono>
#include <ctime>
#include <string>
#include <utility>
#include <vector>

namespace envsift {

using StageSeconds = std::vector<std::pair<std::string, double>>;

class Stopwatch {
 public:
  // Seconds since the start or the last lap, recorded as `stage`; the next lap starts now.
  double lap(StageSeconds& into, const std::string& stage) {
    const auto now = std::chrono::steady_clock::now();
    const double s = std::chrono::duration<double>(now - last_).count();
    into.emplace_back(stage, s);
    last_ = now;
    return s;
  }
  double seconds() const { return std::chrono::duration<double>(std::chrono::steady_clock::now() - last_).count(); }

 private:
  std::chrono::steady_clock::time_point last_ = std::chrono::steady_clock::now();
};

// CPU seconds the process has used, all threads together (std::clock: the process CPU-time clock
// on Linux): a stage's CPU time beside its wall time says how well it used the cores.
inline double process_cpu_seconds() { return static_cast<double>(std::clock()) / CLOCKS_PER_SEC; }

}  // namespace envsift
