// Private to the reader: one file opened through GDAL's virtual file systems (plain paths,
// /vsizip/, /vsistdin/), closed when it goes.
#pragma once
#include <cstdint>
#include <string>

#include <cpl_vsi.h>

namespace envsift::detail {

class VsiFile {
 public:
  explicit VsiFile(const std::string& path) : f_(VSIFOpenL(path.c_str(), "rb")) {}
  ~VsiFile() {
    if (f_) VSIFCloseL(f_);
  }
  VsiFile(const VsiFile&) = delete;
  VsiFile& operator=(const VsiFile&) = delete;

  bool ok() const { return f_ != nullptr; }
  // The next bytes, up to n; 0 at the end.
  std::size_t read(void* into, std::size_t n) { return VSIFReadL(into, 1, n, f_); }
  std::uint64_t size() {
    VSIFSeekL(f_, 0, SEEK_END);
    return VSIFTellL(f_);
  }
  // Up to n bytes from offset `at` (fewer at the end; none when it cannot seek there).
  std::string read_at(std::uint64_t at, std::uint64_t n) {
    std::string out(static_cast<std::size_t>(n), '\0');
    if (VSIFSeekL(f_, at, SEEK_SET) != 0) return "";
    out.resize(read(out.data(), out.size()));
    return out;
  }

 private:
  VSILFILE* f_;
};

}  // namespace envsift::detail
