#include "vsi_stream.hpp"

#include <cstring>
#include <new>

#include <cpl_string.h>
#include <cpl_vsi.h>
#include <zlib.h>

#include "envsift/errors.hpp"
#include "envsift/read/point_reader.hpp"
#include "vsi_file.hpp"

namespace envsift::detail {
namespace {

const std::string kCopyAgain = "copy or download it again";

// A plain file, standard input, or a zip member checked against its directory entry.
class FileBytes : public ByteSource {
 public:
  FileBytes(const TextSource& s) : file_(s.vsi_path), name_(s.name), member_(s.member) {}
  bool ok() const { return file_.ok(); }
  std::size_t read(char* into, std::size_t n) override {
    const std::size_t got = file_.read(into, n);
    if (!member_) return got;
    crc_ = crc32_z(crc_, reinterpret_cast<const Bytef*>(into), got);
    count_ += got;
    if (got == 0 && (count_ != member_->size || crc_ != member_->crc32))
      throw InputError(name_,
                       count_ != member_->size
                           ? "the zip member holds " + std::to_string(count_) + " bytes where the archive's directory says " +
                                 std::to_string(member_->size) + ": the archive is damaged"
                           : "the zip member's data do not match the CRC-32 its archive records: the archive is damaged",
                       "check it with unzip -t, then " + kCopyAgain);
    return got;
  }

 private:
  VsiFile file_;
  std::string name_;
  std::optional<ZipEntry> member_;
  uLong crc_ = crc32_z(0, nullptr, 0);
  std::uint64_t count_ = 0;
};

// A gzip file decoded with zlib, which checks each member's CRC-32 and length (RFC 1952 §2.3.1);
// members written one after another (gzip allows it) are read in turn.
class GzipBytes : public ByteSource {
 public:
  explicit GzipBytes(const TextSource& s) : file_(s.vsi_path), name_(s.name), input_(1 << 16) {
    if (inflateInit2(&z_, 15 + 16) != Z_OK) throw std::bad_alloc();
  }
  ~GzipBytes() override { inflateEnd(&z_); }
  bool ok() const { return file_.ok(); }

  std::size_t read(char* into, std::size_t n) override {
    z_.next_out = reinterpret_cast<Bytef*>(into);
    z_.avail_out = static_cast<uInt>(std::min<std::size_t>(n, 1u << 30));
    const uInt wanted = z_.avail_out;
    while (z_.avail_out == wanted) {
      if (z_.avail_in == 0) {
        const std::size_t got = file_.read(input_.data(), input_.size());
        if (got == 0) {
          if (member_ended_ || seen_ == 0) return 0;
          throw InputError(name_, "the gzip stream stops before its end (the file is cut short after " +
                                      std::to_string(seen_) + " bytes)",
                           "check it with gzip -t, then " + kCopyAgain);
        }
        seen_ += got;
        z_.next_in = input_.data();
        z_.avail_in = static_cast<uInt>(got);
      }
      if (member_ended_) {  // more bytes after a member: zero padding, or the next member
        while (z_.avail_in && *z_.next_in == 0) ++z_.next_in, --z_.avail_in;
        if (!z_.avail_in) continue;
        inflateReset(&z_);
        member_ended_ = false;
      }
      const int r = inflate(&z_, Z_NO_FLUSH);
      if (r == Z_STREAM_END) {
        member_ended_ = true;
      } else if (r == Z_DATA_ERROR) {
        const std::string why = !z_.msg ? "invalid data"
                                : std::string(z_.msg) == "incorrect data check"   ? "its CRC-32 does not match the data"
                                : std::string(z_.msg) == "incorrect length check" ? "its recorded length does not match the data"
                                                                                  : z_.msg;
        throw InputError(name_, "the gzip data are damaged (" + why + ")", "check it with gzip -t, then " + kCopyAgain);
      } else if (r == Z_MEM_ERROR) {
        throw std::bad_alloc();
      } else if (r != Z_OK && !(r == Z_BUF_ERROR && z_.avail_in == 0)) {  // no progress possible: never spin
        throw InputError(name_, "the gzip data cannot be decoded (zlib error " + std::to_string(r) + ")",
                         "check it with gzip -t, then " + kCopyAgain);
      }
    }
    return wanted - z_.avail_out;
  }

