// Private to the reader: a std::istream over any points file — plain, a gzip stream, a member of
// a zip archive, standard input or a pipe — so that every form is read by the same tokenizer in
// bounded memory. Compressed input is complete or refused: a gzip stream must reach its end
// marker with a matching CRC-32 and length (RFC 1952), a zip member must match the size and
// CRC-32 its archive's directory records; otherwise reading throws InputError naming the file.
#pragma once
#include <istream>
#include <memory>
#include <optional>
#include <streambuf>
#include <string>
#include <vector>

#include "zip_directory.hpp"

namespace envsift::detail {

// Where the text of a points argument is: `-` is standard input, a gzip file (by its first
// bytes, whatever its name) is decoded here, a zip archive holding one delimited text file is
// read through /vsizip/ and checked against its directory; `text` is false for everything else
// that is not .csv/.tsv/.tab/.txt (read by OGR).
struct TextSource {
  enum class Packing { plain, gzip, zip_member };
  std::string vsi_path;  // what to open: the file itself (plain, gzip) or /vsizip/ARCHIVE/MEMBER
  std::string name;      // for messages: the path, or ARCHIVE/MEMBER
  bool text = false;
  Packing packing = Packing::plain;
  std::optional<ZipEntry> member;  // a zip member's size and CRC-32, to check
  bool rewindable = true;          // false for standard input and pipes: read once from the start
};
TextSource locate_text(const std::string& path);
// A file given by an archive (a zip member, or a plain file): checked like a points file.
TextSource archive_member(const std::string& vsi_path, const std::string& name, std::optional<ZipEntry> member);

// The bytes of a source, in order.
class ByteSource {
 public:
  virtual ~ByteSource() = default;
  // Up to n bytes; 0 at the end. Throws InputError when the data are damaged or cut short.
  virtual std::size_t read(char* into, std::size_t n) = 0;
};
// Null when the file cannot be opened.
std::unique_ptr<ByteSource> open_bytes(const TextSource& source);

class VsiStreamBuf : public std::streambuf {
 public:
  explicit VsiStreamBuf(TextSource source);
  bool is_open() const { return bytes_ != nullptr; }

 protected:
  int_type underflow() override;
  pos_type seekoff(off_type offset, std::ios_base::seekdir direction, std::ios_base::openmode) override;
  pos_type seekpos(pos_type position, std::ios_base::openmode) override;

 private:
  TextSource source_;
  std::unique_ptr<ByteSource> bytes_;
  std::vector<char> buffer_;
  std::uint64_t buffer_start_ = 0;  // offset of buffer_[0] in the (decoded) text
};

// Errors of the source (a damaged gzip, a bad CRC) reach the caller as the InputError thrown.
class VsiInput : public std::istream {
 public:
  explicit VsiInput(TextSource source) : std::istream(nullptr), buffer_(std::move(source)) {
    rdbuf(&buffer_);
    if (!buffer_.is_open()) setstate(std::ios::failbit);
    exceptions(std::ios::badbit);
  }

 private:
  VsiStreamBuf buffer_;
};

// All of a (small) file's text, checked as above: meta.xml.
std::string read_whole(const TextSource& source);

}  // namespace envsift::detail
