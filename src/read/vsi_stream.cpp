#include "vsi_stream.hpp"

#include <cstring>

#include "envsift/errors.hpp"
#include "envsift/read/point_reader.hpp"

namespace envsift::detail {

VsiStreamBuf::VsiStreamBuf(const std::string& vsi_path) : file_(VSIFOpenL(vsi_path.c_str(), "rb")), buffer_(1 << 16) {
  setg(buffer_.data(), buffer_.data(), buffer_.data());
}

VsiStreamBuf::~VsiStreamBuf() {
  if (file_) VSIFCloseL(file_);
}

VsiStreamBuf::int_type VsiStreamBuf::underflow() {
  if (gptr() < egptr()) return traits_type::to_int_type(*gptr());
  if (!file_) return traits_type::eof();
  buffer_start_ += static_cast<vsi_l_offset>(egptr() - eback());
  const std::size_t got = VSIFReadL(buffer_.data(), 1, buffer_.size(), file_);
  setg(buffer_.data(), buffer_.data(), buffer_.data() + got);
  return got ? traits_type::to_int_type(*gptr()) : traits_type::eof();
}

VsiStreamBuf::pos_type VsiStreamBuf::seekoff(off_type offset, std::ios_base::seekdir direction, std::ios_base::openmode mode) {
  if (direction == std::ios_base::cur)
    return seekpos(static_cast<off_type>(buffer_start_ + static_cast<vsi_l_offset>(gptr() - eback())) + offset, mode);
  if (direction == std::ios_base::beg) return seekpos(offset, mode);
  return pos_type(off_type(-1));  // from the end: not needed, and a pipe has none
}

VsiStreamBuf::pos_type VsiStreamBuf::seekpos(pos_type position, std::ios_base::openmode) {
  if (!file_ || position < 0) return pos_type(off_type(-1));
  // within the bytes in hand: no seek on the file, so a pipe can be read again from its start
  const auto at = static_cast<vsi_l_offset>(position);
  if (at >= buffer_start_ && at <= buffer_start_ + static_cast<vsi_l_offset>(egptr() - eback())) {
    setg(eback(), eback() + (at - buffer_start_), egptr());
    return position;
  }
  if (VSIFSeekL(file_, at, SEEK_SET) != 0) return pos_type(off_type(-1));
  buffer_start_ = static_cast<vsi_l_offset>(position);
  setg(buffer_.data(), buffer_.data(), buffer_.data());
  return position;
}

namespace {

std::string first_bytes(const std::string& path, std::size_t n) {
  std::string bytes(n, '\0');
  VSILFILE* f = VSIFOpenL(path.c_str(), "rb");
  if (!f) return "";
  bytes.resize(VSIFReadL(bytes.data(), 1, n, f));
  VSIFCloseL(f);
  return bytes;
}

}  // namespace

TextSource locate_text(const std::string& path) {
  if (path == "-") return {"/vsistdin/", "standard input", true};
  VSIStatBufL st;
  if (VSIStatL(path.c_str(), &st) == 0 && !VSI_ISREG(st.st_mode) && !VSI_ISDIR(st.st_mode))
    return {path, path, true};  // a pipe (<(zcat ...)) or a device: text, read once from its start
  const std::string magic = first_bytes(path, 4);
  if (magic.size() >= 2 && static_cast<unsigned char>(magic[0]) == 0x1F && static_cast<unsigned char>(magic[1]) == 0x8B)
    return {"/vsigzip/" + path, path, true};
  if (magic == std::string("PK\x03\x04", 4)) {
    const std::string archive = "/vsizip/" + path;
    char** listing = VSIReadDirRecursive(archive.c_str());
    std::vector<std::string> members, texts;
    for (char** m = listing; m && *m; ++m) {
      members.emplace_back(*m);
      if (is_delimited_text(*m)) texts.emplace_back(*m);
    }
    CSLDestroy(listing);
    std::string list;
    for (const auto& m : members) list += (list.empty() ? "" : ", ") + m;
    if (texts.size() != 1)
      throw InputError(path, texts.empty() ? "a zip archive without a CSV/TSV file (it holds: " + (list.empty() ? "nothing" : list) + ")"
                                           : "a zip archive with several CSV/TSV files (" + list + ")",
                       "unzip it and give the points file, or give one member as /vsizip/" + path + "/MEMBER");
    return {archive + "/" + texts[0], path + "/" + texts[0], true};
  }
  return {path, path, is_delimited_text(path)};
}

}  // namespace envsift::detail
