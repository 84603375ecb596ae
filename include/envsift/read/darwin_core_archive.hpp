// Darwin Core Archives (TDWG Darwin Core Text Guide): a zip file or a folder with a `meta.xml`
// that describes the core data file — its location, field and line terminators, quote
// character, encoding, header lines, and each field's term URI (or a `default` value for every
// record). envsift reads the core as the points; extensions are ignored, with a note.
#pragma once
#include <cstdint>
#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace envsift {

struct ArchiveCore {
  std::string vsi_path;                 // the core data file, as GDAL's virtual file systems open it
  std::string name;                     // for messages: ARCHIVE/MEMBER
  bool zip_member = false;              // in a zip archive: its size and CRC-32 are checked as it is read
  std::uint32_t crc32 = 0;
  std::uint64_t size = 0;
  std::vector<std::string> files;       // the files of a folder archive (meta.xml, the core): inputs, never outputs
  char delimiter = '\t';                // fieldsTerminatedBy
  bool quoted = false;                  // fieldsEnclosedBy is '"' (RFC 4180 quoting)
  std::size_t header_lines = 0;         // ignoreHeaderLines
  std::vector<std::string> columns;     // by index: the term's name (decimalLatitude, ...)
  std::vector<std::pair<std::string, std::string>> defaults;  // fields only given a default value
  std::vector<std::string> notes;       // e.g. extensions ignored
};

// The core of the archive at `path` (a .zip file or a folder holding meta.xml); nothing when
// `path` is not an archive. Throws InputError naming meta.xml when it cannot be used, and when
// the core's location leaves the archive: an absolute path, a `..` step or a symbolic link (in a
// folder) or a symbolic link member (in a zip) is refused, so an archive cannot make envsift read
// a file the user did not give.
std::optional<ArchiveCore> read_archive_meta(const std::string& path);

}  // namespace envsift
