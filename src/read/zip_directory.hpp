// Private to the reader: what a zip archive's central directory says of each member — its name,
// size, CRC-32 and whether it is a symbolic link (PKWARE APPNOTE.TXT, sections 4.3.12 central
// directory header, 4.3.16 end of central directory, 4.3.14-15 and 4.5.3 Zip64). GDAL's /vsizip/
// reads the members but neither checks their CRC-32 nor tells a symbolic link from a file; envsift
// checks both.
#pragma once
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

namespace envsift::detail {

struct ZipEntry {
  std::string name;
  std::uint32_t crc32 = 0;
  std::uint64_t size = 0;  // uncompressed
  bool symlink = false;    // made on Unix with the mode of a symbolic link
  bool directory = false;
};

// Every member of the zip archive at `path` (a plain or GDAL virtual path). Throws InputError
// naming the archive when its directory cannot be read.
std::vector<ZipEntry> read_zip_directory(const std::string& path);

// The member named `member`, if the archive has it.
std::optional<ZipEntry> find_zip_entry(const std::vector<ZipEntry>& entries, const std::string& member);

// Throws InputError when a member envsift is about to read is a symbolic link.
void refuse_zip_link(const std::string& archive, const ZipEntry& entry);

}  // namespace envsift::detail
