// The original fields of every record, kept on disk rather than in memory: a run over millions
// of records holds only their parsed coordinates and codes, and reads the text back when it
// writes the output. The file is unlinked as soon as it is created, so nothing is left behind,
// whatever happens to the process. $TMPDIR chooses its directory (default /tmp).
#pragma once
#include <cstdint>
#include <cstdio>
#include <string>
#include <utility>
#include <vector>

namespace envsift {

class FieldStore {
 public:
  // `memory_bytes`: what may wait in memory before it is written to the file (at least 1 MiB);
  // a store that never grows past it is read without a single read(2).
  explicit FieldStore(std::size_t memory_bytes = 0);
  ~FieldStore();
  FieldStore(FieldStore&& other) noexcept;
  FieldStore& operator=(FieldStore&& other) noexcept;
  FieldStore(const FieldStore&) = delete;
  FieldStore& operator=(const FieldStore&) = delete;

  void append(const std::vector<std::string>& fields);
  std::size_t size() const { return offsets_.size(); }
  // Fields of record i. Sequential reads (i, i + 1, …) are buffered.
  void read(std::size_t i, std::vector<std::string>& fields) const;
  // The same, unbuffered and safe to call from several threads at once (not while appending):
  // for reads in no order, one read(2) each. `scratch` is the caller's to reuse.
  void read_concurrently(std::size_t i, std::string& scratch, std::vector<std::string>& fields) const;
  std::vector<std::string> read(std::size_t i) const;
  std::uint64_t bytes() const { return end_; }

 private:
  void fill(std::uint64_t at, std::size_t length, bool in_order) const;
  std::pair<std::uint64_t, std::size_t> extent(std::size_t i) const;  // offset and length of record i
  void read_file(std::uint64_t at, char* into, std::size_t length) const;

  int fd_ = -1;
  std::size_t memory_bytes_ = 0;
  std::vector<std::uint64_t> offsets_;
  std::uint64_t end_ = 0;
  std::string pending_;                  // appended, not yet written
  mutable std::string buffer_;           // read buffer
  mutable std::uint64_t buffer_at_ = 0;  // file offset of buffer_[0]
  mutable std::size_t last_read_ = static_cast<std::size_t>(-2);
};

}  // namespace envsift
