#include "envsift/write/csv_writer.hpp"

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

void CsvWriter::row(const std::vector<std::string>& fields) {
  buffer_.clear();
  for (std::size_t i = 0; i < fields.size(); ++i) {
    if (i) buffer_ += ',';
    append_csv_field(buffer_, fields[i]);
  }
  buffer_ += '\n';
  file_.write(buffer_);
}

}  // namespace envsift
