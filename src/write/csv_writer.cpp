#include "envsift/write/csv_writer.hpp"

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

int remember_partial_output(const std::string& temporary_path) { return remember_partial(temporary_path); }
void forget_partial_output(int slot) { forget_partial(slot); }

void remove_partial_outputs_on_signal() {
  for (int s : {SIGINT, SIGTERM, SIGHUP})
    if (std::signal(s, on_signal) == SIG_IGN) std::signal(s, SIG_IGN);  // keep what nohup & co. ignore
}

void append_csv_field(std::string& out, const std::string& field) {
  const bool quote = field.find_first_of(",\"\r\n") != std::string::npos ||
                     (!field.empty() && (field.front() == ' ' || field.back() == ' '));
  if (!quote) {
    out += field;
    return;
  }
  out += '"';
  for (char c : field) {
    if (c == '"') out += '"';
    out += c;
  }
  out += '"';
}

CsvWriter::CsvWriter(std::string path) : path_(std::move(path)) {
  temp_path_ = path_ + ".partial-" + std::to_string(::getpid());
  slot_ = remember_partial(temp_path_);
  file_ = std::fopen(temp_path_.c_str(), "wb");
  if (!file_) {
    forget_partial(slot_);
    throw OutputError(path_, std::string("cannot create output (") + std::strerror(errno) + ")");
  }
}

CsvWriter::~CsvWriter() {
  if (file_) {
    std::fclose(file_);
    std::remove(temp_path_.c_str());
  }
  forget_partial(slot_);
}

void CsvWriter::row(const std::vector<std::string>& fields) {
  buffer_.clear();
  for (std::size_t i = 0; i < fields.size(); ++i) {
    if (i) buffer_ += ',';
    append_csv_field(buffer_, fields[i]);
  }
  buffer_ += '\n';
  if (std::fwrite(buffer_.data(), 1, buffer_.size(), file_) != buffer_.size())
    throw OutputError(path_, std::string("write failed (") + std::strerror(errno) + ")");
}

void CsvWriter::write_text(const std::string& text) {
  if (std::fwrite(text.data(), 1, text.size(), file_) != text.size())
    throw OutputError(path_, std::string("write failed (") + std::strerror(errno) + ")");
}

void CsvWriter::commit() {
  // Test hook (tests/cli/atomic_output_test.cpp): hold the finished temporary file for a while, so
  // a test can interrupt the run at the last moment.
  if (const char* pause = std::getenv("ENVSIFT_TEST_PAUSE_BEFORE_COMMIT")) ::sleep(static_cast<unsigned>(std::atoi(pause)));
  const bool flushed = std::fflush(file_) == 0 && ::fsync(::fileno(file_)) == 0;
  const int saved = errno;
  const bool closed = std::fclose(file_) == 0;
  file_ = nullptr;
  if (!flushed || !closed || std::rename(temp_path_.c_str(), path_.c_str()) != 0) {
    const int err = flushed && closed ? errno : saved;
    std::remove(temp_path_.c_str());
    forget_partial(slot_);
    throw OutputError(path_, std::string("cannot finish output (") + std::strerror(err) + ")");
  }
  forget_partial(slot_);
}

}  // namespace envsift
