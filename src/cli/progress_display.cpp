#include "progress_display.hpp"

#include <cstdio>
#include <unistd.h>

namespace envsift::cli {

ProgressDisplay::ProgressDisplay() : terminal_(::isatty(STDERR_FILENO) == 1) {}

void ProgressDisplay::stage(const std::string& name, std::size_t total, const std::string& unit) {
  std::lock_guard<std::mutex> lock(mutex_);
  if (drawn_ && terminal_) print(true);
  name_ = name;
  unit_ = unit;
  total_ = total;
  done_ = 0;
  started_ = last_print_ = std::chrono::steady_clock::now();
  drawn_ = false;
}

void ProgressDisplay::advance(std::size_t done) {
  done_ += done;
  const auto now = std::chrono::steady_clock::now();
  const auto every = terminal_ ? std::chrono::milliseconds(200) : std::chrono::milliseconds(10000);
  if (now - last_print_ < every) return;
  std::unique_lock<std::mutex> lock(mutex_, std::try_to_lock);  // never make a worker wait
  if (!lock || now - last_print_ < every) return;
  last_print_ = now;
  print(false);
}

void ProgressDisplay::finish() {
  std::lock_guard<std::mutex> lock(mutex_);
  if (drawn_ && terminal_) print(true);
}

void ProgressDisplay::print(bool final_line) {
  const double seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - started_).count();
  const std::size_t done = done_;
  const double rate = seconds > 0 ? done / seconds : 0;
  char left[32] = "";
  if (rate > 0 && total_ > done) std::snprintf(left, sizeof left, ", %.0f s left", (total_ - done) / rate);
  std::fprintf(stderr, "%senvsift: %s: %zu of %zu %s (%.0f %s/s%s)%s", terminal_ ? "\r\033[K" : "", name_.c_str(), done,
               total_, unit_.c_str(), rate, unit_.c_str(), left, terminal_ && !final_line ? "" : "\n");
  std::fflush(stderr);
  drawn_ = !final_line;
}

}  // namespace envsift::cli
