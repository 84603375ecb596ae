// A streaming reader for delimited text. With RFC 4180 quoting, quoted fields may hold the
// delimiter, doubled quotes and line breaks. Literal reading (what data-portal exports and Darwin
// Core Archives use for tab-separated text) takes a quote as a character like any other: a
// field is the text between delimiters and every line is a record. CRLF, LF and a lone CR (old Mac
// files) end a record; a UTF-8 byte-order mark is skipped.
#pragma once
#include <cstddef>
#include <istream>
#include <string>
#include <vector>

namespace envsift {

enum class Quoting { rfc4180, literal };

class CsvReader {
 public:
  // The longest record read (64 MiB): far beyond any occurrence record, short of exhausting memory
  // on a file that is not a points file (a compressed file of one endless line).
  static constexpr std::size_t kMaxRecordBytes = std::size_t(64) << 20;

  CsvReader(std::istream& in, char delimiter, std::string source_name, Quoting quoting = Quoting::rfc4180);

  // Reads the next record into `fields`. Returns false at end of input. `line` is set to the
  // 1-based line number where the record starts. Throws InputError on an unterminated quote or a record over kMaxRecordBytes.
  bool next(std::vector<std::string>& fields, std::size_t& line);
  // The line the last record read ended on (after `line` when a quoted field held a line break).
  std::size_t last_line() const { return line_ - 1; }

 private:
  int get();
  int peek();

  std::istream& in_;
  char delimiter_;
  Quoting quoting_;
  std::string source_;
  std::size_t line_ = 1;
  bool at_start_ = true;
};

// Picks the delimiter of a header line: the most frequent of tab, comma and semicolon outside
// quotes (comma when none occurs).
char sniff_delimiter(const std::string& header_line);

}  // namespace envsift
