#include "envsift/write/atomic_file.hpp"

#include <atomic>
#include <cerrno>
#include <csignal>
#include <cstdlib>
#include <cstring>
#include <unistd.h>

#include "envsift/errors.hpp"

namespace envsift {
namespace {

// Temporary files being written, readable from a signal handler: fixed storage, atomic flags.
constexpr int kSlots = 32;
char g_partial[kSlots][4096];
std::atomic<bool> g_in_use[kSlots];

int remember_partial(const std::string& path) {
  if (path.size() >= sizeof g_partial[0]) return -1;
  for (int i = 0; i < kSlots; ++i) {
    bool expected = false;
    if (g_in_use[i].load() || !g_in_use[i].compare_exchange_strong(expected, true)) continue;
    std::memcpy(g_partial[i], path.c_str(), path.size() + 1);
    return i;
  }
  return -1;
}

void forget_partial(int slot) {
  if (slot >= 0) g_in_use[slot].store(false);
}

extern "C" void on_signal(int signal) {
  for (int i = 0; i < kSlots; ++i)
    if (g_in_use[i].load()) ::unlink(g_partial[i]);  // async-signal-safe
  std::signal(signal, SIG_DFL);
  std::raise(signal);
}

}  // namespace

void remove_partial_outputs_on_signal() {
  for (int s : {SIGINT, SIGTERM, SIGHUP})
    if (std::signal(s, on_signal) == SIG_IGN) std::signal(s, SIG_IGN);  // keep what nohup & co. ignore
}

TemporaryPath::TemporaryPath(std::string target, const std::string& suffix)
    : target_(std::move(target)), temporary_(target_ + ".partial-" + std::to_string(::getpid()) + suffix),
      slot_(remember_partial(temporary_)) {}

TemporaryPath::~TemporaryPath() {
  if (!committed_) std::remove(temporary_.c_str());
  forget_partial(slot_);
}

void TemporaryPath::commit() {
  // Test hook (tests/cli/atomic_output_test.cpp): hold the finished temporary file for a while, so
  // a test can interrupt the run at the last moment.
  if (const char* pause = std::getenv("ENVSIFT_TEST_PAUSE_BEFORE_COMMIT")) ::sleep(static_cast<unsigned>(std::atoi(pause)));
  if (std::rename(temporary_.c_str(), target_.c_str()) != 0) {
    const int err = errno;
    std::remove(temporary_.c_str());
    throw OutputError(target_, std::string("cannot finish output (") + std::strerror(err) + ")");
  }
  committed_ = true;
}

AtomicFile::AtomicFile(std::string target) : path_(std::move(target)) {
  file_ = std::fopen(path_.temporary().c_str(), "wb");
  if (!file_) throw OutputError(path_.target(), std::string("cannot create output (") + std::strerror(errno) + ")");
}

AtomicFile::~AtomicFile() {
  if (file_) std::fclose(file_);
}

void AtomicFile::write(const std::string& text) {
  if (!file_) throw OutputError(path_.target(), "written after it was finished (an envsift bug)");
  if (std::fwrite(text.data(), 1, text.size(), file_) != text.size())
    throw OutputError(path_.target(), std::string("write failed (") + std::strerror(errno) + ")");
}

void AtomicFile::finish() {
  if (!file_) return;
  const bool flushed = std::fflush(file_) == 0 && ::fsync(::fileno(file_)) == 0;
  const int saved = errno;
  const bool closed = std::fclose(file_) == 0;
  file_ = nullptr;
  if (!flushed || !closed)
    throw OutputError(path_.target(), std::string("cannot finish output (") + std::strerror(flushed ? errno : saved) + ")");
}

void AtomicFile::commit() {
  finish();
  path_.commit();
}

}  // namespace envsift
