#include "envsift/write/csv_writer.hpp"

#include "envsift/spreadsheet_cells.hpp"

namespace envsift {
namespace {
constexpr std::size_t kWriteBytes = std::size_t(4) << 20;  // one write(2) per 4 MiB
}

void append_csv_field(std::string& out, std::string_view field) {
  // one pass over the field (find_first_of would search the set once per character)
  bool quote = !field.empty() && (field.front() == ' ' || field.back() == ' ');
  for (std::size_t i = 0; i < field.size() && !quote; ++i) {
    const char c = field[i];
    quote = c == ',' || c == '"' || c == '\r' || c == '\n';
  }
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

void CsvWriter::row(const std::vector<std::string>& fields) {
  buffer_.clear();
  for (std::size_t i = 0; i < fields.size(); ++i) {
    if (i) buffer_ += ',';
    if (style_ == CellStyle::spreadsheet_safe) append_csv_field(buffer_, spreadsheet_safe(fields[i]));
    else append_csv_field(buffer_, fields[i]);
  }
  buffer_ += '\n';
  lines(buffer_);
}

void CsvWriter::lines(std::string_view text) {
  pending_ += text;
  if (pending_.size() < kWriteBytes) return;
  file_.write(pending_);
  pending_.clear();
}

void CsvWriter::finish() {
  if (finished_) return;
  finished_ = true;
  if (!pending_.empty()) file_.write(pending_);
  pending_.clear();
  file_.finish();
}

}  // namespace envsift
