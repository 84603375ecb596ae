#include "envsift/read/field_store.hpp"

#include <algorithm>
#include <cerrno>
#include <cstdlib>
#include <cstring>
#include <stdexcept>
#include <unistd.h>

#include "envsift/errors.hpp"

namespace envsift {
namespace {

constexpr std::size_t kChunk = 1 << 20;

void put_length(std::string& out, std::uint64_t n) {  // LEB128
  do {
    unsigned char b = n & 0x7F;
    n >>= 7;
    out += static_cast<char>(n ? b | 0x80 : b);
  } while (n);
}

std::uint64_t get_length(const std::string& in, std::size_t& at) {
  std::uint64_t n = 0;
  for (int shift = 0;; shift += 7) {
    const auto b = static_cast<unsigned char>(in.at(at++));
    n |= static_cast<std::uint64_t>(b & 0x7F) << shift;
    if (!(b & 0x80)) return n;
  }
}

std::string temp_dir() {
  const char* t = std::getenv("TMPDIR");
  return t && *t ? t : "/tmp";
}

}  // namespace

FieldStore::FieldStore(std::size_t memory_bytes) : memory_bytes_(std::max(kChunk, memory_bytes)) {
  std::string path = temp_dir() + "/envsift-fields-XXXXXX";
  fd_ = ::mkstemp(path.data());
  if (fd_ < 0)
    throw OutputError(temp_dir() + " (TMPDIR)", std::string("cannot create a temporary file there (") + std::strerror(errno) +
                                                  "); set TMPDIR to a writable directory");
  ::unlink(path.c_str());  // gone when the process ends, however it ends
}

FieldStore::~FieldStore() {
  if (fd_ >= 0) ::close(fd_);
}

FieldStore::FieldStore(FieldStore&& o) noexcept { *this = std::move(o); }

FieldStore& FieldStore::operator=(FieldStore&& o) noexcept {
  if (this != &o) {
    if (fd_ >= 0) ::close(fd_);
    fd_ = o.fd_;
    memory_bytes_ = o.memory_bytes_;
    o.fd_ = -1;
    offsets_ = std::move(o.offsets_);
    end_ = o.end_;
    pending_ = std::move(o.pending_);
    buffer_ = std::move(o.buffer_);
    buffer_at_ = o.buffer_at_;
    last_read_ = o.last_read_;
  }
  return *this;
}

void FieldStore::append(const std::vector<std::string>& fields) {
  if (pending_.capacity() < memory_bytes_) pending_.reserve(memory_bytes_ + kChunk);  // no doubling past the budget
  offsets_.push_back(end_ + pending_.size());
  put_length(pending_, fields.size());
  for (const auto& f : fields) {
    put_length(pending_, f.size());
    pending_ += f;
  }
  if (pending_.size() >= memory_bytes_) {
    for (std::size_t done = 0; done < pending_.size();) {  // pwrite may write part of it: the rest, or why not
      const ssize_t n = ::pwrite(fd_, pending_.data() + done, pending_.size() - done, static_cast<off_t>(end_ + done));
      if (n <= 0) {
        const int err = n == 0 ? ENOSPC : errno;  // nothing written and no error: the disk is full
        throw OutputError(temp_dir() + " (TMPDIR)",
                          std::string("cannot write the temporary copy of the records (") + std::strerror(err) +
                              "); free space there, or set TMPDIR to a directory with room for about the points "
                              "file's size");
      }
      done += static_cast<std::size_t>(n);
    }
    end_ += pending_.size();
    pending_.clear();
  }
}

void FieldStore::read_file(std::uint64_t at, char* into, std::size_t length) const {
  std::size_t got = 0;
  while (got < length && at + got < end_) {
    const ssize_t n = ::pread(fd_, into + got, length - got, static_cast<off_t>(at + got));
    if (n <= 0) throw std::runtime_error(std::string("cannot read the temporary copy of the records: ") + std::strerror(errno));
    got += static_cast<std::size_t>(n);
  }
  if (got < length) throw std::runtime_error("the temporary copy of the records is shorter than written");
}

// Makes buffer_ hold [at, at + length): a large chunk when reading in order, only what is asked
// for when jumping around (e.g. writing rows in rank order).
void FieldStore::fill(std::uint64_t at, std::size_t length, bool in_order) const {
  if (at >= buffer_at_ && at + length <= buffer_at_ + buffer_.size()) return;
  buffer_.resize(static_cast<std::size_t>(std::min<std::uint64_t>(in_order ? std::max(kChunk, length) : length, end_ - at)));
  read_file(at, buffer_.data(), buffer_.size());
  buffer_at_ = at;
}

std::pair<std::uint64_t, std::size_t> FieldStore::extent(std::size_t i) const {
  const std::uint64_t start = offsets_.at(i);
  const std::uint64_t stop = i + 1 < offsets_.size() ? offsets_[i + 1] : end_ + pending_.size();
  return {start, static_cast<std::size_t>(stop - start)};
}

namespace {
void decode(const std::string& source, std::size_t at, std::vector<std::string>& fields) {
  fields.resize(static_cast<std::size_t>(get_length(source, at)));
  for (auto& f : fields) {
    const auto n = static_cast<std::size_t>(get_length(source, at));
    f.assign(source, at, n);
    at += n;
  }
}
}  // namespace

void FieldStore::read(std::size_t i, std::vector<std::string>& fields) const {
  const auto [start, length] = extent(i);
  if (start >= end_) {  // still in memory
    decode(pending_, static_cast<std::size_t>(start - end_), fields);
  } else {
    fill(start, length, i == last_read_ + 1);
    decode(buffer_, static_cast<std::size_t>(start - buffer_at_), fields);
  }
  last_read_ = i;
}

void FieldStore::read_concurrently(std::size_t i, std::string& scratch, std::vector<std::string>& fields) const {
  const auto [start, length] = extent(i);
  if (start >= end_) return decode(pending_, static_cast<std::size_t>(start - end_), fields);
  scratch.resize(length);
  read_file(start, scratch.data(), length);
  decode(scratch, 0, fields);
}

std::vector<std::string> FieldStore::read(std::size_t i) const {
  std::vector<std::string> fields;
  read(i, fields);
  return fields;
}

}  // namespace envsift
