// The command line's Progress: on a terminal, one line on stderr redrawn a few times a second
// (units done, rate, time left); when stderr is a file or pipe, a log line every 10 seconds.
#pragma once
#include <atomic>
#include <chrono>
#include <mutex>

#include "envsift/progress.hpp"

namespace envsift::cli {

class ProgressDisplay : public Progress {
 public:
  ProgressDisplay();
  void stage(const std::string& name, std::size_t total, const std::string& unit) override;
  void advance(std::size_t done) override;
  void finish() override;

 private:
  void print(bool final_line);

  const bool terminal_;
  std::mutex mutex_;
  std::string name_, unit_;
  std::size_t total_ = 0;
  std::atomic<std::size_t> done_{0};
  std::chrono::steady_clock::time_point started_, last_print_;
  bool drawn_ = false;
};

}  // namespace envsift::cli
