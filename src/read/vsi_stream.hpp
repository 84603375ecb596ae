// Private to the reader: a std::istream over any file GDAL's virtual file systems open —
// /vsigzip/ (gzip), /vsizip/ (a member of a zip archive), /vsistdin/ (standard input), plain
// paths — so that compressed and piped points are read by the same tokenizer, in bounded memory.
#pragma once
#include <istream>
#include <memory>
#include <streambuf>
#include <string>
#include <vector>

#include <cpl_string.h>
#include <cpl_vsi.h>

namespace envsift::detail {

class VsiStreamBuf : public std::streambuf {
 public:
  explicit VsiStreamBuf(const std::string& vsi_path);
  ~VsiStreamBuf() override;
  bool is_open() const { return file_ != nullptr; }

 protected:
  int_type underflow() override;
  pos_type seekoff(off_type offset, std::ios_base::seekdir direction, std::ios_base::openmode) override;
  pos_type seekpos(pos_type position, std::ios_base::openmode) override;

 private:
  VSILFILE* file_ = nullptr;
  std::vector<char> buffer_;
  vsi_l_offset buffer_start_ = 0;  // file offset of buffer_[0]
};

class VsiInput : public std::istream {
 public:
  explicit VsiInput(const std::string& vsi_path) : std::istream(nullptr), buffer_(vsi_path) {
    rdbuf(&buffer_);
    if (!buffer_.is_open()) setstate(std::ios::failbit);
  }

 private:
  VsiStreamBuf buffer_;
};

// Where the text of a points argument is: `-` is standard input, a gzip file (by its first bytes,
// whatever its name) is read through /vsigzip/, a zip archive holding one delimited text file
// through /vsizip/; `text` is false for everything else that is not .csv/.tsv/.tab/.txt (read by OGR).
struct TextSource {
  std::string vsi_path;  // what to open
  std::string name;      // for messages: the path, or ARCHIVE/MEMBER
  bool text = false;
};
TextSource locate_text(const std::string& path);

}  // namespace envsift::detail
