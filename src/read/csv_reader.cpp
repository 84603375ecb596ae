#include "envsift/read/csv_reader.hpp"

#include "envsift/errors.hpp"

namespace envsift {

CsvReader::CsvReader(std::istream& in, char delimiter, std::string source_name, Quoting quoting)
    : in_(in), delimiter_(delimiter), quoting_(quoting), source_(std::move(source_name)) {}

// Straight from the stream's buffer: istream::get() builds a sentry for every character.
int CsvReader::get() { return in_.rdbuf()->sbumpc(); }
int CsvReader::peek() { return in_.rdbuf()->sgetc(); }

bool CsvReader::next(std::vector<std::string>& fields, std::size_t& line) {
  fields.clear();
  if (at_start_) {
    at_start_ = false;
    const int first = peek();
    if (first == 0x1F)  // gzip's first byte; a file is detected by its bytes before this, a pipe cannot be
      throw InputError(source_, 1, "the input is gzip-compressed",
                       "give the .gz file itself as --points (any name), or decompress it: zcat FILE | envsift ... --points -");
    if (first == 0xFF || first == 0xFE)  // a UTF-16 byte-order mark (FF FE or FE FF)
      throw InputError(source_, 1, "the file is UTF-16, not UTF-8 text",
                       "save it as UTF-8 (or CSV UTF-8) and run again");
    static const unsigned char bom[3] = {0xEF, 0xBB, 0xBF};
    if (peek() == bom[0]) {
      get();
      if (peek() == bom[1]) {
        get();
        if (peek() == bom[2]) get();
        else in_.rdbuf()->sungetc(), in_.rdbuf()->sungetc();
      } else {
        in_.rdbuf()->sungetc();
      }
    }
  }
  if (peek() == std::char_traits<char>::eof()) return false;

  line = line_;
  std::string field;
  bool quoted = false;      // inside a quoted section
  bool was_quoted = false;  // field began with a quote
  std::size_t quote_line = 0;
  std::size_t record_bytes = 0;
  for (;;) {
    int c = get();
    if (++record_bytes > kMaxRecordBytes)
      throw InputError(source_, line, "a record longer than " + std::to_string(kMaxRecordBytes >> 20) +
                                          " MiB (one line without a line break, or a quoted field that never closes)",
                       "check that this is a points file, with one record per line");
    if (c == 0)
      throw InputError(source_, line_, "a NUL byte: this is not a text file (or it is UTF-16 without a byte-order mark)",
                       "check the file, or save it as UTF-8 text");
    if (c == std::char_traits<char>::eof()) {
      if (quoted)
        throw InputError(source_, quote_line, "quote opened here is never closed",
                         "close the quote or remove it; a quote inside a field must be doubled (\"\")");
      fields.push_back(std::move(field));
      ++line_;  // as if the last line had ended with a line break
      return true;
    }
    if (quoted) {
      if (c == '"') {
        if (peek() == '"') {
          get();
          field.push_back('"');
        } else {
          quoted = false;
        }
      } else {
        if (c == '\n') ++line_;
        field.push_back(static_cast<char>(c));
      }
      continue;
    }
    if (c == '"' && field.empty() && !was_quoted && quoting_ == Quoting::rfc4180) {
      quoted = was_quoted = true;
      quote_line = line_;
    } else if (c == delimiter_) {
      fields.push_back(std::move(field));
      field.clear();
      was_quoted = false;
    } else if (c == '\r' && peek() == '\n') {
      // CRLF: the '\n' ends the record on the next iteration
    } else if (c == '\n' || c == '\r') {  // LF, or a lone CR (old Mac line endings)
      ++line_;
      fields.push_back(std::move(field));
      return true;
    } else {
      field.push_back(static_cast<char>(c));
    }
  }
}

char sniff_delimiter(const std::string& header_line) {
  std::size_t tabs = 0, commas = 0, semicolons = 0;
  bool quoted = false;
  for (char c : header_line) {
    if (c == '"') quoted = !quoted;
    if (quoted) continue;
    tabs += c == '\t';
    commas += c == ',';
    semicolons += c == ';';
  }
  if (tabs >= commas && tabs >= semicolons && tabs > 0) return '\t';
  if (semicolons > commas) return ';';
  return ',';
}

}  // namespace envsift
