#include "envsift/write/atomic_file.hpp"

#include <atomic>
#include <cerrno>
#include <csignal>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <signal.h>
#include <unistd.h>

#include "envsift/errors.hpp"

namespace envsift {
namespace {

// Temporary files being written, readable from a signal handler: fixed storage, atomic flags.
constexpr int kSlots = 64;
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

std::atomic<bool> g_committing{false};

// GDAL's SQLite-based writers (GeoPackage) keep side files beside the file while it is open.
const char* const kSideFiles[] = {"-journal", "-wal", "-shm"};

extern "C" void on_signal(int signal) {
  bool removed = false;
  for (int i = 0; i < kSlots; ++i)
    if (g_in_use[i].load()) ::unlink(g_partial[i]), removed = true;  // async-signal-safe
  static const char interrupted[] = "\nenvsift: interrupted; no output was written (partial files removed)\n";
  static const char committing[] = "\nenvsift: interrupted while the outputs were being put in place; some may be "
                                   "missing or from an earlier run: run again\n";
  if (g_committing.load()) (void)!::write(2, committing, sizeof committing - 1);
  else if (removed) (void)!::write(2, interrupted, sizeof interrupted - 1);
  std::signal(signal, SIG_DFL);
  std::raise(signal);
}

}  // namespace

void remove_partial_outputs_on_signal() {
  for (int s : {SIGINT, SIGTERM, SIGHUP})
    if (std::signal(s, on_signal) == SIG_IGN) std::signal(s, SIG_IGN);  // keep what nohup & co. ignore
}

namespace {

// This machine's name, as the temporary names carry it (without the tag's own separator).
std::string host_tag() {
  char host[256] = {};
  if (::gethostname(host, sizeof host - 1) != 0 || !*host) std::strcpy(host, "host");
  for (char* c = host; *c; ++c)
    if (*c == '/' || *c == '-') *c = '_';
  return host;
}

// "HOST-PID": a temporary name no other process, here or on another machine sharing the folder, uses.
std::string partial_tag() { return host_tag() + "-" + std::to_string(::getpid()); }

// Temporary files of this target left by runs on this machine that no longer exist (killed with
// SIGKILL, or by the machine going down, so that no handler could remove them): removed, so they
// do not pile up (they can be as large as the output). A file of a live process is left alone.
void remove_stale_partials(const std::string& target) {
  namespace fs = std::filesystem;
  const fs::path t(target);
  const std::string prefix = t.filename().string() + ".partial-";
  const std::string mine = host_tag();
  std::error_code ec;
  const fs::path dir = t.has_parent_path() ? t.parent_path() : fs::path(".");
  for (fs::directory_iterator it(dir, ec), end; !ec && it != end; it.increment(ec)) {
    const std::string name = it->path().filename().string();
    if (name.compare(0, prefix.size(), prefix) != 0) continue;
    const std::string tag = name.substr(prefix.size());
    const auto dash = tag.find('-');
    if (dash == std::string::npos || tag.substr(0, dash) != mine) continue;  // another machine's: it may be running
    char* end_of_pid = nullptr;
    const long pid = std::strtol(tag.c_str() + dash + 1, &end_of_pid, 10);
    if (pid <= 0 || end_of_pid == tag.c_str() + dash + 1 || pid == ::getpid()) continue;
    if (::kill(static_cast<pid_t>(pid), 0) == -1 && errno == ESRCH) fs::remove(it->path(), ec);
  }
}

}  // namespace

TemporaryPath::TemporaryPath(std::string target, const std::string& suffix)
    : target_(std::move(target)), temporary_(target_ + ".partial-" + partial_tag() + suffix) {
  remove_stale_partials(target_);
  slots_.push_back(remember_partial(temporary_));
  for (const char* side : kSideFiles) slots_.push_back(remember_partial(temporary_ + side));
}

TemporaryPath::~TemporaryPath() {
  if (!committed_) std::remove(temporary_.c_str());
  for (const char* side : kSideFiles) std::remove((temporary_ + side).c_str());
  for (int slot : slots_) forget_partial(slot);
}

CommitPhase::CommitPhase() { g_committing.store(true); }
CommitPhase::~CommitPhase() { g_committing.store(false); }

void pause_before_commit_for_tests() {
  if (const char* pause = std::getenv("ENVSIFT_TEST_PAUSE_BEFORE_COMMIT")) ::sleep(static_cast<unsigned>(std::atoi(pause)));
}

void TemporaryPath::commit() {
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
