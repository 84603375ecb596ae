#include "envsift/write/csv_writer.hpp"

#include <cerrno>
#include <cstring>
#include <unistd.h>

#include "envsift/errors.hpp"

namespace envsift {

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
  file_ = std::fopen(temp_path_.c_str(), "wb");
  if (!file_) throw OutputError(path_, std::string("cannot create output (") + std::strerror(errno) + ")");
}

CsvWriter::~CsvWriter() {
  if (file_) {
    std::fclose(file_);
    std::remove(temp_path_.c_str());
  }
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

void CsvWriter::commit() {
  const bool flushed = std::fflush(file_) == 0 && ::fsync(::fileno(file_)) == 0;
  const int saved = errno;
  const bool closed = std::fclose(file_) == 0;
  file_ = nullptr;
  if (!flushed || !closed || std::rename(temp_path_.c_str(), path_.c_str()) != 0) {
    const int err = flushed && closed ? errno : saved;
    std::remove(temp_path_.c_str());
    throw OutputError(path_, std::string("cannot finish output (") + std::strerror(err) + ")");
  }
}

}  // namespace envsift
