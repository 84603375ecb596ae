// CSV rows (RFC 4180) into an AtomicFile: nothing appears at the target until commit().
#pragma once
#include <string>
#include <vector>

#include "envsift/write/atomic_file.hpp"

namespace envsift {

class CsvWriter {
 public:
  explicit CsvWriter(std::string path) : file_(std::move(path)) {}
  void row(const std::vector<std::string>& fields);
  void finish() { file_.finish(); }
  void commit() { file_.commit(); }

 private:
  AtomicFile file_;
  std::string buffer_;
};

// RFC 4180: a field is quoted when it holds a comma, quote, CR or LF, or starts/ends with a space.
void append_csv_field(std::string& out, const std::string& field);

}  // namespace envsift
