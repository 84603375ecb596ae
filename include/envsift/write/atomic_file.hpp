// Every output is written under a temporary name beside its target and renamed over it only when
// the whole run has finished writing, so a failed or interrupted run never leaves a file that
// looks complete. This is the one place that does it: `TemporaryPath` for writers that create the
// file themselves (GDAL), `AtomicFile` for envsift's own text.
#pragma once
#include <cstdio>
#include <string>
#include <vector>

namespace envsift {

class TemporaryPath {
 public:
  // `suffix`: kept at the end of the temporary name (GDAL picks drivers by extension).
  explicit TemporaryPath(std::string target, const std::string& suffix = "");
  ~TemporaryPath();  // removes the temporary file unless committed
  TemporaryPath(const TemporaryPath&) = delete;
  TemporaryPath& operator=(const TemporaryPath&) = delete;

  const std::string& target() const { return target_; }
  const std::string& temporary() const { return temporary_; }
  void commit();  // renames the temporary file over the target; throws OutputError

 private:
  std::string target_, temporary_;
  std::vector<int> slots_;  // in the signal handler's list of partial outputs (with side files)
  bool committed_ = false;
};

class AtomicFile {
 public:
  explicit AtomicFile(std::string target);
  ~AtomicFile();
  AtomicFile(const AtomicFile&) = delete;
  AtomicFile& operator=(const AtomicFile&) = delete;

  void write(const std::string& text);  // throws OutputError when the disk is full
  void finish();  // flushes and closes; the file is complete but not yet in place
  void commit();  // finish() if not done, then rename into place
  const std::string& target() const { return path_.target(); }

 private:
  TemporaryPath path_;
  std::FILE* file_ = nullptr;
};

// Test hook (tests/cli/atomic_output_test.cpp): with ENVSIFT_TEST_PAUSE_BEFORE_COMMIT=SECONDS,
// waits that long when every output has finished and none is in place yet, so that a test can
// interrupt the run at the last moment.
void pause_before_commit_for_tests();

// While one lives, the outputs are being renamed into place: a signal then says so instead of
// "no output was written".
struct CommitPhase {
  CommitPhase();
  ~CommitPhase();
};

// On SIGINT, SIGTERM or SIGHUP, removes every output still being written (its temporary file and
// GDAL's side files), says on stderr that nothing was written, then lets the signal end the
// process as it would have. Call once, early in main().
void remove_partial_outputs_on_signal();

}  // namespace envsift