 private:
  VsiFile file_;
  std::string name_;
  std::vector<Bytef> input_;
  z_stream z_{};
  bool member_ended_ = false;
  std::uint64_t seen_ = 0;
};

std::string first_bytes(const std::string& path, std::size_t n) {
  std::string bytes(n, '\0');
  VsiFile f(path);
  if (!f.ok()) return "";
  bytes.resize(f.read(bytes.data(), n));
  return bytes;
}

}  // namespace

std::unique_ptr<ByteSource> open_bytes(const TextSource& source) {
  if (source.packing == TextSource::Packing::gzip) {
    auto g = std::make_unique<GzipBytes>(source);
    if (!g->ok()) return nullptr;
    return g;
  }
  auto f = std::make_unique<FileBytes>(source);
  if (!f->ok()) return nullptr;
  return f;
}

VsiStreamBuf::VsiStreamBuf(TextSource source) : source_(std::move(source)), bytes_(open_bytes(source_)), buffer_(1 << 16) {
  setg(buffer_.data(), buffer_.data(), buffer_.data());
}

VsiStreamBuf::int_type VsiStreamBuf::underflow() {
  if (gptr() < egptr()) return traits_type::to_int_type(*gptr());
  if (!bytes_) return traits_type::eof();
  buffer_start_ += static_cast<std::uint64_t>(egptr() - eback());
  const std::size_t got = bytes_->read(buffer_.data(), buffer_.size());
  setg(buffer_.data(), buffer_.data(), buffer_.data() + got);
  return got ? traits_type::to_int_type(*gptr()) : traits_type::eof();
}

VsiStreamBuf::pos_type VsiStreamBuf::seekoff(off_type offset, std::ios_base::seekdir direction, std::ios_base::openmode mode) {
  if (direction == std::ios_base::cur)
    return seekpos(static_cast<off_type>(buffer_start_ + static_cast<std::uint64_t>(gptr() - eback())) + offset, mode);
  if (direction == std::ios_base::beg) return seekpos(offset, mode);
  return pos_type(off_type(-1));  // from the end: not needed, and a pipe has none
}

VsiStreamBuf::pos_type VsiStreamBuf::seekpos(pos_type position, std::ios_base::openmode) {
  if (!bytes_ || position < 0) return pos_type(off_type(-1));
  // within the bytes in hand: no new read, so a pipe can be read again from its start
  const auto at = static_cast<std::uint64_t>(position);
  if (at >= buffer_start_ && at <= buffer_start_ + static_cast<std::uint64_t>(egptr() - eback())) {
    setg(eback(), eback() + (at - buffer_start_), egptr());
    return position;
  }
  if (at != 0 || !source_.rewindable) return pos_type(off_type(-1));
  bytes_ = open_bytes(source_);  // back to the start: read (and check) the file again
  buffer_start_ = 0;
  setg(buffer_.data(), buffer_.data(), buffer_.data());
  return bytes_ ? position : pos_type(off_type(-1));
}

std::string read_whole(const TextSource& source) {
  auto bytes = open_bytes(source);
  if (!bytes) return "";
  std::string text;
  char buf[65536];
  for (std::size_t got; (got = bytes->read(buf, sizeof buf)) > 0;) text.append(buf, got);
  return text;
}

TextSource archive_member(const std::string& vsi_path, const std::string& name, std::optional<ZipEntry> member) {
  TextSource s;
  s.vsi_path = vsi_path;
  s.name = name;
  s.text = true;
  if (member) s.packing = TextSource::Packing::zip_member, s.member = std::move(member);
  return s;
}

TextSource locate_text(const std::string& path) {
  TextSource s;
  s.vsi_path = s.name = path;
  s.text = true;
  if (path == "-") {
    s.vsi_path = "/vsistdin/", s.name = "standard input", s.rewindable = false;
    return s;
  }
  VSIStatBufL st;
  if (VSIStatL(path.c_str(), &st) == 0 && !VSI_ISREG(st.st_mode) && !VSI_ISDIR(st.st_mode)) {
    s.rewindable = false;  // a pipe (<(zcat ...)) or a device: text, read once from its start
    return s;
  }
  const std::string magic = first_bytes(path, 4);
  if (magic.size() >= 2 && static_cast<unsigned char>(magic[0]) == 0x1F && static_cast<unsigned char>(magic[1]) == 0x8B) {
    s.packing = TextSource::Packing::gzip;
    return s;
  }
  if (magic == std::string("PK\x03\x04", 4)) {
    const auto entries = read_zip_directory(path);
    std::vector<const ZipEntry*> texts;
    std::string list;
    for (const auto& e : entries) {
      if (e.directory) continue;
      list += (list.empty() ? "" : ", ") + e.name;
      if (is_delimited_text(e.name)) texts.push_back(&e);
    }
    if (texts.size() != 1)
      throw InputError(path, texts.empty() ? "a zip archive without a CSV/TSV file (it holds: " + (list.empty() ? "nothing" : list) + ")"
                                           : "a zip archive with several CSV/TSV files (" + list + ")",
                       "unzip it and give the points file, or give one member as /vsizip/" + path + "/MEMBER");
    refuse_zip_link(path, *texts[0]);
    return archive_member("/vsizip/" + path + "/" + texts[0]->name, path + "/" + texts[0]->name, *texts[0]);
  }
  s.text = is_delimited_text(path);
  return s;
}

}  // namespace envsift::detail
