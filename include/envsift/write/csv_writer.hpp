// CSV rows (RFC 4180) into an AtomicFile: nothing appears at the target until commit().
#pragma once
#include <string>
#include <string_view>
#include <vector>

#include "envsift/write/atomic_file.hpp"

namespace envsift {

// as_is: every cell byte for byte (the main output, whose fields are the input's own);
// spreadsheet_safe: formula-like cells neutralised (spreadsheet_cells.hpp), for files that are
// made to be opened in a spreadsheet.
enum class CellStyle { as_is, spreadsheet_safe };

class CsvWriter {
 public:
  explicit CsvWriter(std::string path, CellStyle style = CellStyle::as_is) : file_(std::move(path)), style_(style) {}
  void row(const std::vector<std::string>& fields);
  // Rows already encoded (append_record_csv), gathered into large writes.
  void lines(std::string_view text);
  void finish();
  void commit() {
    finish();
    file_.commit();
  }

 private:
  AtomicFile file_;
  std::string buffer_, pending_;
  CellStyle style_;
  bool finished_ = false;
};

// RFC 4180: a field is quoted when it holds a comma, quote, CR or LF, or starts/ends with a space.
void append_csv_field(std::string& out, std::string_view field);

}  // namespace envsift
