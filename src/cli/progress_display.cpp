#include "progress_display.hpp"

#include "envsift/run_summary.hpp"

#include <cstdio>
#include <string>
#include <unistd.h>

namespace envsift::cli {

ProgressDisplay::ProgressDisplay() : terminal_(::isatty(STDERR_FILENO) == 1) {}

void ProgressDisplay::stage(const std::string& name, std::size_t total, const std::string& unit) {
  std::lock_guard<std::mutex> lock(mutex_);
  if (drawn_) print(true);  // the stage that ends says where it ended, in a log too
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
  if (drawn_) print(true);
}

void ProgressDisplay::print(bool final_line) {
  const double seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - started_).count();
  const std::size_t done = done_;
  const double rate = seconds > 0 ? done / seconds : 0;
  std::string left;
  if (rate > 0 && total_ > done) left = ", " + std::to_string(static_cast<long>((total_ - done) / rate + 0.5)) + " s left";
  const std::string of = total_ ? " of " + with_thousands(total_) : "";  // 0: the total is not known in advance
  std::fprintf(stderr, "%senvsift: %s: %s%s %s (%s %s/s%s)%s", terminal_ ? "\r\033[K" : "", name_.c_str(),
               with_thousands(done).c_str(), of.c_str(), unit_.c_str(), with_thousands(static_cast<std::size_t>(rate)).c_str(),
               unit_.c_str(), left.c_str(), terminal_ && !final_line ? "" : "\n");
  std::fflush(stderr);
  drawn_ = !final_line;  // a stage that printed anything prints its final count when it ends
}

}  // namespace envsift::cli
