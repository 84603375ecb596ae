#include "zip_directory.hpp"

#include <algorithm>

#include "envsift/errors.hpp"
#include "vsi_file.hpp"

namespace envsift::detail {
namespace {

std::uint64_t little_endian(const std::string& b, std::size_t at, int bytes) {
  std::uint64_t v = 0;
  for (int k = bytes - 1; k >= 0; --k) v = v << 8 | static_cast<unsigned char>(b[at + static_cast<std::size_t>(k)]);
  return v;
}

constexpr std::uint32_t kEndOfDirectory = 0x06054b50, kZip64Locator = 0x07064b50, kZip64End = 0x06064b50,
                        kDirectoryEntry = 0x02014b50;

}  // namespace

std::vector<ZipEntry> read_zip_directory(const std::string& path) {
  const std::string todo = "the zip archive is damaged or cut short; check it with unzip -t and copy or download it again";
  VsiFile f(path);
  if (!f.ok()) throw InputError(path, "cannot open the zip archive", "check the path and its read permission");
  const std::uint64_t size = f.size();
  // the end-of-directory record: 22 bytes, after which only a comment of up to 65,535 bytes
  const std::uint64_t tail_start = size > 65557 ? size - 65557 : 0;
  const std::string tail = f.read_at(tail_start, size - tail_start);
  std::size_t eocd = std::string::npos;
  for (std::size_t k = tail.size() >= 22 ? tail.size() - 22 + 1 : 0; k-- > 0;)
    if (little_endian(tail, k, 4) == kEndOfDirectory) {
      eocd = k;
      break;
    }
  if (eocd == std::string::npos) throw InputError(path, "has no zip central directory", todo);
  std::uint64_t entries = little_endian(tail, eocd + 10, 2), dir_size = little_endian(tail, eocd + 12, 4),
                dir_offset = little_endian(tail, eocd + 16, 4);
  if (eocd >= 20 && little_endian(tail, eocd - 20, 4) == kZip64Locator) {
    const std::string z = f.read_at(little_endian(tail, eocd - 20 + 8, 8), 56);
    if (z.size() < 56 || little_endian(z, 0, 4) != kZip64End) throw InputError(path, "has a damaged Zip64 directory", todo);
    entries = little_endian(z, 32, 8), dir_size = little_endian(z, 40, 8), dir_offset = little_endian(z, 48, 8);
  }
  if (dir_offset + dir_size > size) throw InputError(path, "its zip central directory lies beyond the file's end", todo);
  const std::string dir = f.read_at(dir_offset, dir_size);
  std::vector<ZipEntry> out;
  std::size_t at = 0;
  for (std::uint64_t e = 0; e < entries; ++e) {
    if (at + 46 > dir.size() || little_endian(dir, at, 4) != kDirectoryEntry)
      throw InputError(path, "its zip central directory is damaged (entry " + std::to_string(e + 1) + ")", todo);
    const auto made_on = little_endian(dir, at + 5, 1);  // high byte of "version made by": 3 is Unix
    ZipEntry z;
    z.crc32 = static_cast<std::uint32_t>(little_endian(dir, at + 16, 4));
    z.size = little_endian(dir, at + 24, 4);
    std::uint64_t compressed = little_endian(dir, at + 20, 4);
    const auto name_len = little_endian(dir, at + 28, 2), extra_len = little_endian(dir, at + 30, 2),
               comment_len = little_endian(dir, at + 32, 2);
    const auto external = little_endian(dir, at + 38, 4);
    if (at + 46 + name_len + extra_len + comment_len > dir.size())
      throw InputError(path, "its zip central directory is damaged (entry " + std::to_string(e + 1) + ")", todo);
    z.name = dir.substr(at + 46, name_len);
    // Zip64 extended information: the sizes that did not fit in 32 bits, in this order
    for (std::size_t x = at + 46 + name_len; x + 4 <= at + 46 + name_len + extra_len;) {
      const auto id = little_endian(dir, x, 2), len = little_endian(dir, x + 2, 2);
      if (id == 0x0001) {
        std::size_t v = x + 4;
        if (z.size == 0xFFFFFFFF && v + 8 <= x + 4 + len) z.size = little_endian(dir, v, 8), v += 8;
        if (compressed == 0xFFFFFFFF && v + 8 <= x + 4 + len) compressed = little_endian(dir, v, 8);
      }
      x += 4 + len;
    }
    const auto mode = external >> 16;
    z.symlink = made_on == 3 && (mode & 0170000) == 0120000;
    z.directory = !z.name.empty() && z.name.back() == '/';
    out.push_back(std::move(z));
    at += 46 + name_len + extra_len + comment_len;
  }
  return out;
}

std::optional<ZipEntry> find_zip_entry(const std::vector<ZipEntry>& entries, const std::string& member) {
  const auto it = std::find_if(entries.begin(), entries.end(), [&](const ZipEntry& e) { return e.name == member; });
  if (it == entries.end()) return std::nullopt;
  return *it;
}

void refuse_zip_link(const std::string& archive, const ZipEntry& entry) {
  if (entry.symlink)
    throw InputError(archive + "/" + entry.name,
                     "is a symbolic link inside the zip archive, which could point at any file on this machine; "
                     "envsift does not follow it",
                     "put the file itself into the archive (zip without --symlinks)");
}

}  // namespace envsift::detail
